/**
 * Seeded pseudo-random numbers for reproducible Monte Carlo runs: xoshiro128**
 * (Blackman & Vigna, "Scrambled linear pseudorandom number generators", 2018),
 * seeded through splitmix32; normals by the Box-Muller transform.
 */
export interface Rng {
  /** uniform on [0, 1) */
  next(): number;
  /** standard normal */
  normal(): number;
}

export function xoshiro128ss(seed: number): Rng {
  let x = seed >>> 0;
  const split = () => {
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let a = split();
  let b = split();
  let c = split();
  let d = split();
  const u32 = () => {
    const r = Math.imul(((Math.imul(b, 5) << 7) | (Math.imul(b, 5) >>> 25)) >>> 0, 9) >>> 0;
    const t = (b << 9) >>> 0;
    c ^= a;
    d ^= b;
    b ^= c;
    a ^= d;
    c ^= t;
    d = ((d << 11) | (d >>> 21)) >>> 0;
    return r;
  };
  // the second normal of a Box-Muller pair, kept for the next call (a number and a flag: one shape)
  let spare = 0;
  let hasSpare = false;
  const next = () => (u32() * 2 ** 21 + (u32() >>> 11)) / 2 ** 53;
  return {
    next,
    normal() {
      if (hasSpare) {
        hasSpare = false;
        return spare;
      }
      let u = next();
      while (u <= 0) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      hasSpare = true;
      return r * Math.cos(2 * Math.PI * v);
    },
  };
}
