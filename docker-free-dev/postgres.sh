#!/usr/bin/env bash
# PostgreSQL 15 for development and tests, from Debian's packages, on 127.0.0.1 only.
# Usage: docker-free-dev/postgres.sh start|stop|status|reset-db NAME   (idempotent; data in .data/pg)
# Prints "started" when this call started the server, "running" when it was already up.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT="$(pwd)"
PGPORT="${PGPORT:-5544}"
# PG_DIR (relative to the project) puts a second server's data, socket and log elsewhere (fault tests start their own)
PG_DIR="$ROOT/${PG_DIR:-.data}"
DATA="$PG_DIR/pg"
SOCK="$PG_DIR/pg-socket"
LOG="$PG_DIR/pg.log"
DB_USER=benchrelay
DB_PASS=benchrelay

find_bin() {
  for d in /usr/lib/postgresql/15/bin /usr/lib/postgresql/*/bin; do
    [ -x "$d/pg_ctl" ] && { echo "$d"; return 0; }
  done
  return 1
}

BIN="$(find_bin || true)"
if [ -z "$BIN" ]; then
  if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null; then
    echo "PostgreSQL is missing: installing Debian's postgresql package" >&2
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql) >&2
    BIN="$(find_bin)"
  else
    echo "PostgreSQL 15 is not installed. Run: sudo apt-get install -y postgresql" >&2
    exit 1
  fi
fi

# Postgres refuses to run as root: run its commands as the postgres user when we are root.
as_pg() {
  if [ "$(id -u)" = 0 ]; then
    su postgres -s /bin/bash -c "$(printf '%q ' "$@")"
  else
    "$@"
  fi
}

is_up() { as_pg "$BIN/pg_ctl" -D "$DATA" status >/dev/null 2>&1; }

start() {
  mkdir -p "$ROOT/.data" "$PG_DIR" "$SOCK"
  if [ "$(id -u)" = 0 ]; then
    # The postgres user must be able to reach the data folder through the project path.
    chmod o+x "$ROOT/.data" "$PG_DIR" 2>/dev/null || true
    p="$ROOT"; while [ "$p" != "/" ]; do chmod o+x "$p" 2>/dev/null || true; p="$(dirname "$p")"; done
    chown postgres "$SOCK"
    touch "$LOG" && chown postgres "$LOG"
  fi
  if [ ! -s "$DATA/PG_VERSION" ]; then
    mkdir -p "$DATA"
    [ "$(id -u)" = 0 ] && chown postgres "$DATA"
    chmod 700 "$DATA"
    as_pg "$BIN/initdb" -D "$DATA" -U postgres -A trust -E UTF8 --locale=C.UTF-8 >/dev/null
    # loopback only, trust only on the local socket, passwords over TCP
    cat > "$DATA/pg_hba.conf" <<HBA
local all all trust
host  all all 127.0.0.1/32 scram-sha-256
host  all all ::1/128 scram-sha-256
HBA
    [ "$(id -u)" = 0 ] && chown postgres "$DATA/pg_hba.conf"
  fi
  if is_up; then
    echo running
  else
    as_pg "$BIN/pg_ctl" -D "$DATA" -l "$LOG" -w -t 60 \
      -o "-p $PGPORT -c listen_addresses=127.0.0.1 -k $SOCK -c max_connections=200 -c fsync=off -c synchronous_commit=off" start >/dev/null
    echo started
  fi
  # role and databases (idempotent)
  psql_pg() { as_pg "$BIN/psql" -h "$SOCK" -p "$PGPORT" -U postgres -v ON_ERROR_STOP=1 -qAt "$@"; }
  if [ "$(psql_pg -c "select 1 from pg_roles where rolname='$DB_USER'")" != 1 ]; then
    psql_pg -c "create role $DB_USER login createdb password '$DB_PASS'"
  fi
  for each_db in benchrelay ${EXTRA_DATABASES:-}; do
    if [ "$(psql_pg -c "select 1 from pg_database where datname='$each_db'")" != 1 ]; then
      psql_pg -c "create database $each_db owner $DB_USER"
    fi
    # extensions need a superuser; the app role then only uses them
    psql_pg -d "$each_db" -c "create extension if not exists pg_trgm; create extension if not exists pgcrypto;"
  done
}

# A fresh, empty database (tests use their own): drop it, create it again with the extensions.
reset_db() {
  local db="$1"
  start >/dev/null
  as_pg "$BIN/psql" -h "$SOCK" -p "$PGPORT" -U postgres -v ON_ERROR_STOP=1 -qAt \
    -c "drop database if exists $db with (force)" -c "create database $db owner $DB_USER"
  as_pg "$BIN/psql" -h "$SOCK" -p "$PGPORT" -U postgres -d "$db" -v ON_ERROR_STOP=1 -qAt \
    -c "create extension if not exists pg_trgm; create extension if not exists pgcrypto;"
  echo "reset $db"
}

case "${1:-start}" in
  start) start ;;
  reset-db) reset_db "${2:?database name}" ;;
  restart) if is_up; then as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w restart -l "$LOG" >/dev/null; echo restarted; else start; fi ;;
  bin) echo "$BIN" ;;
  stop) if is_up; then as_pg "$BIN/pg_ctl" -D "$DATA" -m fast -w stop >/dev/null; echo stopped; else echo "not running"; fi ;;
  status) if is_up; then echo running; else echo stopped; exit 3; fi ;;
  *) echo "usage: $0 start|stop|restart|status|bin|reset-db NAME" >&2; exit 2 ;;
esac
