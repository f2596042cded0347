/**
 * The robot profiles a submitted plan may be scored under: those the instance's stored results
 * use, most used first, then the starter profile when none of them is it. The first is the form's
 * default, so a plan is scored beside the results it will be compared with on the board (the board
 * keeps instances under different profiles apart).
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { z } from 'zod';
import { STARTER_PROFILE } from '@shared/executions-constants';
import { profileLabel } from '@shared/leaderboards';
import type { RobotProfile } from '@shared/plan';
import type { SubmissionProfilesResponse } from '@shared/submissions';
import type { Models } from '../db/models';
import { validate } from '../errors/validate';
import { isSetVisible } from '../instance-sets/instance-set-access';
import { AppError } from '../errors/app-error';
import { parameterHash } from '../sweeps/parameter-hash';

/** Query of GET /api/submissions/profiles. */
export const ProfilesQuery = z.object({
  scenarioId: z.coerce.number().int().positive().max(2_147_483_647),
  agents: z.coerce.number().int().positive().max(1000),
}).strict();

/** The profiles to offer for one instance (404 SCENARIO_NOT_FOUND when `viewer` may not see the scenario). */
export async function profilesOfInstance(sequelize: Sequelize, models: Models, viewer: Express.User, query: unknown): Promise<SubmissionProfilesResponse> {
  const { scenarioId, agents } = validate(ProfilesQuery, query);
  const scenario = await models.ScenarioFile.findByPk(scenarioId, { attributes: ['id', 'instanceSetId'] });
  const set = scenario && (await models.InstanceSet.findByPk(scenario.instanceSetId, { attributes: ['ownerId', 'visibility'] }));
  if (!scenario || !set || !isSetVisible(set, viewer)) throw new AppError('SCENARIO_NOT_FOUND', 404, `No scenario ${scenarioId}`);
  // Ties go to the profile used first, so the default does not change from one request to the next.
  const rows = await sequelize.query<{ hash: string; profile: RobotProfile; results: number }>(
    `SELECT robot_profile_hash AS hash, (array_agg(robot_profile ORDER BY id))[1] AS profile, count(*)::int AS results
       FROM results WHERE scenario_id = :scenarioId AND agents = :agents
       GROUP BY robot_profile_hash ORDER BY results DESC, min(id)`,
    { type: QueryTypes.SELECT, replacements: { scenarioId, agents } },
  );
  const items = rows.map((r) => ({ profile: r.profile, label: profileLabel(r.profile), results: r.results }));
  const starterHash = parameterHash(STARTER_PROFILE);
  if (!rows.some((r) => r.hash.trim() === starterHash)) items.push({ profile: STARTER_PROFILE, label: profileLabel(STARTER_PROFILE), results: 0 });
  return { items };
}
