/**
 * `npm run -s calibrate -- --log FILE... [--json]`: fits a robot profile (forward, quarter-turn and
 * wait times, timing jitter, stalls) to field trial logs (CSV or JSON, README "Field trial logs")
 * by maximum likelihood under the simulator's noise model (solvers/trials/calibrate.ts). Prints a
 * table with 95 % intervals, or with --json exactly
 * { forwardMs, quarterTurnMs, waitMs, timingJitter, stallProbability, stallMs, actions: { forward, turn, wait }, ci95 }.
 * Exit code 0 on a fit; 2 on a usage error or a bad log (every problem on stderr as
 * `file:line:column: field: message`, and nothing is fitted).
 */
import { readFileSync, statSync } from 'node:fs';
import { formatTrialLogError, MAX_TRIAL_LOG_BYTES, parseTrialLog, type TrialLog, type TrialLogError } from '@shared/trial-log';
import { calibrateProfile, calibrationSummary, type ProfileFit } from '../trials/calibrate';

const USAGE = `usage: npm run -s calibrate -- --log FILE... [--json]
  --log FILE...  one or more trial logs (.csv or .json; other names are told apart by content);
                 every normally ended action of every log is fitted (aborted rows are left out)
  --json         print the fit as one JSON object instead of a table
  --help         print this text
`;

/** What the arguments ask for, or a usage problem. */
export type CalibrateArgs = { readonly kind: 'run'; readonly files: readonly string[]; readonly isJson: boolean } | { readonly kind: 'help' } | { readonly kind: 'usage'; readonly message: string };

/** Reads the command line (after `--`). */
export function parseCalibrateArgs(argv: readonly string[]): CalibrateArgs {
  const files: string[] = [];
  let isJson = false;
  let isInLog = false;
  for (const arg of argv) {
    if (arg === '--help' || arg === '-h') return { kind: 'help' };
    if (arg === '--json') {
      isJson = true;
      isInLog = false;
    } else if (arg === '--log') {
      isInLog = true;
    } else if (arg.startsWith('--log=')) {
      files.push(arg.slice('--log='.length));
      isInLog = true;
    } else if (arg.startsWith('-')) {
      return { kind: 'usage', message: `unknown option ${arg}` };
    } else if (isInLog) {
      files.push(arg);
    } else {
      return { kind: 'usage', message: `${arg}: log files follow --log` };
    }
  }
  if (files.length === 0) return { kind: 'usage', message: 'no log given (--log FILE...)' };
  return { kind: 'run', files, isJson };
}

/** The human-readable table. */
export function calibrationTable(fit: ProfileFit, files: readonly string[]): string {
  const ms = (v: number | null): string => (v === null ? '—' : `${v.toFixed(1)} ms`);
  const num = (v: number | null, digits: number): string => (v === null ? '—' : v.toFixed(digits));
  const ci = (c: readonly [number, number] | null, show: (v: number) => string): string => (c === null ? '—' : `${show(c[0])} – ${show(c[1])}`);
  const rows: [string, string, string, string][] = [
    ['forward', ms(fit.forwardMs), ci(fit.ci95.forwardMs, (v) => v.toFixed(1)), `${fit.actions.forward} actions`],
    ['quarter turn', ms(fit.quarterTurnMs), ci(fit.ci95.quarterTurnMs, (v) => v.toFixed(1)), `${fit.actions.turn} actions`],
    ['wait', ms(fit.waitMs), ci(fit.ci95.waitMs, (v) => v.toFixed(1)), `${fit.actions.wait} actions`],
    ['timing jitter (CV)', num(fit.timingJitter, 4), ci(fit.ci95.timingJitter, (v) => v.toFixed(4)), 'log-normal'],
    ['stall probability', num(fit.stallProbability, 4), ci(fit.ci95.stallProbability, (v) => v.toFixed(4)), fit.hasStalls ? `≈ ${fit.stalledActions.toFixed(1)} stalled` : 'no stalls found'],
    ['stall length', fit.hasStalls ? ms(fit.stallMs) : '—', ci(fit.ci95.stallMs, (v) => v.toFixed(1)), ''],
  ];
  const width = [0, 1, 2].map((c) => Math.max(...rows.map((r) => r[c].length), ['parameter', 'fit', '95 % CI'][c].length));
  const line = (r: readonly string[]): string => `${r[0].padEnd(width[0])}  ${r[1].padStart(width[1])}  ${r[2].padEnd(width[2])}  ${r[3]}`.trimEnd();
  return [
    `calibrated from ${files.length} log${files.length === 1 ? '' : 's'}: ${files.join(', ')}`,
    line(['parameter', 'fit', '95 % CI', '']),
    ...rows.map(line),
    `goodness of fit: Kolmogorov–Smirnov distance ${fit.goodnessOfFit.ksDistance.toFixed(4)} of the standardised log durations from N(0, 1)`,
    '',
  ].join('\n');
}

function readLog(file: string): { log: TrialLog } | { errors: readonly TrialLogError[] } {
  const fail = (message: string) => ({ errors: [{ file, line: null, column: null, field: null, message }] });
  try {
    const size = statSync(file).size;
    if (size > MAX_TRIAL_LOG_BYTES) return fail(`the file is larger than ${MAX_TRIAL_LOG_BYTES} bytes (the limit of one log)`);
    const parsed = parseTrialLog(file, readFileSync(file, 'utf8'));
    return parsed.kind === 'parsed' ? { log: parsed.log } : { errors: parsed.errors };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    return fail(code === 'ENOENT' ? 'the file does not exist' : `the file cannot be read (${code ?? String(error)})`);
  }
}

function main(argv: readonly string[]): number {
  const args = parseCalibrateArgs(argv);
  if (args.kind === 'help') {
    process.stdout.write(USAGE);
    return 0;
  }
  if (args.kind === 'usage') {
    process.stderr.write(`calibrate: ${args.message}\n${USAGE}`);
    return 2;
  }
  const logs: TrialLog[] = [];
  const errors: TrialLogError[] = [];
  for (const file of args.files) {
    const read = readLog(file);
    if ('log' in read) logs.push(read.log);
    else errors.push(...read.errors);
  }
  if (errors.length === 0) {
    const result = calibrateProfile(logs);
    if (result.kind === 'fitted') {
      process.stdout.write(args.isJson ? `${JSON.stringify(calibrationSummary(result.fit), null, 2)}\n` : calibrationTable(result.fit, args.files));
      return 0;
    }
    errors.push(...result.errors);
  }
  for (const e of errors) process.stderr.write(`${formatTrialLogError(e)}\n`);
  process.stderr.write(`calibrate: nothing fitted (${errors.length} problem${errors.length === 1 ? '' : 's'})\n`);
  return 2;
}

if (require.main === module) process.exitCode = main(process.argv.slice(2));
