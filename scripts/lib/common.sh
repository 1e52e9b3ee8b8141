#!/usr/bin/env bash
# Shared by start.sh and test.sh: install what is missing, run a private PostgreSQL cluster on loopback.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"

log() { printf '[pendula] %s\n' "$*" >&2; }

as_root() { if [ "$(id -u)" -eq 0 ]; then "$@"; else sudo "$@"; fi; }

ensure_node_modules() {
  if [ ! -d "$ROOT/node_modules" ] || [ ! -e "$ROOT/node_modules/.package-lock.json" ]; then
    log "installing npm dependencies (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund)
  fi
}

# Server, worker, fakes, seed, migrations and the analysis CLI run as JavaScript built once by
# scripts/build.mjs; this rebuilds when any file a bundle was built from is newer than the build.
ensure_build() {
  (cd "$ROOT" && node scripts/build.mjs --if-stale)
}

pg_bindir() {
  local d
  for d in /usr/lib/postgresql/*/bin; do
    if [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ]; then echo "$d"; fi
  done | sort -V | tail -n 1
}

ensure_postgres() {
  if [ -z "$(pg_bindir)" ]; then
    log "PostgreSQL server binaries missing: installing Debian's postgresql (no system cluster)"
    as_root apt-get update -qq
    DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends postgresql-common >/dev/null
    as_root sed -i 's/^#\?\s*create_main_cluster.*/create_main_cluster = false/' /etc/postgresql-common/createcluster.conf
    DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends postgresql >/dev/null
  fi
  PG_BIN="$(pg_bindir)"
  [ -n "$PG_BIN" ] || { log "PostgreSQL install failed"; exit 1; }
  export PG_BIN
}

# initdb refuses root: as root, the cluster belongs to a system user and every command runs as it.
pg_user() {
  if [ "$(id -u)" -ne 0 ]; then id -un; return; fi
  if id postgres >/dev/null 2>&1; then echo postgres; return; fi
  if ! id pendula-pg >/dev/null 2>&1; then useradd --system --no-create-home --shell /usr/sbin/nologin pendula-pg; fi
  echo pendula-pg
}

as_pg() {
  local u; u="$(pg_user)"
  if [ "$(id -u)" -eq 0 ]; then runuser -u "$u" -- "$@"; else "$@"; fi
}

# pg_cluster_up DIR PORT [throwaway] [SUPERUSER_PASSWORD]
# With a password (the product's clusters) every connection, on the socket and on 127.0.0.1, must
# give its role's password (scram-sha-256); a cluster made earlier with trust is switched over.
# Without one every local connection is trusted: throwaway test clusters only, in a private folder.
pg_cluster_up() {
  local dir="$1" port="$2" throwaway="${3:-}" password="${4:-}"
  mkdir -p "$dir"
  if [ "$(id -u)" -eq 0 ]; then chown "$(pg_user)" "$dir"; fi
  chmod 700 "$dir"
  if [ ! -f "$dir/data/PG_VERSION" ]; then
    if [ -n "$password" ]; then
      # initdb reads the password from a file the cluster's user can read, inside the private folder.
      printf '%s\n' "$password" | as_pg tee "$dir/.initdb-pw" >/dev/null
      as_pg "$PG_BIN/initdb" -D "$dir/data" -U postgres --auth=scram-sha-256 --pwfile="$dir/.initdb-pw" -E UTF8 --locale=C.UTF-8 --no-sync >/dev/null
      as_pg rm -f "$dir/.initdb-pw"
    else
      as_pg "$PG_BIN/initdb" -D "$dir/data" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 --no-sync >/dev/null
    fi
    {
      echo "listen_addresses = '127.0.0.1'"
      echo "port = $port"
      echo "unix_socket_directories = '$dir'"
      echo "max_connections = 200"
      if [ -n "$throwaway" ]; then
        echo "fsync = off"; echo "synchronous_commit = off"; echo "full_page_writes = off"
      fi
    } | as_pg tee -a "$dir/data/postgresql.conf" >/dev/null
  fi
  if ! as_pg "$PG_BIN/pg_ctl" -D "$dir/data" status >/dev/null 2>&1; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir/data" -l "$dir/postgres.log" -w -t 30 start >/dev/null
  fi
  export PGHOST=127.0.0.1 PGPORT="$port" PGUSER=postgres
  # Not exported: psql and createdb get it per command (pg_psql), the product's processes never.
  PG_SUPERUSER_PASSWORD="$password"
  if [ -n "$password" ]; then pg_require_passwords "$dir"; fi
}

# The superuser's password in PGPASSWORD for this one command only.
pg_psql() {
  PGPASSWORD="${PG_SUPERUSER_PASSWORD:-}" "$PG_BIN/psql" -X -q -h 127.0.0.1 -p "$PGPORT" -U postgres -v ON_ERROR_STOP=1 "$@"
}

