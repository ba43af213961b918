#!/usr/bin/env bash
# maildev (the local mail catcher) from node_modules, SMTP on 127.0.0.1:$WS_SMTP_PORT and its web
# page + REST API on 127.0.0.1:$WS_MAIL_WEB_PORT.
# Usage: maildev.sh start|stop|status.  Idempotent: a start finds a running one, including one
# started by hand on the same ports; stop only stops the one this script started (pid file).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

PID_FILE="$RUN_DIR/maildev.pid"
LOG="$LOG_DIR/maildev-$WS_PROFILE.log"
HEALTH="http://127.0.0.1:$WS_MAIL_WEB_PORT/api/healthz"

start() {
  if curl -fsS -o /dev/null --max-time 2 "$HEALTH" 2>/dev/null && port_open "$WS_SMTP_PORT"; then
    say "maildev already running (SMTP 127.0.0.1:$WS_SMTP_PORT, web http://127.0.0.1:$WS_MAIL_WEB_PORT)"
    return 0
  fi
  pid_alive "$PID_FILE" && die "maildev (pid $(cat "$PID_FILE")) runs but does not answer $HEALTH; see ${LOG#"$ROOT"/}"
  port_open "$WS_SMTP_PORT" && die "port $WS_SMTP_PORT is taken by something that is not maildev; pick another with WS_SMTP_PORT=…"
  port_open "$WS_MAIL_WEB_PORT" && die "port $WS_MAIL_WEB_PORT is taken by something that is not maildev; pick another with WS_MAIL_WEB_PORT=…"
  local bin="$ROOT/node_modules/maildev/dist/bin/maildev.js"
  [ -f "$bin" ] || die "maildev is not installed; run docker-free-scripts/ensure-deps.sh"
  # Started straight from node (not npx) so the pid file names the real process; its own session keeps
  # it alive after the calling terminal closes. The web UI would bind 0.0.0.0 without --web-ip.
  setsid nohup node "$bin" --ip 127.0.0.1 --web-ip 127.0.0.1 -s "$WS_SMTP_PORT" -w "$WS_MAIL_WEB_PORT" \
    >"$LOG" 2>&1 </dev/null &
  echo $! >"$PID_FILE"
  if ! wait_http "$HEALTH" 30 "$PID_FILE"; then
    tail -n 20 "$LOG" >&2 || true
    stop_pidfile "$PID_FILE" maildev
    die "maildev did not come up on $HEALTH"
  fi
  say "maildev started (SMTP 127.0.0.1:$WS_SMTP_PORT, web http://127.0.0.1:$WS_MAIL_WEB_PORT)"
}

stop() {
  if pid_alive "$PID_FILE"; then
    stop_pidfile "$PID_FILE" "maildev ($WS_PROFILE)"
  else
    rm -f "$PID_FILE"
  fi
}

case "${1:-}" in
  start) start ;;
  stop) stop ;;
  status)
    if curl -fsS -o /dev/null --max-time 2 "$HEALTH" 2>/dev/null; then
      echo "running on SMTP $WS_SMTP_PORT, web $WS_MAIL_WEB_PORT$(pid_alive "$PID_FILE" && echo " (pid $(cat "$PID_FILE"))" || echo " (not started by these scripts)")"
    else echo "stopped"; exit 3; fi ;;
  *) echo "usage: $0 start|stop|status" >&2; exit 2 ;;
esac
