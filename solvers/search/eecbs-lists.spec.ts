// Checks the EECBS node lists (eecbs-lists.ts) against a brute-force scan of the open nodes:
// LB is the least open lower bound, and the node chosen obeys the selection rule of Li, Ruml,
// Koenig (AAAI 2021), also when a selected node comes back with raised figures (tightened or
// bypassed), which leaves stale entries in the heaps.
import { createRng } from '../random';
import { EecbsLists, type EecbsNode } from './eecbs-lists';
import { boundOf } from './suboptimality';

interface TestNode extends EecbsNode {
  d: number;
}

describe('EecbsLists', () => {
  it('keeps LB the least open lower bound and selects by the EECBS rule through re-pushes with raised figures', () => {
    // Arrange: seeded pushes, selections, and re-pushes of selected nodes with a higher lower bound.
    const rng = createRng(77);
    const w = 1.2;
    const lists = new EecbsLists<TestNode>(w, (n) => n.d);
    const open = new Set<TestNode>();
    const closed: TestNode[] = [];
    let nextId = 0;
    const push = (n: TestNode): void => {
      lists.push(n);
      open.add(n);
    };
    let selections = 0;
    let repushed = 0;
    let fromCleanup = 0;
    for (let step = 0; step < 3000; step++) {
      const r = rng.next();
      if (r < 0.45 || open.size === 0) {
        const fLb = 1000 + rng.int(400);
        const g = fLb + rng.int(300);
        push({ id: nextId++, g, fLb, fHat: g + rng.int(100), d: rng.int(12), version: 0, isClosed: false });
      } else if (r < 0.6 && closed.length > 0) {
        // A selected node comes back with raised figures, as tighten and bypass do.
        const n = closed.splice(rng.int(closed.length), 1)[0];
        n.fLb += 1 + rng.int(200);
        n.g = Math.max(n.g, n.fLb);
        n.fHat = n.g + rng.int(100);
        n.d = rng.int(12);
        push(n);
        repushed++;
      } else {
        // Act
        const pick = lists.select();
        // Assert: LB, and the chosen node against the rule applied to every open node.
        const all = [...open];
        const lb = Math.min(...all.map((n) => n.fLb));
        expect(pick).not.toBeNull();
        if (pick === null) return;
        expect(pick.lowerBound).toBe(lb);
        expect(open.has(pick.node)).toBe(true);
        const bound = boundOf(lb, w);
        if (pick.source === 'cleanup') {
          expect(pick.node.fLb).toBe(lb);
          fromCleanup++;
        } else {
          expect(pick.node.g).toBeLessThanOrEqual(bound);
        }
        if (pick.source === 'open') expect(pick.node.fHat).toBe(Math.min(...all.map((n) => n.fHat)));
        open.delete(pick.node);
        closed.push(pick.node);
        selections++;
      }
    }
    expect(selections).toBeGreaterThan(800);
    expect(repushed).toBeGreaterThan(200);
    expect(fromCleanup).toBeGreaterThan(10);
  });
});
