/// <reference types="node" />
/**
 * Runs the calibrate CLI as a user would (a child process) on logs the simulator wrote with a
 * fixed seed (one CSV, one JSON) and on broken logs of our own.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { STARTER_PROFILE } from '@shared/executions-constants';
import { formatTrialLogCsv, formatTrialLogJson, parseTrialLog, type TrialLog } from '@shared/trial-log';
import { realisedTimeline } from '../execute';
import { randomWalks } from '../execute/testing/random-walks';
import { calibrateProfile } from '../trials/calibrate';
import { trialLogFromTimeline } from '../trials/simulated-trial';

const ROOT = resolve(__dirname, '../..');
// The local tsx binary is what `npx tsx` resolves to; calling it directly skips npx's start-up.
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const calibrate = (...args: string[]) => {
  const run = spawnSync(TSX, ['solvers/cli/calibrate.ts', ...args], { cwd: ROOT, encoding: 'utf8' });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
};

describe('npm run calibrate', () => {
  let temp: string;
  let csvFile: string;
  let jsonFile: string;
  let logs: TrialLog[];

  beforeAll(() => {
    temp = mkdtempSync(join(tmpdir(), 'qt-calibrate-'));
    const profile = { ...STARTER_PROFILE, timingJitter: 0 };
    const walk = randomWalks(8, { robots: 10, actions: 60, side: 40, spacing: 3, profile, stopsEarly: false });
    const noise = { jitterCv: 0.12, stallProbability: 0.03, stallMs: 2000 };
    const simulated = [0, 1].map((run) => trialLogFromTimeline('sim', realisedTimeline(walk.instance, { timeline: 'steps', schedule: walk.schedule }, profile, { policy: 'open-loop', noise, seed: 31 }, run)));
    csvFile = join(temp, 'run-0.csv');
    jsonFile = join(temp, 'run-1.json');
    writeFileSync(csvFile, formatTrialLogCsv(simulated[0].rows));
    writeFileSync(jsonFile, formatTrialLogJson(simulated[1].rows));
    logs = [parseTrialLog(csvFile, formatTrialLogCsv(simulated[0].rows)), parseTrialLog(jsonFile, formatTrialLogJson(simulated[1].rows))]
      .map((p) => (p.kind === 'parsed' ? p.log : undefined))
      .filter((l): l is TrialLog => l !== undefined);
  });
  afterAll(() => rmSync(temp, { recursive: true, force: true }));

  it('prints exactly the contract keys with --json, the same fit as the library, and exits 0', () => {
    const { status, stdout, stderr } = calibrate('--log', csvFile, jsonFile, '--json');
    const fit = calibrateProfile(logs);
    if (fit.kind !== 'fitted') throw new Error('the simulated logs should fit');

    const out = JSON.parse(stdout);

    expect([status, stderr]).toEqual([0, '']);
    expect(logs).toHaveLength(2);
    expect(Object.keys(out)).toEqual(['forwardMs', 'quarterTurnMs', 'waitMs', 'timingJitter', 'stallProbability', 'stallMs', 'actions', 'ci95']);
    expect(Object.keys(out.ci95)).toEqual(['forwardMs', 'quarterTurnMs', 'waitMs', 'timingJitter', 'stallProbability', 'stallMs']);
    expect(out.actions).toEqual({ forward: fit.fit.actions.forward, turn: fit.fit.actions.turn, wait: fit.fit.actions.wait });
    expect(out.actions.forward + out.actions.turn + out.actions.wait).toBe(1200);
    expect(out.forwardMs).toBe(fit.fit.forwardMs);
    expect(out.stallMs).toBe(fit.fit.stallMs);
    expect(Math.abs(out.forwardMs / STARTER_PROFILE.forwardMs - 1)).toBeLessThan(0.03);
  });

  it('prints a table with the intervals and the goodness of fit without --json', () => {
    const { status, stdout } = calibrate('--log', csvFile);

    expect(status).toBe(0);
    expect(stdout).toContain(`calibrated from 1 log: ${csvFile}`);
    expect(stdout).toMatch(/^forward +\d+\.\d ms +\d+\.\d – \d+\.\d +\d+ actions$/m);
    expect(stdout).toMatch(/^timing jitter \(CV\) +0\.\d{4} +0\.\d{4} – 0\.\d{4} +log-normal$/m);
    expect(stdout).toContain('Kolmogorov–Smirnov distance');
  });

  it('names file, line, column and field of every problem, fits nothing and exits 2', () => {
    const bad = join(temp, 'bad.csv');
    writeFileSync(bad, 'robot,action,start_ms,end_ms\n0,forward,0,1000\n0,jump,1000,2000\n');

    const { status, stdout, stderr } = calibrate('--log', csvFile, bad, join(temp, 'absent.json'), '--json');

    expect(status).toBe(2);
    expect(stdout).toBe('');
    expect(stderr.split('\n')).toEqual([
      `${bad}:3:3: action: must be one of forward, turn-left, turn-right, wait, got "jump"`,
      `${join(temp, 'absent.json')}: the file does not exist`,
      'calibrate: nothing fitted (2 problems)',
      '',
    ]);
  });

  it('refuses a log with a zero-length action at its line', () => {
    const zero = join(temp, 'zero.csv');
    writeFileSync(zero, 'robot,action,start_ms,end_ms\n0,forward,0,1000\n0,wait,1000,1000\n0,forward,1000,2000\n');

    const { status, stderr } = calibrate('--log', zero);

    expect(status).toBe(2);
    expect(stderr).toContain(`${zero}:3: end_ms: the action lasts 0 ms`);
  });

  it('exits 2 with the usage on a missing --log or an unknown option', () => {
    const none = calibrate('--json');
    const unknown = calibrate('--log', csvFile, '--jitter', '0.1');

    expect([none.status, unknown.status]).toEqual([2, 2]);
    expect(none.stderr).toContain('calibrate: no log given (--log FILE...)');
    expect(unknown.stderr).toContain('calibrate: unknown option --jitter');
    expect(unknown.stderr).toContain('usage: npm run -s calibrate -- --log FILE... [--json]');
  });
});
