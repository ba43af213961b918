#!/usr/bin/env bash
# npm run seed:scale: the benchmark's data set in its own database (wingstage_scale) on the bench
# profile's PostgreSQL: migrated, the demo workshop seeded, then 10,000 jobs and their rows in bulk.
# Idempotent: a second run finds the rows there. WS_SCALE_DB names another database.
export WS_PROFILE="${WS_PROFILE:-bench}"
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
: "${WS_SCALE_DB:=wingstage_scale}"
bash "$SCRIPTS/ensure-deps.sh"
bash "$SCRIPTS/postgres.sh" start
bash "$SCRIPTS/postgres.sh" ensure-db "$WS_SCALE_DB"
cd "$ROOT"
say "seeding the scale data set into $WS_SCALE_DB (a few minutes the first time)"
DATABASE_URL="postgres://postgres@127.0.0.1:$WS_PG_PORT/$WS_SCALE_DB" npm run --silent seed:scale -w server
