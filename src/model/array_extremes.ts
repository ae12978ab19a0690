/** Smallest and largest value of a numeric array without spreading it into arguments. */

export function arrayMax(xs: ArrayLike<number>, start = -Infinity): number {
  let m = start;
  for (let i = 0; i < xs.length; i++) if (xs[i]! > m) m = xs[i]!;
  return m;
}

export function arrayMin(xs: ArrayLike<number>, start = Infinity): number {
  let m = start;
  for (let i = 0; i < xs.length; i++) if (xs[i]! < m) m = xs[i]!;
  return m;
}

/** Largest absolute value. */
export function arrayMaxAbs(xs: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < xs.length; i++) {
    const a = Math.abs(xs[i]!);
    if (a > m) m = a;
  }
  return m;
}
