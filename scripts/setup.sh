#!/usr/bin/env bash
# Installs everything the project needs on a fresh machine: Debian packages the tests use
# (python3-scipy, postgresql, chromium; run as root, as on CI; otherwise through sudo) and the npm dependencies from the lock file.
set -euo pipefail
cd "$(dirname "$0")/.."

need=()
/usr/bin/python3 -c 'import scipy' 2>/dev/null || need+=(python3-scipy python3-numpy)
# A real PostgreSQL server for the scale-out tests (started by the tests on loopback).
ls /usr/lib/postgresql/*/bin/postgres >/dev/null 2>&1 || need+=(postgresql)
# Real Chromium for the browser tests (driven by playwright-core, never downloaded by it).
[ -x /usr/bin/chromium ] || need+=(chromium)

if ((${#need[@]})); then
  echo "setup: installing Debian packages: ${need[*]}"
  sudo=""
  [ "$(id -u)" = 0 ] || sudo="sudo"
  $sudo apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq "${need[@]}" >/dev/null
fi

# npm ci only when the installed tree is older than the lock file (or missing).
if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  npm ci --no-audit --no-fund
fi
# Our patches to dependencies (patches/, applied by npm's postinstall too): re-applied when a
# checkout brings a new one to an installed tree; already-applied ones are left alone.
npx --no-install patch-package
