#!/usr/bin/env bash
# Common settings for the local stand-ins. Sourced, not run.
# Everything lives under .local/ inside the project (git-ignored) and listens on 127.0.0.1 only.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
SCRIPTS="$ROOT/docker-free-scripts"
LOCAL_DIR="${WS_LOCAL_DIR:-$ROOT/.local}"
# "dev" for npm start, "test" for npm test, "bench" for the benchmarks: separate ports, data and databases.
WS_PROFILE="${WS_PROFILE:-dev}"
if [ "$WS_PROFILE" = "test" ]; then
  : "${WS_PG_PORT:=54339}" "${WS_APP_PORT:=3100}" "${WS_SMTP_PORT:=1026}" "${WS_MAIL_WEB_PORT:=1081}" "${WS_STRIPE_PORT:=12112}" "${WS_DB_NAME:=wingstage_test}"
elif [ "$WS_PROFILE" = "bench" ]; then
  # The benchmarks (npm run seed:scale, bench:api, bench:lcp): beside a running npm start and npm test.
  : "${WS_PG_PORT:=54359}" "${WS_APP_PORT:=3300}" "${WS_SMTP_PORT:=1028}" "${WS_MAIL_WEB_PORT:=1083}" "${WS_STRIPE_PORT:=12113}" "${WS_DB_NAME:=wingstage_scale}"
else
  : "${WS_PG_PORT:=54329}" "${WS_APP_PORT:=3000}" "${WS_SMTP_PORT:=1025}" "${WS_MAIL_WEB_PORT:=1080}" "${WS_STRIPE_PORT:=12111}" "${WS_DB_NAME:=wingstage}"
fi
PG_DIR="$LOCAL_DIR/pg-$WS_PROFILE"
RUN_DIR="$LOCAL_DIR/run-$WS_PROFILE"
LOG_DIR="$LOCAL_DIR/logs"
mkdir -p "$LOCAL_DIR" "$RUN_DIR" "$LOG_DIR"
export WS_PROFILE WS_PG_PORT WS_APP_PORT WS_SMTP_PORT WS_MAIL_WEB_PORT WS_STRIPE_PORT WS_DB_NAME
say() { printf '[wingstage] %s\n' "$*"; }
die() { printf '[wingstage] error: %s\n' "$*" >&2; exit 1; }

# True when something accepts TCP connections on 127.0.0.1:$1 (bash's /dev/tcp: no extra tools needed).
port_open() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

# True when the pid in file $1 names a live process.
pid_alive() {
  local pid
  [ -s "$1" ] || return 1
  pid="$(cat "$1")"
  [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null
}

# wait_http URL SECONDS [PID_FILE]: poll until the URL answers 2xx; give up early if the process died.
wait_http() {
  local url="$1" limit="$2" pidfile="${3:-}" i=0
  while [ "$i" -lt $((limit * 4)) ]; do
    if curl -fsS -o /dev/null --max-time 2 "$url" 2>/dev/null; then return 0; fi
    if [ -n "$pidfile" ] && ! pid_alive "$pidfile"; then return 1; fi
    sleep 0.25; i=$((i + 1))
  done
  return 1
}

# Each service runs in its own session (setsid), so its pid is also its process-group id and a stop
# reaches the whole tree (npm → tsx → node) without touching anything else on the machine.
stop_pidfile() {
  local pidfile="$1" what="$2" pid i
  if ! pid_alive "$pidfile"; then rm -f "$pidfile"; return 0; fi
  pid="$(cat "$pidfile")"
  kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null || true
  for i in $(seq 1 40); do kill -0 "$pid" 2>/dev/null || break; sleep 0.25; done
  if kill -0 "$pid" 2>/dev/null; then kill -KILL -- "-$pid" 2>/dev/null || kill -KILL "$pid" 2>/dev/null || true; fi
  rm -f "$pidfile"
  say "$what stopped"
}

# Secrets are generated once per profile and never committed (.local/ is git-ignored): the session
# secret, the webhook signing secret shared by the app and the Stripe fake, and the fake's test key.
# A file from before a secret existed gains it on the next run.
load_secrets() {
  local file="$LOCAL_DIR/secrets-$WS_PROFILE.env" key value
  (umask 077; touch "$file")
  random() { node -e "process.stdout.write(require('crypto').randomBytes($1).toString('$2'))"; }
  grep -q '^JWT_SECRET=' "$file" || printf 'JWT_SECRET=%s\n' "$(random 48 base64url)" >>"$file"
  grep -q '^STRIPE_WEBHOOK_SECRET=' "$file" || printf 'STRIPE_WEBHOOK_SECRET=whsec_%s\n' "$(random 24 hex)" >>"$file"
  grep -q '^STRIPE_SECRET_KEY=' "$file" || printf 'STRIPE_SECRET_KEY=sk_test_%s\n' "$(random 16 hex)" >>"$file"
  # A secret given by the caller wins (npm test hands each run a fresh JWT secret).
  while IFS='=' read -r key value; do
    [ -n "$key" ] || continue
    if [ -z "${!key:-}" ]; then export "$key=$value"; fi
  done <"$file"
}

# Postgres binaries from Debian's packages (newest installed major).
pg_bin() {
  local v
  for v in 17 16 15; do
    if [ -x "/usr/lib/postgresql/$v/bin/pg_ctl" ]; then echo "/usr/lib/postgresql/$v/bin"; return; fi
  done
  return 1
}

psql_local() { "$(pg_bin)/psql" -h 127.0.0.1 -p "$WS_PG_PORT" -U postgres -v ON_ERROR_STOP=1 -qtA "$@"; }

# The environment the server reads (names fixed by the server's config).
app_env() {
  load_secrets
  # npm start serves what it measures: production code (the demo's conveniences have their own
  # switches below); npm test runs the server in test mode.
  export NODE_ENV="${NODE_ENV:-$([ "$WS_PROFILE" = test ] && echo test || echo production)}"
  export HOST=127.0.0.1 PORT="$WS_APP_PORT"
  export APP_URL="http://127.0.0.1:$WS_APP_PORT"
  export DATABASE_URL="${DATABASE_URL:-postgres://postgres@127.0.0.1:$WS_PG_PORT/$WS_DB_NAME}"
  export SMTP_HOST=127.0.0.1 SMTP_PORT="$WS_SMTP_PORT"
  export MAIL_FROM="${MAIL_FROM:-Wingstage <no-reply@wingstage.example>}"
  export CLIENT_DIST="${CLIENT_DIST:-$ROOT/client/dist}"
  export LOG_LEVEL="${LOG_LEVEL:-info}"
  # Card payments go to the local Stripe fake (docker-free-scripts/stripe-fake.sh), never to Stripe.
  export STRIPE_API_URL="${STRIPE_API_URL:-http://127.0.0.1:$WS_STRIPE_PORT}"
  # Plain http on loopback: a Secure cookie would not be sent back over it. The server accepts this
  # in production only while APP_URL is a loopback http address.
  export COOKIE_SECURE="${COOKIE_SECURE:-false}"
}
