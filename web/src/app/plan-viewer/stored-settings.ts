/**
 * Stored settings versus the settings of what is on screen: a stored sweep result opens with the
 * exact settings its sweep replayed it with (so the viewer shows the leaderboard's figures), and
 * anything else is a what-if that must say what differs. Pure functions, no Angular.
 */
import type { ExecutionSummaryView } from '@shared/executions';
import type { ExecutionPolicyName } from '@shared/executions-constants';
import type { StoredExecutionSettings, StoredPolicyExecution, StoredResultExecutionsView } from '@shared/stored-executions';
import { formatPercent, formatSeconds } from './viewer-format';

/** The settings a batch ran with (the summary carries them all). */
export type BatchSettings = StoredExecutionSettings;

/** The settings of a summary. */
export function settingsOfSummary(s: ExecutionSummaryView): BatchSettings {
  return { policy: s.policy, noise: { ...s.noise }, runs: s.runs, seed: s.seed, onCollision: s.onCollision };
}

/** The stored replays that ran (a policy the simulator refused has no figures to reproduce). */
export function replayablePolicies(stored: StoredResultExecutionsView): readonly StoredPolicyExecution[] {
  return stored.executions.filter((e) => e.error === null);
}

/**
 * The stored replay to open: the one of `wanted` when the sweep stored it, else open-loop, else
 * the first stored one; null when the result has no stored replay (a submitted plan).
 */
export function storedReplayFor(stored: StoredResultExecutionsView, wanted?: string | null): StoredPolicyExecution | null {
  const list = replayablePolicies(stored);
  return list.find((e) => e.settings.policy === wanted) ?? list.find((e) => e.settings.policy === 'open-loop') ?? list[0] ?? null;
}

/**
 * What `actual` changes against the stored replays, one phrase per setting ("jitter CV 0.3
 * instead of 0.15"); empty when `actual` is exactly one stored replay's settings. A policy the
 * sweep did not replay is itself a difference (the others are compared with its first stored replay).
 */
export function settingsDifferences(stored: StoredResultExecutionsView, actual: BatchSettings): string[] {
  const list = replayablePolicies(stored);
  const same = list.find((e) => e.settings.policy === actual.policy);
  const base = same?.settings ?? list[0]?.settings;
  if (!base) return [];
  const out: string[] = [];
  if (!same) out.push(`policy ${actual.policy} (the sweep stored ${list.map((e) => e.settings.policy).join(', ')})`);
  const a = actual.noise;
  const b = base.noise;
  if (a.jitterCv !== b.jitterCv) out.push(`jitter CV ${a.jitterCv} instead of ${b.jitterCv}`);
  if (a.stallProbability !== b.stallProbability) out.push(`stall probability ${formatPercent(a.stallProbability)} instead of ${formatPercent(b.stallProbability)}`);
  if (a.stallMs !== b.stallMs) out.push(`stall duration ${formatSeconds(a.stallMs)} instead of ${formatSeconds(b.stallMs)}`);
  if (actual.runs !== base.runs) out.push(`${actual.runs} runs instead of ${base.runs}`);
  if (actual.seed !== base.seed) out.push(`seed ${actual.seed} instead of ${base.seed}`);
  if (actual.onCollision !== base.onCollision) out.push(`on collision "${actual.onCollision}" instead of "${base.onCollision}"`);
  return out;
}

/** The stored replay of a policy, if the sweep stored one that ran. */
export function storedOfPolicy(stored: StoredResultExecutionsView, policy: ExecutionPolicyName): StoredPolicyExecution | null {
  return replayablePolicies(stored).find((e) => e.settings.policy === policy) ?? null;
}

/**
 * The stored figures a replay with the stored settings must reproduce, compared to the digit;
 * returns the ones that differ ("realised makespan p95: stored 47.7 s, replayed 44.2 s").
 * Counts how many were compared so a caller can say it. With a relative `tolerance` (browser
 * replays), figures that differ by no more than it count as equal and are counted in `lastBits`:
 * the same code in another JavaScript engine may round the last bits of a sum differently.
 */
export function storedFigureMismatches(
  stored: StoredPolicyExecution,
  replay: ExecutionSummaryView,
  tolerance = 0,
): { compared: number; mismatches: string[]; lastBits: number } {
  const f = stored.figures;
  const pairs: [string, number | null, number | null, (v: number | null) => string][] = [
    ['execution success rate', f.successRate, replay.successRate, (v) => (v === null ? '–' : formatPercent(v))],
    ['collisions per run (mean)', f.collisions.mean, replay.collisions.mean, String],
    ['realised makespan (mean)', f.realisedMakespanMs.mean, replay.realisedMakespanMs.mean, formatSeconds],
    ['realised makespan (p95)', f.realisedMakespanMs.p95, replay.realisedMakespanMs.p95, formatSeconds],
    ['finish spread (mean)', f.finishSpreadMs.mean, replay.finishSpreadMs.mean, formatSeconds],
    ['finish spread (p95)', f.finishSpreadMs.p95, replay.finishSpreadMs.p95, formatSeconds],
    ['waiting, total over robots (mean)', f.waitingMs.mean, replay.waitingMs.mean, formatSeconds],
  ];
  const isClose = (a: number | null, b: number | null) => a !== null && b !== null && Math.abs(a - b) <= tolerance * Math.max(Math.abs(a), Math.abs(b));
  const differing = pairs.filter(([, a, b]) => a !== b);
  const mismatches = differing
    .filter(([, a, b]) => !isClose(a, b))
    .map(([label, a, b, fmt]) => `${label}: stored ${fmt(a)}, replayed ${fmt(b)}`);
  return { compared: pairs.length, mismatches, lastBits: differing.length - mismatches.length };
}

/** One line of the stored figures of a policy, for the what-if banner. */
export function storedFiguresLine(stored: StoredPolicyExecution): string {
  const f = stored.figures;
  return `${stored.settings.policy}: execution success rate ${formatPercent(f.successRate)} · realised makespan mean ${formatSeconds(f.realisedMakespanMs.mean)}`
    + `, p95 ${formatSeconds(f.realisedMakespanMs.p95)} · finish spread mean ${formatSeconds(f.finishSpreadMs.mean)}`;
}
