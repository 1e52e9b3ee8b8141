#!/usr/bin/env bash
# `npm test`: typecheck, lint, every workspace's tests, the cross-package tests and the browser tests,
# against a throwaway PostgreSQL cluster that is removed afterwards, on success or failure.
# Ends with one line `N passed, N failed` over everything it ran (`N passed, N failed, N skipped` when
# tests were skipped, e.g. the real-data checks when ../shared/data is absent).
set -uo pipefail
. "$(dirname "$0")/lib/common.sh"
. "$(dirname "$0")/lib/product.sh"
set +e

ensure_node_modules || exit 1
ensure_build || exit 1
ensure_postgres || exit 1
if [ ! -x /usr/bin/chromium ] && [ "${PENDULA_SKIP_E2E:-}" != "1" ]; then
  log "installing Debian's Chromium for the browser tests"
  as_root apt-get update -qq && DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends chromium >/dev/null
fi

TMP="$(mktemp -d)"
chmod 755 "$TMP"
REPORTS="$TMP/reports"; mkdir -p "$REPORTS"
PG_DIR="$TMP/pg"
E2E_PG_DIR="$TMP/product-pg"
cleanup() {
  trap - EXIT INT TERM
  stop_product
  pg_cluster_down "$E2E_PG_DIR"
  pg_cluster_down "$PG_DIR"
  rm -rf "$TMP"
}
trap cleanup EXIT INT TERM

PASSED=0; FAILED=0; SKIPPED=0
record() { # name exit_code
  if [ "$2" -eq 0 ]; then PASSED=$((PASSED + 1)); log "$1: ok"; else FAILED=$((FAILED + 1)); log "$1: FAILED"; fi
}
count_vitest() { # json report
  [ -f "$1" ] || { FAILED=$((FAILED + 1)); log "no report $1 (runner crashed)"; return; }
  local p f s
  read -r p f s < <(node "$ROOT/scripts/lib/count-vitest.cjs" "$1")
  PASSED=$((PASSED + p)); FAILED=$((FAILED + f)); SKIPPED=$((SKIPPED + s))
}

cd "$ROOT"
log "typecheck"; npm run --silent typecheck; record typecheck $?
log "lint"; npx eslint . ; record lint $?

PG_PORT="$(free_port)"
pg_cluster_up "$PG_DIR" "$PG_PORT" throwaway || { echo "0 passed, 1 failed"; exit 1; }
export PENDULA_TEST_PG="postgres://postgres@127.0.0.1:$PG_PORT"
export BCRYPT_COST=4

log "unit, integration and reference tests"
npx vitest run --reporter=default --reporter=json --outputFile.json="$REPORTS/vitest.json"
UNIT_RC=$?
count_vitest "$REPORTS/vitest.json"

E2E_RC=0
if [ "${PENDULA_SKIP_E2E:-}" != "1" ] && [ -f tests/e2e/vitest.e2e.config.ts ]; then
  log "browser tests against the running product (throwaway database, demo seed)"
  PENDULA_DATA="$TMP/product"; PENDULA_DB=pendula_e2e; PENDULA_PORT="$(free_port)"; PENDULA_SEED_MAX_WEEKS=8
  # A cluster of its own, with passwords and the application role, as `npm start` runs it (the unit
  # tests' cluster above trusts local connections, which only a throwaway folder may).
  if product_cluster_up "$E2E_PG_DIR" "$(free_port)" throwaway && product_env && start_fakes && migrate_and_seed && build_portal && start_services; then
    PENDULA_E2E_URL="http://127.0.0.1:$PENDULA_PORT" npx vitest run --config tests/e2e/vitest.e2e.config.ts \
      --reporter=default --reporter=json --outputFile.json="$REPORTS/e2e.json"
    E2E_RC=$?
    count_vitest "$REPORTS/e2e.json"
  else
    E2E_RC=1; FAILED=$((FAILED + 1)); log "could not start the product for the browser tests"
  fi
  stop_product
fi

if [ "$SKIPPED" -gt 0 ]; then echo "$PASSED passed, $FAILED failed, $SKIPPED skipped"; else echo "$PASSED passed, $FAILED failed"; fi
[ "$FAILED" -eq 0 ] && [ "$UNIT_RC" -eq 0 ] && [ "$E2E_RC" -eq 0 ]
