#!/bin/sh
# First step of `npm start` and `npm test`: install the npm dependencies from the lockfile when
# they are missing or older than the lockfile. Everything after this runs in TypeScript (tsx).
set -e
cd "$(dirname "$0")/../.."
if [ ! -x node_modules/.bin/tsx ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "Installing npm dependencies from package-lock.json ..."
  npm ci --no-audit --no-fund
fi
