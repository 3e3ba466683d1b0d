#!/usr/bin/env node
// Prints the plain closing line CI reads ("N passed, N failed") from vitest's JSON report.
// A missing report (the type check or vitest itself failed first) counts as one failure.
import { readFileSync } from 'node:fs';

const file = process.argv[2] ?? '.vitest-results.json';
let passed = 0;
let failed = 1;
try {
  const r = JSON.parse(readFileSync(file, 'utf8'));
  passed = r.numPassedTests ?? 0;
  failed = r.numFailedTests ?? 0;
  // A suite that fails to load has no failed tests of its own but must still fail the run.
  if (r.success === false && failed === 0) failed = Math.max(1, r.numFailedTestSuites ?? 0);
} catch {
  process.stderr.write(`test-summary: no test report at ${file}\n`);
}
process.stdout.write(`${passed} passed, ${failed} failed\n`);
process.exit(failed > 0 ? 1 : 0);
