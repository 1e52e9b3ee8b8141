#!/usr/bin/env bash
# `npm start`: the whole product with demo data on one loopback URL. Ctrl-C stops everything it started.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
. "$(dirname "$0")/lib/product.sh"

ensure_node_modules
ensure_build
ensure_postgres

PENDULA_DATA="${PENDULA_DATA:-$ROOT/.pendula}"
PENDULA_PORT="${PENDULA_PORT:-8641}"
PENDULA_PG_PORT="${PENDULA_PG_PORT:-55433}"
PENDULA_DB="${PENDULA_DB:-pendula}"
mkdir -p "$PENDULA_DATA"

# The cluster lives in the project's git-ignored .pendula/ folder. When the PostgreSQL system user
# cannot reach it (a checkout under /root, say), the cluster goes to /var/lib/pendula/<id> and
# .pendula/pg links to it.
PG_DIR="$PENDULA_DATA/pg"
if [ "$(id -u)" -eq 0 ] && [ ! -L "$PG_DIR" ] && ! as_pg test -x "$PENDULA_DATA" 2>/dev/null; then
  alt="/var/lib/pendula/$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
  mkdir -p "$alt"
  ln -sfn "$alt" "$PG_DIR"
  log "cluster folder: $PG_DIR -> $alt (the postgres user cannot traverse $PENDULA_DATA)"
fi
PG_DIR="$(readlink -f "$PG_DIR" 2>/dev/null || echo "$PG_DIR")"

cleanup() {
  trap - EXIT INT TERM
  log "stopping"
  stop_product
  pg_cluster_down "$PG_DIR"
}
trap cleanup EXIT INT TERM

product_cluster_up "$PG_DIR" "$PENDULA_PG_PORT"
product_env
start_fakes
migrate_and_seed
build_portal
start_services
log "DEMO MODE — demo accounts with a published password, captured mail at /api/dev/mailbox; not for patient data (README: production start)"
log "Pendula is running. Sign in with the demo accounts in README.md. Ctrl-C stops it."
echo "http://127.0.0.1:$PENDULA_PORT"
wait
