#!/usr/bin/env bash
# npm test: the same set-up as npm start on the test profile (own ports, own PostgreSQL data folder,
# own databases), then every check: tsc in every workspace and ESLint (beside vitest, in a full
# run), vitest (shared, server, client, lint, stripe-fake) and the Playwright journeys against the
# built app in Debian's Chromium. Prints which stage failed and exits non-zero if any did.
#
#   npm test                      everything
#   npm test -- --only types      tsc --noEmit and ESLint only
#   npm test -- --only unit       vitest only (extra arguments go to vitest)
#   npm test -- --only e2e smoke  Playwright only (extra arguments go to playwright test)
#   WS_KEEP_SERVICES=1 npm test   leave PostgreSQL and maildev running afterwards (faster reruns)
# The WS_* port overrides of lib.sh apply here too.
export WS_PROFILE=test
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

only=""
if [ "${1:-}" = "--only" ]; then only="${2:?--only types|unit|e2e}"; shift 2; fi
case "$only" in ""|types|unit|e2e) ;; *) die "--only takes types, unit or e2e, not '$only'" ;; esac
: "${WS_E2E_DB:=wingstage_e2e}"

began=$(date +%s)
results=()
failed=0
started_pg=0 started_mail=0 started_stripe=0 started_app=0

record() { # stage status seconds
  results+=("$(printf '  %-22s %-7s %4ss' "$1" "$2" "$3")")
  [ "$2" = passed ] || [ "$2" = skipped ] || failed=1
}

cleanup() {
  local rc=$?
  set +e
  # A run stopped before its browser stage: the background preparation ends with it.
  if [ -n "${prep_pid:-}" ]; then kill "$prep_pid" 2>/dev/null; wait "$prep_pid" 2>/dev/null; fi
  if [ -n "${types_pid:-}" ]; then kill "$types_pid" 2>/dev/null; wait "$types_pid" 2>/dev/null; fi
  [ "$started_app" = 1 ] && bash "$SCRIPTS/app.sh" stop >/dev/null
  if [ "${WS_KEEP_SERVICES:-0}" != 1 ]; then
    [ "$started_mail" = 1 ] && bash "$SCRIPTS/maildev.sh" stop
    [ "$started_stripe" = 1 ] && bash "$SCRIPTS/stripe-fake.sh" stop
    [ "$started_pg" = 1 ] && bash "$SCRIPTS/postgres.sh" stop
  fi
  echo
  say "test summary (profile test, total $(( $(date +%s) - began )) s)"
  if [ "${#results[@]}" -gt 0 ]; then printf '%s\n' "${results[@]}"; fi
  [ "$rc" = 130 ] && printf '  %-22s\n' "interrupted"
  if [ "$failed" = 1 ] || [ "$rc" != 0 ]; then
    say "FAILED — logs in .local/logs/, Playwright report in e2e/playwright-report/"
    exit 1
  fi
  say "all stages passed"
}
trap cleanup EXIT
trap 'exit 130' INT TERM

# Set-up failures stop the run: nothing after them can mean anything.
stage_setup() {
  local t=$(date +%s)
  bash "$SCRIPTS/ensure-deps.sh" --test || return 1
  bash "$SCRIPTS/postgres.sh" status >/dev/null 2>&1 || started_pg=1
  bash "$SCRIPTS/postgres.sh" start || return 1
  bash "$SCRIPTS/postgres.sh" ensure-db "$WS_DB_NAME" || return 1
  curl -fsS -o /dev/null --max-time 2 "http://127.0.0.1:$WS_MAIL_WEB_PORT/api/healthz" 2>/dev/null || started_mail=1
  bash "$SCRIPTS/maildev.sh" start || return 1
  # The browser journeys pay on the fake's page; API and contract tests start their own in-process.
  bash "$SCRIPTS/stripe-fake.sh" status >/dev/null 2>&1 || started_stripe=1
  bash "$SCRIPTS/stripe-fake.sh" start || return 1
  record "set-up" passed $(( $(date +%s) - t ))
}
if ! stage_setup; then record "set-up" failed 0; exit 1; fi

# A fresh secret per run: no test can depend on a token minted by an earlier one.
export JWT_SECRET="$(node -e 'process.stdout.write(require("crypto").randomBytes(48).toString("base64url"))')"
export NODE_ENV=test LOG_LEVEL="${LOG_LEVEL:-warn}"
export SIGNIN_ACCOUNT_LIMIT="${SIGNIN_ACCOUNT_LIMIT:-100}" SIGNIN_ADDRESS_LIMIT="${SIGNIN_ADDRESS_LIMIT:-10000}"
app_env
# API tests make their own databases from this server; mail goes to the test maildev.
export TEST_DATABASE_URL="postgres://postgres@127.0.0.1:$WS_PG_PORT/postgres"
export MAILDEV_API_URL="http://127.0.0.1:$WS_MAIL_WEB_PORT"
export E2E_BASE_URL="http://127.0.0.1:$WS_APP_PORT"
export E2E_MAILDEV_URL="$MAILDEV_API_URL"
cd "$ROOT"

run_types() {
  local t=$(date +%s)
  say "type-checking every workspace (tsc --noEmit)"
  if npm run --silent typecheck; then record "typecheck" passed $(( $(date +%s) - t ))
  else record "typecheck" failed $(( $(date +%s) - t )); fi
  t=$(date +%s)
  say "linting the repository (ESLint, import boundaries)"
  if npm run --silent lint; then record "lint" passed $(( $(date +%s) - t ))
  else record "lint" failed $(( $(date +%s) - t )); fi
}

