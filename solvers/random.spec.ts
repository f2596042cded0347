import { createRng } from './random';

describe('createRng', () => {
  it('repeats the same stream for the same seed', () => {
    const a = createRng(42);
    const b = createRng(42);
    const xs = Array.from({ length: 100 }, () => a.next());
    expect(Array.from({ length: 100 }, () => b.next())).toEqual(xs);
  });

  it('gives different streams for neighbouring seeds', () => {
    expect(createRng(1).next()).not.toEqual(createRng(2).next());
  });

  it('stays in [0, 1) with a mean near 1/2 and int() in range', () => {
    const rng = createRng(7);
    let sum = 0;
    for (let i = 0; i < 20000; i++) {
      const x = rng.next();
      expect(x >= 0 && x < 1).toBe(true);
      sum += x;
      const k = rng.int(5);
      expect(Number.isInteger(k) && k >= 0 && k < 5).toBe(true);
    }
    expect(Math.abs(sum / 20000 - 0.5)).toBeLessThan(0.01);
  });

  it('draws normal deviates with mean 0 and variance 1', () => {
    const rng = createRng(3);
    const n = 40000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      s += z;
      s2 += z * z;
    }
    expect(Math.abs(s / n)).toBeLessThan(0.02);
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.03);
  });
});
