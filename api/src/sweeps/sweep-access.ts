/**
 * Who sees and who cancels a sweep. The rule (issue 13, after a demotion kept access):
 *
 * A sweep is seen by its owner and by maintainers and admins (who run the shared workers), and
 * only while the viewer may also see the sweep's instance set *now* (instance-set-access.ts:
 * public sets, his own, or any set for maintainers and admins). Its results show the set's maps
 * and scenarios, so a maintainer demoted to researcher keeps his sweeps over public sets and his
 * own sets, and loses those over other people's private sets; promoted again, he has them back.
 * A sweep whose set was deleted (its runs and results went with it) stays with its owner.
 *
 * Role and visibility are read when asked: the role comes from the database on every request
 * (passport-setup.ts) and on every event of a live stream (sweep-events.ts), never from the session.
 */
import { hasRole } from '@shared/auth';
import { isSetVisible, type SetAccessFields } from '../instance-sets/instance-set-access';

/** Whether `viewer` may see and cancel `sweep`, whose instance set is `set` (null: the set is gone). */
export function canSeeSweep(sweep: { readonly ownerId: number }, set: SetAccessFields | null, viewer: Express.User): boolean {
  const isOwnerOrCurator = viewer.id === sweep.ownerId || hasRole(viewer.role, 'maintainer');
  return isOwnerOrCurator && (set === null || isSetVisible(set, viewer));
}

/** The same rule as a SQL condition on the sweeps alias `s`. */
export function visibleSweepsCondition(viewer: Express.User): { readonly sql: string; readonly replacements: Record<string, unknown> } {
  if (hasRole(viewer.role, 'maintainer')) return { sql: 'TRUE', replacements: {} };
  return {
    sql: `s.owner_id = :sweepViewerId AND NOT EXISTS (
      SELECT 1 FROM instance_sets vis WHERE vis.id = (s.definition->'instances'->>'instanceSetId')::int
        AND vis.visibility <> 'public' AND vis.owner_id <> :sweepViewerId)`,
    replacements: { sweepViewerId: viewer.id },
  };
}
