/**
 * Runs an external solver as a child process under a run's limits (issue 16, item 4).
 *
 * - No shell: the argument vector goes to `spawn` as is (shared/external-solvers.ts builds it
 *   word by word), so nothing in it is ever interpreted as shell syntax.
 * - Environment: only PATH and LANG of the worker, with HOME and TMPDIR set to the run's own
 *   folder (`solverEnvironment`): the worker's secrets (DATABASE_URL, SESSION_SECRET, SMTP_URL, …)
 *   never reach a solver, whose output can end up in a run's public reason.
 * - Memory: `prlimit --data` (util-linux) sets RLIMIT_DATA of the child before it starts, so the
 *   operating system refuses its allocations past the limit and the process dies. RLIMIT_DATA and
 *   not RLIMIT_AS, because V8 reserves far more address space than it uses: measured on this
 *   machine (Node 20), `node -e` does not even start under `--as` of 512 MB, while under `--data`
 *   it starts at 128 MB and dies with "JavaScript heap out of memory" (exit 134) once its heap
 *   outgrows the limit. A resource limit holds per process: a solver that starts several
 *   processes may use the limit in each of them. Core dumps are off (`--core=0`).
 * - Files: `prlimit --fsize` caps each file a solver process writes at FILE_SIZE_LIMIT_MB
 *   (RLIMIT_FSIZE, again per file and per process, not a disk quota), so one runaway file cannot
 *   fill the temporary disk.
 * - CPU time and peak memory: GNU time (`/usr/bin/time -f`, Debian package `time`) waits for the
 *   solver and writes the user + system CPU time of what it waited for (wait4's rusage, so
 *   processes the solver itself started and waited for count too) and its maximum resident set
 *   size (kB), which is the largest single process's peak, not the sum over processes.
 * - Wall time: the run's time limit, counted from the spawn. On overrun every process of the
 *   child's process group except GNU time is killed (SIGKILL), so GNU time still reports the
 *   usage; a moment later the whole group is killed in case anything is left. A cancelled sweep
 *   or a stopping worker does the same through `signal`. As a backstop that holds even if the
 *   worker itself dies, `prlimit --cpu` lets each process use at most the time limit plus
 *   CPU_GRACE_SECONDS of CPU time (RLIMIT_CPU, per process: a process with several busy threads
 *   reaches it before the wall-time limit and ends as a timeout too).
 * - Output: stdout and stderr are kept up to OUTPUT_CAP_BYTES each (the tail: the last lines say
 *   why a process failed) for the run's reason.
 *
 * A solver that moves itself to another process group or session escapes the kill; registered
 * commands come from maintainers, who are trusted not to do that.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { delimiter, join } from 'node:path';

/** GNU time, from the Debian package `time` (the shell keyword `time` is something else). */
export const GNU_TIME = '/usr/bin/time';
/** prlimit from util-linux. */
export const PRLIMIT = 'prlimit';
/** How much of stdout and of stderr is kept, bytes. */
export const OUTPUT_CAP_BYTES = 16 * 1024;
/** How long after killing the solver's processes the whole group is killed, ms. */
const GROUP_KILL_DELAY_MS = 2000;
/** How often the end of a killed group is checked, ms. */
const GROUP_POLL_MS = 20;
/** CPU seconds a process may use beyond the time limit before the operating system kills it (RLIMIT_CPU backstop). */
export const CPU_GRACE_SECONDS = 5;
/** Largest file a solver process may write, MB (RLIMIT_FSIZE). */
export const FILE_SIZE_LIMIT_MB = 256;

/** The RLIMIT_CPU of a run with `timeLimitMs`, s. */
export function cpuLimitSeconds(timeLimitMs: number): number {
  return Math.ceil(timeLimitMs / 1000) + CPU_GRACE_SECONDS;
}

/** The whole environment of a solver process: PATH and LANG of the worker, HOME and TMPDIR its run folder, nothing else. */
export function solverEnvironment(homeDir: string, from: NodeJS.ProcessEnv = process.env): NodeJS.ProcessEnv {
  return { PATH: from.PATH ?? '/usr/local/bin:/usr/bin:/bin', LANG: from.LANG ?? 'C.UTF-8', HOME: homeDir, TMPDIR: homeDir };
}

