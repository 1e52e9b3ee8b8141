#!/usr/bin/env bash
# `npm run bench:upload`: a throwaway cluster, then ingest-server/bench/upload-bench.ts (peak RSS of
# the server while many large uploads run at once, and another user's read latency meanwhile).
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_node_modules
ensure_postgres
throwaway_test_cluster
cd "$ROOT" && npx tsx --expose-gc ingest-server/bench/upload-bench.ts "$@"
