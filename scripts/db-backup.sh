#!/usr/bin/env bash
# `npm run db:backup [-- FILE]`: a custom-format pg_dump of the product database (default: the
# cluster `npm start` runs). Restore with `npm run db:restore -- FILE`.
set -euo pipefail
. "$(dirname "$0")/lib/common.sh"
ensure_postgres
product_database_connection
out="${1:-$ROOT/.pendula/backups/pendula-$(date -u +%Y%m%dT%H%M%SZ).dump}"
mkdir -p "$(dirname "$out")"
"$PG_BIN/pg_dump" --format=custom --no-owner --no-privileges --file="$out" "$PG_URL"
log "backup written: $out ($(stat -c %s "$out") bytes)"
echo "$out"
