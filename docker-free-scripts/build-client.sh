#!/usr/bin/env bash
# Builds the client into client/dist unless the build is newer than every source it comes from
# (client and shared sources, configs, the lock file). WS_BUILD=always forces a build.
# Always a production build, whatever NODE_ENV the caller has: this is what npm start serves, what
# the browser journeys load and what the decision page's size budget test measures.
# WS_CLIENT_OUT builds into another folder (the budget test's own copy).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

dist="${WS_CLIENT_OUT:-$ROOT/client/dist}"
out="$dist/index.html"
if [ "${WS_BUILD:-auto}" != always ] && [ -f "$out" ]; then
  newer="$(find "$ROOT/client" "$ROOT/shared" "$ROOT/package-lock.json" \
    \( -name node_modules -o -name dist -o -name test -o -name '*.test.*' \) -prune -o \
    -type f -newer "$out" -print -quit)"
  if [ -z "$newer" ]; then
    say "client build is up to date"
    exit 0
  fi
fi
say "building the client"
cd "$ROOT"
NODE_ENV=production npm run --silent build -w client -- --outDir "$dist" --emptyOutDir >"$LOG_DIR/build-client.log" 2>&1 || {
  tail -n 40 "$LOG_DIR/build-client.log" >&2
  die "the client build failed; full output in ${LOG_DIR#"$ROOT"/}/build-client.log"
}
say "client built into ${dist#"$ROOT"/}"
