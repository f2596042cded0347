/**
 * `npm test`: everything, in one Jest run over all projects (solvers, shared, api,
 * integration, web, e2e) after making sure Chromium and a fresh web build exist.
 * Ends with the closing line `N passed, N failed` (and `, N skipped`) and exits non-zero on
 * any failure, including a suite that failed to load.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { ensureChromium } from './chromium';
import { ensureWebBuild } from './web-build';

interface JestSummary {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  numRuntimeErrorTestSuites: number;
  numTotalTests: number;
  success: boolean;
}

function main(): number {
  const root = resolve(__dirname, '..');
  process.chdir(root);
  ensureChromium();
  // A broken web build fails the run but must not hide the other projects' results.
  let buildFailures = 0;
  try {
    ensureWebBuild();
  } catch (err) {
    console.error(String(err));
    buildFailures = 1;
  }

  // ts-jest transpiles file by file, so only the compiler sees type errors across files.
  console.log('typecheck: tsc over api, solvers, shared, web and e2e…');
  const typecheck = spawnSync('npm', ['run', '-s', 'typecheck'], { stdio: 'inherit' });
  const typeFailures = typecheck.status === 0 ? 0 : 1;

  const outDir = mkdtempSync(join(tmpdir(), 'qt-jest-'));
  const outFile = join(outDir, 'results.json');
  const extra = process.argv.slice(2);
  const jest = spawnSync(
    process.execPath,
    [require.resolve('jest/bin/jest'), '--ci', '--maxWorkers=2', '--json', `--outputFile=${outFile}`, ...extra],
    { stdio: 'inherit', env: { ...process.env, FORCE_COLOR: process.env.CI ? '0' : process.env.FORCE_COLOR } },
  );
  if (!existsSync(outFile)) {
    console.log(`\nJest produced no results (exit ${jest.status}).`);
    console.log(`0 passed, ${1 + buildFailures + typeFailures} failed`);
    return 1;
  }
  const summary = JSON.parse(readFileSync(outFile, 'utf8')) as JestSummary;
  rmSync(outDir, { recursive: true, force: true });
  // A suite that cannot even load has no test results of its own: count it as one failure.
  const failed = summary.numFailedTests + summary.numRuntimeErrorTestSuites + buildFailures + typeFailures;
  const skipped = summary.numPendingTests + summary.numTodoTests;
  console.log(`\n${summary.numPassedTests} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
  return failed === 0 && jest.status === 0 && summary.numTotalTests > 0 ? 0 : 1;
}

process.exitCode = main();
