/**
 * Home-page counts. Features register a counter for their figure when they exist; figures
 * nobody registered count 0, so the endpoint works before those tables do.
 */
import type { StatsResponse } from '@shared/auth';

/** Counts one figure; `viewer` is the signed-in account or null, so counters can hide private rows from visitors. */
export type StatsCounter = (viewer: Express.User | null) => Promise<number>;

/** A figure of StatsResponse. */
export type StatsKey = keyof StatsResponse;

/** The registry and reader of home-page counts. */
export interface StatsService {
  /** Sets the counter of `key`, replacing an earlier one. */
  register(key: StatsKey, counter: StatsCounter): void;
  read(viewer: Express.User | null): Promise<StatsResponse>;
}

const KEYS: readonly StatsKey[] = ['instanceSets', 'maps', 'scenarios', 'sweeps', 'results'];

/** A stats service with no counters registered. */
export function createStatsService(): StatsService {
  const counters = new Map<StatsKey, StatsCounter>();
  return {
    register(key, counter) {
      counters.set(key, counter);
    },
    async read(viewer) {
      const values = await Promise.all(KEYS.map((k) => counters.get(k)?.(viewer) ?? Promise.resolve(0)));
      return Object.fromEntries(KEYS.map((k, i) => [k, values[i]])) as unknown as StatsResponse;
    },
  };
}
