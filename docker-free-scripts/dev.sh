#!/usr/bin/env bash
# npm run dev: for changing the code. PostgreSQL and maildev as for npm start, then the server
# restarting on every change (tsx watch, port $WS_APP_PORT) and Vite's dev server for the client
# (its config sends /api to the server). Runs in the foreground; Ctrl-C ends both.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

bash "$SCRIPTS/ensure-deps.sh"
bash "$SCRIPTS/postgres.sh" start
bash "$SCRIPTS/postgres.sh" ensure-db "$WS_DB_NAME"
bash "$SCRIPTS/maildev.sh" start
bash "$SCRIPTS/stripe-fake.sh" start
pid_alive "$RUN_DIR/app.pid" && die "npm start's app holds port $WS_APP_PORT; stop it first (npm run stop) or use WS_APP_PORT=…"

# Development mode here only: npm start and the benchmarks run production code.
export NODE_ENV="${NODE_ENV:-development}"
app_env
cd "$ROOT"
npm run --silent migrate -w server
npm run --silent seed -w server

pids=()
cleanup() { for p in "${pids[@]}"; do kill -TERM -- "-$p" 2>/dev/null || true; done; }
trap cleanup EXIT
trap 'exit 130' INT TERM
(cd server && exec setsid npx tsx watch --clear-screen=false src/index.ts) &
pids+=($!)
(cd client && exec setsid npx vite --host 127.0.0.1) &
pids+=($!)
say "server (API) on http://127.0.0.1:$WS_APP_PORT, client with hot reload on the Vite URL printed above/below,"
say "mail catcher on http://127.0.0.1:$WS_MAIL_WEB_PORT — Ctrl-C stops the server and the client"
wait -n "${pids[@]}"