# pg_hba.conf of a product cluster: passwords on the socket and on loopback, nothing else.
pg_require_passwords() {
  local dir="$1" hba="$1/data/pg_hba.conf" want
  want="$(printf '%s\n' \
    "# Written by scripts/lib/common.sh: every connection gives its role's password." \
    "# TYPE  DATABASE  USER  ADDRESS       METHOD" \
    "local   all       all                 scram-sha-256" \
    "host    all       all   127.0.0.1/32  scram-sha-256")"
  if [ "$(as_pg cat "$hba")" != "$want" ]; then
    if as_pg grep -qE '^[[:space:]]*(local|host)[^#]*[[:space:]]trust([[:space:]]|$)' "$hba"; then
      # Made before passwords: trust still lets us in to give the superuser its password.
      log "the cluster in $dir trusted every local connection: giving the superuser a password and switching to scram-sha-256"
      printf "SET password_encryption = 'scram-sha-256';\nALTER ROLE postgres PASSWORD '%s';\n" "$PG_SUPERUSER_PASSWORD" |
        "$PG_BIN/psql" -X -q -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -v ON_ERROR_STOP=1 >/dev/null
    fi
    printf '%s\n' "$want" | as_pg tee "$hba" >/dev/null
    as_pg "$PG_BIN/pg_ctl" -D "$dir/data" reload >/dev/null
    sleep 0.2
  fi
  if ! pg_psql -d postgres -tAc "SELECT 1" >/dev/null 2>&1; then
    log "the cluster in $dir refuses the superuser password from the secrets file; if that file was replaced, delete the cluster folder to start over"
    return 1
  fi
}

pg_cluster_down() {
  local dir="$1"
  if [ -f "$dir/data/PG_VERSION" ]; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir/data" -m fast -w stop >/dev/null 2>&1 || true
  fi
}

# A free TCP port on loopback, as the kernel hands one out.
free_port() {
  node -e 'const s=require("net").createServer();s.listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})'
}

# A throwaway cluster (trusted local connections, no fsync) in a new private folder, stopped and
# removed when the script exits, with PENDULA_TEST_PG pointing at it: what the test harness needs
# (ingest-server/src/testing/harness.ts) for the benches that drive the server through it.
throwaway_test_cluster() {
  THROWAWAY_DIR="$(mktemp -d)"; chmod 755 "$THROWAWAY_DIR"
  trap 'pg_cluster_down "$THROWAWAY_DIR/pg"; rm -rf "$THROWAWAY_DIR"' EXIT INT TERM
  local port; port="$(free_port)"
  pg_cluster_up "$THROWAWAY_DIR/pg" "$port" throwaway
  export PENDULA_TEST_PG="postgres://postgres@127.0.0.1:$port"
}

pg_ensure_database() {
  local name="$1"
  if ! pg_psql -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$name'" | grep -q 1; then
    PGPASSWORD="${PG_SUPERUSER_PASSWORD:-}" "$PG_BIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U postgres "$name"
  fi
}

# secret_value FILE NAME: one NAME=value line of a secrets file (empty when absent).
secret_value() {
  [ -f "$1" ] || return 0
  sed -n "s/^$2=//p" "$1" | head -n 1
}

# For db-backup.sh and db-restore.sh, sets PG_URL (without password) and exports PGPASSWORD, so the
# password never appears on a command line (which any local user can list). The database is
# MIGRATION_DATABASE_URL's (the tables' owner), else DATABASE_URL's, else that of the cluster
# `npm start` runs, as its superuser with the password from .pendula/secrets.env. The application
# role could do neither: it may not read the migration bookkeeping nor create tables.
product_database_connection() {
  local url="${MIGRATION_DATABASE_URL:-${DATABASE_URL:-}}" pw=""
  if [ -z "$url" ]; then
    url="postgres://postgres@127.0.0.1:${PENDULA_PG_PORT:-55433}/${PENDULA_DB:-pendula}"
    pw="$(secret_value "${PENDULA_DATA:-$ROOT/.pendula}/secrets.env" PG_SUPERUSER_PASSWORD)"
  fi
  local split
  split="$(PENDULA_URL_IN="$url" node -e '
    const u = new URL(process.env.PENDULA_URL_IN);
    const pw = decodeURIComponent(u.password);
    u.password = "";
    console.log(u.toString());
    console.log(pw);
  ')"
  PG_URL="$(printf '%s\n' "$split" | sed -n 1p)"
  [ -n "$pw" ] || pw="$(printf '%s\n' "$split" | sed -n 2p)"
  if [ -n "$pw" ]; then export PGPASSWORD="$pw"; fi
}
