#!/bin/sh
# Installs the locked dependencies when node_modules is missing (npm start / npm test
# call this first, before anything that needs a package).
set -e
export NUXT_TELEMETRY_DISABLED=1
# npm keeps the tree it installed in node_modules/.package-lock.json: a lockfile changed since
# (a pull or a branch switch that added a package) installs again.
if [ ! -d node_modules ] || [ ! -x node_modules/.bin/tsx ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "setline: installing dependencies (npm ci)…"
  npm ci --no-audit --no-fund
fi
