// Reads vitest's and Playwright's JSON reports and prints one closing line: "N passed, N failed".
import { readFileSync, existsSync } from 'node:fs';
let passed = 0,
  failed = 0,
  skipped = 0;
const [unitPath, e2ePath] = process.argv.slice(2);
if (unitPath && existsSync(unitPath)) {
  const u = JSON.parse(readFileSync(unitPath, 'utf8'));
  passed += u.numPassedTests ?? 0;
  failed += u.numFailedTests ?? 0;
  skipped += (u.numPendingTests ?? 0) + (u.numTodoTests ?? 0);
  if (u.numFailedTestSuites && !u.numFailedTests) failed += u.numFailedTestSuites;
} else {
  failed += 1;
  console.error('unit test report missing');
}
if (e2ePath && existsSync(e2ePath)) {
  const e = JSON.parse(readFileSync(e2ePath, 'utf8'));
  const s = e.stats ?? {};
  passed += (s.expected ?? 0) + (s.flaky ?? 0);
  failed += s.unexpected ?? 0;
  skipped += s.skipped ?? 0;
} else {
  failed += 1;
  console.error('end-to-end test report missing');
}
console.log(`Tests: ${passed} passed, ${failed} failed` + (skipped ? `, ${skipped} skipped` : ''));
process.exitCode = failed > 0 || passed === 0 ? 1 : 0;
