import { createRng } from '../random';
import { BinaryHeap, type HeapItem } from './binary-heap';
import { IndexHeap } from './index-heap';

describe('IndexHeap', () => {
  it('pops ids in key order (ties by smaller id) under random pushes and decrease-keys', () => {
    const rng = createRng(5);
    const heap = new IndexHeap();
    const keys = new Map<number, number>();
    const popped: [number, number][] = [];
    for (let step = 0; step < 5000; step++) {
      if (rng.next() < 0.6 || keys.size === 0) {
        const id = rng.int(3000);
        const key = rng.int(200);
        heap.push(id, key);
        const old = keys.get(id);
        if (old === undefined || key < old) keys.set(id, key);
      } else {
        const id = heap.pop();
        const best = [...keys.entries()].sort((a, b) => a[1] - b[1] || a[0] - b[0])[0];
        expect([id, keys.get(id)]).toEqual(best);
        keys.delete(id);
        popped.push(best);
      }
      expect(heap.size).toBe(keys.size);
    }
    expect(popped.length).toBeGreaterThan(1000);
  });

  it('ignores a push with a larger key for an id already inside and reports membership', () => {
    const heap = new IndexHeap();
    heap.push(7, 3);
    heap.push(7, 9);
    expect(heap.has(7)).toBe(true);
    expect(heap.peekKey()).toBe(3);
    expect(heap.pop()).toBe(7);
    expect(heap.has(7)).toBe(false);
    expect(heap.pop()).toBe(-1);
  });
});

describe('BinaryHeap', () => {
  it('pops items in comparator order and keeps their slots', () => {
    interface Item extends HeapItem { v: number; id: number }
    const heap = new BinaryHeap<Item>((a, b) => a.v < b.v || (a.v === b.v && a.id < b.id));
    const rng = createRng(9);
    const items: Item[] = Array.from({ length: 500 }, (_, id) => ({ v: rng.int(50), id, heapIndex: -1 }));
    items.forEach((it) => heap.push(it));
    for (const it of heap.values()) expect(heap.values()[it.heapIndex]).toBe(it);
    const order = items.slice().sort((a, b) => a.v - b.v || a.id - b.id);
    for (const expected of order) expect(heap.pop()).toBe(expected);
    expect(heap.pop()).toBeUndefined();
  });
});
