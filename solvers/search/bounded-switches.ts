/**
 * The CBS improvements a bounded-suboptimal search (w > 1, EECBS; cbs.ts) can use: the WDG
 * heuristic and rectangle reasoning are switched off there, because their arguments need each
 * agent's path to be optimal under its constraints (MDDs at the optimal cost), which focal
 * search does not give. With w = 1 the switches are returned unchanged.
 */
import type { CbsSwitches } from './cbs-types';

/** `switches` as the search with suboptimality factor `w` runs them. */
export function switchesForSuboptimality(switches: CbsSwitches, w: number): CbsSwitches {
  return w > 1 ? { ...switches, wdg: false, rectangleReasoning: false } : switches;
}
