/**
 * The body of a field-trial upload's check, run in a thread of the interactive pool
 * (workers/plan-thread.ts): open zips, parse every log (shared/trial-log.ts), check each against
 * the result's plan and compute its figures (solvers/trials/compare-to-plan.ts, the simulator's
 * own figure code), and simulate the plan under the upload's policy to get the central 95 % of
 * simulated runs each field figure is compared with. All or nothing: the first file with a
 * problem makes the answer a list of problems (file, line, column) and no run.
 */
import { gzipSync } from 'node:zlib';
import type { ExecutionPolicyName } from '@shared/executions-constants';
import {
  COMPARED_FIGURES, TRIAL_UPLOAD_LIMITS, type ActionDurationFigures, type ComparedFigure, type FieldTrialRun, type SimulatedRange, type TrialSimulation,
} from '@shared/field-trials';
import type { RobotProfile, ActionKind } from '@shared/plan';
import { parseTrialLog, type TrialLog, type TrialLogError } from '@shared/trial-log';
import { realisedTimeline, simulateExecution } from '@solvers/execute';
import type { ExecutablePlan } from '@solvers/execute/execution-types';
import type { MapfInstance } from '@solvers/instance';
import { compareTrialToPlan, type TrialRunFigures } from '@solvers/trials/compare-to-plan';
import { UPLOAD_LIMITS } from '@shared/instance-sets';
import { ByteBudget } from '../instance-sets/byte-budget';
import { readZip } from '../instance-sets/read-zip';
import { decodeText, type UploadEntry } from '../instance-sets/upload-entry';
import type { ExecutionTaskInstance } from '../executions/execution-task';

/** One uploaded file as it crosses into the thread. */
export interface TrialFile {
  readonly name: string;
  readonly bytes: Uint8Array;
}

/** The simulation settings the field runs are compared with (the stored replay's, or the defaults). */
export interface TrialSimulationSettings {
  readonly policy: ExecutionPolicyName;
  readonly runs: number;
  readonly seed: number;
  readonly noise: { readonly jitterCv: number; readonly stallProbability: number; readonly stallMs: number };
  readonly onCollision: 'count' | 'stop';
  readonly settingsFrom: 'stored' | 'default';
}

/** The job: the result's instance, plan and profile, the files and the simulation settings. */
export interface CheckTrialsJob {
  readonly instance: ExecutionTaskInstance;
  readonly plan: ExecutablePlan;
  readonly profile: RobotProfile;
  readonly files: readonly TrialFile[];
  readonly simulation: TrialSimulationSettings;
}

/** One checked run, ready to store. */
export interface CheckedRun {
  readonly fileName: string;
  readonly format: 'csv' | 'json';
  readonly rows: number;
  readonly figures: TrialRunFigures;
  readonly actionDurations: FieldTrialRun['actionDurations'];
  readonly outside: readonly ComparedFigure[];
  /** The log as uploaded, gzipped. */
  readonly logGz: Uint8Array;
}

/** The answer: every run and the simulation, or the problems (parse errors, or the first divergence). */
export type CheckTrialsOutcome =
  | { readonly kind: 'checked'; readonly runs: readonly CheckedRun[]; readonly simulation: TrialSimulation }
  | { readonly kind: 'invalid'; readonly code: 'INVALID_TRIAL_LOG' | 'TRIAL_DIVERGES'; readonly errors: readonly TrialLogError[] };

const isLogName = (name: string): boolean => /\.(csv|json)$/i.test(name);
const fileError = (file: string, message: string): TrialLogError => ({ file, line: null, column: null, field: null, message });

/** Checks the upload (async only for unzipping). */
export async function checkTrials(job: CheckTrialsJob): Promise<CheckTrialsOutcome> {
  const instance = toInstance(job.instance);
  const entries: UploadEntry[] = [];
  const budget = new ByteBudget(UPLOAD_LIMITS.maxTotalBytes);
  for (const f of job.files) {
    const bytes = Buffer.from(f.bytes.buffer, f.bytes.byteOffset, f.bytes.byteLength);
    if (/\.zip$/i.test(f.name)) {
      const zip = await readZip(f.name, bytes, budget, isLogName);
      if (zip.problems.length > 0) return invalid(zip.problems.map((p) => fileError(p.file, p.message)));
      entries.push(...zip.entries);
    } else if (isLogName(f.name)) {
      entries.push({ name: f.name, label: f.name, bytes });
    } else {
      return invalid([fileError(f.name, 'a trial log is a .csv or .json file (or a .zip of them)')]);
    }
  }
  if (entries.length === 0) return invalid([fileError('(upload)', 'the upload holds no .csv or .json trial log')]);
  if (entries.length > TRIAL_UPLOAD_LIMITS.maxRuns) {
    return invalid([fileError('(upload)', `the upload holds ${entries.length} logs; at most ${TRIAL_UPLOAD_LIMITS.maxRuns} runs are accepted at once`)]);
  }

  const logs: { log: TrialLog; text: string }[] = [];
  for (const e of entries) {
    const decoded = decodeText(e);
    if ('problem' in decoded) {
      const p = decoded.problem;
      return invalid([{ file: p.file, line: p.line, column: p.column, field: null, message: p.message }]);
    }
    const parsed = parseTrialLog(e.label, decoded.text);
    if (parsed.kind === 'invalid') return invalid(parsed.errors);
    logs.push({ log: parsed.log, text: decoded.text });
  }

  const plan = job.plan;
  const runs: CheckedRun[] = [];
  const simulation = simulate(instance, plan, job.profile, job.simulation);
  for (const { log, text } of logs) {
    const compared = compareTrialToPlan(instance, plan, job.profile, log);
    if (compared.kind === 'diverges') return { kind: 'invalid', code: 'TRIAL_DIVERGES', errors: [compared.divergence] };
    const figures = compared.figures;
    runs.push({
      fileName: log.file, format: log.format, rows: log.rows.length, figures,
      actionDurations: measuredDurations(log),
      outside: COMPARED_FIGURES.filter((k) => isOutside(figures[k], simulation[k])),
      logGz: gzipSync(text),
    });
  }
  return { kind: 'checked', runs, simulation };
}

