#!/usr/bin/env bash
# npm run bench:api: the app as npm start serves it (production client build, NODE_ENV=production)
# on the scale data set, beside a bare Express 5 + pg baseline on the same PostgreSQL, both driven by
# autocannon; prints each read as a ratio of the baseline and the lists' p95 (server/bench/).
# A few minutes in all. Knobs: BENCH_SECONDS (8), BENCH_ROUNDS (2), BENCH_CONNECTIONS (32),
# BENCH_LIST_SAMPLES (100); BENCH_CPU_PROF=1 also writes the app's CPU profile (node --cpu-prof)
# into .local/bench/. Uses the bench profile's own PostgreSQL and WS_APP_PORT; the baseline takes
# a free port the system gives it (or WS_BENCH_BASE_PORT).
export WS_PROFILE="${WS_PROFILE:-bench}"
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
: "${WS_SCALE_DB:=wingstage_scale}"
BENCH_DIR="$LOCAL_DIR/bench"
mkdir -p "$BENCH_DIR"
base_pid="$RUN_DIR/baseline.pid"

bash "$SCRIPTS/seed-scale.sh"
bash "$SCRIPTS/maildev.sh" start
bash "$SCRIPTS/build-client.sh"

cleanup() {
  set +e
  bash "$SCRIPTS/app.sh" stop >/dev/null
  stop_pidfile "$base_pid" baseline >/dev/null
}
trap cleanup EXIT
trap 'exit 130' INT TERM

bash "$SCRIPTS/app.sh" stop >/dev/null 2>&1 || true
export DATABASE_URL="postgres://postgres@127.0.0.1:$WS_PG_PORT/$WS_SCALE_DB"
# As npm start runs it; BENCH_NODE_ENV=development measures an older build that could not run in production on http.
export NODE_ENV="${BENCH_NODE_ENV:-production}"
if [ "${BENCH_CPU_PROF:-0}" = 1 ]; then
  # The same server as npm start's (tsx's loader in one node process) with the V8 profiler on; the
  # profile is written when it stops, open it in Chromium's DevTools (Performance) or speedscope.
  app_env
  mkdir -p "$BENCH_DIR/cpu-prof"
  cd "$ROOT/server"
  setsid nohup node --cpu-prof --cpu-prof-dir="$BENCH_DIR/cpu-prof" --import tsx src/index.ts >"$LOG_DIR/app-$WS_PROFILE.log" 2>&1 </dev/null &
  echo $! >"$RUN_DIR/app.pid"
  wait_http "http://127.0.0.1:$WS_APP_PORT/api/health" 90 "$RUN_DIR/app.pid" || die "the profiled app did not start; see .local/logs/app-$WS_PROFILE.log"
else
  bash "$SCRIPTS/app.sh" start
fi

cd "$ROOT"
rm -f "$RUN_DIR/baseline.port"
DATABASE_URL="$DATABASE_URL" PORT="${WS_BENCH_BASE_PORT:-0}" PORT_FILE="$RUN_DIR/baseline.port" setsid nohup node server/bench/baseline.mjs >"$LOG_DIR/bench-baseline.log" 2>&1 </dev/null &
echo $! >"$base_pid"
for _ in $(seq 1 120); do [ -s "$RUN_DIR/baseline.port" ] && break; pid_alive "$base_pid" || break; sleep 0.25; done
[ -s "$RUN_DIR/baseline.port" ] || die "the baseline did not start; see .local/logs/bench-baseline.log"
base_port="$(cat "$RUN_DIR/baseline.port")"

BENCH_APP_URL="http://127.0.0.1:$WS_APP_PORT" BENCH_BASELINE_URL="http://127.0.0.1:$base_port" BENCH_OUT_DIR="$BENCH_DIR" \
  node server/bench/api-bench.mjs
