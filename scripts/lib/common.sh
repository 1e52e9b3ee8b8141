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

# pg_cluster_up DIR PORT [throwaway]
pg_cluster_up() {
  local dir="$1" port="$2" throwaway="${3:-}"
  mkdir -p "$dir"
  if [ "$(id -u)" -eq 0 ]; then chown "$(pg_user)" "$dir"; fi
  chmod 700 "$dir"
  if [ ! -f "$dir/data/PG_VERSION" ]; then
    as_pg "$PG_BIN/initdb" -D "$dir/data" -U postgres --auth=trust -E UTF8 --locale=C.UTF-8 --no-sync >/dev/null
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
}

pg_cluster_down() {
  local dir="$1"
  if [ -f "$dir/data/PG_VERSION" ]; then
    as_pg "$PG_BIN/pg_ctl" -D "$dir/data" -m fast -w stop >/dev/null 2>&1 || true
  fi
}

pg_ensure_database() {
  local name="$1"
  if ! "$PG_BIN/psql" -h 127.0.0.1 -p "$PGPORT" -U postgres -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$name'" | grep -q 1; then
    "$PG_BIN/createdb" -h 127.0.0.1 -p "$PGPORT" -U postgres "$name"
  fi
}
