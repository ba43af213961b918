#!/usr/bin/env bash
# PostgreSQL from Debian's packages, in a project-local data folder, on 127.0.0.1:$WS_PG_PORT.
# Usage: postgres.sh start|stop|status|ensure-db NAME|recreate-db NAME
# Idempotent: a second start finds it running. A start that really starts it leaves
# $RUN_DIR/postgres.started, so `npm run stop` knows it may stop it.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

install_pg() {
  if ! pg_bin >/dev/null; then
    [ "$(id -u)" = "0" ] || die "PostgreSQL is missing; run as root or: apt-get install -y postgresql"
    say "PostgreSQL is not installed: installing it from Debian's packages"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq postgresql >/dev/null
  fi
}

as_pg() {
  if [ "$(id -u)" = "0" ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

running() { [ -s "$PG_DIR/PG_VERSION" ] && as_pg "$(pg_bin)/pg_ctl" -D "$PG_DIR" status >/dev/null 2>&1; }

# Line 4 of postmaster.pid is the port the running server listens on.
running_port() { sed -n 4p "$PG_DIR/postmaster.pid" 2>/dev/null | tr -d '[:space:]'; }

start() {
  install_pg
  local bin; bin="$(pg_bin)"
  if [ "$(id -u)" = "0" ]; then
    # initdb refuses root; the data folder belongs to postgres and every folder above it must be traversable.
    # The data folder itself must stay 0700: PostgreSQL refuses to start on anything looser.
    local d; d="$(dirname "$PG_DIR")"; while [ "$d" != "/" ]; do chmod o+x "$d" 2>/dev/null || true; d="$(dirname "$d")"; done
  fi
  if [ -d "$PG_DIR" ]; then chmod 700 "$PG_DIR" 2>/dev/null || true; fi
  if [ ! -s "$PG_DIR/PG_VERSION" ]; then
    mkdir -p "$PG_DIR"; if [ "$(id -u)" = "0" ]; then chown postgres:postgres "$PG_DIR"; fi; chmod 700 "$PG_DIR"
    say "initialising PostgreSQL in ${PG_DIR#"$ROOT"/}"
    as_pg "$bin/initdb" -D "$PG_DIR" -A trust -U postgres -E UTF8 --locale=C.UTF-8 >/dev/null
  fi
  if running; then
    local port; port="$(running_port)"
    [ "$port" = "$WS_PG_PORT" ] || die "the $WS_PROFILE PostgreSQL in ${PG_DIR#"$ROOT"/} already runs on port $port, not $WS_PG_PORT; stop it first (WS_PG_PORT=$port $0 stop)"
    say "PostgreSQL already running on 127.0.0.1:$WS_PG_PORT"
    return 0
  fi
  if port_open "$WS_PG_PORT"; then
    die "port $WS_PG_PORT is taken by another program; pick another with WS_PG_PORT=…"
  fi
  local log="$LOG_DIR/postgres-$WS_PROFILE.log"
  touch "$log"; if [ "$(id -u)" = "0" ]; then chown postgres "$log"; fi
  # The test profile trades durability for speed: its data is thrown away anyway.
  local extra=""; [ "$WS_PROFILE" = test ] && extra="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  as_pg "$bin/pg_ctl" -D "$PG_DIR" -l "$log" -w -t 60 \
    -o "-p $WS_PG_PORT -k $PG_DIR -c listen_addresses=127.0.0.1 -c max_connections=200 $extra" start >/dev/null \
    || die "PostgreSQL did not start; see ${log#"$ROOT"/}"
  touch "$RUN_DIR/postgres.started"
  say "PostgreSQL started on 127.0.0.1:$WS_PG_PORT"
}

ensure_db() {
  local name="$1"
  if [ "$(psql_local -d postgres -c "select 1 from pg_database where datname='$name'")" != "1" ]; then
    psql_local -d postgres -c "create database \"$name\"" >/dev/null
    say "created database $name"
  fi
}

recreate_db() {
  local name="$1"
  # WITH (FORCE) ends leftover sessions from an earlier run that died mid-way.
  PGOPTIONS='-c client_min_messages=warning' psql_local -d postgres -c "drop database if exists \"$name\" with (force)" >/dev/null
  psql_local -d postgres -c "create database \"$name\"" >/dev/null
  say "created a fresh database $name"
}

stop() {
  pg_bin >/dev/null || return 0
  if running; then
    as_pg "$(pg_bin)/pg_ctl" -D "$PG_DIR" -m fast -w stop >/dev/null
    say "PostgreSQL stopped ($WS_PROFILE)"
  fi
  rm -f "$RUN_DIR/postgres.started"
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status) if running; then echo "running on 127.0.0.1:$(running_port)"; else echo "stopped"; exit 3; fi ;;
  ensure-db) ensure_db "${2:?database name}" ;;
  recreate-db) recreate_db "${2:?database name}" ;;
  *) echo "usage: $0 start|stop|status|ensure-db NAME|recreate-db NAME" >&2; exit 2 ;;
esac
