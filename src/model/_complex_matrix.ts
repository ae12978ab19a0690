/**
 * Small dense complex matrix kernels: row-major n×n, real and imaginary parts in separate
 * Float64Arrays. Meant for the few-by-few matrices of line models (phases plus neutrals), so
 * they favour clarity over blocking; neither kernel allocates inside its loops.
 *
 * @module
 */

/** Relative size below which a pivot counts as zero (singular to working precision). */
const PIVOT_TOLERANCE = 1e-13;

function maxAbsEntry(count: number, re: Float64Array, im: Float64Array): number {
  let scale = 0;
  for (let k = 0; k < count; k++) {
    const magnitude = Math.hypot(re[k]!, im[k]!);
    if (magnitude > scale) scale = magnitude;
  }
  return scale;
}

/**
 * Inverts the n×n complex matrix (aRe, aIm) into (outRe, outIm) by Gauss–Jordan elimination
 * with partial pivoting. The inputs are left unchanged; the outputs must not alias them.
 *
 * @returns `true` on success; `false` if a pivot is below 1e-13 times the largest entry
 *   (singular to working precision), in which case the outputs hold no meaningful values.
 */
export function invertComplexMatrix(
  n: number,
  aRe: Float64Array,
  aIm: Float64Array,
  outRe: Float64Array,
  outIm: Float64Array,
): boolean {
  const count = n * n;
  const wRe = aRe.slice(0, count);
  const wIm = aIm.slice(0, count);
  outRe.fill(0, 0, count);
  outIm.fill(0, 0, count);
  for (let i = 0; i < n; i++) outRe[i * n + i] = 1;
  const threshold = PIVOT_TOLERANCE * maxAbsEntry(count, wRe, wIm);
  if (!(threshold > 0)) return false;

  for (let col = 0; col < n; col++) {
    let pivotRow = col;
    let pivotMagnitude = Math.hypot(wRe[col * n + col]!, wIm[col * n + col]!);
    for (let row = col + 1; row < n; row++) {
      const magnitude = Math.hypot(wRe[row * n + col]!, wIm[row * n + col]!);
      if (magnitude > pivotMagnitude) {
        pivotMagnitude = magnitude;
        pivotRow = row;
      }
    }
    if (!(pivotMagnitude > threshold)) return false;
    if (pivotRow !== col) {
      for (let k = 0; k < n; k++) {
        swap(wRe, col * n + k, pivotRow * n + k);
        swap(wIm, col * n + k, pivotRow * n + k);
        swap(outRe, col * n + k, pivotRow * n + k);
        swap(outIm, col * n + k, pivotRow * n + k);
      }
    }
    // Scale the pivot row by 1 / pivot.
    const pRe = wRe[col * n + col]!;
    const pIm = wIm[col * n + col]!;
    const denominator = pRe * pRe + pIm * pIm;
    const invRe = pRe / denominator;
    const invIm = -pIm / denominator;
    for (let k = 0; k < n; k++) {
      const idx = col * n + k;
      const wr = wRe[idx]!;
      const wi = wIm[idx]!;
      wRe[idx] = wr * invRe - wi * invIm;
      wIm[idx] = wr * invIm + wi * invRe;
      const or = outRe[idx]!;
      const oi = outIm[idx]!;
      outRe[idx] = or * invRe - oi * invIm;
      outIm[idx] = or * invIm + oi * invRe;
    }
    // Eliminate the column from every other row.
    for (let row = 0; row < n; row++) {
      if (row === col) continue;
      const fRe = wRe[row * n + col]!;
      const fIm = wIm[row * n + col]!;
      for (let k = 0; k < n; k++) {
        const src = col * n + k;
        const dst = row * n + k;
        const wr = wRe[src]!;
        const wi = wIm[src]!;
        wRe[dst] = wRe[dst]! - (fRe * wr - fIm * wi);
        wIm[dst] = wIm[dst]! - (fRe * wi + fIm * wr);
        const or = outRe[src]!;
        const oi = outIm[src]!;
        outRe[dst] = outRe[dst]! - (fRe * or - fIm * oi);
        outIm[dst] = outIm[dst]! - (fRe * oi + fIm * or);
      }
    }
  }
  return true;
}

/**
 * Kron reduction: eliminates the last `n − keep` rows and columns of the n×n complex matrix
 * (aRe, aIm), writing the keep×keep Schur complement `Z_kk − Z_ke · Z_ee⁻¹ · Z_ek` into
 * (outRe, outIm). Eliminates one index at a time from the last, dividing by the current
 * diagonal without pivoting, which is sound for the matrices of line models (their
 * Hermitian part is positive definite, and so is that of every intermediate complement).
 * The inputs are left unchanged.
 *
 * @returns `true` on success; `false` if a diagonal pivot is below 1e-13 times the largest
 *   entry, in which case the outputs hold no meaningful values.
 */
export function reduceKron(
  n: number,
  keep: number,
  aRe: Float64Array,
  aIm: Float64Array,
  outRe: Float64Array,
  outIm: Float64Array,
): boolean {
  const count = n * n;
  const wRe = aRe.slice(0, count);
  const wIm = aIm.slice(0, count);
  const threshold = PIVOT_TOLERANCE * maxAbsEntry(count, wRe, wIm);
  for (let e = n - 1; e >= keep; e--) {
    const pRe = wRe[e * n + e]!;
    const pIm = wIm[e * n + e]!;
    if (!(Math.hypot(pRe, pIm) > threshold)) return false;
    const denominator = pRe * pRe + pIm * pIm;
    const invRe = pRe / denominator;
    const invIm = -pIm / denominator;
    for (let i = 0; i < e; i++) {
      // f = Z_ie / Z_ee
      const ieRe = wRe[i * n + e]!;
      const ieIm = wIm[i * n + e]!;
      const fRe = ieRe * invRe - ieIm * invIm;
      const fIm = ieRe * invIm + ieIm * invRe;
      for (let j = 0; j < e; j++) {
        const ejRe = wRe[e * n + j]!;
        const ejIm = wIm[e * n + j]!;
        const dst = i * n + j;
        wRe[dst] = wRe[dst]! - (fRe * ejRe - fIm * ejIm);
        wIm[dst] = wIm[dst]! - (fRe * ejIm + fIm * ejRe);
      }
    }
  }
  for (let i = 0; i < keep; i++) {
    for (let j = 0; j < keep; j++) {
      outRe[i * keep + j] = wRe[i * n + j]!;
      outIm[i * keep + j] = wIm[i * n + j]!;
    }
  }
  return true;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}
