#!/usr/bin/env bash
# `npm start`: sets up and runs Tributary on http://127.0.0.1:3000 (PORT overrides). See scripts/start.ts.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
if [[ ! -d node_modules/tsx || ! -d node_modules/next ]]; then
  echo "Dependencies are missing: run 'npm ci' first." >&2
  exit 1
fi
exec node --import tsx scripts/start.ts "$@"
