#!/usr/bin/env bash
# The one test command: unit tests (vitest), then end-to-end tests in real Chromium (Playwright),
# then a closing line "N passed, N failed" counted from both runners' JSON reports.
set -uo pipefail
cd "$(dirname "$0")/.."
mkdir -p reports
[ -d node_modules ] || npm ci --no-audit --no-fund
[ -f sample-data/downhole/project.zip ] || npm run -s make-demo
bash scripts/ensure-chromium.sh || exit 1
rm -f reports/unit.json
npx vitest run --reporter=default --reporter=json --outputFile.json=reports/unit.json
unit_rc=$?
rm -f reports/e2e.json
npx playwright test
e2e_rc=$?
node scripts/summarize-tests.mjs reports/unit.json reports/e2e.json
sum_rc=$?
[ $unit_rc -eq 0 ] && [ $e2e_rc -eq 0 ] && [ $sum_rc -eq 0 ]
