#!/usr/bin/env bash
# The Wingstage app (API + built client, one Express process) on 127.0.0.1:$WS_APP_PORT, in the
# background with a pid file and a log file.
# Usage: app.sh start|stop|status.  Idempotent: a second start finds it running.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

PID_FILE="$RUN_DIR/app.pid"
LOG="$LOG_DIR/app-$WS_PROFILE.log"
HEALTH="http://127.0.0.1:$WS_APP_PORT/api/health"

start() {
  if pid_alive "$PID_FILE"; then
    wait_http "$HEALTH" 60 "$PID_FILE" || die "the app (pid $(cat "$PID_FILE")) runs but $HEALTH does not answer; see ${LOG#"$ROOT"/}"
    say "app already running on http://127.0.0.1:$WS_APP_PORT"
    return 0
  fi
  port_open "$WS_APP_PORT" && die "port $WS_APP_PORT is taken by another program; pick another with WS_APP_PORT=…"
  [ -f "$ROOT/client/dist/index.html" ] || die "the client is not built (client/dist); run: npm run build -w client"
  app_env
  cd "$ROOT"
  setsid nohup npm run --silent start -w server >"$LOG" 2>&1 </dev/null &
  echo $! >"$PID_FILE"
  if ! wait_http "$HEALTH" "${WS_APP_WAIT:-90}" "$PID_FILE"; then
    say "the app did not answer $HEALTH; last lines of ${LOG#"$ROOT"/}:" >&2
    tail -n 30 "$LOG" >&2 || true
    stop_pidfile "$PID_FILE" app
    exit 1
  fi
  say "app started on http://127.0.0.1:$WS_APP_PORT (log: ${LOG#"$ROOT"/})"
}

case "${1:-}" in
  start) start ;;
  stop) stop_pidfile "$PID_FILE" "app ($WS_PROFILE)" ;;
  status) if pid_alive "$PID_FILE"; then echo "running (pid $(cat "$PID_FILE")) on http://127.0.0.1:$WS_APP_PORT"; else echo "stopped"; exit 3; fi ;;
  *) echo "usage: $0 start|stop|status" >&2; exit 2 ;;
esac
