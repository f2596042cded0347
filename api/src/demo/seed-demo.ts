/**
 * Idempotent demo data for `npm start` (and e2e tests): every step may run on every start and
 * must leave existing rows alone. A feature adds its own step file and one entry in DEMO_STEPS.
 */
import type { Sequelize } from 'sequelize';
import { defineModels, type Models } from '../db/models';
import { seedDemoAccounts } from './seed-demo-accounts';
import { seedDemoExternalSolver } from './seed-demo-external-solver';
import { seedDemoInstances } from './seed-demo-instances';
import { seedDemoResults } from './seed-demo-results';
import { seedDemoTrials } from './seed-demo-trials';
import { seedOpenBenchmarks } from './seed-open-benchmarks';

/** What a demo step receives. */
export interface DemoSeedContext {
  readonly sequelize: Sequelize;
  readonly models: Models;
}

/** One idempotent step of the demo seed. */
export type DemoSeedStep = (ctx: DemoSeedContext) => Promise<void>;

/** The steps in order (later ones may rely on the accounts). */
export const DEMO_STEPS: readonly DemoSeedStep[] = [seedDemoAccounts, seedDemoExternalSolver, seedDemoInstances, seedOpenBenchmarks, seedDemoResults, seedDemoTrials];

/** Runs every demo step on a migrated database. */
export async function seedDemo(sequelize: Sequelize): Promise<void> {
  const ctx: DemoSeedContext = { sequelize, models: defineModels(sequelize) };
  for (const step of DEMO_STEPS) await step(ctx);
}
