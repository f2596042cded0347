/**
 * POST /api/instance-sets/generate: the seeded generators run on the server, and their files
 * are checked and stored like uploads. Same request, same bytes; another seed, other bytes.
 */
import { createHash } from 'node:crypto';
import type { GenerateInstancesRequest, UploadResponse } from '@shared/instance-sets';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { loadInstance } from '../../api/src/instance-sets/load-instance';
import { createSet, json, signInAs, startLibraryServer, type LibraryServer, type SignedInClient } from './instance-library-support';

describe('generating instances on the server', () => {
  let lib: LibraryServer;
  let owner: SignedInClient;

  beforeAll(async () => {
    lib = await startLibraryServer();
    owner = await signInAs(lib.server.url, DEMO_IDENTITIES[0].login);
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  const generate = async (body: GenerateInstancesRequest) => owner.request('/api/instance-sets/generate', json('POST', body));
  const request = (instanceSetId: number, seed: number): GenerateInstancesRequest => ({
    instanceSetId, seed, name: 'aisles',
    map: { kind: 'warehouse', shelfColumns: 3, shelfRows: 4, shelfLength: 5, margin: 2 },
    scenarioCount: 2, scenarioMode: 'random', rowCount: 20,
  });

  it('stores the same bytes for the same request and seed, and other bytes for another seed', async () => {
    const [a, b, c] = [await createSet(owner, 'gen a'), await createSet(owner, 'gen b'), await createSet(owner, 'gen c')];
    const ra = (await (await generate(request(a, 17))).json()) as UploadResponse;
    const rb = (await (await generate(request(b, 17))).json()) as UploadResponse;
    const rc = (await (await generate(request(c, 18))).json()) as UploadResponse;
    const sums = (r: UploadResponse) => [...r.maps, ...r.scenarios].map((f) => `${f.name} ${f.checksum}`);
    expect([...ra.maps, ...ra.scenarios].map((f) => f.name)).toEqual(['aisles.map', 'aisles-random-1.scen', 'aisles-random-2.scen']);
    expect(sums(rb)).toEqual(sums(ra));
    // The map of the warehouse generator has no randomness at gapRate 0; the scenarios do.
    expect(rc.maps[0].checksum).toBe(ra.maps[0].checksum);
    expect(rc.scenarios[0].checksum).not.toBe(ra.scenarios[0].checksum);
  });

  it('stores a map whose size follows the generator formula and whose download hashes to its checksum', async () => {
    const set = await createSet(owner, 'gen sizes');
    const res = (await (await generate(request(set, 5))).json()) as UploadResponse;
    // width = 2·margin + columns·length + (columns − 1)·aisle = 4 + 15 + 2; height = 4 + 4·2 + 3·1 (solvers/generate/warehouse-map.ts).
    expect([res.maps[0].width, res.maps[0].height]).toEqual([21, 15]);
    const bytes = Buffer.from(await (await owner.request(`/api/maps/${res.maps[0].id}/download`)).arrayBuffer());
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(res.maps[0].checksum);
    expect(res.scenarios.map((s) => s.rowCount)).toEqual([20, 20]);
    const loaded = await loadInstance(lib.server.app.context.models, res.scenarios[0].id, 20);
    expect(loaded.instance.agents).toHaveLength(20);
    for (const a of loaded.instance.agents) expect([loaded.map.grid.passable[a.start], loaded.map.grid.passable[a.goal]]).toEqual([1, 1]);
  });

  it('refuses bad generator parameters with 400 naming the field', async () => {
    const set = await createSet(owner, 'gen bad');
    const res = await generate({ instanceSetId: set, seed: 1, map: { kind: 'random', width: 0, height: 8, density: 0.2 } });
    expect(res.status).toBe(400);
    expect(JSON.stringify(await res.json())).toMatch(/width/);
    const tooBig = await generate({ instanceSetId: set, seed: 1, map: { kind: 'rooms', roomsX: 64, roomsY: 64, roomWidth: 30, roomHeight: 30 } });
    expect(tooBig.status).toBe(400);
    expect(((await tooBig.json()) as { error: { message: string } }).error.message).toMatch(/at most 1024 cells a side/);
  });

  it('refuses a second generation with the same file names, storing nothing new', async () => {
    const set = await createSet(owner, 'gen twice');
    expect((await generate(request(set, 3))).status).toBe(201);
    const again = await generate(request(set, 3));
    expect(again.status).toBe(400);
    expect(((await again.json()) as { error: { code: string } }).error.code).toBe('INVALID_INSTANCE_FILES');
    const [{ n }] = await lib.sql<{ n: number }>('SELECT count(*)::int AS n FROM maps WHERE instance_set_id = :set', { set });
    expect(n).toBe(1);
  });
});
