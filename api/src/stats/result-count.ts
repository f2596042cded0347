/**
 * The home page's "Results" figure: stored results (solved or not, from sweeps and submitted
 * plans) over the instance sets the viewer may see, under the same rule as the sets, maps and
 * scenarios counted beside it (instance-set-access.ts), so a visitor never counts private work.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { visibleSetsCondition, type Viewer } from '../instance-sets/instance-set-access';

/** How many results the viewer may see. */
export async function countVisibleResults(sequelize: Sequelize, viewer: Viewer): Promise<number> {
  const visible = visibleSetsCondition(viewer);
  // Curators see every set: no join needed.
  const sql = visible.sql === 'TRUE'
    ? 'SELECT count(*)::int AS n FROM results'
    : `SELECT count(*)::int AS n FROM results r JOIN instance_sets s ON s.id = r.instance_set_id WHERE ${visible.sql}`;
  const [row] = await sequelize.query<{ n: number }>(sql, { type: QueryTypes.SELECT, replacements: visible.replacements });
  return row?.n ?? 0;
}
