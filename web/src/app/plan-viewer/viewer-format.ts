/** Number formats of the plan viewer (ms as seconds, fractions as percent, profile one-liners). */
import type { RobotProfile } from '@shared/plan';

/** `7.5 s`, or `–` for a missing value. */
export function formatSeconds(ms: number | null | undefined): string {
  return ms === null || ms === undefined || !Number.isFinite(ms) ? '–' : `${+(ms / 1000).toFixed(2)} s`;
}

/** `95%` (one decimal below 10 points of the ends). */
export function formatPercent(fraction: number): string {
  const p = fraction * 100;
  return `${p === 0 || p === 100 ? p.toFixed(0) : p.toFixed(1)}%`;
}

/** The robot profile in one line, e.g. "forward 1000 ms · quarter turn 500 ms · wait 1000 ms · pitch 1000 mm · Ø 700 mm". */
export function profileLine(p: RobotProfile): string {
  return `forward ${p.forwardMs} ms · quarter turn ${p.quarterTurnMs} ms · wait ${p.waitMs} ms · pitch ${p.cellPitchMm} mm · Ø ${p.robotDiameterMm} mm`;
}
