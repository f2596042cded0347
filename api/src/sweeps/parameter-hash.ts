/** Short stable hashes of parameter objects, for the run identity and the robot profile column. */
import { createHash } from 'node:crypto';
import { canonicalJson } from '@shared/sweeps';

/** The first 16 hex digits of sha256 over the canonical JSON of `value` (key order never matters). */
export function parameterHash(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value)).digest('hex').slice(0, 16);
}
