#!/usr/bin/env bash
# `npm run bench:upload`: a throwaway cluster, then ingest-server/bench/upload-bench.ts (peak RSS of
# the server while many large uploads run at once, and another user's read latency meanwhile).
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_node_modules
ensure_postgres
TMP="$(mktemp -d)"; chmod 755 "$TMP"
cleanup() { pg_cluster_down "$TMP/pg"; rm -rf "$TMP"; }
trap cleanup EXIT INT TERM
PORT="$(node -e 'const s=require("net").createServer();s.listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})')"
pg_cluster_up "$TMP/pg" "$PORT" throwaway
export PENDULA_TEST_PG="postgres://postgres@127.0.0.1:$PORT"
cd "$ROOT" && npx tsx --expose-gc ingest-server/bench/upload-bench.ts "$@"
