/**
 * Uploading to the instance library against a real PostgreSQL: the open benchmark files as
 * plain files and as a zip, byte-for-byte downloads, and every refusal (broken files with line
 * and column, unknown maps, zip bombs, path traversal, size limits) storing nothing.
 */
import { createHash } from 'node:crypto';
import type { MapDetail, ScenarioDetail, UploadProblem, UploadResponse } from '@shared/instance-sets';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { loadInstance } from '../../api/src/instance-sets/load-instance';
import {
  buildZip, createSet, datasetBytes, datasetFiles, signInAs, startLibraryServer, upload,
  type LibraryServer, type SignedInClient, type UploadFile,
} from './instance-library-support';

const [researcherId] = DEMO_IDENTITIES;
const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const asFile = (name: string): UploadFile => ({ name, bytes: datasetBytes(name) });
const text = (s: string): Buffer => Buffer.from(s, 'utf8');

describe('instance library uploads', () => {
  let lib: LibraryServer;
  let owner: SignedInClient;
  let url: string;

  beforeAll(async () => {
    lib = await startLibraryServer();
    url = lib.server.url;
    owner = await signInAs(url, researcherId.login);
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  const counts = async () => (await lib.sql<{ maps: number; scenarios: number }>(
    'SELECT (SELECT count(*) FROM maps)::int AS maps, (SELECT count(*) FROM scenarios)::int AS scenarios'))[0];
  const problemsOf = (body: unknown): UploadProblem[] => (body as { error: { details: UploadProblem[] } }).error.details;

  describe('the open benchmark files', () => {
    let setId: number;
    let stored: UploadResponse;

    beforeAll(async () => {
      setId = await createSet(owner, 'benchmarks as files');
      const res = await upload(url, owner, setId, datasetFiles().map(asFile));
      expect(res.status).toBe(201);
      stored = res.body as UploadResponse;
    }, 60_000);

    it('stores all 8 maps and 41 scenarios of the dataset, each scenario on its own map', () => {
      // The dataset README lists 8 maps and 41 scenarios (source: benchmarks/datasets/grid-benchmarks/README.md).
      expect(stored.maps.map((m) => m.name)).toEqual(datasetFiles().filter((f) => f.endsWith('.map')));
      expect(stored.scenarios).toHaveLength(41);
      const mapName = new Map(stored.maps.map((m) => [m.id, m.name]));
      for (const s of stored.scenarios) {
        // The dataset's naming: <map>-even-N.scen / <map>-random-N.scen belong to <map>.map.
        expect(mapName.get(s.mapId)).toBe(s.name.replace(/-(even|random)-\d+\.scen$/, '.map'));
      }
    });

    it('records sizes, free cells and sha256 checksums computed from the files themselves', () => {
      for (const m of stored.maps) {
        const raw = datasetBytes(m.name).toString('utf8');
        const [w, h] = [/width (\d+)/.exec(raw)?.[1], /height (\d+)/.exec(raw)?.[1]].map(Number);
        const body = raw.split('\n').slice(4).join('');
        const free = [...body].filter((ch) => ch === '.' || ch === 'G' || ch === 'S').length;
        expect({ name: m.name, width: m.width, height: m.height, passable: m.passableCount, checksum: m.checksum, size: m.byteSize })
          .toEqual({ name: m.name, width: w, height: h, passable: free, checksum: sha256(datasetBytes(m.name)), size: datasetBytes(m.name).length });
      }
    });

    it('downloads every map and scenario byte for byte as uploaded', async () => {
      for (const f of [...stored.maps.map((m) => ['maps', m] as const), ...stored.scenarios.map((s) => ['scenarios', s] as const)]) {
        const [kind, file] = f;
        const res = await fetch(`${url}/api/${kind}/${file.id}/download`, { headers: { cookie: owner.jar.header() } });
        expect(res.status).toBe(200);
        expect(res.headers.get('content-disposition')).toBe(`attachment; filename="${file.name}"`);
        expect(Buffer.from(await res.arrayBuffer()).equals(datasetBytes(file.name))).toBe(true);
      }
    });

    it('serves a map with its rows exactly as the file has them, and its scenarios', async () => {
      const m = stored.maps.find((x) => x.name === 'room-32-32-4.map');
      const res = await owner.request(`/api/maps/${m?.id}`);
      const detail = (await res.json()) as MapDetail;
      const fileRows = datasetBytes('room-32-32-4.map').toString('utf8').trimEnd().split('\n').slice(4);
      expect(detail.rows).toEqual(fileRows);
      expect(detail.scenarios.map((s) => s.name)).toEqual([1, 2, 3, 4, 5].map((i) => `room-32-32-4-even-${i}.scen`));
    });

    it('serves scenario rows as the file lists them', async () => {
      const s = stored.scenarios.find((x) => x.name === 'empty-8-8-even-1.scen');
      const detail = (await (await owner.request(`/api/scenarios/${s?.id}`)).json()) as ScenarioDetail;
      const lines = datasetBytes('empty-8-8-even-1.scen').toString('utf8').trimEnd().split('\n').slice(1);
      expect(detail.rowCount).toBe(lines.length);
      expect(detail.mapName).toBe('empty-8-8.map');
      const [b, , , , sx, sy, gx, gy, len] = lines[1].split('\t');
      expect(detail.rows[1]).toEqual({ bucket: Number(b), start: [Number(sx), Number(sy)], goal: [Number(gx), Number(gy)], optimalLength: Number(len) });
    });

    it('builds an instance from the first k rows with loadInstance', async () => {
      const s = stored.scenarios.find((x) => x.name === 'random-32-32-20-even-1.scen');
      const loaded = await loadInstance(lib.server.app.context.models, s?.id ?? 0, 7);
      // Cells by hand from the file's own columns: index = y * width + x (solvers/grid/grid.ts).
      const rows = datasetBytes('random-32-32-20-even-1.scen').toString('utf8').split('\n').slice(1, 8).map((l) => l.split('\t').map(Number));
      expect(loaded.instance.agents).toEqual(rows.map((r) => ({ start: r[5] * 32 + r[4], goal: r[7] * 32 + r[6] })));
      expect(loaded.mapName).toBe('random-32-32-20.map');
      await expect(loadInstance(lib.server.app.context.models, s?.id ?? 0, 100_000)).rejects.toMatchObject({ status: 400 });
    });

    it('stores the same files from a zip (with a folder, a README and a directory entry) with the same checksums', async () => {
      const zipSet = await createSet(owner, 'benchmarks as zip');
      const zip = await buildZip([
        { name: 'grid/', bytes: Buffer.alloc(0) },
        { name: 'grid/README.md', bytes: datasetBytes('README.md') },
        ...datasetFiles().map((n) => ({ name: `grid/${n}`, bytes: datasetBytes(n) })),
      ]);
      const res = await upload(url, owner, zipSet, [{ name: 'grid-benchmarks.zip', bytes: zip }]);
      expect(res.status).toBe(201);
      const body = res.body as UploadResponse;
      expect(body.skipped).toEqual(['grid/README.md']);
      const checksums = (r: UploadResponse) => [...r.maps, ...r.scenarios].map((f) => `${f.name} ${f.checksum}`).sort();
      expect(checksums(body)).toEqual(checksums(stored));
    });

    it('lets a later upload add a scenario for a map already in the set', async () => {
      const extra = datasetBytes('empty-8-8-even-1.scen');
      const res = await upload(url, owner, setId, [{ name: 'empty-8-8-extra.scen', bytes: extra }]);
      expect(res.status).toBe(201);
      expect((res.body as UploadResponse).scenarios[0].mapId).toBe(stored.maps.find((m) => m.name === 'empty-8-8.map')?.id);
    });

    it('refuses a file whose name the set already holds', async () => {
      const before = await counts();
      const res = await upload(url, owner, setId, [asFile('empty-8-8.map')]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)).toEqual([expect.objectContaining({ file: 'empty-8-8.map', message: expect.stringMatching(/already holds a map/) })]);
      expect(await counts()).toEqual(before);
    });
  });

  describe('refusals', () => {
    let setId: number;
    beforeAll(async () => {
      setId = await createSet(owner, 'refusals');
    });

    it('refuses a broken map with its line and column and stores none of the upload', async () => {
      const before = await counts();
      // Row 3 of the body is line 7 (four header lines); column 5 gets a character that is no terrain.
      const lines = datasetBytes('empty-8-8.map').toString('utf8').split('\n');
      lines[6] = '....x...';
      const res = await upload(url, owner, setId, [
        { name: 'broken.map', bytes: text(lines.join('\n')) },
        asFile('empty-16-16.map'),
        asFile('empty-16-16-even-1.scen'),
      ]);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('INVALID_INSTANCE_FILES');
      expect(problemsOf(res.body)).toEqual([{ file: 'broken.map', line: 7, column: 5, message: expect.stringMatching(/unexpected character 'x'/) }]);
      expect(res.body.error.message).toMatch(/broken\.map:7:5/);
      expect(await counts()).toEqual(before);
    });

    it('lists every problem of every file, by file, line and column', async () => {
      const scen = datasetBytes('empty-8-8-even-1.scen').toString('utf8').split('\n');
      scen[3] = scen[3].replace(/^\d+\t/, 'x\t');
      const res = await upload(url, owner, setId, [
        asFile('empty-8-8.map'),
        { name: 'bad-rows.scen', bytes: text(scen.join('\n')) },
        { name: 'no-header.map', bytes: text('type octile\nheight 2\nwidth 2\nmap\n..\n.') },
      ]);
      expect(res.status).toBe(400);
      const problems = problemsOf(res.body);
      expect(problems).toEqual(expect.arrayContaining([
        { file: 'bad-rows.scen', line: 4, column: 1, message: "bucket 'x' is not a whole number" },
        { file: 'no-header.map', line: 6, column: 2, message: expect.stringMatching(/this map row has 1 cell, expected 2/) },
      ]));
    });

    it('refuses a scenario whose map is neither in the set nor in the upload', async () => {
      const before = await counts();
      const res = await upload(url, owner, setId, [asFile('maze-32-32-2-even-1.scen')]);
      expect(res.status).toBe(400);
      // map_file is the second field of line 2, after the one-character bucket and a tab.
      expect(problemsOf(res.body)).toEqual([{ file: 'maze-32-32-2-even-1.scen', line: 2, column: 3, message: expect.stringMatching(/names no map of this set/) }]);
      expect(await counts()).toEqual(before);
    });

    it('refuses a scenario whose rows do not fit the map it names', async () => {
      // A scenario of the 16 × 16 map relabelled for the 8 × 8 one: sizes differ.
      const scen = datasetBytes('empty-16-16-even-1.scen').toString('utf8').replace(/empty-16-16\.map/g, 'empty-8-8.map');
      const res = await upload(url, owner, setId, [asFile('empty-8-8.map'), { name: 'misfit.scen', bytes: text(scen) }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)[0]).toMatchObject({ file: 'misfit.scen', line: 2, message: expect.stringMatching(/map_width 16 does not match the map \(width 8\)/) });
    });

    it('refuses a map over 1024 cells a side before reading its rows', async () => {
      const res = await upload(url, owner, setId, [{ name: 'huge.map', bytes: text('type octile\nheight 4\nwidth 2000\nmap\n') }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)).toEqual([{ file: 'huge.map', line: 3, column: 7, message: 'width 2000 is over the limit of 1024 cells a side' }]);
    });

    it('refuses a file over 8 MB with 413', async () => {
      const res = await upload(url, owner, setId, [{ name: 'big.map', bytes: Buffer.alloc(8 * 1024 * 1024 + 1, 46) }]);
      expect(res.status).toBe(413);
      expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
    });

    it('refuses files of other kinds and names with folders or parent segments', async () => {
      // fetch's FormData keeps the file name as given (supertest's form-data would shorten it).
      const form = new FormData();
      // Plain-ArrayBuffer copies: DOM's Blob typing refuses a Buffer (it may view a SharedArrayBuffer).
      form.append('files', new Blob([new Uint8Array(text('hello'))]), 'notes.txt');
      form.append('files', new Blob([new Uint8Array(datasetBytes('empty-8-8.map'))]), '../escape.map');
      const res = await owner.request(`/api/instance-sets/${setId}/files`, { method: 'POST', body: form });
      expect(res.status).toBe(400);
      expect(problemsOf(await res.json()).map((p) => [p.file, p.message])).toEqual([
        ['notes.txt', expect.stringMatching(/only \.map and \.scen/)],
        ['../escape.map', expect.stringMatching(/climbs out of its folder/)],
      ]);
    });

    it('refuses an archive entry that climbs out with ..', async () => {
      // yazl itself refuses '..' names, so the zip is built with a same-length name and patched.
      const zip = await buildZip([{ name: 'xx/evil.map', bytes: datasetBytes('empty-8-8.map') }, asFile('empty-16-16.map')]);
      const patched = Buffer.from(zip.toString('latin1').split('xx/evil.map').join('../evil.map'), 'latin1');
      const before = await counts();
      const res = await upload(url, owner, setId, [{ name: 'sly.zip', bytes: patched }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)).toEqual([{ file: 'sly.zip', line: 0, column: 0, message: expect.stringMatching(/entry '\.\.\/evil\.map' is refused/) }]);
      expect(await counts()).toEqual(before);
    });

    it('refuses a zip bomb: entries that inflate past 64 MB in all', async () => {
      // Nine entries of 7.5 MB of dots each: each under the 8 MB file limit, 67.5 MB in all.
      const dots = Buffer.alloc(7.5 * 1024 * 1024, 46);
      const zip = await buildZip(Array.from({ length: 9 }, (_, i) => ({ name: `dots-${i}.map`, bytes: dots })));
      expect(zip.length).toBeLessThan(1024 * 1024);
      const res = await upload(url, owner, setId, [{ name: 'bomb.zip', bytes: zip }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)).toEqual(expect.arrayContaining([
        { file: 'bomb.zip', line: 0, column: 0, message: expect.stringMatching(/expands to more than 67108864 bytes/) },
      ]));
    }, 30_000);

    it('refuses an archive with more than 1000 entries', async () => {
      const zip = await buildZip(Array.from({ length: 1001 }, (_, i) => ({ name: `e${i}.txt`, bytes: text('x') })));
      const res = await upload(url, owner, setId, [{ name: 'many.zip', bytes: zip }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)).toEqual([{ file: 'many.zip', line: 0, column: 0, message: 'the archive holds more than 1000 entries' }]);
    });

    it('refuses a file named .zip that is no archive', async () => {
      const res = await upload(url, owner, setId, [{ name: 'fake.zip', bytes: text('not a zip') }]);
      expect(res.status).toBe(400);
      expect(problemsOf(res.body)[0]).toMatchObject({ file: 'fake.zip', message: expect.stringMatching(/not a readable zip archive/) });
    });

    it('refuses an upload without the CSRF header', async () => {
      const res = await upload(url, owner, setId, [asFile('empty-8-8.map')]).set('x-csrf-token', 'wrong-token-wrong-token-wrong-token');
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('CSRF_REJECTED');
    });
  });
});
