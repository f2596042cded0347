/**
 * The repository's benchmark files are the published ones, byte for byte: every file listed in SHA256SUMS exists
 * and hashes to its listed value (the list was taken from the published files; sources in the README beside them),
 * and nothing else sits in the folder unlisted.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR, openBenchmarkPath } from './open-grid-benchmarks';

const listed = readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, 'SHA256SUMS'), 'utf8')
  .split('\n').filter((line) => line.trim() !== '')
  .map((line) => { const [hash, name] = line.split(/\s+\*?/); return { hash, name }; });

describe('open grid benchmarks in the repository', () => {
  it('lists the 8 maps and 41 scenario files the README names', () => {
    expect(listed.filter((f) => f.name.endsWith('.map'))).toHaveLength(8);
    expect(listed.filter((f) => f.name.endsWith('.scen'))).toHaveLength(41);
  });

  it('holds every listed file unchanged', () => {
    let compared = 0;
    for (const { hash, name } of listed) {
      const digest = createHash('sha256').update(readFileSync(openBenchmarkPath(name))).digest('hex');
      expect({ name, digest }).toEqual({ name, digest: hash });
      compared++;
    }
    expect(compared).toBe(49);
  });

  it('holds no unlisted map or scenario file (no game maps)', () => {
    const onDisk = readdirSync(OPEN_GRID_BENCHMARKS_DIR).filter((f) => /\.(map|scen)$/.test(f)).sort();
    expect(onDisk).toEqual(listed.map((f) => f.name).sort());
    expect(onDisk.some((f) => f.startsWith('den'))).toBe(false);
  });

  it('fails loudly on a missing file', () => {
    expect(() => openBenchmarkPath('no-such-map.map')).toThrow(/open grid benchmark file missing/);
  });
});
