#!/usr/bin/env bash
# npm run bench:lcp: the owner's decision page as a phone on slow 4G sees it. Starts the app as
# npm start serves it (production build, NODE_ENV=production) on the bench profile's database, then
# server/bench/lcp-bench.mjs opens a fresh decision link in Chromium (/usr/bin/chromium) at 375 px,
# 4× CPU throttle, 150 ms / 1.6 Mbit/s, BENCH_LCP_RUNS times (3), and prints the median LCP.
export WS_PROFILE="${WS_PROFILE:-bench}"
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
: "${WS_SCALE_DB:=wingstage_scale}"

bash "$SCRIPTS/seed-scale.sh"
bash "$SCRIPTS/maildev.sh" start
bash "$SCRIPTS/build-client.sh"
[ -x "${BENCH_CHROMIUM:-/usr/bin/chromium}" ] || die "Chromium is missing: apt-get install -y chromium"

trap 'bash "$SCRIPTS/app.sh" stop >/dev/null' EXIT
bash "$SCRIPTS/app.sh" stop >/dev/null 2>&1 || true
export DATABASE_URL="postgres://postgres@127.0.0.1:$WS_PG_PORT/$WS_SCALE_DB"
export NODE_ENV=production
bash "$SCRIPTS/app.sh" start
cd "$ROOT"
BENCH_APP_URL="http://127.0.0.1:$WS_APP_PORT" BENCH_MAILDEV_URL="http://127.0.0.1:$WS_MAIL_WEB_PORT" node server/bench/lcp-bench.mjs
