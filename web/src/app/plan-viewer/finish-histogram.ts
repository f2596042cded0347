/** Histogram of robot finish times: equal-width bins over [min, max] of the values. */
import { KIND, type FleetTrack } from './fleet-track';

/** Bins: `edges` has one more entry than `counts`; bin i is [edges[i], edges[i + 1]) and the last also holds max. */
export interface Histogram {
  readonly edges: readonly number[];
  readonly counts: readonly number[];
  /** Largest count (for scaling bars). */
  readonly peak: number;
}

/**
 * Bins `values` into `binCount` equal-width bins from their minimum to their maximum (the
 * maximum goes into the last bin; common practice, as in most plotting tools). When every value
 * is equal there is one bin of width 1 around it; no values give no bins.
 */
export function finishHistogram(values: readonly number[], binCount: number): Histogram {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length === 0) return { edges: [], counts: [], peak: 0 };
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of finite) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (hi === lo) return { edges: [lo - 0.5, lo + 0.5], counts: [finite.length], peak: finite.length };
  const n = Math.max(1, Math.floor(binCount));
  const width = (hi - lo) / n;
  const edges = Array.from({ length: n + 1 }, (_, i) => (i === n ? hi : lo + i * width));
  const counts = new Array<number>(n).fill(0);
  for (const v of finite) counts[Math.min(n - 1, Math.floor((v - lo) / width))]++;
  return { edges, counts, peak: Math.max(...counts) };
}

/** Per robot the time it reaches its goal for good (end of its last forward; 0 when it never moves), Infinity when it never does. */
export function finishTimes(track: FleetTrack): number[] {
  const out: number[] = [];
  for (let r = 0; r < track.robotCount; r++) {
    let finish = 0;
    for (let a = track.first[r]; a < track.first[r + 1]; a++) if (track.kind[a] === KIND.forward) finish = track.end[a];
    out.push(finish);
  }
  return out;
}
