/**
 * One column of the bus impedance matrix of a tree network in O(n), from its Thevenin pass
 * (tree_thevenin.ts): the voltage at every bus for a unit current injected at bus j. It
 * starts at Zth[j] and walks out with the voltage divider of each branch: up the path to
 * the source (at each parent, the rest of the network is yTot − yBranch of the child it
 * came from), then down every other subtree (a child sees its own subtree ySub). A bus
 * cut off by an open branch gets zero.
 */
import { magnitude } from "../model/magnitude.ts";
import type { TreeThevenin } from "./tree_thevenin.ts";

export function treeColumn(
  parent: Int32Array,
  t: TreeThevenin,
  zRe: Float64Array,
  zIm: Float64Array,
  j: number,
  outRe: Float64Array,
  outIm: Float64Array,
): void {
  const n = t.zthRe.length;
  const seen = new Uint8Array(n);
  outRe.fill(0, 0, n);
  outIm.fill(0, 0, n);
  if (!Number.isFinite(t.zthRe[j]!)) return; // no path to earth: no voltage anywhere
  outRe[j] = t.zthRe[j]!;
  outIm[j] = t.zthIm[j]!;
  seen[j] = 1;
  for (let k = j; k > 0;) {
    const p = parent[k]!;
    const yr = t.ySubRe[p]! + t.yUpRe[p]! - t.yBranchRe[k]!,
      yi = t.ySubIm[p]! + t.yUpIm[p]! - t.yBranchIm[k]!;
    divide(outRe, outIm, k, p, zRe[k - 1]!, zIm[k - 1]!, yr, yi);
    seen[p] = 1;
    k = p;
  }
  for (let k = 1; k < n; k++) {
    if (seen[k]) continue;
    const p = parent[k]!;
    divide(outRe, outIm, p, k, zRe[k - 1]!, zIm[k - 1]!, t.ySubRe[k]!, t.ySubIm[k]!);
    seen[k] = 1;
  }
}

/** v[to] = v[from] · (1/y)/(z + 1/y) = v[from] / (1 + z·y); zero across an open branch. */
function divide(
  vRe: Float64Array,
  vIm: Float64Array,
  from: number,
  to: number,
  zr: number,
  zi: number,
  yr: number,
  yi: number,
): void {
  if (!Number.isFinite(zr) || !Number.isFinite(zi)) {
    vRe[to] = 0;
    vIm[to] = 0;
    return;
  }
  const dr = 1 + zr * yr - zi * yi, di = zr * yi + zi * yr;
  const d2 = dr * dr + di * di;
  vRe[to] = (vRe[from]! * dr + vIm[from]! * di) / d2;
  vIm[to] = (vIm[from]! * dr - vRe[from]! * di) / d2;
}

/**
 * Σj |Zkj|·Ij for every bus k at once, in O(n): |Zkj| is |Zth,j| times the magnitudes of
 * the voltage dividers along the path from j to k (each depends only on the branch and the
 * direction it is crossed in), so the sums follow from one pass up (what reaches each bus
 * from its own subtree) and one down (what reaches it from outside).
 */
export function transferMagnitudeSums(
  parent: Int32Array,
  t: TreeThevenin,
  zRe: Float64Array,
  zIm: Float64Array,
  bus: Int32Array,
  current: Float64Array,
): Float64Array {
  const n = t.zthRe.length;
  const up = new Float64Array(n), down = new Float64Array(n);
  const fUp = new Float64Array(n), fDown = new Float64Array(n);
  for (let i = 0; i < bus.length; i++) {
    const j = bus[i]!;
    if (Number.isFinite(t.zthRe[j]!)) {
      up[j] = up[j]! + current[i]! * magnitude(t.zthRe[j]!, t.zthIm[j]!);
    }
  }
  for (let k = 1; k < n; k++) {
    const p = parent[k]!, zr = zRe[k - 1]!, zi = zIm[k - 1]!;
    if (!Number.isFinite(zr) || !Number.isFinite(zi)) continue; // open: factors stay 0
    const yr = t.ySubRe[p]! + t.yUpRe[p]! - t.yBranchRe[k]!,
      yi = t.ySubIm[p]! + t.yUpIm[p]! - t.yBranchIm[k]!;
    fUp[k] = 1 / magnitude(1 + zr * yr - zi * yi, zr * yi + zi * yr);
    const sr = t.ySubRe[k]!, si = t.ySubIm[k]!;
    fDown[k] = 1 / magnitude(1 + zr * sr - zi * si, zr * si + zi * sr);
  }
  for (let k = n - 1; k > 0; k--) up[parent[k]!] = up[parent[k]!]! + up[k]! * fUp[k]!;
  for (let k = 1; k < n; k++) {
    const p = parent[k]!;
    down[k] = (down[p]! + up[p]! - up[k]! * fUp[k]!) * fDown[k]!;
  }
  for (let k = 0; k < n; k++) up[k] = up[k]! + down[k]!;
  return up;
}

