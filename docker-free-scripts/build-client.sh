#!/usr/bin/env bash
# Builds the client into client/dist, and the decision page's first-view renderer (vite build --ssr,
# client/src/decide-ssr.tsx) into client/dist-ssr, unless both are newer than every source they
# come from (client and shared sources, configs, the lock file). WS_BUILD=always forces a build.
# Always a production build, whatever NODE_ENV the caller has: this is what npm start serves, what
# the browser journeys load and what the decision page's size budget test measures.
# WS_CLIENT_OUT builds into another folder (and its renderer into that folder's name + "-ssr").
# Two callers at once (the client's and the server's tests) take turns; the second finds it built.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

dist="${WS_CLIENT_OUT:-$ROOT/client/dist}"
dist="$(mkdir -p "$dist" && cd "$dist" && pwd)"
ssr="$dist-ssr"
exec 8>"$LOCAL_DIR/build-client.lock"
flock -w 600 8 || die "another client build held the lock for ten minutes"

out="$dist/index.html"
if [ "${WS_BUILD:-auto}" != always ] && [ -f "$out" ] && [ -f "$ssr/decide-ssr.js" ]; then
  newer="$(find "$ROOT/client" "$ROOT/shared" "$ROOT/package-lock.json" \
    \( -name node_modules -o -name dist -o -name dist-ssr -o -name test -o -name '*.test.*' \) -prune -o \
    -type f \( -newer "$out" -o -newer "$ssr/decide-ssr.js" \) -print -quit)"
  if [ -z "$newer" ]; then
    say "client build is up to date"
    exit 0
  fi
fi
say "building the client"
cd "$ROOT"
{ NODE_ENV=production npm run --silent build -w client -- --outDir "$dist" --emptyOutDir \
  && NODE_ENV=production npm run --silent build -w client -- --ssr src/decide-ssr.tsx --outDir "$ssr" --emptyOutDir; } >"$LOG_DIR/build-client.log" 2>&1 || {
  tail -n 40 "$LOG_DIR/build-client.log" >&2
  die "the client build failed; full output in ${LOG_DIR#"$ROOT"/}/build-client.log"
}
say "client built into ${dist#"$ROOT"/} (first-view renderer in ${ssr#"$ROOT"/})"
