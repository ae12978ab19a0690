/**
 * Thevenin admittances of every bus of a tree network in O(n): one pass from the leaves
 * up (the admittance of each subtree to earth, seen from its root) and one pass down (the
 * admittance of the rest of the network, seen up through each bus's branch). Buses in
 * breadth-first order, parent[k] < k, tree branch k − 1 joining bus k to parent[k]; series
 * impedances per branch and shunt admittances to earth per bus, per unit, complex as
 * (re, im) pairs. An open branch (a winding that blocks zero-sequence current) has an
 * impedance that is not finite.
 *
 * With yTot = ySub + yUp, the Thevenin impedance of bus k is 1/yTot[k] (not finite where
 * yTot is zero: a bus with no path to earth). A fault current I at bus k arrives
 * yUp[k]/yTot[k] of it through the bus's own branch and yBranch[c]/yTot[k] of it up
 * through the branch of each child c, where yBranch[c] = 1/(z_c + 1/ySub[c]) is the
 * admittance of child c's branch and subtree together. Current divider identities of a
 * tree (common practice); checked against the inverse of the full admittance matrix in
 * tests.
 */

export interface TreeThevenin {
  readonly ySubRe: Float64Array;
  readonly ySubIm: Float64Array;
  readonly yUpRe: Float64Array;
  readonly yUpIm: Float64Array;
  /** Admittance of each bus's own branch with its subtree, seen from the parent (0 at bus 0). */
  readonly yBranchRe: Float64Array;
  readonly yBranchIm: Float64Array;
  /** Thevenin impedance per bus (Infinity where the bus has no path to earth). */
  readonly zthRe: Float64Array;
  readonly zthIm: Float64Array;
}

/** Admittances below this (relative to 1 pu) count as no path. */
const NO_PATH = 1e-15;

export function solveTreeThevenin(
  n: number,
  parent: Int32Array,
  zRe: Float64Array,
  zIm: Float64Array,
  yShRe: Float64Array,
  yShIm: Float64Array,
): TreeThevenin {
  const ySubRe = Float64Array.from(yShRe.subarray(0, n));
  const ySubIm = Float64Array.from(yShIm.subarray(0, n));
  const yUpRe = new Float64Array(n), yUpIm = new Float64Array(n);
  const yBrRe = new Float64Array(n), yBrIm = new Float64Array(n);
  const zthRe = new Float64Array(n), zthIm = new Float64Array(n);
  // Up: subtree admittances, leaves first.
  for (let k = n - 1; k > 0; k--) {
    const zr = zRe[k - 1]!, zi = zIm[k - 1]!;
    const sr = ySubRe[k]!, si = ySubIm[k]!;
    const s2 = sr * sr + si * si;
    if (!Number.isFinite(zr) || !Number.isFinite(zi) || s2 < NO_PATH * NO_PATH) continue;
    // y = 1 / (z + 1/ySub)
    const ar = zr + sr / s2, ai = zi - si / s2;
    const a2 = ar * ar + ai * ai;
    if (a2 === 0) continue; // a short to earth through a zero impedance: not a network case
    yBrRe[k] = ar / a2;
    yBrIm[k] = -ai / a2;
    const p = parent[k]!;
    ySubRe[p] = ySubRe[p]! + yBrRe[k]!;
    ySubIm[p] = ySubIm[p]! + yBrIm[k]!;
  }
  // Down: the rest of the network seen up through each branch.
  for (let k = 0; k < n; k++) {
    if (k > 0) {
      const p = parent[k]!;
      const zr = zRe[k - 1]!, zi = zIm[k - 1]!;
      // Admittance at the parent without this child's branch.
      const rr = ySubRe[p]! + yUpRe[p]! - yBrRe[k]!, ri = ySubIm[p]! + yUpIm[p]! - yBrIm[k]!;
      const r2 = rr * rr + ri * ri;
      if (Number.isFinite(zr) && Number.isFinite(zi) && r2 >= NO_PATH * NO_PATH) {
        const ar = zr + rr / r2, ai = zi - ri / r2;
        const a2 = ar * ar + ai * ai;
        if (a2 > 0) {
          yUpRe[k] = ar / a2;
          yUpIm[k] = -ai / a2;
        }
      }
    }
    const tr = ySubRe[k]! + yUpRe[k]!, ti = ySubIm[k]! + yUpIm[k]!;
    const t2 = tr * tr + ti * ti;
    if (t2 < NO_PATH * NO_PATH) {
      zthRe[k] = Infinity;
      zthIm[k] = Infinity;
    } else {
      zthRe[k] = tr / t2;
      zthIm[k] = -ti / t2;
    }
  }
  return { ySubRe, ySubIm, yUpRe, yUpIm, yBranchRe: yBrRe, yBranchIm: yBrIm, zthRe, zthIm };
}
