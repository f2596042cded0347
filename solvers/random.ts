/**
 * The one seeded random number generator of the solvers: sfc32 (Chris Doty-Humphrey's Small
 * Fast Counting generator, public domain, from the PractRand suite), seeded through
 * splitmix32 so that nearby seeds give unrelated streams. Deterministic across platforms.
 */

/** A seeded stream of pseudo-random numbers. */
export interface Rng {
  /** A float in [0, 1). */
  next(): number;
  /** An integer in [0, n). */
  int(n: number): number;
  /** A standard normal deviate (Box–Muller). */
  normal(): number;
}

/** Creates a generator from a 32-bit integer seed (other numbers are truncated to 32 bits). */
export function createRng(seed: number): Rng {
  let s = seed >>> 0;
  const splitmix = (): number => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let a = splitmix();
  let b = splitmix();
  let c = splitmix();
  let d = splitmix();
  const nextU32 = (): number => {
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = ((c << 21) | (c >>> 11)) >>> 0;
    c = (c + t) >>> 0;
    return t;
  };
  for (let i = 0; i < 12; i++) nextU32();
  let spare: number | undefined;
  const next = (): number => nextU32() / 4294967296;
  return {
    next,
    int: (n) => Math.floor(next() * n),
    normal: () => {
      if (spare !== undefined) {
        const v = spare;
        spare = undefined;
        return v;
      }
      let u = 0;
      while (u === 0) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
  };
}