/**
 * Bus voltages v = Z·J for current injections J at any buses of a tree, in O(n): the
 * injections gathered from the leaves up (a subtree passes J/(1 + z·ySub) to its parent),
 * the root's voltage from its total, then down each branch
 * v_child = (v_parent + z·Jsub) / (1 + z·ySub). Equal to Σj Z(:,j)·Jj without forming a
 * column per injection.
 */
export function treeSolve(
  parent: Int32Array,
  t: TreeThevenin,
  zRe: Float64Array,
  zIm: Float64Array,
  jRe: Float64Array,
  jIm: Float64Array,
  outRe: Float64Array,
  outIm: Float64Array,
): void {
  const n = t.zthRe.length;
  const aRe = Float64Array.from(jRe.subarray(0, n)), aIm = Float64Array.from(jIm.subarray(0, n));
  // Up: each subtree's injections, passed to its parent through the branch divider.
  for (let k = n - 1; k > 0; k--) {
    const zr = zRe[k - 1]!, zi = zIm[k - 1]!;
    if (!Number.isFinite(zr) || !Number.isFinite(zi)) continue;
    const dr = 1 + zr * t.ySubRe[k]! - zi * t.ySubIm[k]!,
      di = zr * t.ySubIm[k]! + zi * t.ySubRe[k]!;
    const d2 = dr * dr + di * di, p = parent[k]!;
    aRe[p] = aRe[p]! + (aRe[k]! * dr + aIm[k]! * di) / d2;
    aIm[p] = aIm[p]! + (aIm[k]! * dr - aRe[k]! * di) / d2;
  }
  const s0 = t.ySubRe[0]! ** 2 + t.ySubIm[0]! ** 2;
  outRe[0] = s0 > 0 ? (aRe[0]! * t.ySubRe[0]! + aIm[0]! * t.ySubIm[0]!) / s0 : 0;
  outIm[0] = s0 > 0 ? (aIm[0]! * t.ySubRe[0]! - aRe[0]! * t.ySubIm[0]!) / s0 : 0;
  // Down: v_k = (v_parent + z·A_k) / (1 + z·ySub_k).
  for (let k = 1; k < n; k++) {
    const zr = zRe[k - 1]!, zi = zIm[k - 1]!, sr = t.ySubRe[k]!, si = t.ySubIm[k]!;
    if (!Number.isFinite(zr) || !Number.isFinite(zi)) {
      const s2 = sr * sr + si * si;
      outRe[k] = s2 > 0 ? (aRe[k]! * sr + aIm[k]! * si) / s2 : 0;
      outIm[k] = s2 > 0 ? (aIm[k]! * sr - aRe[k]! * si) / s2 : 0;
      continue;
    }
    const p = parent[k]!;
    const nr = outRe[p]! + zr * aRe[k]! - zi * aIm[k]!,
      ni = outIm[p]! + zr * aIm[k]! + zi * aRe[k]!;
    const dr = 1 + zr * sr - zi * si, di = zr * si + zi * sr, d2 = dr * dr + di * di;
    outRe[k] = (nr * dr + ni * di) / d2;
    outIm[k] = (ni * dr - nr * di) / d2;
  }
}
