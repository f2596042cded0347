/**
 * k-delay conflict detection against the independent k-robust validator (solvers/validate, no
 * shared code): on random walks of two agents, a conflict is found exactly when the validator
 * rejects the pair; and every reported window holds both occupancies it was built from.
 */
import { gridFromText } from '../grid/grid';
import { createRng } from '../random';
import { validateKRobustPlan } from '../validate/k-robust';
import type { Conflict } from './conflict';
import { findKDelayConflicts, K_RANGE } from './range-conflicts';

const grid = gridFromText('....\n....\n....');
const identity = Int32Array.from({ length: 12 }, (_, i) => i);

function walk(rng: ReturnType<typeof createRng>, start: number, steps: number): number[] {
  const path = [start];
  for (let t = 0; t < steps; t++) {
    const c = path[path.length - 1];
    const x = c % 4;
    const options = [c, ...[c - 4, c + 4].filter((n) => n >= 0 && n < 12), ...(x > 0 ? [c - 1] : []), ...(x < 3 ? [c + 1] : [])];
    path.push(options[rng.int(options.length)]);
  }
  // Trim at the last arrival (the engine's path form): drop trailing waits.
  while (path.length > 1 && path[path.length - 1] === path[path.length - 2]) path.pop();
  return path;
}

describe('findKDelayConflicts', () => {
  it('finds a conflict exactly when the independent validator rejects the two paths, for k = 1…4', () => {
    const rng = createRng(99);
    let conflicting = 0;
    let clean = 0;
    for (let trial = 0; trial < 600; trial++) {
      const k = 1 + (trial % 4);
      const a = walk(rng, rng.int(12), rng.int(7));
      const b = walk(rng, rng.int(12), rng.int(7));
      if (a[0] === b[0] || a[a.length - 1] === b[b.length - 1]) continue;
      const inst = { grid, agents: [{ start: a[0], goal: a[a.length - 1] }, { start: b[0], goal: b[b.length - 1] }] };
      const out: Conflict[] = [];
      findKDelayConflicts(identity, k, 0, Int32Array.from(a), 1, Int32Array.from(b), out);
      const verdict = validateKRobustPlan(inst, [a, b], k);
      expect(out.length > 0).toBe(!verdict.ok);
      if (out.length > 0) conflicting++;
      else clean++;
      const at = (p: number[], t: number) => p[Math.min(t, p.length - 1)];
      for (const c of out) {
        expect(c.kind).toBe(K_RANGE);
        const [c1] = c.constraints1!;
        expect(c1.t1 - c1.t0).toBe(k);
        // Both agents are in the cell somewhere inside the window (so each child forbids its current path).
        const inWindow = (p: number[]) => Array.from({ length: k + 1 }, (_, d) => at(p, c1.t0 + d)).includes(c.cell);
        expect(inWindow(a)).toBe(true);
        expect(inWindow(b)).toBe(true);
      }
    }
    expect(conflicting).toBeGreaterThan(50);
    expect(clean).toBeGreaterThan(20);
  });
});
