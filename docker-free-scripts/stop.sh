#!/usr/bin/env bash
# npm run stop: stops what `npm start` started (dev profile): the app, maildev, the Stripe fake, and PostgreSQL
# if these scripts started them. A maildev or PostgreSQL that was already running is left alone.
# WS_PROFILE=test stops the test profile's leftovers the same way.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

bash "$SCRIPTS/app.sh" stop
bash "$SCRIPTS/maildev.sh" stop
bash "$SCRIPTS/stripe-fake.sh" stop
if [ -f "$RUN_DIR/postgres.started" ]; then
  bash "$SCRIPTS/postgres.sh" stop
elif bash "$SCRIPTS/postgres.sh" status >/dev/null 2>&1; then
  say "PostgreSQL on 127.0.0.1:$WS_PG_PORT was not started by npm start; leaving it running (stop it with: bash docker-free-scripts/postgres.sh stop)"
fi
say "stopped ($WS_PROFILE)"