/** What to run and under which limits. */
export interface ExternalProcessRequest {
  /** Program and arguments, one string per argument. */
  readonly argv: readonly string[];
  readonly cwd: string;
  /** The run's own folder: HOME and TMPDIR of the process (solverEnvironment). */
  readonly homeDir: string;
  readonly timeLimitMs: number;
  readonly memoryLimitMb: number;
  /** Aborts the run (a cancelled sweep, a stopping worker). */
  readonly signal?: AbortSignal;
}

/** How the process ended. */
export type ExternalEnd =
  /** Exit status 0. */
  | 'exited'
  /** Killed at the wall-time limit, or by the operating system at the CPU-time backstop. */
  | 'timeout'
  /** Died after the operating system refused memory past the limit. */
  | 'memory'
  /** Nonzero exit or a signal, not from a limit. */
  | 'crashed'
  /** Killed because of `signal`. */
  | 'aborted'
  /** The program could not be started (not found, not executable, tools missing). */
  | 'spawn-failed';

/** What became of one process. */
export interface ExternalProcessOutcome {
  readonly end: ExternalEnd;
  readonly exitCode: number | null;
  /** The signal that ended the solver, e.g. SIGKILL (from GNU time's report). */
  readonly signalNumber: number | null;
  readonly wallMs: number;
  /** User + system CPU time, ms; null when GNU time wrote nothing. */
  readonly cpuTimeMs: number | null;
  /** Maximum resident set size, kB; null when GNU time wrote nothing. */
  readonly peakMemoryKb: number | null;
  /** The tail of stdout and stderr (at most OUTPUT_CAP_BYTES each). */
  readonly stdout: string;
  readonly stderr: string;
  /** A sentence on how it ended, for the run's reason. */
  readonly message: string;
}

/**
 * The tools this module needs that this machine lacks, each with its Debian package: GNU time
 * (`time`) and prlimit (`util-linux`). A worker missing one declares no external solver.
 */
export function missingProcessTools(): string[] {
  const missing: string[] = [];
  if (!existsSync(GNU_TIME)) missing.push(`${GNU_TIME} (Debian package time)`);
  const path = (process.env.PATH ?? '').split(delimiter).filter((d) => d !== '');
  if (!path.some((d) => existsSync(join(d, PRLIMIT)))) missing.push(`${PRLIMIT} (Debian package util-linux)`);
  return missing;
}

/** Signal numbers on Linux (x86-64 and arm64): SIGKILL, SIGXCPU (CPU-time limit), SIGXFSZ (file size limit). */
const SIGKILL = 9;
const SIGXCPU = 24;
const SIGXFSZ = 25;

/** Words in stderr by which common runtimes say an allocation failed (Node/V8, C, C++, Python, Java, Rust). */
const OUT_OF_MEMORY = /out of memory|allocation failed|Cannot allocate memory|std::bad_alloc|MemoryError|OutOfMemoryError|memory allocation of \d+ bytes failed|ENOMEM/i;

/** Keeps the last `cap` bytes written. */
class Tail {
  private chunks: Buffer[] = [];
  private size = 0;
  constructor(private readonly cap: number) {}
  push(chunk: Buffer): void {
    this.chunks.push(chunk);
    this.size += chunk.length;
    while (this.size - this.chunks[0].length >= this.cap) this.size -= this.chunks.shift()!.length;
  }
  text(): string {
    const all = Buffer.concat(this.chunks);
    return all.subarray(Math.max(0, all.length - this.cap)).toString('utf8');
  }
}

/** GNU time's report: "Command terminated by signal 9" / "Command exited with non-zero status 3", then our format line. */
export function parseTimeReport(text: string): { readonly cpuTimeMs: number | null; readonly peakMemoryKb: number | null; readonly exitCode: number | null; readonly signalNumber: number | null } {
  const lines = text.split('\n').map((l) => l.trim()).filter((l) => l !== '');
  const usage = [...lines].reverse().find((l) => /^qt-usage /.test(l));
  const signal = /Command terminated by signal (\d+)/.exec(text);
  const status = /Command exited with non-zero status (\d+)/.exec(text);
  let cpuTimeMs: number | null = null;
  let peakMemoryKb: number | null = null;
  if (usage) {
    const [, user, system, rss] = usage.split(/\s+/);
    const u = Number(user);
    const s = Number(system);
    const r = Number(rss);
    if (Number.isFinite(u) && Number.isFinite(s)) cpuTimeMs = Math.round((u + s) * 1000);
    if (Number.isFinite(r)) peakMemoryKb = r;
  }
  return { cpuTimeMs, peakMemoryKb, exitCode: status ? Number(status[1]) : signal ? null : usage ? 0 : null, signalNumber: signal ? Number(signal[1]) : null };
}

