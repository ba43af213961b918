#!/usr/bin/env bash
# npm start: everything the app needs on this machine, then the app itself, on 127.0.0.1.
# Installs what is missing, starts PostgreSQL, maildev and the Stripe fake, migrates, seeds the demo once, builds the
# client and serves client + API from one process. A second run finds it all running.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
began=$(date +%s)

bash "$SCRIPTS/ensure-deps.sh"
bash "$SCRIPTS/postgres.sh" start
bash "$SCRIPTS/postgres.sh" ensure-db "$WS_DB_NAME"
bash "$SCRIPTS/maildev.sh" start
bash "$SCRIPTS/stripe-fake.sh" start

app_env
cd "$ROOT"
if ! pid_alive "$RUN_DIR/app.pid"; then
  say "migrating the database $WS_DB_NAME"
  npm run --silent migrate -w server >"$LOG_DIR/migrate-$WS_PROFILE.log" 2>&1 || {
    tail -n 40 "$LOG_DIR/migrate-$WS_PROFILE.log" >&2; die "migrations failed; see .local/logs/migrate-$WS_PROFILE.log"; }
  # The seed itself leaves an existing demo alone; `npm run demo:reset` starts it over.
  say "seeding the demo workshop (once)"
  npm run --silent seed -w server >"$LOG_DIR/seed-$WS_PROFILE.log" 2>&1 || {
    tail -n 40 "$LOG_DIR/seed-$WS_PROFILE.log" >&2; die "seeding failed; see .local/logs/seed-$WS_PROFILE.log"; }
  bash "$SCRIPTS/build-client.sh"
fi
bash "$SCRIPTS/app.sh" start

cat <<MSG

  Wingstage is running:      http://127.0.0.1:$WS_APP_PORT
  Mail catcher (all e-mail): http://127.0.0.1:$WS_MAIL_WEB_PORT
  Card payments:             the local Stripe fake on http://127.0.0.1:$WS_STRIPE_PORT (test cards only)
  Ready in $(( $(date +%s) - began )) s. Logs in .local/logs/. Stop everything with: npm run stop

MSG
bash "$SCRIPTS/demo-users.sh"
