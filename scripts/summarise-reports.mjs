// Sums the JSON reports of every test runner into the one line CI reads: `N passed, N failed`.
// A runner whose report is missing (it crashed before writing) counts as one failure, never as zero tests.
import fs from 'node:fs';

let passed = Number(process.argv[2] ?? 0);
let failed = Number(process.argv[3] ?? 0);
let skipped = 0;

function read(file) {
  try {
    return JSON.parse(fs.readFileSync(file, 'utf8'));
  } catch {
    return undefined;
  }
}

const vitest = read('reports/vitest.json');
if (vitest) {
  passed += vitest.numPassedTests ?? 0;
  failed += (vitest.numFailedTests ?? 0) + (vitest.numRuntimeErrorTestSuites ?? 0);
  skipped += (vitest.numPendingTests ?? 0) + (vitest.numTodoTests ?? 0);
  // A suite that failed to load has no tests but is a failure.
  failed += (vitest.testResults ?? []).filter((s) => s.status === 'failed' && (s.assertionResults ?? []).length === 0).length;
} else {
  console.error('vitest wrote no report (reports/vitest.json): counted as a failure');
  failed += 1;
}

if (process.env.SKIP_E2E !== '1') {
  const e2e = read('reports/e2e.json');
  if (e2e?.stats) {
    passed += (e2e.stats.expected ?? 0) + (e2e.stats.flaky ?? 0);
    failed += e2e.stats.unexpected ?? 0;
    skipped += e2e.stats.skipped ?? 0;
    if ((e2e.errors ?? []).length > 0) failed += 1;
  } else {
    console.error('Playwright wrote no report (reports/e2e.json): counted as a failure');
    failed += 1;
  }
}

console.log(skipped > 0 ? `${passed} passed, ${failed} failed, ${skipped} skipped` : `${passed} passed, ${failed} failed`);
process.exit(failed > 0 ? 1 : 0);