/** Pids whose process group is `pgid` and that still run (not zombies waiting for their reaper), from /proc; Linux only. */
async function groupMembers(pgid: number): Promise<number[]> {
  const members: number[] = [];
  for (const entry of await readdir('/proc').catch(() => [] as string[])) {
    if (!/^\d+$/.test(entry)) continue;
    const stat = await readFile(`/proc/${entry}/stat`, 'utf8').catch(() => '');
    // Fields after the command name in parentheses: state ppid pgrp …
    const after = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    if (Number(after[2]) === pgid && after[0] !== 'Z') members.push(Number(entry));
  }
  return members;
}

/**
 * Resolves once no process of group `pgid` runs, or after `withinMs`. A SIGKILL is delivered at
 * once but a process ends only when it is next scheduled (a large runtime tears down its memory
 * first), so without this wait a run could be reported over while its processes still ran.
 */
async function untilGroupGone(pgid: number, withinMs: number): Promise<void> {
  const deadline = performance.now() + withinMs;
  while ((await groupMembers(pgid)).length > 0 && performance.now() < deadline) {
    await new Promise((resolve) => setTimeout(resolve, GROUP_POLL_MS));
  }
}

const killQuietly = (pid: number, signal: NodeJS.Signals) => {
  try {
    process.kill(pid, signal);
  } catch {
    // already gone
  }
};

