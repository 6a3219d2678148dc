#!/usr/bin/env bash
# All tests: static checks (types, lint incl. layering, format), unit tests, end-to-end tests in
# Chromium. Ends with the plain line "tests: N passed, N failed, N skipped".
set -u
cd "$(dirname "$0")/.."
export NEXT_TELEMETRY_DISABLED=1 NO_COLOR=1

if ! command -v chromium >/dev/null 2>&1 && [ -z "${CHROMIUM_PATH:-}" ]; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    echo "Installing Debian's chromium and poppler-utils for the browser and PDF tests…"
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium poppler-utils >/dev/null) || { echo "Could not install chromium with apt-get."; exit 1; }
  else
    echo "The end-to-end tests need Chromium. Install it (Debian/Ubuntu: sudo apt-get install chromium poppler-utils)"
    echo "or set CHROMIUM_PATH to a Chromium or Chrome binary, then run npm test again."
    exit 1
  fi
fi

rm -rf reports test-results && mkdir -p reports
status=0
: > reports/checks.txt
check() { local name=$1; shift; echo "== $name"; if "$@"; then echo "$name passed" >> reports/checks.txt; else echo "$name failed" >> reports/checks.txt; status=1; fi; }
check "type-check" npx tsc --noEmit -p .
check "lint-and-layering" npx eslint .
check "format-check" npx prettier --check . --log-level warn
echo "== unit tests"
npx vitest run --reporter=default --reporter=json --outputFile.json=reports/vitest.json || status=1
echo "== build";        npx next build > reports/next-build.log 2>&1 || { tail -40 reports/next-build.log; status=1; }
echo "== end-to-end tests"
npx playwright test || status=1
node scripts/summary.mjs --checks reports/checks.txt reports/vitest.json reports/e2e.json || status=1
exit $status
