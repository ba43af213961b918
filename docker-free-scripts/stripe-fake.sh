#!/usr/bin/env bash
# The local Stripe fake (docker-free-scripts/stripe-fake/) on 127.0.0.1:$WS_STRIPE_PORT: the API the
# real stripe SDK calls, the hosted test payment page, and signed webhooks to the app on
# http://127.0.0.1:$WS_APP_PORT/api/webhooks/stripe. Key and webhook secret: .local/secrets-<profile>.env.
# Usage: stripe-fake.sh start|stop|status.  Idempotent: a second start finds it running.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

PID_FILE="$RUN_DIR/stripe-fake.pid"
LOG="$LOG_DIR/stripe-fake-$WS_PROFILE.log"
HEALTH="http://127.0.0.1:$WS_STRIPE_PORT/health"

start() {
  if curl -fsS -o /dev/null --max-time 2 "$HEALTH" 2>/dev/null; then
    say "Stripe fake already running on http://127.0.0.1:$WS_STRIPE_PORT"
    return 0
  fi
  pid_alive "$PID_FILE" && die "the Stripe fake (pid $(cat "$PID_FILE")) runs but does not answer $HEALTH; see ${LOG#"$ROOT"/}"
  port_open "$WS_STRIPE_PORT" && die "port $WS_STRIPE_PORT is taken by something that is not the Stripe fake; pick another with WS_STRIPE_PORT=…"
  load_secrets
  cd "$ROOT"
  # Started straight from node (tsx as a loader) so the pid file names the real process.
  WS_STRIPE_WEBHOOK_URL="${WS_STRIPE_WEBHOOK_URL:-http://127.0.0.1:$WS_APP_PORT/api/webhooks/stripe}" \
    setsid nohup node --import tsx docker-free-scripts/stripe-fake/src/cli.ts >"$LOG" 2>&1 </dev/null &
  echo $! >"$PID_FILE"
  if ! wait_http "$HEALTH" 30 "$PID_FILE"; then
    tail -n 20 "$LOG" >&2 || true
    stop_pidfile "$PID_FILE" "Stripe fake"
    die "the Stripe fake did not come up on $HEALTH"
  fi
  say "Stripe fake started on http://127.0.0.1:$WS_STRIPE_PORT (test payments only; log: ${LOG#"$ROOT"/})"
}

stop() {
  if pid_alive "$PID_FILE"; then
    stop_pidfile "$PID_FILE" "Stripe fake ($WS_PROFILE)"
  else
    rm -f "$PID_FILE"
  fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status)
    if curl -fsS -o /dev/null --max-time 2 "$HEALTH" 2>/dev/null; then
      echo "running on http://127.0.0.1:$WS_STRIPE_PORT$(pid_alive "$PID_FILE" && echo " (pid $(cat "$PID_FILE"))" || echo " (not started by these scripts)")"
    else echo "stopped"; exit 3; fi ;;
  *) echo "usage: $0 start|stop|status" >&2; exit 2 ;;
esac
