#!/usr/bin/env bash
# `npm run db:restore -- FILE`: replaces the product database's contents with a db:backup dump.
# Stop the server and workers first; the restore runs in one transaction and fails as a whole.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_postgres
in="${1:?usage: npm run db:restore -- FILE}"
[ -f "$in" ] || { log "no such backup file: $in"; exit 2; }
product_database_connection
"$PG_BIN/pg_restore" --clean --if-exists --no-owner --no-privileges --single-transaction --exit-on-error --dbname="$PG_URL" "$in"
log "restored $in"
log "the next start (migrations and prepare-database) grants the application role its rights on the restored tables again"
