import { ownedBytes, prepareUpload, transferableJob, type ExistingMapRows } from './prepare-upload';

const MAP = 'type octile\nheight 2\nwidth 3\nmap\n..@\n...\n';
const SCEN = 'version 1\n0\tsmall.map\t3\t2\t0\t0\t1\t1\t1.41421356\n';
const file = (name: string, text: string) => ({ name, bytes: Buffer.from(text, 'utf8') });
const NONE = { mapNames: [], scenarioNames: [] };

describe('prepareUpload', () => {
  it('gives the stored forms: cells text, rows as JSON, sizes and the bytes as sent', async () => {
    const out = await prepareUpload({ files: [file('small.map', MAP), file('small-1.scen', SCEN)], ...NONE }, async () => []);
    if (out.kind !== 'ready') throw new Error(JSON.stringify(out));
    expect(out.maps.map((m) => [m.name, m.width, m.height, m.passableCount, Buffer.from(m.cells).toString()])).toEqual([['small.map', 3, 2, 5, '..@\n...']]);
    expect(Buffer.from(out.maps[0].original).toString()).toBe(MAP);
    expect(out.scenarios.map((s) => [s.mapName, s.rowCount, s.maxAgents, JSON.parse(Buffer.from(s.rows).toString())])).toEqual([
      ['small.map', 1, 1, [[0, 0, 0, 1, 1, 1.41421356]]],
    ]);
  });

  it('asks for a stored map only when a scenario names one the upload does not carry', async () => {
    const asked: string[][] = [];
    const loadMaps = async (names: readonly string[]): Promise<ExistingMapRows[]> => {
      asked.push([...names]);
      return [{ name: 'small.map', type: 'octile', cells: '..@\n...' }];
    };
    await prepareUpload({ files: [file('small.map', MAP), file('a.scen', SCEN)], mapNames: ['small.map'], scenarioNames: [] }, loadMaps);
    expect(asked).toEqual([]);
    const out = await prepareUpload({ files: [file('a.scen', SCEN)], mapNames: ['small.map'], scenarioNames: [] }, loadMaps);
    expect(asked).toEqual([['small.map']]);
    expect(out.kind).toBe('ready');
  });

  it('refuses with every problem and prepares nothing', async () => {
    const out = await prepareUpload({ files: [file('small.map', MAP), file('bad.scen', 'version 1\n0\tsmall.map\t3\t2\t2\t0\t0\t1\t1\n')], ...NONE }, async () => []);
    expect(out).toEqual({ kind: 'refused', problems: [expect.objectContaining({ file: 'bad.scen', line: 2 })] });
  });
});

describe('transferable bytes', () => {
  it('copies a slice of a shared buffer and keeps a buffer it owns', () => {
    const whole = new Uint8Array(16);
    expect(ownedBytes(whole)).toBe(whole);
    const slice = Buffer.from('small');
    expect(slice.byteLength).toBeLessThan(slice.buffer.byteLength);
    const owned = ownedBytes(slice);
    expect(owned.byteLength).toBe(owned.buffer.byteLength);
    expect(Buffer.from(owned).toString()).toBe('small');
  });

  it('lists each buffer once, copying a file sent twice so each owns its own', () => {
    const big = new Uint8Array(8192);
    const { job, transferList } = transferableJob({ files: [{ name: 'a.map', bytes: big }, { name: 'b.map', bytes: big }], ...NONE });
    expect(job.files[0].bytes.buffer).not.toBe(job.files[1].bytes.buffer);
    expect(transferList).toHaveLength(2);
  });
});
