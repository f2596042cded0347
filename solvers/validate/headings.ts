/**
 * Heading rules for the validators (kept apart from solvers/grid's heading graph on purpose):
 * N = towards y − 1, E = x + 1, S = y + 1, W = x − 1; a quarter turn left goes N → W → S → E → N.
 */
import { HEADINGS, type Heading, type StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';

/** The [dx, dy] of one forward move per heading. */
export const FORWARD_DELTA: Readonly<Record<Heading, readonly [number, number]>> = {
  N: [0, -1],
  E: [1, 0],
  S: [0, 1],
  W: [-1, 0],
};

/** Whether a value is one of the four headings. */
export function isHeading(v: unknown): v is Heading {
  return typeof v === 'string' && (HEADINGS as readonly string[]).includes(v);
}

/** The heading after a quarter turn to the left. */
export function leftOf(h: Heading): Heading {
  return ({ N: 'W', W: 'S', S: 'E', E: 'N' } as const)[h];
}

/** The heading after a quarter turn to the right. */
export function rightOf(h: Heading): Heading {
  return ({ N: 'E', E: 'S', S: 'W', W: 'N' } as const)[h];
}

/** The start heading agent i must have: the instance's own, else the plan-wide rule ('free' = any). */
export function requiredStartHeading(instance: MapfInstance, i: number, rule: StartHeading): StartHeading {
  return instance.agents[i].startHeading ?? rule;
}
