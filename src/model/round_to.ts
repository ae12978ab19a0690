/** Rounding of figures for the result files: `digits` decimals, and never a negative zero. */
export function roundTo(v: number, digits: number): number {
  const f = 10 ** digits;
  const r = Math.round(v * f) / f;
  return Object.is(r, -0) ? 0 : r;
}
