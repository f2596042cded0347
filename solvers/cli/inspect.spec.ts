/// <reference types="node" />
/**
 * Runs the inspect CLI as a user would (a child process) on the open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, read in place; Sturtevant 2012 and Stern et al. 2019,
 * see the dataset README) and on broken files of our own.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const ROOT = resolve(__dirname, '../..');
const DATASET = OPEN_GRID_BENCHMARKS_DIR;
// The local tsx binary is what `npx tsx` resolves to; calling it directly skips npx's start-up.
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const inspect = (...files: string[]) => {
  const run = spawnSync(TSX, ['solvers/cli/inspect.ts', ...files], { cwd: ROOT, encoding: 'utf8' });
  return { status: run.status, stderr: run.stderr, out: run.stdout ? JSON.parse(run.stdout) : undefined };
};

describe('npm run inspect', () => {
  let temp: string;
  beforeAll(() => {
    temp = mkdtempSync(join(tmpdir(), 'qt-inspect-'));
  });
  afterAll(() => rmSync(temp, { recursive: true, force: true }));

  it('reports every dataset map and scenario as ok and exits 0', () => {
    const files = readdirSync(DATASET).filter((f) => /\.(map|scen)$/.test(f)).sort().map((f) => join(DATASET, f));
    const { status, out } = inspect(...files);
    expect(status).toBe(0);
    expect(out).toHaveLength(files.length);
    expect(out.every((r: { ok: boolean; errors: unknown[] }) => r.ok && r.errors.length === 0)).toBe(true);
    expect(files).toHaveLength(49);
    // Values read off the dataset files themselves: the warehouse map is 161 wide, 63 high with 5699 '.' cells,
    // and its even-1 scenario has 450 rows.
    expect(out.find((r: { file: string }) => r.file.endsWith('warehouse-10-20-10-2-1.map'))).toEqual({
      file: join(DATASET, 'warehouse-10-20-10-2-1.map'), kind: 'map', ok: true, width: 161, height: 63, passable: 5699, errors: [],
    });
    expect(out.find((r: { file: string }) => r.file.endsWith('warehouse-10-20-10-2-1-even-1.scen'))).toEqual({
      file: join(DATASET, 'warehouse-10-20-10-2-1-even-1.scen'), kind: 'scenario', ok: true, width: 161, height: 63, rows: 450, errors: [],
    });
  });

  it('reports broken files with line and column, a missing map and a missing file, and exits 1', () => {
    const badMap = join(temp, 'bad.map');
    writeFileSync(badMap, 'type octile\nheight 2\nwidth 3\nmap\n...\n.#.\n');
    const orphan = join(temp, 'orphan.scen');
    writeFileSync(orphan, 'version 1\n0\tnowhere.map\t3\t2\t0\t0\t2\t0\t2\n');
    const { status, out } = inspect(badMap, orphan, join(temp, 'absent.map'), join(DATASET, 'empty-8-8.map'));
    expect(status).toBe(1);
    expect(out.map((r: { ok: boolean }) => r.ok)).toEqual([false, false, false, true]);
    expect(out[0]).toEqual({
      file: badMap, kind: 'map', ok: false, width: null, height: null, passable: null,
      errors: [{ line: 6, column: 2, message: "unexpected character '#' (expected one of . G S @ O T W)" }],
    });
    expect(out[1]).toMatchObject({ kind: 'scenario', ok: false, rows: 1, width: null, height: null });
    expect(out[1].errors[0]).toMatchObject({ line: 2, column: 3, message: expect.stringMatching(/^map_file 'nowhere.map' was not found beside the scenario/) });
    expect(out[2].errors).toEqual([{ line: 0, column: 0, message: 'the file does not exist' }]);
  });

  it('checks a scenario against the map beside it', () => {
    writeFileSync(join(temp, 'pair.map'), 'type octile\nheight 2\nwidth 3\nmap\n...\n.@.\n');
    const scen = join(temp, 'pair.scen');
    writeFileSync(scen, 'version 1\n0\tpair.map\t3\t2\t0\t0\t1\t1\t1.41421356\n');
    const { status, out } = inspect(scen);
    expect(status).toBe(1);
    expect(out[0]).toEqual({
      file: scen, kind: 'scenario', ok: false, width: 3, height: 2, rows: 1,
      errors: [{ line: 2, column: 20, message: "goal (1, 1) is a blocked cell ('@') of the map" }],
    });
  });

  it('prints usage and exits 2 without files', () => {
    const run = spawnSync(TSX, ['solvers/cli/inspect.ts'], { cwd: ROOT, encoding: 'utf8' });
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/usage/);
  });
});
