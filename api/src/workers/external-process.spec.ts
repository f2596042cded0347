/**
 * The external process runner: GNU time's report as it reads it, and real child processes (Node
 * scripts under prlimit and GNU time, as a worker runs them) for the environment a solver sees
 * and the kill at the time limit. The sweep path is exercised in test/integration/external-solvers.spec.ts.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cpuLimitSeconds, lastLine, parseTimeReport, runExternalProcess, solverEnvironment } from './external-process';

describe('parseTimeReport', () => {
  it('reads CPU time and peak memory of a clean exit', () => {
    expect(parseTimeReport('qt-usage 0.42 0.08 51200\n')).toEqual({ cpuTimeMs: 500, peakMemoryKb: 51200, exitCode: 0, signalNumber: null });
  });

  it('reads a nonzero status and a signal (GNU time writes a line before its format)', () => {
    expect(parseTimeReport('Command exited with non-zero status 3\nqt-usage 0.10 0.02 40000\n')).toEqual({ cpuTimeMs: 120, peakMemoryKb: 40000, exitCode: 3, signalNumber: null });
    expect(parseTimeReport('Command terminated by signal 9\nqt-usage 1.00 0.50 90000\n')).toEqual({ cpuTimeMs: 1500, peakMemoryKb: 90000, exitCode: null, signalNumber: 9 });
  });

  it('knows nothing when GNU time wrote nothing', () => {
    expect(parseTimeReport('')).toEqual({ cpuTimeMs: null, peakMemoryKb: null, exitCode: null, signalNumber: null });
  });

  it('takes the last non-empty line of output, shortened', () => {
    expect(lastLine('a\nb\n\n')).toBe('b');
    expect(lastLine('x'.repeat(400), 10)).toBe(`${'x'.repeat(10)}…`);
  });
});

/** Whether `pid` still runs: process.kill(pid, 0) succeeds and it is not a zombie waiting for its reaper (it runs no more then). */
function isRunning(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch {
    return false;
  }
  const stat = (() => {
    try {
      return readFileSync(`/proc/${pid}/stat`, 'utf8');
    } catch {
      return '';
    }
  })();
  return stat !== '' && stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3) !== 'Z';
}

describe('runExternalProcess with real processes', () => {
  let dir: string;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'qt-process-spec-'));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('gives the solver PATH, LANG, HOME and TMPDIR (its run folder) and none of the worker\'s secrets', async () => {
    const saved = process.env['QT_SPEC_SECRET'];
    process.env['QT_SPEC_SECRET'] = 'postgres://secret@db/qt';
    try {
      writeFileSync(join(dir, 'env.js'), "console.error(JSON.stringify(process.env)); process.exit(2);");
      const out = await runExternalProcess({ argv: [process.execPath, join(dir, 'env.js')], cwd: dir, homeDir: dir, timeLimitMs: 10_000, memoryLimitMb: 512 });
      expect(out.end).toBe('crashed');
      const seen = JSON.parse(lastLine(out.stderr, 100_000)) as Record<string, string>;
      expect(Object.keys(seen).sort()).toEqual(['HOME', 'LANG', 'PATH', 'TMPDIR']);
      expect([seen['HOME'], seen['TMPDIR'], seen['PATH']]).toEqual([dir, dir, process.env.PATH]);
      expect(out.stderr).not.toContain('postgres://secret');
      expect(solverEnvironment('/r', { PATH: '/bin', DATABASE_URL: 'postgres://x', SESSION_SECRET: 's', NODE_OPTIONS: '--inspect' })).toEqual({ PATH: '/bin', LANG: 'C.UTF-8', HOME: '/r', TMPDIR: '/r' });
    } finally {
      if (saved === undefined) delete process.env['QT_SPEC_SECRET'];
      else process.env['QT_SPEC_SECRET'] = saved;
    }
  });

  it('kills the solver and the grandchild it started at the time limit', async () => {
    const pids = join(dir, 'pids');
    writeFileSync(join(dir, 'spawner.js'), `
      const child = require('child_process').spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' });
      require('fs').writeFileSync(${JSON.stringify(pids)}, process.pid + ' ' + child.pid);
      setInterval(() => {}, 1000);`);
    const out = await runExternalProcess({ argv: [process.execPath, join(dir, 'spawner.js')], cwd: dir, homeDir: dir, timeLimitMs: 1500, memoryLimitMb: 512 });
    expect([out.end, out.message]).toEqual(['timeout', 'killed at the time limit of 1500 ms']);
    const [solver, grandchild] = readFileSync(pids, 'utf8').split(' ').map(Number);
    expect(solver).toBeGreaterThan(0);
    expect(grandchild).toBeGreaterThan(0);
    expect([isRunning(solver), isRunning(grandchild), isRunning(process.pid)]).toEqual([false, false, true]);
  });

  it('runs the solver under the CPU-time, file size and memory limits (its /proc/self/limits)', async () => {
    writeFileSync(join(dir, 'limits.js'), "require('fs').writeFileSync(process.argv[2], require('fs').readFileSync('/proc/self/limits', 'utf8'));");
    const out = await runExternalProcess({ argv: [process.execPath, join(dir, 'limits.js'), join(dir, 'limits.txt')], cwd: dir, homeDir: dir, timeLimitMs: 1500, memoryLimitMb: 300 });
    expect(out.end).toBe('exited');
    const limits = readFileSync(join(dir, 'limits.txt'), 'utf8');
    expect(limits).toMatch(/Max cpu time\s+7\s+7\s+seconds/);
    expect(limits).toMatch(new RegExp(`Max file size\\s+${256 * 1024 * 1024}\\s+${256 * 1024 * 1024}\\s+bytes`));
    expect(limits).toMatch(new RegExp(`Max data size\\s+${300 * 1024 * 1024}\\s+${300 * 1024 * 1024}\\s+bytes`));
  });

  it('kills the solver and its grandchild when the signal aborts (a stopping worker)', async () => {
    const pids = join(dir, 'pids');
    writeFileSync(join(dir, 'spawner.js'), `
      const child = require('child_process').spawn(process.execPath, ['-e', 'setInterval(() => {}, 1000)'], { stdio: 'ignore' });
      require('fs').writeFileSync(${JSON.stringify(pids)}, process.pid + ' ' + child.pid);
      setInterval(() => {}, 1000);`);
    const stop = new AbortController();
    const running = runExternalProcess({ argv: [process.execPath, join(dir, 'spawner.js')], cwd: dir, homeDir: dir, timeLimitMs: 60_000, memoryLimitMb: 512, signal: stop.signal });
    for (let i = 0; i < 100; i++) {
      const text = (() => { try { return readFileSync(pids, 'utf8'); } catch { return ''; } })();
      if (text.includes(' ')) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    stop.abort();
    const out = await running;
    expect(out.end).toBe('aborted');
    const [solver, grandchild] = readFileSync(pids, 'utf8').split(' ').map(Number);
    expect([isRunning(solver), isRunning(grandchild)]).toEqual([false, false]);
  });

  it('sets the CPU-time backstop at the time limit plus a grace, rounded up to whole seconds', () => {
    expect([cpuLimitSeconds(1500), cpuLimitSeconds(30_000)]).toEqual([7, 35]);
  });
});
