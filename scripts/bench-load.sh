#!/usr/bin/env bash
# `npm run bench:load`: a throwaway cluster, 500 patients × 2 years of weekly sessions, then
# autocannon against the trend and session routes. Prints latency percentiles and throughput.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_node_modules
ensure_postgres
throwaway_test_cluster
cd "$ROOT" && npx tsx tests/load/bench-load.ts "$@"
