/**
 * Demo step: registers the example external solver shipped in the repository
 * (solvers/cli/external-example/prioritised-astar.ts; shared/external-solvers.ts EXAMPLE_SOLVER)
 * in the demo maintainer's name, so a sweep can name it out of the box; the embedded worker of
 * `npm start` declares it by default (WORKER_SOLVERS). A registration of that name and version,
 * whoever made it, is left alone.
 */
import { EXAMPLE_SOLVER } from '@shared/external-solvers';
import { DEMO_IDENTITIES } from '../dev/fake-oauth/demo-identities';
import type { DemoSeedStep } from './seed-demo';

/** Registers the example solver once. */
export const seedDemoExternalSolver: DemoSeedStep = async ({ sequelize, models }) => {
  const identity = DEMO_IDENTITIES.find((d) => d.demoRole === 'maintainer');
  const owner = identity && (await models.User.findOne({ where: { provider: 'fake', providerId: identity.id } }));
  await sequelize.query(
    `INSERT INTO external_solvers (name, version, models, command, plan_format, description, registered_by)
     VALUES (:name, :version, ARRAY[:models]::text[], :command, :planFormat, :description, :by)
     ON CONFLICT (name, version) DO NOTHING`,
    {
      replacements: {
        name: EXAMPLE_SOLVER.name, version: EXAMPLE_SOLVER.version, models: [...EXAMPLE_SOLVER.models], command: EXAMPLE_SOLVER.command,
        planFormat: EXAMPLE_SOLVER.planFormat, description: EXAMPLE_SOLVER.description, by: owner?.id ?? null,
      },
    },
  );
};
