/** The demo instance sets: generated once, public, owned by the demo maintainer, every scenario usable. */
import { createSequelize } from '../../api/src/db/sequelize';
import { defineModels } from '../../api/src/db/models';
import { seedDemo } from '../../api/src/demo/seed-demo';
import { DEMO_INSTANCE_SETS } from '../../api/src/demo/seed-demo-instances';
import { loadInstance } from '../../api/src/instance-sets/load-instance';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import type { Sequelize } from 'sequelize';

describe('demo instance sets', () => {
  let db: TestDatabase;
  let sequelize: Sequelize;

  beforeAll(async () => {
    db = await createTestDatabase();
    sequelize = createSequelize(db.url, { poolMax: 2 });
    await seedDemo(sequelize);
  }, 60_000);
  afterAll(async () => {
    await sequelize?.close();
    await db?.drop();
  });

  const tally = async () => (await sequelize.query(
    `SELECT s.name, s.visibility, u.login, count(DISTINCT m.id)::int AS maps, count(DISTINCT c.id)::int AS scenarios
     FROM instance_sets s JOIN users u ON u.id = s.owner_id
     LEFT JOIN maps m ON m.instance_set_id = s.id LEFT JOIN scenarios c ON c.instance_set_id = s.id
     GROUP BY s.id, u.login ORDER BY s.name`, { plain: false, raw: true }))[0];

  it('creates the invented sets as public sets of the demo maintainer, with every map and scenario', async () => {
    const expected = DEMO_INSTANCE_SETS.map((d) => ({
      name: d.name, visibility: 'public', login: 'tobiah-venkat',
      maps: d.generate.length, scenarios: d.generate.reduce((n, g) => n + (g.scenarioCount ?? 1), 0),
    })).sort((a, b) => a.name.localeCompare(b.name));
    expect(await tally()).toEqual(expected);
  });

  it('is idempotent: a second run adds nothing and changes no bytes', async () => {
    const before = await sequelize.query('SELECT name, checksum FROM maps UNION ALL SELECT name, checksum FROM scenarios ORDER BY 1');
    await seedDemo(sequelize);
    expect(await sequelize.query('SELECT name, checksum FROM maps UNION ALL SELECT name, checksum FROM scenarios ORDER BY 1')).toEqual(before);
  });

  it('gives scenarios whose largest agent count loads as a valid instance', async () => {
    const models = defineModels(sequelize);
    const scenarios = await models.ScenarioFile.findAll({ attributes: ['id', 'maxAgents', 'rowCount'] });
    for (const s of scenarios) {
      expect(s.maxAgents).toBeGreaterThanOrEqual(10);
      const loaded = await loadInstance(models, s.id, s.maxAgents);
      expect(loaded.instance.agents).toHaveLength(s.maxAgents);
    }
  });
});