/** Runs `request` (see the module comment); never rejects. */
export async function runExternalProcess(request: ExternalProcessRequest): Promise<ExternalProcessOutcome> {
  const started = performance.now();
  let usageDir: string;
  try {
    usageDir = await mkdtemp(join(tmpdir(), 'qt-usage-'));
  } catch (err) {
    return {
      end: 'spawn-failed', exitCode: null, signalNumber: null, wallMs: performance.now() - started, cpuTimeMs: null, peakMemoryKb: null,
      stdout: '', stderr: '', message: `no temporary folder for the usage report: ${(err as Error).message}`,
    };
  }
  const usageFile = join(usageDir, 'usage');
  const cpuLimit = cpuLimitSeconds(request.timeLimitMs);
  const limitBytes = request.memoryLimitMb * 1024 * 1024;
  const stdout = new Tail(OUTPUT_CAP_BYTES);
  const stderr = new Tail(OUTPUT_CAP_BYTES);
  let why: 'timeout' | 'aborted' | undefined;
  let groupTimer: NodeJS.Timeout | undefined;
  try {
    const child = spawn(PRLIMIT, [
      `--data=${limitBytes}`, `--cpu=${cpuLimit}`, `--fsize=${FILE_SIZE_LIMIT_MB * 1024 * 1024}`, '--core=0', '--',
      GNU_TIME, '-f', 'qt-usage %U %S %M', '-o', usageFile, '--',
      ...request.argv,
    ], { cwd: request.cwd, env: solverEnvironment(request.homeDir), detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    child.stdout.on('data', (c: Buffer) => stdout.push(c));
    child.stderr.on('data', (c: Buffer) => stderr.push(c));
    // prlimit execs GNU time in place, so the child's pid is GNU time's and the group's id.
    const stopSolver = (reason: 'timeout' | 'aborted') => {
      if (why || child.exitCode !== null || child.pid === undefined) return;
      why = reason;
      const pgid = child.pid;
      void groupMembers(pgid).then((pids) => {
        for (const pid of pids) if (pid !== pgid) killQuietly(pid, 'SIGKILL');
      });
      groupTimer = setTimeout(() => killQuietly(-pgid, 'SIGKILL'), GROUP_KILL_DELAY_MS);
    };
    const timer = setTimeout(() => stopSolver('timeout'), request.timeLimitMs);
    const onAbort = () => stopSolver('aborted');
    request.signal?.addEventListener('abort', onAbort, { once: true });
    if (request.signal?.aborted) onAbort();
    const closed = new Promise<void>((resolve) => child.once('close', () => resolve()));
    const ended = await new Promise<{ code: number | null; spawnError?: Error }>((resolve) => {
      child.once('error', (err) => resolve({ code: null, spawnError: err }));
      child.once('exit', (code) => resolve({ code }));
    });
    clearTimeout(timer);
    // The run's time ends when GNU time exits, not after the clean-up below.
    const wallMs = performance.now() - started;
    // GNU time has reaped the solver; whatever is left in the group (a background process the
    // solver started and did not wait for) goes too, so it can neither run on nor hold the pipes open.
    if (child.pid !== undefined && !ended.spawnError) {
      killQuietly(-child.pid, 'SIGKILL');
      await untilGroupGone(child.pid, GROUP_KILL_DELAY_MS);
    }
    let closeTimer: NodeJS.Timeout | undefined;
    await Promise.race([closed, new Promise((resolve) => { closeTimer = setTimeout(resolve, GROUP_KILL_DELAY_MS); })]);
    clearTimeout(closeTimer);
    request.signal?.removeEventListener('abort', onAbort);
    const report = parseTimeReport(await readFile(usageFile, 'utf8').catch(() => ''));
    const base = { wallMs, cpuTimeMs: report.cpuTimeMs, peakMemoryKb: report.peakMemoryKb, stdout: stdout.text(), stderr: stderr.text() };
    if (ended.spawnError) {
      return { ...base, end: 'spawn-failed', exitCode: null, signalNumber: null, message: `${PRLIMIT} could not start: ${ended.spawnError.message}` };
    }
    const exitCode = report.exitCode ?? ended.code;
    const signalNumber = report.signalNumber;
    if (why === 'aborted') return { ...base, end: 'aborted', exitCode, signalNumber, message: 'stopped: the sweep was cancelled or the worker is shutting down' };
    if (why === 'timeout') return { ...base, end: 'timeout', exitCode, signalNumber, message: `killed at the time limit of ${request.timeLimitMs} ms` };
    // GNU time answers 127 (not found) or 126 (not executable) for a program it could not run.
    if ((ended.code === 127 || ended.code === 126) && base.stderr.includes(`${GNU_TIME}: cannot run`)) {
      return { ...base, end: 'spawn-failed', exitCode, signalNumber, message: `the program could not be run (exit ${ended.code}): ${lastLine(base.stderr)}` };
    }
    if (exitCode === 0 && signalNumber === null) return { ...base, end: 'exited', exitCode, signalNumber, message: 'exited with status 0' };
    const how = signalNumber !== null ? `ended by signal ${signalNumber}` : `exited with status ${exitCode}`;
    // RLIMIT_CPU: SIGXCPU at the limit, SIGKILL at the hard limit (the same here).
    if ((signalNumber === SIGXCPU || signalNumber === SIGKILL) && report.cpuTimeMs !== null && report.cpuTimeMs >= cpuLimit * 1000 - 1000) {
      return { ...base, end: 'timeout', exitCode, signalNumber, message: `killed by the operating system at its CPU-time limit of ${cpuLimit} s (${how})` };
    }
    if (signalNumber === SIGXFSZ) {
      return { ...base, end: 'crashed', exitCode, signalNumber, message: `${how}: it wrote a file past the limit of ${FILE_SIZE_LIMIT_MB} MB per file` };
    }
    // Refused allocations show as a runtime's out-of-memory message, or as a peak resident size at the limit.
    const nearLimit = report.peakMemoryKb !== null && report.peakMemoryKb * 1024 >= 0.9 * limitBytes;
    if (OUT_OF_MEMORY.test(base.stderr) || nearLimit) {
      return { ...base, end: 'memory', exitCode, signalNumber, message: `memory limit of ${request.memoryLimitMb} MB reached (${how}; the operating system refused more)` };
    }
    return { ...base, end: 'crashed', exitCode, signalNumber, message: how };
  } finally {
    if (groupTimer) {
      // The group kill is only a safety net; once the process has ended nothing of ours is left in it.
      clearTimeout(groupTimer);
    }
    await rm(usageDir, { recursive: true, force: true });
  }
}

/** The last non-empty line of `text`, shortened. */
export function lastLine(text: string, max = 300): string {
  const line = text.split('\n').map((l) => l.trim()).filter((l) => l !== '').pop() ?? '';
  return line.length > max ? `${line.slice(0, max)}…` : line;
}