# A full run type-checks and lints beside vitest: tsc and ESLint want the CPU, while vitest's server
# files spend most of their time waiting on PostgreSQL, bcrypt and mail. Their output goes to a log,
# printed once vitest has finished (in full if a check failed), so the two stages' lines do not mix.
types_pid=""
start_types_beside() {
  rm -f "$RUN_DIR"/types-*.result
  say "type-checking and linting beside vitest (log: .local/logs/types.log)"
  (
    t=$(date +%s)
    if npm run --silent typecheck; then echo "passed $(( $(date +%s) - t ))"; else echo "failed $(( $(date +%s) - t ))"; fi >"$RUN_DIR/types-typecheck.result"
    t=$(date +%s)
    if npm run --silent lint; then echo "passed $(( $(date +%s) - t ))"; else echo "failed $(( $(date +%s) - t ))"; fi >"$RUN_DIR/types-lint.result"
  ) >"$LOG_DIR/types.log" 2>&1 &
  types_pid=$!
}
finish_types_beside() {
  wait "$types_pid"; types_pid=""
  local stage result bad=0
  for stage in typecheck lint; do
    read -r result secs <"$RUN_DIR/types-$stage.result" 2>/dev/null || { result=failed secs=0; }
    record "$stage (beside)" "$result" "$secs"
    [ "$result" = passed ] || bad=1
  done
  if [ "$bad" = 1 ]; then say "type-check or lint failed:"; cat "$LOG_DIR/types.log" >&2
  else say "type-check and lint passed (log: .local/logs/types.log)"; fi
}

run_unit() {
  local t=$(date +%s)
  say "unit and API tests (vitest)"
  if npx vitest run "$@"; then record "vitest" passed $(( $(date +%s) - t ))
  else record "vitest" failed $(( $(date +%s) - t )); fi
}

# What the browser stage needs before its app can start: the client build (with the decision
# page's first-view renderer) and a fresh, migrated, seeded e2e database. Neither depends on the
# earlier stages, so a full run makes them in the background while tsc, ESLint and vitest run
# (vitest's server tests mostly wait on PostgreSQL, bcrypt and mail, so the cores are free).
e2e_prep() {
  if ! bash "$SCRIPTS/build-client.sh"; then echo "client build" >"$RUN_DIR/e2e-prep.failed"; return 1; fi
  if ! { bash "$SCRIPTS/postgres.sh" recreate-db "$WS_E2E_DB" >/dev/null \
      && DATABASE_URL="$E2E_DB_URL" npm run --silent migrate -w server >"$LOG_DIR/migrate-e2e.log" 2>&1 \
      && DATABASE_URL="$E2E_DB_URL" npm run --silent seed -w server >"$LOG_DIR/seed-e2e.log" 2>&1; }; then
    tail -n 30 "$LOG_DIR/migrate-e2e.log" "$LOG_DIR/seed-e2e.log" 2>/dev/null >&2
    echo "e2e database" >"$RUN_DIR/e2e-prep.failed"; return 1
  fi
}
E2E_DB_URL="postgres://postgres@127.0.0.1:$WS_PG_PORT/$WS_E2E_DB"
prep_pid=""
start_e2e_prep() {
  # Two runs in one checkout would share port $WS_APP_PORT and the e2e database: take turns. The
  # lock is this shell's from here to the end of the browser stage (the background step shares it).
  exec 9>"$RUN_DIR/e2e.lock"
  if ! flock -n 9; then say "another npm test is in its browser stage here; waiting for it"; flock -w 1800 9 || die "waited 30 minutes for the other run"; fi
  rm -f "$RUN_DIR/e2e-prep.failed" "$RUN_DIR/e2e-prep.seconds"
  say "preparing the browser stage in the background (client build, e2e database; log: .local/logs/e2e-prep.log)"
  ( b=$(date +%s); e2e_prep && echo $(( $(date +%s) - b )) >"$RUN_DIR/e2e-prep.seconds" ) >"$LOG_DIR/e2e-prep.log" 2>&1 &
  prep_pid=$!
}

run_e2e() {
  local t=$(date +%s)
  if [ -z "$prep_pid" ]; then start_e2e_prep; fi
  if ! wait "$prep_pid" || [ -f "$RUN_DIR/e2e-prep.failed" ]; then
    cat "$LOG_DIR/e2e-prep.log" >&2
    record "e2e set-up ($(cat "$RUN_DIR/e2e-prep.failed" 2>/dev/null || echo prep))" failed $(( $(date +%s) - t )); return
  fi
  prep_pid=""
  record "e2e prep (background)" passed "$(cat "$RUN_DIR/e2e-prep.seconds" 2>/dev/null || echo '?')"
  export DATABASE_URL="$E2E_DB_URL"
  export E2E_DATABASE_URL="$DATABASE_URL"
  if bash "$SCRIPTS/app.sh" status >/dev/null 2>&1; then
    record "e2e app" failed 0; say "an app from an earlier run still holds the test pid file; run: WS_PROFILE=test npm run stop" >&2; return
  fi
  started_app=1
  if ! bash "$SCRIPTS/app.sh" start; then record "e2e app start" failed $(( $(date +%s) - t )); return; fi
  record "e2e set-up" passed $(( $(date +%s) - t ))
  t=$(date +%s)
  say "browser journeys (Playwright, Chromium at /usr/bin/chromium)"
  if npx playwright test -c e2e/playwright.config.ts "$@"; then record "playwright" passed $(( $(date +%s) - t ))
  else record "playwright" failed $(( $(date +%s) - t )); fi
  bash "$SCRIPTS/app.sh" stop >/dev/null; started_app=0
  flock -u 9
}

case "$only" in
  types) run_types ;;
  unit) run_unit "$@" ;;
  e2e) run_e2e "$@" ;;
  *) start_e2e_prep; start_types_beside; run_unit; finish_types_beside; run_e2e ;;
esac
