/** Seeded random numbers for synthetic fleets (no Math.random: every fleet is repeatable). */

// ---------------------------------------------------------------------------------------
// Seeded random numbers

/** Mixes two 32-bit words into one (a multiply–xorshift finaliser). */
export function hash32(a: number, b: number): number {
  let h = Math.imul(a ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(b + 0x7f4a7c15, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x7feb352d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x846ca68b);
  h ^= h >>> 16;
  return h >>> 0;
}

export type Random = () => number;

/** A small 32-bit generator (mulberry32 style), uniform in [0, 1). */
export function makeRandom(seed32: number): Random {
  let s = seed32 >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = Math.imul(s ^ (s >>> 15), 1 | s);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export const uniform = (rnd: Random, lo: number, hi: number) => lo + (hi - lo) * rnd();

export function gaussian(rnd: Random): number {
  const u = 1 - rnd();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rnd());
}
