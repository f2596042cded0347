/**
 * The demo instance sets: the invented ones generated once, and the repository's open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, Sturtevant 2012; Stern et al. 2019) stored unchanged; all public, owned by
 * the demo maintainer, every scenario usable.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';
import { OPEN_BENCHMARKS_SET_NAME } from '../../api/src/demo/seed-open-benchmarks';
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
    }));
    // The README beside the benchmark files lists 8 maps and 41 scenario files.
    expected.push({ name: OPEN_BENCHMARKS_SET_NAME, visibility: 'public', login: 'tobiah-venkat', maps: 8, scenarios: 41 });
    expected.sort((a, b) => a.name.localeCompare(b.name));
    expect(await tally()).toEqual(expected);
  });

  it('stores the open benchmark files byte for byte, with their source and citation', async () => {
    // SHA256SUMS lists the published files' hashes (benchmarks/datasets/grid-benchmarks/README.md).
    const published = readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, 'SHA256SUMS'), 'utf8').trim().split('\n')
      .map((line) => { const [hash, name] = line.split(/\s+/); return { name, checksum: hash }; })
      .sort((a, b) => a.name.localeCompare(b.name));
    const [stored] = await sequelize.query(
      `SELECT f.name, f.checksum FROM (SELECT instance_set_id, name, checksum FROM maps UNION ALL SELECT instance_set_id, name, checksum FROM scenarios) f
       JOIN instance_sets s ON s.id = f.instance_set_id WHERE s.name = :name`,
      { replacements: { name: OPEN_BENCHMARKS_SET_NAME } });
    expect((stored as { name: string; checksum: string }[]).sort((a, b) => a.name.localeCompare(b.name))).toEqual(published);
    expect(published).toHaveLength(49);
    const [[set]] = await sequelize.query('SELECT source, description FROM instance_sets WHERE name = :name', { replacements: { name: OPEN_BENCHMARKS_SET_NAME } }) as [{ source: string }[], unknown];
    expect(set.source).toMatch(/Sturtevant.*2012/);
    expect(set.source).toMatch(/Stern et al\..*SoCS 2019/);
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
