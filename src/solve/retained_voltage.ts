/**
 * The positive-sequence voltage left at every bus of a radial feeder during a fault at bus k
 * (the short-circuit study's model, IEC 60909-0 equivalent source c at the fault): V1 = c −
 * Z1(:,k)·I1 + Z1·J, with I1 the fault's positive-sequence current (three-phase: c'/Z1kk;
 * line-to-earth: c'/(Z1kk + Z2kk + Z0kk)) and J the converters' injections, phased as the
 * study adds them, and c the fault bus's voltage factor (the pre-fault voltage everywhere).
 * Reported as a share of c — the fraction of the pre-fault voltage a generator or motor there
 * still sees. Two O(n) tree passes per fault.
 */
import { magnitude } from "../model/magnitude.ts";
import type { FaultModel } from "./fault_branch_currents.ts";
import { treeColumn, treeSolve } from "./tree_column.ts";

export interface RetainedScratch {
  readonly colRe: Float64Array;
  readonly colIm: Float64Array;
  readonly jRe: Float64Array;
  readonly jIm: Float64Array;
  readonly zjRe: Float64Array;
  readonly zjIm: Float64Array;
}

export function retainedScratch(n: number): RetainedScratch {
  const f = () => new Float64Array(n);
  return { colRe: f(), colIm: f(), jRe: f(), jIm: f(), zjRe: f(), zjIm: f() };
}

/** Writes |V1| / c of every bus into `out` for a fault of `type` at bus k. */
export function retainedVoltages(
  m: FaultModel,
  k: number,
  type: "three_phase" | "line_to_earth",
  s: RetainedScratch,
  out: Float64Array,
): void {
  const { form, nets, t1, t2, t0 } = m;
  const n = form.nBus;
  s.jRe.fill(0);
  s.jIm.fill(0);
  let source = nets.c[k]!;
  m.converterColumns.forEach((col, i) => {
    const z = magnitude(col.re[k]!, col.im[k]!);
    if (z === 0) return;
    const bus = nets.converterBus[i]!, mag = nets.converterIPu[i]!;
    s.jRe[bus] = s.jRe[bus]! + mag * col.re[k]! / z;
    s.jIm[bus] = s.jIm[bus]! - mag * col.im[k]! / z;
    source += z * mag;
  });
  let zr = t1.zthRe[k]!, zi = t1.zthIm[k]!;
  if (type === "line_to_earth" && Number.isFinite(t0.zthRe[k]!)) {
    zr += t2.zthRe[k]! + t0.zthRe[k]!;
    zi += t2.zthIm[k]! + t0.zthIm[k]!;
  }
  const z2 = zr * zr + zi * zi;
  const i1r = source * zr / z2, i1i = -source * zi / z2;
  treeColumn(form.parent, t1, nets.z1Re, nets.z1Im, k, s.colRe, s.colIm);
  s.zjRe.fill(0);
  s.zjIm.fill(0);
  if (m.converterColumns.length > 0) {
    treeSolve(form.parent, t1, nets.z1Re, nets.z1Im, s.jRe, s.jIm, s.zjRe, s.zjIm);
  }
  const c = nets.c[k]!;
  for (let i = 0; i < n; i++) {
    const vr = c - (s.colRe[i]! * i1r - s.colIm[i]! * i1i) + s.zjRe[i]!;
    const vi = -(s.colRe[i]! * i1i + s.colIm[i]! * i1r) + s.zjIm[i]!;
    out[i] = Math.min(magnitude(vr, vi) / c, 1);
  }
}
