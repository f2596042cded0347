/**
 * Downloads of files named outside ASCII (issue 13, item 7): `地图.map` used to answer 500 (Node
 * refuses header characters above U+00FF) and `café.map` came out garbled (one Latin-1 byte). Every
 * download names its file as RFC 6266 §4.3 advises: `filename` with an ASCII fallback and
 * `filename*` (RFC 8187, formerly RFC 5987) with the UTF-8 name percent-encoded.
 */
import type { UploadResponse } from '@shared/instance-sets';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { createSet, datasetBytes, signInAs, startLibraryServer, upload, type LibraryServer, type SignedInClient } from './instance-library-support';

const [researcherId] = DEMO_IDENTITIES;

/** The name a browser takes from a Content-Disposition header: filename* when present (RFC 6266 §4.3). */
function downloadName(header: string): string | undefined {
  const extended = /;\s*filename\*=UTF-8''([^;]+)/i.exec(header);
  if (extended) return decodeURIComponent(extended[1]);
  return /;\s*filename="([^"]*)"/.exec(header)?.[1];
}

describe('downloads of files named outside ASCII', () => {
  let lib: LibraryServer;
  let owner: SignedInClient;
  let stored: UploadResponse;
  const mapBytes = datasetBytes('empty-8-8.map');
  // The same scenario, pointed at the map's new name (a scenario names its map in its second column).
  const scenBytes = Buffer.from(datasetBytes('empty-8-8-even-1.scen').toString('utf8').split('\tempty-8-8.map\t').join('\t地图.map\t'), 'utf8');

  beforeAll(async () => {
    lib = await startLibraryServer();
    owner = await signInAs(lib.server.url, researcherId.login);
    const setId = await createSet(owner, 'names outside ascii');
    const res = await upload(lib.server.url, owner, setId, [
      { name: '地图.map', bytes: mapBytes },
      { name: 'café.map', bytes: mapBytes },
      { name: 'café «1».scen', bytes: scenBytes },
    ]);
    expect(res.status).toBe(201);
    stored = res.body as UploadResponse;
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  const download = (kind: 'maps' | 'scenarios', id: number) =>
    fetch(`${lib.server.url}/api/${kind}/${id}/download`, { headers: { cookie: owner.jar.header() } });

  it('stores the names as uploaded', () => {
    expect(stored.maps.map((m) => m.name).sort()).toEqual(['café.map', '地图.map']);
    expect(stored.scenarios.map((s) => s.name)).toEqual(['café «1».scen']);
  });

  it.each([
    ['maps', '地图.map', "attachment; filename=\"__.map\"; filename*=UTF-8''%E5%9C%B0%E5%9B%BE.map"],
    ['maps', 'café.map', "attachment; filename=\"cafe.map\"; filename*=UTF-8''caf%C3%A9.map"],
    ['scenarios', 'café «1».scen', "attachment; filename=\"cafe _1_.scen\"; filename*=UTF-8''caf%C3%A9%20%C2%AB1%C2%BB.scen"],
  ] as const)('downloads %s/%s with 200, its bytes and its name in filename*', async (kind, name, header) => {
    const file = (kind === 'maps' ? stored.maps : stored.scenarios).find((f) => f.name === name);
    const res = await download(kind, file?.id ?? 0);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toBe(header);
    expect(downloadName(header)).toBe(name);
    expect(Buffer.from(await res.arrayBuffer()).equals(kind === 'maps' ? mapBytes : scenBytes)).toBe(true);
  });
});
