#!/usr/bin/env bash
# `npm test`: every test of every kind against a throwaway PostgreSQL and a production build; ends with one
# line `N passed, M failed`. Options: --no-e2e | --only unit | --only e2e, then `-- <vitest args>`.
# See scripts/test.ts and DEVELOPERS.md ("Testing").
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

# Debian packages the tests need: chromium (browser tests), poppler-utils (pdftotext, PDF export tests).
missing=()
[[ -x /usr/bin/chromium ]] || missing+=(chromium)
command -v pdftotext >/dev/null 2>&1 || missing+=(poppler-utils)
if (( ${#missing[@]} )); then
  if [[ $(id -u) -eq 0 ]]; then sudo=()
  elif command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then sudo=(sudo -n)
  else
    echo "[test] the tests need Debian packages that are not installed: ${missing[*]}" >&2
    echo "[test] install them once as an administrator, then run npm test again:" >&2
    echo "[test]     sudo apt-get update && sudo apt-get install -y ${missing[*]}" >&2
    echo "0 passed, 1 failed"
    exit 1
  fi
  echo "[test] installing ${missing[*]} with apt-get" >&2
  if ! { "${sudo[@]}" env DEBIAN_FRONTEND=noninteractive apt-get update -q \
      && "${sudo[@]}" env DEBIAN_FRONTEND=noninteractive apt-get install -y -q "${missing[@]}"; } >&2; then
    echo "[test] apt-get install ${missing[*]} failed (see above)" >&2
    echo "0 passed, 1 failed"
    exit 1
  fi
fi

if [[ ! -d node_modules/tsx || ! -d node_modules/vitest ]]; then
  echo "[test] dependencies are missing: run 'npm ci' first" >&2
  echo "0 passed, 1 failed"
  exit 1
fi
exec node --import tsx scripts/test.ts "$@"