function invalid(errors: readonly TrialLogError[]): CheckTrialsOutcome {
  return { kind: 'invalid', code: 'INVALID_TRIAL_LOG', errors };
}

/** Whether a field figure lies outside the simulated central 95 % (a missing figure against finishing simulated runs counts as outside). */
export function isOutside(value: number | null, range: SimulatedRange): boolean {
  if (range.low === null || range.high === null) return false;
  if (value === null) return true;
  return value < range.low || value > range.high;
}

/** The action kinds the durations are grouped by (a turn either way is one kind). */
function kindOf(action: ActionKind): 'forward' | 'turn' | 'wait' {
  return action === 'forward' ? 'forward' : action === 'wait' ? 'wait' : 'turn';
}

const KINDS = ['forward', 'turn', 'wait'] as const;

function measuredDurations(log: TrialLog): FieldTrialRun['actionDurations'] {
  return KINDS.map((action) => {
    const d = log.rows.filter((r) => kindOf(r.action) === action && r.event !== 'abort').map((r) => r.endMs - r.startMs);
    return { action, meanMs: d.length > 0 ? d.reduce((s, x) => s + x, 0) / d.length : 0, count: d.length };
  }).filter((d) => d.count > 0);
}

/** Central 95 % of `values` by nearest rank (2.5th and 97.5th percentiles), and their mean. */
export function simulatedRange(values: readonly (number | null)[]): SimulatedRange {
  const v = values.filter((x): x is number => x !== null && Number.isFinite(x)).sort((a, b) => a - b);
  if (v.length === 0) return { mean: null, low: null, high: null, count: 0 };
  const rank = (p: number) => v[Math.min(v.length - 1, Math.max(0, Math.ceil(p * v.length) - 1))];
  return { mean: v.reduce((s, x) => s + x, 0) / v.length, low: rank(0.025), high: rank(0.975), count: v.length };
}

/** Simulated runs at which per-action durations are sampled (the batch's first runs). */
const DURATION_SAMPLE_RUNS = 20;

function simulate(instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile, s: TrialSimulationSettings): TrialSimulation {
  const options = { policy: s.policy, noise: s.noise, seed: s.seed, onCollision: s.onCollision } as const;
  const summary = simulateExecution(instance, plan, profile, { ...options, runs: s.runs });
  const per = summary.perRun;
  const durations = new Map<string, number[]>(KINDS.map((k) => [k, []]));
  for (let run = 0; run < Math.min(s.runs, DURATION_SAMPLE_RUNS); run++) {
    for (const robot of realisedTimeline(instance, plan, profile, options, run).robots) {
      for (const a of robot) if (!a.isPadding && Number.isFinite(a.durationMs)) durations.get(kindOf(a.action))!.push(a.durationMs);
    }
  }
  const planned: Record<(typeof KINDS)[number], number> = { forward: profile.forwardMs, turn: profile.quarterTurnMs, wait: profile.waitMs };
  const actionDurations: ActionDurationFigures[] = KINDS
    .filter((k) => durations.get(k)!.length > 0)
    .map((k) => ({ action: k, plannedMs: planned[k], simulated: simulatedRange(durations.get(k)!) }));
  return {
    policy: s.policy, runs: s.runs, seed: s.seed, noise: s.noise, settingsFrom: s.settingsFrom,
    successRate: summary.successRate,
    realisedMakespanMs: simulatedRange(per.map((r) => r.realisedMakespanMs)),
    realisedSocMs: simulatedRange(per.map((r) => r.realisedSocMs)),
    finishSpreadMs: simulatedRange(per.map((r) => r.finishSpreadMs)),
    waitingMs: simulatedRange(per.map((r) => r.waitingMs)),
    actionDurations,
  };
}

function toInstance(t: ExecutionTaskInstance): MapfInstance {
  const passable = new Uint8Array(t.width * t.height);
  for (let i = 0; i < passable.length; i++) passable[i] = t.cells.charCodeAt(i) === 49 ? 1 : 0;
  return { grid: { width: t.width, height: t.height, passable }, agents: t.agents };
}
