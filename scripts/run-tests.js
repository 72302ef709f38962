#!/usr/bin/env node
// Runs the whole test suite (unit, time-domain, build and browser tests) with
// vitest and ends with one plain line: "tests: N passed, M failed[, K skipped]".
'use strict';
const { spawnSync } = require('child_process');
const fs = require('fs');
const path = require('path');
const os = require('os');

const report = path.join(os.tmpdir(), `hush-vitest-${process.pid}.json`);
const args = ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...process.argv.slice(2)];
const r = spawnSync('npx', args, { stdio: 'inherit', env: process.env });
let passed = 0;
let failed = 0;
let skipped = 0;
try {
  const j = JSON.parse(fs.readFileSync(report, 'utf8'));
  passed = j.numPassedTests;
  failed = j.numFailedTests;
  skipped = (j.numPendingTests || 0) + (j.numTodoTests || 0);
  // A test file that fails to load has no test results; count it as a failure.
  for (const f of j.testResults || []) if (f.status === 'failed' && (!f.assertionResults || f.assertionResults.length === 0)) failed++;
  fs.unlinkSync(report);
} catch (e) {
  failed = Math.max(failed, 1);
  console.error(`could not read the test report: ${e.message}`);
}
console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(r.status === 0 && failed === 0 ? 0 : 1);
