/**
 * One backward/forward sweep with current summation on a radial tree in breadth-first
 * order (Shirmohammadi, Hong, Semlyen, Luo, IEEE Trans. Power Systems 3(2), 1988; the
 * ladder technique in Kersting, Distribution System Modeling and Analysis).
 *
 * Bus 0 is the slack; bus k > 0 hangs from parent[k] < k through tree branch k − 1 with
 * series impedance z (pu, `to` side) behind an ideal complex ratio a (V' = V_parent / a).
 * Backward: the current into bus k is its own draw plus what its children take, seen
 * through their ratios (I_from = I / conj(a)). Forward: V_k = V_parent / a − z·J_k.
 * Allocation-free; every array is owned by the caller.
 *
 * @returns the largest change of a bus voltage magnitude-wise, |V_new − V_old|, pu.
 */
export function sweepBalanced(
  n: number,
  parent: Int32Array,
  zRe: Float64Array,
  zIm: Float64Array,
  aRe: Float64Array,
  aIm: Float64Array,
  drawRe: Float64Array,
  drawIm: Float64Array,
  vRe: Float64Array,
  vIm: Float64Array,
  jRe: Float64Array,
  jIm: Float64Array,
  accRe: Float64Array,
  accIm: Float64Array,
): number {
  for (let k = 0; k < n; k++) {
    accRe[k] = drawRe[k]!;
    accIm[k] = drawIm[k]!;
  }
  // Backward: branch k − 1 carries everything bus k and its subtree draw.
  for (let k = n - 1; k > 0; k--) {
    const b = k - 1;
    const cr = accRe[k]!, ci = accIm[k]!;
    jRe[b] = cr;
    jIm[b] = ci;
    // I_from = J / conj(a) = J·a / |a|².
    const ar = aRe[b]!, ai = aIm[b]!;
    const m = ar * ar + ai * ai;
    const p = parent[k]!;
    accRe[p] = accRe[p]! + (cr * ar - ci * ai) / m;
    accIm[p] = accIm[p]! + (cr * ai + ci * ar) / m;
  }
  // Forward: V_k = V_parent·conj(a)/|a|² − z·J.
  let change = 0;
  for (let k = 1; k < n; k++) {
    const b = k - 1;
    const p = parent[k]!;
    const ar = aRe[b]!, ai = aIm[b]!;
    const m = ar * ar + ai * ai;
    const pr = vRe[p]!, pi = vIm[p]!;
    const jr = jRe[b]!, ji = jIm[b]!;
    const zr = zRe[b]!, zi = zIm[b]!;
    const nr = (pr * ar + pi * ai) / m - (zr * jr - zi * ji);
    const ni = (pi * ar - pr * ai) / m - (zr * ji + zi * jr);
    const dr = nr - vRe[k]!, di = ni - vIm[k]!;
    const d = dr * dr + di * di;
    if (d > change) change = d;
    vRe[k] = nr;
    vIm[k] = ni;
  }
  return Math.sqrt(change);
}
