#!/usr/bin/env bash
# `npm run bench:e2e`: upload → processed session through the real API and queue. Starts its own
# cluster (durable settings, as the product), object-storage and e-mail fakes, the built server and
# 1, 2 or 4 built worker processes, the same way `npm start` does (scripts/lib/product.sh); the
# driver (tests/load/bench-e2e.ts) uploads 30-minute four-sensor sessions as patients and prints
# upload→done p50/p95 one session at a time, then sessions per minute for BENCH_BURST sessions
# uploaded at once with each worker count, with each worker's peak RSS and the load average.
# Environment: BENCH_MINUTES (30), BENCH_SINGLE (5), BENCH_BURST (40), BENCH_WORKERS ("1 2 4");
# BENCH_SINGLE=0 or BENCH_BURST=0 skips that part.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
. "$(dirname "$0")/lib/product.sh"

MINUTES="${BENCH_MINUTES:-30}"
SINGLE="${BENCH_SINGLE:-5}"
BURST="${BENCH_BURST:-40}"
WORKER_COUNTS="${BENCH_WORKERS-1 2 4}"

ensure_node_modules
ensure_postgres
ensure_build

TMP="$(mktemp -d)"; chmod 755 "$TMP"
PENDULA_DATA="$TMP/data"
PENDULA_PORT="$(free_port)"
PENDULA_DB=pendula
STATE="$TMP/state"
mkdir -p "$PENDULA_DATA" "$STATE"
cleanup() {
  trap - EXIT INT TERM
  stop_product
  pg_cluster_down "$TMP/pg"
  rm -rf "$TMP"
}
trap cleanup EXIT INT TERM

pg_cluster_up "$TMP/pg" "$(free_port)"
product_env
start_fakes
migrate_database
start_server

driver() { (cd "$ROOT" && "$ROOT/node_modules/.bin/tsx" tests/load/bench-e2e.ts "$@" --state-dir "$STATE"); }

WORKERS=()
start_workers() {
  local n="$1" i
  WORKERS=()
  for i in $(seq 1 "$n"); do
    : >"$PENDULA_DATA/worker-$i.log"
    start_worker "$PENDULA_DATA/worker-$i.log"
    WORKERS+=("$WORKER_PID")
  done
  for i in $(seq 1 "$n"); do
    wait_for_line "$PENDULA_DATA/worker-$i.log" "worker ready" 60 || { log "worker $i did not start:"; cat "$PENDULA_DATA/worker-$i.log" >&2; return 1; }
  done
}
stop_workers() {
  local pid
  for pid in "${WORKERS[@]}"; do kill -TERM "$pid" 2>/dev/null || true; done
  for pid in "${WORKERS[@]}"; do wait "$pid" 2>/dev/null || true; done
  WORKERS=()
}
worker_pids() { local IFS=,; echo "${WORKERS[*]}"; }
# For the driver's CPU and memory figures (read from /proc; nothing is signalled).
BENCH_SERVER_PID="$SERVER_PID"
BENCH_FAKES_PID="$(pgrep -f "fakes.js --data $PENDULA_DATA/fakes" | head -1 || true)"
BENCH_PG_PID="$(head -1 "$TMP/pg/data/postmaster.pid")"
export BENCH_SERVER_PID BENCH_FAKES_PID BENCH_PG_PID

echo "machine: $(nproc) cores, $(awk '/MemTotal/ {printf "%.1f GB", $2 / 1048576}' /proc/meminfo) memory; load average $(cut -d' ' -f1-3 /proc/loadavg) (1, 5, 15 min)"
echo "server: node ingest-server/dist/server.js (pid $SERVER_PID); workers: node ingest-server/dist/worker.js, one session at a time each; database: durable (fsync on)"
driver prepare --patients "$(( BURST > SINGLE ? BURST : SINGLE ))" --minutes "$MINUTES"

# Week 0: one session at a time, one worker (BENCH_SINGLE=0 skips it).
if [ "$SINGLE" -gt 0 ]; then
  start_workers 1
  BENCH_WORKER_PIDS="$(worker_pids)" driver single --count "$SINGLE" --week 0 --workers-label "1 worker"
  stop_workers
fi

# Weeks 1, 2, 3: the burst with each worker count (fresh workers, so each peak RSS is this pass's).
week=1
[ "$BURST" -gt 0 ] || WORKER_COUNTS=""
for n in $WORKER_COUNTS; do
  start_workers "$n"
  BENCH_WORKER_PIDS="$(worker_pids)" driver burst --count "$BURST" --week "$week" --workers "$n"
  stop_workers
  week=$((week + 1))
done
