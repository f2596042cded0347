/**
 * Who sees and changes what in the instance library, with real sign-ins: visitor, the owner,
 * another researcher, a maintainer and an admin. Private sets answer 404 to everyone but the
 * owner, maintainers and admins, through every route that reaches them.
 */
import type { InstanceSetDetail, InstanceSetListResponse, UploadResponse } from '@shared/instance-sets';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import {
  createSet, datasetBytes, json, setRole, signInAs, startLibraryServer, upload, visitorClient,
  type LibraryServer, type SignedInClient,
} from './instance-library-support';

// Without the demo seed every identity starts as researcher; roles are then set in the database.
const [ownerId, curatorId, otherId] = DEMO_IDENTITIES;

describe('instance library visibility and rights', () => {
  let lib: LibraryServer;
  let visitor: SignedInClient;
  let owner: SignedInClient;
  let other: SignedInClient;
  let curator: SignedInClient;
  let privateSet: number;
  let publicSet: number;
  let privateFiles: UploadResponse;

  beforeAll(async () => {
    lib = await startLibraryServer();
    const url = lib.server.url;
    visitor = await visitorClient(url);
    owner = await signInAs(url, ownerId.login);
    other = await signInAs(url, otherId.login);
    curator = await signInAs(url, curatorId.login);
    privateSet = await createSet(owner, 'Lantern Yard private drafts', 'private');
    publicSet = await createSet(owner, 'Lantern Yard public', 'public');
    const files = ['empty-8-8.map', 'empty-8-8-even-1.scen'].map((name) => ({ name, bytes: datasetBytes(name) }));
    privateFiles = (await upload(url, owner, privateSet, files).expect(201)).body as UploadResponse;
    await upload(url, owner, publicSet, files).expect(201);
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  const status = async (c: SignedInClient, path: string, init?: RequestInit) => (await c.request(path, init)).status;
  const listNames = async (c: SignedInClient, query = '') =>
    ((await (await c.request(`/api/instance-sets${query}`)).json()) as InstanceSetListResponse).items.map((s) => s.name);
  const privatePaths = () => [
    `/api/instance-sets/${privateSet}`,
    `/api/maps/${privateFiles.maps[0].id}`,
    `/api/maps/${privateFiles.maps[0].id}/download`,
    `/api/scenarios/${privateFiles.scenarios[0].id}`,
    `/api/scenarios/${privateFiles.scenarios[0].id}/download`,
  ];

  describe('as maintainer and admin', () => {
    beforeAll(() => setRole(lib, curatorId.login, 'maintainer'));

    it.each(['maintainer', 'admin'] as const)('a %s sees private sets in the list and through every route', async (role) => {
      await setRole(lib, curatorId.login, role);
      expect(await listNames(curator)).toEqual(expect.arrayContaining(['Lantern Yard private drafts', 'Lantern Yard public']));
      for (const path of privatePaths()) expect([path, await status(curator, path)]).toEqual([path, 200]);
      const detail = (await (await curator.request(`/api/instance-sets/${privateSet}`)).json()) as InstanceSetDetail;
      expect(detail.canManage).toBe(true);
    });
  });

  it('shows a visitor only public sets and answers 404 for everything private', async () => {
    expect(await listNames(visitor)).toEqual(['Lantern Yard public']);
    for (const path of privatePaths()) {
      const res = await visitor.request(path);
      expect([path, res.status]).toEqual([path, 404]);
    }
    expect(await status(visitor, `/api/instance-sets/${publicSet}`)).toBe(200);
  });

  it('treats another researcher like a visitor for private sets', async () => {
    expect(await listNames(other)).toEqual(['Lantern Yard public']);
    for (const path of privatePaths()) expect([path, await status(other, path)]).toEqual([path, 404]);
    const body = (await (await other.request(`/api/instance-sets/${privateSet}`)).json()) as { error: { code: string } };
    expect(body.error.code).toBe('INSTANCE_SET_NOT_FOUND');
  });

  it('shows the owner both sets, with the right to manage them', async () => {
    expect(await listNames(owner)).toEqual(expect.arrayContaining(['Lantern Yard private drafts', 'Lantern Yard public']));
    for (const path of privatePaths()) expect([path, await status(owner, path)]).toEqual([path, 200]);
    const detail = (await (await owner.request(`/api/instance-sets/${publicSet}`)).json()) as InstanceSetDetail;
    expect(detail.canManage).toBe(true);
    expect(detail.maps.map((m) => m.name)).toEqual(['empty-8-8.map']);
  });

  it('refuses visitors every change with 401', async () => {
    expect(await status(visitor, '/api/instance-sets', json('POST', { name: 'x' }))).toBe(401);
    expect(await status(visitor, `/api/instance-sets/${publicSet}`, { method: 'DELETE' })).toBe(401);
    expect(await status(visitor, `/api/maps/${privateFiles.maps[0].id}`, { method: 'DELETE' })).toBe(401);
    const up = await upload(lib.server.url, visitor, publicSet, [{ name: 'a.map', bytes: datasetBytes('empty-8-8.map') }]);
    expect(up.status).toBe(401);
  });

  it("refuses another researcher changes to someone's public set (403) and hides the private one (404)", async () => {
    const detail = (await (await other.request(`/api/instance-sets/${publicSet}`)).json()) as InstanceSetDetail;
    expect(detail.canManage).toBe(false);
    const up = await upload(lib.server.url, other, publicSet, [{ name: 'a.map', bytes: datasetBytes('empty-8-8.map') }]);
    expect(up.status).toBe(403);
    expect(await status(other, `/api/instance-sets/${publicSet}`, { method: 'DELETE' })).toBe(403);
    expect(await status(other, `/api/maps/${detail.maps[0].id}`, { method: 'DELETE' })).toBe(403);
    expect(await status(other, `/api/instance-sets/${privateSet}`, { method: 'DELETE' })).toBe(404);
    const generate = json('POST', { instanceSetId: privateSet, map: { kind: 'empty', width: 4, height: 4 }, seed: 1 });
    expect(await status(other, '/api/instance-sets/generate', generate)).toBe(404);
  });

  it('counts on the home page only what the viewer may see', async () => {
    const stats = async (c: SignedInClient) => (await (await c.request('/api/stats')).json()) as Record<string, number>;
    expect(await stats(visitor)).toMatchObject({ instanceSets: 1, maps: 1, scenarios: 1 });
    expect(await stats(owner)).toMatchObject({ instanceSets: 2, maps: 2, scenarios: 2 });
  });

  it('searches names and descriptions and pages the list on the server', async () => {
    const mine = [1, 2, 3].map((i) => `Harbour ramp ${i}`);
    for (const name of mine) await createSet(other, name, 'public');
    expect((await listNames(visitor, '?q=harbour')).sort()).toEqual(mine);
    const page2 = (await (await visitor.request('/api/instance-sets?q=ramp&pageSize=2&page=2')).json()) as InstanceSetListResponse;
    expect([page2.total, page2.items.length, page2.page]).toEqual([3, 1, 2]);
    // ILIKE wildcards in the search text are taken literally.
    expect(await listNames(visitor, '?q=%25')).toEqual([]);
    expect(await status(visitor, '/api/instance-sets?pageSize=500')).toBe(400);
  });

  it('refuses a second set of the same name for one owner with 409', async () => {
    const res = await owner.request('/api/instance-sets', json('POST', { name: 'Lantern Yard public' }));
    expect(res.status).toBe(409);
  });

  it('lets a maintainer delete a map of someone else, taking its scenarios along', async () => {
    await setRole(lib, curatorId.login, 'maintainer');
    const mapId = privateFiles.maps[0].id;
    expect(await status(curator, `/api/maps/${mapId}`, { method: 'DELETE' })).toBe(204);
    expect(await status(owner, `/api/maps/${mapId}`)).toBe(404);
    expect(await status(owner, `/api/scenarios/${privateFiles.scenarios[0].id}`)).toBe(404);
  });

  it('lets the owner delete a set, and then it is gone for everyone', async () => {
    expect(await status(owner, `/api/instance-sets/${privateSet}`, { method: 'DELETE' })).toBe(204);
    expect(await status(owner, `/api/instance-sets/${privateSet}`)).toBe(404);
    expect(await status(curator, `/api/instance-sets/${privateSet}`)).toBe(404);
  });

  it('lets a maintainer delete a public set of someone else', async () => {
    expect(await status(curator, `/api/instance-sets/${publicSet}`, { method: 'DELETE' })).toBe(204);
    expect(await listNames(visitor)).not.toContain('Lantern Yard public');
  });
});
