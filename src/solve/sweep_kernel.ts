/**
 * One backward/forward sweep with current summation on a radial tree in breadth-first
 * order (Shirmohammadi, Hong, Semlyen, Luo, IEEE Trans. Power Systems 3(2), 1988; the
 * ladder technique in Kersting, Distribution System Modeling and Analysis).
 *
 * Bus 0 is the slack; bus k > 0 hangs from parent[k] < k through tree branch k − 1 with
 * series impedance z (pu, `to` side) behind an ideal complex ratio a. The kernel takes
 * g = 1/conj(a) = a/|a|² per branch (see ratioFactors): the current a branch draws from
 * its parent is g·J, and the voltage behind its ratio is V_parent/a = conj(g)·V_parent.
 * Backward: J_k = draw_k + Σ children g·J. Forward: V_k = conj(g)·V_parent − z·J_k.
 * `hasRatio` marks the branches with a ratio (transformers); the others skip the product.
 * Allocation-free; every array is owned by the caller.
 *
 * @returns the largest change of a bus voltage, |V_new − V_old|, pu.
 */
export function sweepBalanced(
  n: number,
  parent: Int32Array,
  zRe: Float64Array,
  zIm: Float64Array,
  gRe: Float64Array,
  gIm: Float64Array,
  hasRatio: Uint8Array,
  drawRe: Float64Array,
  drawIm: Float64Array,
  vRe: Float64Array,
  vIm: Float64Array,
  jRe: Float64Array,
  jIm: Float64Array,
  accRe: Float64Array,
  accIm: Float64Array,
): number {
  accRe.set(drawRe);
  accIm.set(drawIm);
  for (let k = n - 1; k > 0; k--) {
    const b = k - 1;
    const cr = accRe[k]!, ci = accIm[k]!;
    jRe[b] = cr;
    jIm[b] = ci;
    const p = parent[k]!;
    if (hasRatio[b] === 0) {
      accRe[p] = accRe[p]! + cr;
      accIm[p] = accIm[p]! + ci;
    } else {
      const gr = gRe[b]!, gi = gIm[b]!;
      accRe[p] = accRe[p]! + cr * gr - ci * gi;
      accIm[p] = accIm[p]! + cr * gi + ci * gr;
    }
  }
  let change = 0;
  for (let k = 1; k < n; k++) {
    const b = k - 1;
    const p = parent[k]!;
    let pr = vRe[p]!, pi = vIm[p]!;
    if (hasRatio[b] !== 0) {
      const gr = gRe[b]!, gi = gIm[b]!;
      const r = pr * gr + pi * gi;
      pi = pi * gr - pr * gi;
      pr = r;
    }
    const jr = jRe[b]!, ji = jIm[b]!;
    const zr = zRe[b]!, zi = zIm[b]!;
    const nr = pr - (zr * jr - zi * ji);
    const ni = pi - (zr * ji + zi * jr);
    const dr = nr - vRe[k]!, di = ni - vIm[k]!;
    const d = dr * dr + di * di;
    if (d > change) change = d;
    vRe[k] = nr;
    vIm[k] = ni;
  }
  return Math.sqrt(change);
}

/**
 * g = 1/conj(a) = a/|a|² for each branch, the form sweepBalanced takes ratios in, and the
 * flag of branches whose ratio is not exactly 1 (within 1e-15).
 */
export function ratioFactors(
  aRe: Float64Array,
  aIm: Float64Array,
  gRe: Float64Array,
  gIm: Float64Array,
  hasRatio: Uint8Array,
): void {
  for (let b = 0; b < aRe.length; b++) {
    const ar = aRe[b]!, ai = aIm[b]!, m = ar * ar + ai * ai;
    gRe[b] = ar / m;
    gIm[b] = ai / m;
    hasRatio[b] = Math.abs(ar - 1) > 1e-15 || Math.abs(ai) > 1e-15 ? 1 : 0;
  }
}
