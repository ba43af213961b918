#!/usr/bin/env bash
# npm run demo:reset: puts the demo workshop back as seeded (dev database). The running app keeps
# running; signed-in sessions of the old demo users simply stop matching and sign in again.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

bash "$SCRIPTS/ensure-deps.sh"
bash "$SCRIPTS/postgres.sh" start
bash "$SCRIPTS/postgres.sh" ensure-db "$WS_DB_NAME"
app_env
cd "$ROOT"
npm run --silent migrate -w server
say "re-seeding the demo workshop in $WS_DB_NAME"
npm run --silent seed -w server -- --reset
say "demo reset"
bash "$SCRIPTS/demo-users.sh"
