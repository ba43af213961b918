#!/usr/bin/env bash
# Installs what is missing, and nothing else: npm packages (npm ci) when node_modules is absent or
# older than package-lock.json, and Debian packages: postgresql always, chromium + poppler-utils
# with --test (the browser journeys and the PDF checks need them).
# Usage: ensure-deps.sh [--test]
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"

want_test=0
[ "${1:-}" = "--test" ] && want_test=1

command -v node >/dev/null || die "Node.js 20.19 or newer is needed (https://nodejs.org or Debian's nodejs package)"
node -e 'const [a,b]=process.versions.node.split(".").map(Number); process.exit(a>20||(a===20&&b>=19)?0:1)' \
  || die "Node.js $(node -v) is too old: 20.19 or newer is needed"

# --- npm packages -------------------------------------------------------------------------------
# npm rewrites node_modules/.package-lock.json after every install, so a package-lock.json newer
# than it means someone changed the dependencies (a pull, a checkout) since the last install.
stamp="$ROOT/node_modules/.package-lock.json"
if [ ! -d "$ROOT/node_modules" ] || [ ! -f "$stamp" ] || [ "$ROOT/package-lock.json" -nt "$stamp" ]; then
  say "installing npm packages (npm ci)"
  cd "$ROOT"
  # Other checkouts' installs share npm's cache; the lock keeps two installs from racing.
  # npm 11 blocks dependency install scripts; package.json records that esbuild needs none.
  flock /tmp/wingstage-npm.lock npm ci --no-audit --no-fund --loglevel=error
fi

# --- Debian packages ----------------------------------------------------------------------------
missing=()
pg_bin >/dev/null || missing+=(postgresql)
if [ "$want_test" = 1 ]; then
  [ -x /usr/bin/chromium ] || missing+=(chromium)
  command -v pdftotext >/dev/null || missing+=(poppler-utils)
fi
if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" != "0" ]; then
    die "missing Debian packages: ${missing[*]}; install them as root: apt-get install -y ${missing[*]}"
  fi
  say "installing Debian packages: ${missing[*]}"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq "${missing[@]}" >/dev/null
fi
