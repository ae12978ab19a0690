/** Number formatting helpers of the synthetic fleet writer. */

export function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** Three significant digits. */
export function sig3(x: number): number {
  return Number(x.toPrecision(3));
}

export const pad = (k: number, width: number) => String(k).padStart(width, "0");
