/**
 * The current through every branch of a radial feeder, and its direction, for one fault at
 * one bus (the short-circuit study's maximum or minimum condition): what the protection
 * study needs for every device and every fault position. Computed on demand, O(n) per
 * fault, from the Thevenin pass of each sequence network.
 *
 * The equivalent-source method: the only source is c·Un/√3 at the fault; the network
 * feeder and the machines are their impedances to earth. Converters inject
 * Jj = Isk,j·e^(−j·arg Z(1)kj), the phase that makes their contribution at the fault add in
 * magnitude (IEC 60909-0:2016's conservative sum); the fault current is
 * I = (c + Σ|Z(1)kj|·Isk,j) / Zk. The bus voltages are ΔV = Z·J − Z(:,k)·I, from columns of
 * the impedance matrix (tree_column.ts); the current into each branch's subtree is what its
 * shunts (y·ΔV) and the fault draw, minus what its converters inject — summed from the
 * leaves, so closed switching devices (no impedance) need no special case.
 */
import { magnitude } from "../model/magnitude.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import type { FaultSettings } from "./fault_settings.ts";
import {
  buildSequenceNetworks,
  type FaultCondition,
  type SequenceNetworks,
} from "./_fault_networks.ts";
import { solveTreeThevenin, type TreeThevenin } from "./tree_thevenin.ts";
import { treeColumn, treeSolve } from "./tree_column.ts";

export interface FaultModel {
  readonly form: FeederForm;
  readonly nets: SequenceNetworks;
  readonly t1: TreeThevenin;
  readonly t2: TreeThevenin;
  readonly t0: TreeThevenin;
  /** Positive-sequence impedance column of each converter's bus. */
  readonly converterColumns: readonly { re: Float64Array; im: Float64Array }[];
}

export interface BranchFaultCurrents {
  /** The fault current at the fault bus, kA (phase current of the faulted phase). */
  readonly faultKa: number;
  /** Per tree branch (index k − 1 for bus k): magnitude in kA at the branch's far bus. */
  readonly iKa: Float64Array;
  /** +1 away from the source (towards the branch's far bus), −1 towards it, 0 no current. */
  readonly direction: Int8Array;
  /** Residual current 3·I0 per tree branch, kA (zero for a three-phase fault). */
  readonly residualKa: Float64Array;
}

/** The fault model of a radial feeder for one condition; null for a meshed feeder. */
export function prepareFaultModel(
  form: FeederForm,
  s: FaultSettings,
  lvMaxKv: number,
  condition: FaultCondition,
): FaultModel | null {
  const n = form.nBus;
  if (form.nBranch !== n - 1) return null;
  const nets = buildSequenceNetworks(form, condition, s, lvMaxKv);
  const t1 = solveTreeThevenin(n, form.parent, nets.z1Re, nets.z1Im, nets.y1Re, nets.y1Im);
  const t2 = solveTreeThevenin(n, form.parent, nets.z1Re, nets.z1Im, nets.y2Re, nets.y2Im);
  const t0 = solveTreeThevenin(n, form.parent, nets.z0Re, nets.z0Im, nets.y0Re, nets.y0Im);
  const converterColumns = [...nets.converterBus].map((j) => {
    const re = new Float64Array(n), im = new Float64Array(n);
    treeColumn(form.parent, t1, nets.z1Re, nets.z1Im, j, re, im);
    return { re, im };
  });
  return { form, nets, t1, t2, t0, converterColumns };
}

