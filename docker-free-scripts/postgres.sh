#!/usr/bin/env bash
# PostgreSQL from Debian's packages, in a project-local data folder, on 127.0.0.1:$WS_PG_PORT.
# Usage: postgres.sh start|stop|status|ensure-db NAME.  Idempotent: a second start finds it running.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

pg_bin() {
  local v
  for v in 17 16 15; do
    if [ -x "/usr/lib/postgresql/$v/bin/pg_ctl" ]; then echo "/usr/lib/postgresql/$v/bin"; return; fi
  done
  return 1
}

install_pg() {
  if ! pg_bin >/dev/null; then
    say "PostgreSQL is not installed: installing it from Debian's packages"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq postgresql >/dev/null
  fi
}

as_pg() {
  if [ "$(id -u)" = "0" ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

start() {
  install_pg
  local bin; bin="$(pg_bin)"
  if [ "$(id -u)" = "0" ]; then
    # initdb refuses root; the data folder belongs to postgres and every folder above it must be traversable.
    local d="$PG_DIR"; while [ "$d" != "/" ]; do chmod o+x "$d" 2>/dev/null || true; d="$(dirname "$d")"; done
  fi
  if [ ! -s "$PG_DIR/PG_VERSION" ]; then
    mkdir -p "$PG_DIR"; [ "$(id -u)" = "0" ] && chown postgres:postgres "$PG_DIR"; chmod 700 "$PG_DIR"
    say "initialising PostgreSQL in ${PG_DIR#$ROOT/}"
    as_pg "$bin/initdb" -D "$PG_DIR" -A trust -U postgres -E UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if as_pg "$bin/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
    say "PostgreSQL already running on 127.0.0.1:$WS_PG_PORT"
  else
    touch "$LOG_DIR/postgres-$WS_PROFILE.log"; [ "$(id -u)" = "0" ] && chown postgres "$LOG_DIR/postgres-$WS_PROFILE.log"
    as_pg "$bin/pg_ctl" -D "$PG_DIR" -l "$LOG_DIR/postgres-$WS_PROFILE.log" -w -t 60 \
      -o "-p $WS_PG_PORT -k $PG_DIR -c listen_addresses=127.0.0.1 -c max_connections=200 $([ "$WS_PROFILE" = test ] && echo "-c fsync=off -c synchronous_commit=off")" start >/dev/null
    say "PostgreSQL started on 127.0.0.1:$WS_PG_PORT"
  fi
}

ensure_db() {
  local name="$1"
  local psql=("$(pg_bin)/psql" -h 127.0.0.1 -p "$WS_PG_PORT" -U postgres -v ON_ERROR_STOP=1 -qtA)
  if [ "$("${psql[@]}" -d postgres -c "select 1 from pg_database where datname='$name'")" != "1" ]; then
    "${psql[@]}" -d postgres -c "create database \"$name\"" >/dev/null
    say "created database $name"
  fi
}

stop() {
  local bin; bin="$(pg_bin)" || return 0
  if [ -s "$PG_DIR/PG_VERSION" ] && as_pg "$bin/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; then
    as_pg "$bin/pg_ctl" -D "$PG_DIR" -m fast -w stop >/dev/null
    say "PostgreSQL stopped ($WS_PROFILE)"
  fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) as_pg "$(pg_bin)/pg_ctl" -D "$PG_DIR" status ;;
  ensure-db) ensure_db "${2:?database name}" ;;
  *) echo "usage: $0 start|stop|status|ensure-db NAME" >&2; exit 2 ;;
esac
