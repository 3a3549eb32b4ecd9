#!/usr/bin/env bash
# The one test command: unit tests (vitest), then end-to-end tests in real Chromium (Playwright),
# then a closing line "N passed, N failed" counted from both runners' JSON reports.
set -uo pipefail
cd "$(dirname "$0")/.."
mkdir -p reports
[ -d node_modules ] || npm ci --no-audit --no-fund
[ -f sample-data/downhole/project.zip ] || npm run -s make-demo
bash scripts/ensure-chromium.sh || exit 1
npx vitest run --reporter=default --reporter=json --outputFile.json=reports/unit.json
unit_rc=$?
npx playwright test --reporter=list,json
e2e_rc=$?
node scripts/summarize-tests.mjs reports/unit.json reports/e2e.json
[ $unit_rc -eq 0 ] && [ $e2e_rc -eq 0 ]