export function branchCurrentsForFault(
  m: FaultModel,
  k: number,
  type: "three_phase" | "line_to_earth",
): BranchFaultCurrents {
  const { form, nets, t1, t2, t0 } = m;
  const n = form.nBus;
  // Converter injections in the phase that adds their effect at k in magnitude.
  const jRe = new Float64Array(n), jIm = new Float64Array(n);
  let source = nets.c[k]!;
  m.converterColumns.forEach((col, i) => {
    const z = magnitude(col.re[k]!, col.im[k]!);
    if (z === 0) return;
    const bus = nets.converterBus[i]!, mag = nets.converterIPu[i]!;
    jRe[bus] = jRe[bus]! + mag * col.re[k]! / z;
    jIm[bus] = jIm[bus]! - mag * col.im[k]! / z;
    source += z * mag;
  });
  // Sequence current at the fault: I1 (and I2 = I0 = I1 for a line-to-earth fault).
  let zr = t1.zthRe[k]!, zi = t1.zthIm[k]!;
  const earth = type === "line_to_earth" && Number.isFinite(t0.zthRe[k]!);
  if (earth) {
    zr += t2.zthRe[k]! + t0.zthRe[k]!;
    zi += t2.zthIm[k]! + t0.zthIm[k]!;
  }
  const z2 = zr * zr + zi * zi;
  const i1r = source * zr / z2, i1i = -source * zi / z2;
  const outRe = new Float64Array(n), outIm = new Float64Array(n);
  const col = new Float64Array(n), colIm = new Float64Array(n);
  // Positive sequence: ΔV = Z·J − Z(:,k)·I1; subtree draw = y·ΔV − J (+ I1 at k).
  // Z·J in one tree solve, however many converters there are.
  const v1Re = new Float64Array(n), v1Im = new Float64Array(n);
  if (m.converterColumns.length > 0) {
    treeSolve(form.parent, t1, nets.z1Re, nets.z1Im, jRe, jIm, v1Re, v1Im);
  }
  addSequence(
    form.parent,
    t1,
    nets.z1Re,
    nets.z1Im,
    nets.y1Re,
    nets.y1Im,
    k,
    i1r,
    i1i,
    v1Re,
    v1Im,
    jRe,
    jIm,
    col,
    colIm,
    outRe,
    outIm,
  );
  const resRe = new Float64Array(n), resIm = new Float64Array(n);
  if (earth) {
    const zero = new Float64Array(n);
    const seq = (
      t: TreeThevenin,
      z: readonly [Float64Array, Float64Array],
      y: readonly [Float64Array, Float64Array],
      re: Float64Array,
      im: Float64Array,
    ) =>
      addSequence(
        form.parent,
        t,
        z[0],
        z[1],
        y[0],
        y[1],
        k,
        i1r,
        i1i,
        new Float64Array(n),
        new Float64Array(n),
        zero,
        zero,
        col,
        colIm,
        re,
        im,
      );
    seq(t2, [nets.z1Re, nets.z1Im], [nets.y2Re, nets.y2Im], outRe, outIm);
    seq(t0, [nets.z0Re, nets.z0Im], [nets.y0Re, nets.y0Im], outRe, outIm);
    // The zero sequence alone, for the residual current 3·I0 earth elements measure.
    seq(t0, [nets.z0Re, nets.z0Im], [nets.y0Re, nets.y0Im], resRe, resIm);
  }
  const iKa = new Float64Array(Math.max(0, n - 1));
  const residualKa = new Float64Array(Math.max(0, n - 1));
  const direction = new Int8Array(Math.max(0, n - 1));
  const scale = magnitude(i1r, i1i) * 1e-9;
  for (let b = 1; b < n; b++) {
    const mag = magnitude(outRe[b]!, outIm[b]!);
    iKa[b - 1] = mag / (Math.sqrt(3) * form.vnKv[b]!);
    residualKa[b - 1] = 3 * magnitude(resRe[b]!, resIm[b]!) / (Math.sqrt(3) * form.vnKv[b]!);
    // Direction against the fault current's phase at the fault.
    const dot = outRe[b]! * i1r + outIm[b]! * i1i;
    direction[b - 1] = mag <= scale ? 0 : dot > 0 ? 1 : -1;
  }
  const faultPu = (earth ? 3 : 1) * magnitude(i1r, i1i);
  return { faultKa: faultPu / (Math.sqrt(3) * form.vnKv[k]!), iKa, direction, residualKa };
}

/**
 * Adds one sequence's branch currents into (outRe, outIm): bus voltages v − Z(:,k)·I, then
 * each bus's draw y·v − j (plus I at the fault bus), summed up each subtree.
 */
function addSequence(
  parent: Int32Array,
  t: TreeThevenin,
  zRe: Float64Array,
  zIm: Float64Array,
  yRe: Float64Array,
  yIm: Float64Array,
  k: number,
  ir: number,
  ii: number,
  vRe: Float64Array,
  vIm: Float64Array,
  jRe: Float64Array,
  jIm: Float64Array,
  colRe: Float64Array,
  colIm: Float64Array,
  outRe: Float64Array,
  outIm: Float64Array,
): void {
  const n = vRe.length;
  treeColumn(parent, t, zRe, zIm, k, colRe, colIm);
  const dRe = new Float64Array(n), dIm = new Float64Array(n);
  for (let u = 0; u < n; u++) {
    const vr = vRe[u]! - (colRe[u]! * ir - colIm[u]! * ii);
    const vi = vIm[u]! - (colRe[u]! * ii + colIm[u]! * ir);
    dRe[u] = yRe[u]! * vr - yIm[u]! * vi - jRe[u]!;
    dIm[u] = yRe[u]! * vi + yIm[u]! * vr - jIm[u]!;
  }
  dRe[k] = dRe[k]! + ir;
  dIm[k] = dIm[k]! + ii;
  for (let u = n - 1; u > 0; u--) {
    const p = parent[u]!;
    dRe[p] = dRe[p]! + dRe[u]!;
    dIm[p] = dIm[p]! + dIm[u]!;
    outRe[u] = outRe[u]! + dRe[u]!;
    outIm[u] = outIm[u]! + dIm[u]!;
  }
}
