/**
 * Pure helpers of the field-trials panel: figures as text, the rows of the field-against-simulation
 * table, and the geometry of its two charts (realised makespan per run against the simulated
 * central 95 %; per action kind planned, simulated and measured durations). No Angular.
 */
import type { ComparedFigure, FieldTrialRun, FieldTrialUpload, SimulatedRange } from '@shared/field-trials';
import { formatTrialLogError, type TrialLogError } from '@shared/trial-log';

/** ms as seconds with two decimals ("–" for none). */
export function seconds(ms: number | null | undefined): string {
  return ms === null || ms === undefined || !Number.isFinite(ms) ? '–' : `${(ms / 1000).toFixed(2)} s`;
}

/** A simulated range as "mean (low – high)". */
export function rangeText(r: SimulatedRange): string {
  return r.mean === null ? 'no simulated run finished' : `${seconds(r.mean)} (${seconds(r.low)} – ${seconds(r.high)})`;
}

/** Names of the flagged figures. */
export const FIGURE_LABELS: Record<ComparedFigure, string> = {
  realisedMakespanMs: 'realised makespan', realisedSocMs: 'realised sum-of-costs', waitingMs: 'waiting (total over robots)',
};

/** The flags of a run as one sentence, or null when every figure lies within the simulated range. */
export function outsideText(run: FieldTrialRun): string | null {
  return run.outside.length === 0 ? null : `Outside the simulation's 95 %: ${run.outside.map((f) => FIGURE_LABELS[f]).join(', ')}`;
}

/** The robots with the largest arrival delays, as text ("robot 2 +1.20 s"), at most `n`. */
export function delaysText(run: FieldTrialRun, n = 4): string {
  const delayed = run.perRobot.filter((r) => r.arrivalDelayMs !== null).sort((a, b) => (b.arrivalDelayMs ?? 0) - (a.arrivalDelayMs ?? 0));
  if (delayed.length === 0) return 'no robot arrived';
  const sign = (ms: number) => (ms >= 0 ? '+' : '−') + seconds(Math.abs(ms));
  return delayed.slice(0, n).map((r) => `robot ${r.robot} ${sign(r.arrivalDelayMs!)}`).join(', ') + (delayed.length > n ? ', …' : '');
}

/** A problem list of a refused upload as lines (file:line:column: field: message). */
export function problemLines(details: unknown): string[] {
  const errors = (details as { errors?: readonly TrialLogError[] } | null)?.errors;
  return Array.isArray(errors) ? errors.map(formatTrialLogError) : [];
}

/** One horizontal chart row: a band, an optional tick and points, in px along the axis. */
export interface ChartRow {
  readonly label: string;
  readonly band: { readonly x1: number; readonly x2: number } | null;
  readonly mean: number | null;
  readonly tick: number | null;
  readonly points: readonly { readonly x: number; readonly title: string; readonly isOutside: boolean }[];
}

/** A chart: rows on a common ms axis of `width` px (ticks at round seconds). */
export interface Chart {
  readonly width: number;
  readonly rows: readonly ChartRow[];
  readonly axis: readonly { readonly x: number; readonly label: string }[];
}

function axisOf(max: number, width: number): { scale: (ms: number) => number; axis: Chart['axis'] } {
  const top = max > 0 ? max * 1.05 : 1000;
  const scale = (ms: number) => (ms / top) * width;
  const stepS = [0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100, 200, 500, 1000].find((s) => top / 1000 / s <= 6) ?? 1000;
  const axis: { x: number; label: string }[] = [];
  for (let t = 0; t <= top / 1000 + 1e-9; t += stepS) axis.push({ x: scale(t * 1000), label: `${Number(t.toFixed(1))} s` });
  return { scale, axis };
}

/** Realised makespan per run against the simulated central 95 % (one row per run, the band on every row). */
export function makespanChart(upload: FieldTrialUpload, width: number): Chart {
  const sim = upload.simulation.realisedMakespanMs;
  const values = upload.runs.map((r) => r.realisedMakespanMs ?? 0);
  const { scale, axis } = axisOf(Math.max(sim.high ?? 0, ...values), width);
  const band = sim.low !== null && sim.high !== null ? { x1: scale(sim.low), x2: scale(sim.high) } : null;
  return {
    width, axis,
    rows: upload.runs.map((r, k) => ({
      label: `run ${k + 1}`,
      band, mean: sim.mean === null ? null : scale(sim.mean), tick: null,
      points: r.realisedMakespanMs === null ? [] : [{
        x: scale(r.realisedMakespanMs), isOutside: r.outside.includes('realisedMakespanMs'),
        title: `${r.fileName}: realised makespan ${seconds(r.realisedMakespanMs)}`,
      }],
    })),
  };
}

/** Per action kind: the planned duration (tick), the simulated central 95 % (band) and each run's measured mean (points). */
export function durationChart(upload: FieldTrialUpload, width: number): Chart {
  const kinds = upload.simulation.actionDurations;
  const measured = (action: string) => upload.runs.flatMap((r) => r.actionDurations.filter((d) => d.action === action).map((d) => ({ run: r, d })));
  const max = Math.max(0, ...kinds.flatMap((k) => [k.plannedMs, k.simulated.high ?? 0, ...measured(k.action).map((m) => m.d.meanMs)]));
  const { scale, axis } = axisOf(max, width);
  return {
    width, axis,
    rows: kinds.map((k) => {
      const inRange = (ms: number) => k.simulated.low === null || k.simulated.high === null || (ms >= k.simulated.low && ms <= k.simulated.high);
      return {
        label: k.action,
        band: k.simulated.low !== null && k.simulated.high !== null ? { x1: scale(k.simulated.low), x2: scale(k.simulated.high) } : null,
        mean: k.simulated.mean === null ? null : scale(k.simulated.mean),
        tick: scale(k.plannedMs),
        points: measured(k.action).map(({ run, d }) => ({
          x: scale(d.meanMs), isOutside: !inRange(d.meanMs),
          title: `${run.fileName}: ${k.action} mean ${seconds(d.meanMs)} over ${d.count} actions`,
        })),
      };
    }),
  };
}
