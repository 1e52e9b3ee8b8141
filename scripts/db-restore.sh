#!/usr/bin/env bash
# `npm run db:restore -- FILE`: replaces the product database's contents with a db:backup dump.
# Stop the server and workers first; the restore runs in one transaction and fails as a whole.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_postgres
in="${1:?usage: npm run db:restore -- FILE}"
[ -f "$in" ] || { log "no such backup file: $in"; exit 2; }
url="${DATABASE_URL:-postgres://postgres@127.0.0.1:${PENDULA_PG_PORT:-55433}/${PENDULA_DB:-pendula}}"
"$PG_BIN/pg_restore" --clean --if-exists --no-owner --no-privileges --single-transaction --exit-on-error --dbname="$url" "$in"
log "restored $in"
