#!/bin/sh
# Installs the locked dependencies when node_modules is missing (npm start / npm test
# call this first, before anything that needs a package).
set -e
export NUXT_TELEMETRY_DISABLED=1
if [ ! -d node_modules ] || [ ! -x node_modules/.bin/tsx ]; then
  echo "setline: installing dependencies (npm ci)…"
  npm ci --no-audit --no-fund
fi
