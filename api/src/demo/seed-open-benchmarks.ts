/**
 * Demo step: the open grid benchmark files the repository ships (benchmarks/datasets/grid-benchmarks/) as one public
 * instance set of the demo maintainer, so a maintainer can sweep the field's standard maps on a fresh install without
 * uploading anything. The files go through the same upload checks as a user's files. Idempotent: a set of this name
 * that already holds maps is left alone.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../../benchmarks/datasets/open-grid-benchmarks';
import { DEMO_IDENTITIES } from '../dev/fake-oauth/demo-identities';
import { createInstanceSetsService } from '../instance-sets/instance-sets.service';
import { toAccount } from '../users/account';
import type { DemoSeedStep } from './seed-demo';

export const OPEN_BENCHMARKS_SET_NAME = 'Open grid benchmarks';

const DESCRIPTION = 'The synthetic maps of the open MAPF grid benchmark set (empty, random, maze, room and warehouse '
  + 'maps) with their "even" scenario files and one "random" scenario file, unchanged. An instance with k agents uses '
  + 'the first k rows of a scenario.';

const SOURCE = 'The open MAPF grid benchmark set, files unchanged (SHA-256 list in the repository, '
  + 'benchmarks/datasets/grid-benchmarks/SHA256SUMS). Cite: N. Sturtevant, "Benchmarks for Grid-Based Pathfinding", '
  + 'IEEE Transactions on Computational Intelligence and AI in Games 4(2):144–148, 2012 (map and scenario formats); '
  + 'R. Stern et al., "Multi-Agent Pathfinding: Definitions, Variants, and Benchmarks", SoCS 2019 (maps and scenario families).';

/** The map and scenario files of the repository's benchmark folder, maps first (scenarios name their map). */
export function openBenchmarkFileNames(): string[] {
  const names = readdirSync(OPEN_GRID_BENCHMARKS_DIR).filter((f) => /\.(map|scen)$/.test(f)).sort();
  return [...names.filter((f) => f.endsWith('.map')), ...names.filter((f) => f.endsWith('.scen'))];
}

export const seedOpenBenchmarks: DemoSeedStep = async ({ sequelize, models }) => {
  const identity = DEMO_IDENTITIES.find((d) => d.demoRole === 'maintainer');
  const owner = identity && (await models.User.findOne({ where: { provider: 'fake', providerId: identity.id } }));
  if (!owner) return;
  const [set] = await models.InstanceSet.findOrCreate({
    where: { ownerId: owner.id, name: OPEN_BENCHMARKS_SET_NAME },
    defaults: { ownerId: owner.id, name: OPEN_BENCHMARKS_SET_NAME, description: DESCRIPTION, visibility: 'public', source: SOURCE },
  });
  if ((await models.MapFile.count({ where: { instanceSetId: set.id } })) > 0) return;
  const files = openBenchmarkFileNames().map((name) => ({ originalname: name, buffer: readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, name)) }));
  await createInstanceSetsService({ sequelize, models }).upload(toAccount(owner), set.id, files);
};
