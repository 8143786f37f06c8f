#!/usr/bin/env bash
# The project's whole test run (`npm test`): static checks, unit and integration tests (vitest), end-to-end tests
# (Playwright driving Chromium). Every runner writes a JSON report under reports/; the last line printed sums them
# as `N passed, N failed` (static checks count one test each).
set -u
cd "$(dirname "$0")/.."
rm -rf reports && mkdir -p reports
checks_passed=0
checks_failed=0
status=0

run_check() { # name, command...
  local name=$1; shift
  echo "== $name"
  if "$@"; then checks_passed=$((checks_passed + 1)); else checks_failed=$((checks_failed + 1)); status=1; fi
}

run_check typecheck npx tsc -p tsconfig.json --noEmit
run_check lint npx eslint . --max-warnings 0

echo "== unit and integration tests (vitest)"
npx vitest run --reporter=default --reporter=json --outputFile=reports/vitest.json || status=1

if [ "${SKIP_E2E:-}" = "1" ]; then
  echo "== end-to-end tests skipped (SKIP_E2E=1)"
else
  echo "== end-to-end tests (Playwright, Chromium)"
  npx playwright test || status=1
fi

node scripts/summarise-reports.mjs "$checks_passed" "$checks_failed" || status=1
exit $status
