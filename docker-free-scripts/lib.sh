#!/usr/bin/env bash
# Common settings for the local stand-ins. Sourced, not run.
# Everything lives under .local/ inside the project (git-ignored) and listens on 127.0.0.1 only.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
LOCAL_DIR="${WS_LOCAL_DIR:-$ROOT/.local}"
# "dev" for npm start, "test" for npm test: separate ports, data and databases.
WS_PROFILE="${WS_PROFILE:-dev}"
if [ "$WS_PROFILE" = "test" ]; then
  : "${WS_PG_PORT:=54339}" "${WS_APP_PORT:=3100}" "${WS_SMTP_PORT:=1026}" "${WS_MAIL_WEB_PORT:=1081}" "${WS_DB_NAME:=wingstage_test}"
else
  : "${WS_PG_PORT:=54329}" "${WS_APP_PORT:=3000}" "${WS_SMTP_PORT:=1025}" "${WS_MAIL_WEB_PORT:=1080}" "${WS_DB_NAME:=wingstage}"
fi
PG_DIR="$LOCAL_DIR/pg-$WS_PROFILE"
RUN_DIR="$LOCAL_DIR/run-$WS_PROFILE"
LOG_DIR="$LOCAL_DIR/logs"
mkdir -p "$LOCAL_DIR" "$RUN_DIR" "$LOG_DIR"
export WS_PROFILE WS_PG_PORT WS_APP_PORT WS_SMTP_PORT WS_MAIL_WEB_PORT WS_DB_NAME
say() { printf '[wingstage] %s\n' "$*"; }
