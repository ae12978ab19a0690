/**
 * Short-circuit study of one feeder (IEC 60909-0:2016, equivalent voltage source c·Un/√3 at
 * the fault, REFERENCES.md D [memory]): three-phase, line-to-line, line-to-earth and double
 * line-to-earth faults at every bus, for maximum currents with and without generation and
 * for minimum currents; the peak current; the capacitive earth-fault current where the
 * zero-sequence network has no path to earth (isolated or resonant neutral); and the
 * current each switching device must interrupt.
 *
 * Radial feeders: the O(n) tree Thevenin pass per sequence (tree_thevenin.ts). Meshed
 * feeders: the inverse of the full bus admittance matrix, up to settings.meshedMaxBuses.
 * Full-size converters add to the equivalent source as IEC 60909-0:2016 does for them:
 * E = c·Un/√3 + Σj |Z(1)kj|·Isk,j, magnitudes added (the standard's conservative sum).
 * The peak current takes κ = 1.02 + 0.98·e^(−3R/X) from the positive-sequence impedance at
 * the fault (on meshed feeders 1.15·κ, at most 2.0; method B [memory]).
 */
import { magnitude } from "../model/magnitude.ts";
import { roundTo } from "../model/round_to.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { invertComplexMatrix } from "../model/_complex_matrix.ts";
import type { FaultSettings } from "./fault_settings.ts";
import {
  buildSequenceNetworks,
  type FaultCondition,
  type SequenceNetworks,
} from "./_fault_networks.ts";
import { solveTreeThevenin, type TreeThevenin } from "./tree_thevenin.ts";
import { transferMagnitudeSums } from "./tree_column.ts";

/** Initial short-circuit currents at a bus for one condition, kA. */
export interface BusFaultCurrents {
  readonly ik3Ka: number;
  readonly ik2Ka: number;
  /** Line-to-earth; null where the zero-sequence network has no path to earth. */
  readonly ik1Ka: number | null;
  /** Earth current of a double line-to-earth fault; null as ik1Ka. */
  readonly ikE2EKa: number | null;
  /** Peak current of the three-phase fault. */
  readonly ipKa: number;
  /** R/X of the positive-sequence impedance at the fault. */
  readonly rToX: number;
}

export interface BusFaultRow {
  readonly id: string;
  readonly vnKv: number;
  readonly max: BusFaultCurrents;
  readonly maxWithoutGeneration: BusFaultCurrents;
  readonly min: BusFaultCurrents;
  /** Rise of the maximum three-phase current the generation causes, %. */
  readonly generationIncreasePercent: number;
  /** Capacitive earth-fault current of the galvanically connected lines, A (isolated or resonant neutral). */
  readonly capacitiveEarthFaultA: number | null;
}

export interface DeviceDutyRow {
  readonly id: string;
  readonly kind: string;
  readonly branchId: string;
  /** Largest current through the device for a fault beyond it (fed from the source side), kA. */
  readonly forwardKa: number;
  /** Largest current through it for a fault on its source side (fed by generation beyond it), kA. */
  readonly reverseKa: number;
  /** The larger of the two: what it must interrupt. */
  readonly dutyKa: number;
  /** Peak current it must make: κ·√2·duty, kA. */
  readonly peakKa: number;
  readonly breakingCurrentA: number | null;
  readonly makingCurrentA: number | null;
}

export interface FaultStudy {
  readonly buses: readonly BusFaultRow[];
  readonly devices: readonly DeviceDutyRow[];
  readonly diagnostics: readonly Diagnostic[];
}

interface ConditionResult {
  readonly currents: BusFaultCurrents[];
  /** Per sequence Thevenin passes (radial only), for the device currents. */
  readonly tree: { t1: TreeThevenin; t2: TreeThevenin; t0: TreeThevenin } | null;
  readonly nets: SequenceNetworks;
  readonly eff: Float64Array;
}

const SQRT3 = Math.sqrt(3);

export function studyFaults(
  form: FeederForm,
  s: FaultSettings,
  lvMaxKv: number,
  method: "auto" | "matrix" = "auto",
): FaultStudy {
  const n = form.nBus;
  const radial = form.nBranch === n - 1 && method === "auto";
  const diagnostics: Diagnostic[] = [];
  if (form.nBranch !== n - 1 && n > s.meshedMaxBuses) {
    diagnostics.push(makeDiagnostic(
      "fault.too_large",
      "warning",
      `Feeder "${form.feederId}" is meshed with ${n} buses, more than the ${s.meshedMaxBuses} the short-circuit study solves with the full impedance matrix; it has no fault results`,
      { feederId: form.feederId },
    ));
    return { buses: [], devices: [], diagnostics };
  }
  const run = (condition: FaultCondition) => solveCondition(form, condition, s, lvMaxKv, radial);
  const max = run("max"), maxNoGen = run("maxWithoutGeneration"), min = run("min");
  const capacitive = capacitiveEarthFaultA(form);
  const buses: BusFaultRow[] = form.busIds.map((id, k) => {
    const a = max.currents[k]!, b = maxNoGen.currents[k]!;
    return {
      id,
      vnKv: form.vnKv[k]!,
      max: a,
      maxWithoutGeneration: b,
      min: min.currents[k]!,
      generationIncreasePercent: b.ik3Ka > 0 ? 100 * (a.ik3Ka - b.ik3Ka) / b.ik3Ka : 0,
      capacitiveEarthFaultA: a.ik1Ka === null ? capacitive[k]! : null,
    };
  });
  return { buses, devices: radial ? deviceDuties(form, max) : [], diagnostics };
}

function solveCondition(
  form: FeederForm,
  condition: FaultCondition,
  s: FaultSettings,
  lvMaxKv: number,
  radial: boolean,
): ConditionResult {
  const n = form.nBus;
  const nets = buildSequenceNetworks(form, condition, s, lvMaxKv);
  const z1Re = new Float64Array(n), z1Im = new Float64Array(n);
  const z2Re = new Float64Array(n), z2Im = new Float64Array(n);
  const z0Re = new Float64Array(n), z0Im = new Float64Array(n);
  const eff = Float64Array.from(nets.c); // equivalent source, pu
  let tree: ConditionResult["tree"] = null;
  if (radial) {
    const t1 = solveTreeThevenin(n, form.parent, nets.z1Re, nets.z1Im, nets.y1Re, nets.y1Im);
    const t2 = solveTreeThevenin(n, form.parent, nets.z1Re, nets.z1Im, nets.y2Re, nets.y2Im);
    const t0 = solveTreeThevenin(n, form.parent, nets.z0Re, nets.z0Im, nets.y0Re, nets.y0Im);
    z1Re.set(t1.zthRe), z1Im.set(t1.zthIm), z2Re.set(t2.zthRe), z2Im.set(t2.zthIm);
    z0Re.set(t0.zthRe), z0Im.set(t0.zthIm);
    const sums = transferMagnitudeSums(
      form.parent,
      t1,
      nets.z1Re,
      nets.z1Im,
      nets.converterBus,
      nets.converterIPu,
    );
    for (let k = 0; k < n; k++) eff[k] = eff[k]! + sums[k]!;
    tree = { t1, t2, t0 };
  } else {
    const d1 = denseImpedance(form, nets.z1Re, nets.z1Im, nets.y1Re, nets.y1Im);
    const d2 = denseImpedance(form, nets.z1Re, nets.z1Im, nets.y2Re, nets.y2Im);
    const d0 = denseImpedance(form, nets.z0Re, nets.z0Im, nets.y0Re, nets.y0Im);
    for (let k = 0; k < n; k++) {
      z1Re[k] = d1.re[k * n + k]!, z1Im[k] = d1.im[k * n + k]!;
      z2Re[k] = d2.re[k * n + k]!, z2Im[k] = d2.im[k * n + k]!;
      z0Re[k] = d0.ok ? d0.re[k * n + k]! : Infinity;
      z0Im[k] = d0.ok ? d0.im[k * n + k]! : Infinity;
      for (let j = 0; j < nets.converterBus.length; j++) {
        const m = nets.converterBus[j]!;
        eff[k] = eff[k]! + magnitude(d1.re[k * n + m]!, d1.im[k * n + m]!) * nets.converterIPu[j]!;
      }
    }
  }
  const currents = form.busIds.map((_, k) =>
    faultCurrents(
      eff[k]!,
      1 / (SQRT3 * form.vnKv[k]!),
      z1Re[k]!,
      z1Im[k]!,
      z2Re[k]!,
      z2Im[k]!,
      z0Re[k]!,
      z0Im[k]!,
      radial ? 1 : 1.15,
    )
  );
  return { currents, tree, nets, eff };
}

/**
 * Currents of the four fault types from the sequence impedances at the fault (pu) and the
 * equivalent source e (pu); kaPerPu converts to kA at the bus.
 */
export function faultCurrents(
  e: number,
  kaPerPu: number,
  z1r: number,
  z1i: number,
  z2r: number,
  z2i: number,
  z0r: number,
  z0i: number,
  kappaFactor = 1,
): BusFaultCurrents {
  const ik3 = e / magnitude(z1r, z1i);
  const ik2 = SQRT3 * e / magnitude(z1r + z2r, z1i + z2i);
  const earthed = Number.isFinite(z0r) && Number.isFinite(z0i);
  let ik1: number | null = null, ikE2E: number | null = null;
  if (earthed) {
    ik1 = 3 * e / magnitude(z1r + z2r + z0r, z1i + z2i + z0i);
    // Earth current 3·I0 of a double line-to-earth fault: 3·E·|Z2| / |Z1Z2 + Z1Z0 + Z2Z0|.
    const pr = z1r * z2r - z1i * z2i + z1r * z0r - z1i * z0i + z2r * z0r - z2i * z0i;
    const pi = z1r * z2i + z1i * z2r + z1r * z0i + z1i * z0r + z2r * z0i + z2i * z0r;
    ikE2E = 3 * e * magnitude(z2r, z2i) / magnitude(pr, pi);
  }
  const rToX = z1i > 0 ? z1r / z1i : 0;
  const kappa = Math.min(2, kappaFactor * (1.02 + 0.98 * Math.exp(-3 * rToX)));
  return {
    ik3Ka: ik3 * kaPerPu,
    ik2Ka: ik2 * kaPerPu,
    ik1Ka: ik1 === null ? null : ik1 * kaPerPu,
    ikE2EKa: ikE2E === null ? null : ikE2E * kaPerPu,
    ipKa: kappa * Math.SQRT2 * ik3 * kaPerPu,
    rToX,
  };
}

/**
 * Inverse of the full bus admittance matrix of a sequence network, as an n×n matrix over
 * the feeder's buses; ok false when singular. Buses joined by closed switching devices (no
 * impedance) are one node of the matrix and share their rows.
 */
export function denseImpedance(
  form: FeederForm,
  zRe: Float64Array,
  zIm: Float64Array,
  yShRe: Float64Array,
  yShIm: Float64Array,
): { re: Float64Array; im: Float64Array; ok: boolean } {
  const n = form.nBus;
  const root = Int32Array.from({ length: n }, (_, k) => k);
  const find = (k: number): number => (root[k] === k ? k : (root[k] = find(root[k]!)));
  for (let b = 0; b < form.nBranch; b++) {
    if (zRe[b] === 0 && zIm[b] === 0) root[find(form.branchFrom[b]!)] = find(form.branchTo[b]!);
  }
  // Parts of the network with no path to earth (a zero-sequence network behind blocking
  // windings) would make the matrix singular: they are left out, their impedance not finite.
  const part = Int32Array.from({ length: n }, (_, k) => k);
  const top = (k: number): number => (part[k] === k ? k : (part[k] = top(part[k]!)));
  for (let b = 0; b < form.nBranch; b++) {
    if (Number.isFinite(zRe[b]!) && Number.isFinite(zIm[b]!)) {
      part[top(form.branchFrom[b]!)] = top(form.branchTo[b]!);
    }
  }
  const earthed = new Uint8Array(n);
  for (let k = 0; k < n; k++) if (yShRe[k] !== 0 || yShIm[k] !== 0) earthed[top(k)] = 1;
  const node = new Int32Array(n).fill(-1);
  let m = 0;
  for (let k = 0; k < n; k++) if (find(k) === k && earthed[top(k)]) node[k] = m++;
  const at = (k: number) => node[find(k)]!;
  const yRe = new Float64Array(m * m), yIm = new Float64Array(m * m);
  for (let k = 0; k < n; k++) {
    const i = at(k);
    if (i < 0) continue;
    yRe[i * m + i] = yRe[i * m + i]! + yShRe[k]!;
    yIm[i * m + i] = yIm[i * m + i]! + yShIm[k]!;
  }
  for (let b = 0; b < form.nBranch; b++) {
    const zr = zRe[b]!, zi = zIm[b]!;
    if (!Number.isFinite(zr) || !Number.isFinite(zi) || (zr === 0 && zi === 0)) continue;
    const d = zr * zr + zi * zi, gr = zr / d, gi = -zi / d;
    const f = at(form.branchFrom[b]!), t = at(form.branchTo[b]!);
    if (f === t || f < 0 || t < 0) continue;
    yRe[f * m + f] = yRe[f * m + f]! + gr, yIm[f * m + f] = yIm[f * m + f]! + gi;
    yRe[t * m + t] = yRe[t * m + t]! + gr, yIm[t * m + t] = yIm[t * m + t]! + gi;
    yRe[f * m + t] = yRe[f * m + t]! - gr, yIm[f * m + t] = yIm[f * m + t]! - gi;
    yRe[t * m + f] = yRe[t * m + f]! - gr, yIm[t * m + f] = yIm[t * m + f]! - gi;
  }
  const zr = new Float64Array(m * m), zi = new Float64Array(m * m);
  const ok = invertComplexMatrix(m, yRe, yIm, zr, zi);
  const re = new Float64Array(n * n), im = new Float64Array(n * n);
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      const i = at(a), j = at(b);
      const none = i < 0 || j < 0 || top(a) !== top(b);
      re[a * n + b] = none ? (a === b ? Infinity : 0) : zr[i * m + j]!;
      im[a * n + b] = none ? (a === b ? Infinity : 0) : zi[i * m + j]!;
    }
  }
  return { re, im, ok };
}

/**
 * The current each switching device on a tree branch must interrupt (maximum condition):
 * for a fault at its far bus, the share arriving through it from the source side; for a
 * fault at its near bus, the share fed back through it from beyond; three-phase and
 * line-to-earth faults, converter currents on the feeding side added in magnitude (a
 * conservative sum, like the standard's).
 */
function deviceDuties(form: FeederForm, max: ConditionResult): DeviceDutyRow[] {
  const { t1, t2, t0 } = max.tree!;
  const n = form.nBus, nets = max.nets;
  const convSub = new Float64Array(n);
  for (let j = 0; j < nets.converterBus.length; j++) {
    convSub[nets.converterBus[j]!] = convSub[nets.converterBus[j]!]! + nets.converterIPu[j]!;
  }
  for (let k = n - 1; k > 0; k--) {
    convSub[form.parent[k]!] = convSub[form.parent[k]!]! + convSub[k]!;
  }
  const out: DeviceDutyRow[] = [];
  for (const d of form.devices) {
    const b = d.branch;
    if (b >= n - 1) continue; // a loop branch: not a radial path
    const k = b + 1, p = form.parent[k]!;
    const kaK = 1 / (SQRT3 * form.vnKv[k]!), kaP = 1 / (SQRT3 * form.vnKv[p]!);
    // Shares: fault at k through the branch from above; fault at p through it from below.
    // The network part from the voltage source; the converters on the feeding side added in
    // magnitude (not through the source term, which would count them twice).
    const above = convSub[0]! - convSub[k]!, below = convSub[k]!;
    const fwd3 = (nets.c[k]! * share(t1.yUpRe[k]!, t1.yUpIm[k]!, t1, k) + above) * kaK;
    const rev3 = (nets.c[p]! * share(t1.yBranchRe[k]!, t1.yBranchIm[k]!, t1, p) + below) * kaP;
    const fwd1 = (earthShare(nets.c[k]!, t1, t2, t0, k, "up") + above) * kaK;
    const rev1 = (earthShare(nets.c[p]!, t1, t2, t0, p, "branch", k) + below) * kaP;
    const forward = Math.max(fwd3, fwd1), reverse = Math.max(rev3, rev1);
    const duty = Math.max(forward, reverse);
    const kappa = Math.max(kappaOf(max.currents[k]!), kappaOf(max.currents[p]!));
    out.push({
      id: d.id,
      kind: d.kind,
      branchId: form.branchIds[b]!,
      forwardKa: forward,
      reverseKa: reverse,
      dutyKa: duty,
      peakKa: kappa * Math.SQRT2 * duty,
      breakingCurrentA: d.breakingCurrentA ?? null,
      makingCurrentA: d.makingCurrentA ?? null,
    });
  }
  return out;
}

/** |y/yTot| at bus k over the Thevenin impedance: the share of a fault current at k. */
function share(yr: number, yi: number, t: TreeThevenin, k: number): number {
  // y·Zth, Zth = 1/yTot; divided by |Zth| when multiplied by the fault current e/|Zth|.
  const zr = t.zthRe[k]!, zi = t.zthIm[k]!;
  if (!Number.isFinite(zr)) return 0;
  return magnitude(yr * zr - yi * zi, yr * zi + yi * zr) / magnitude(zr, zi);
}

/**
 * Phase current through a branch for a line-to-earth fault: I0 = e/(Z1 + Z2 + Z0) at the
 * fault, times the sum of the branch's share in each sequence, plus the converters.
 */
function earthShare(
  e: number,
  t1: TreeThevenin,
  t2: TreeThevenin,
  t0: TreeThevenin,
  at: number,
  via: "up" | "branch",
  child = 0,
): number {
  if (!Number.isFinite(t0.zthRe[at]!)) return 0;
  const sr = t1.zthRe[at]! + t2.zthRe[at]! + t0.zthRe[at]!;
  const si = t1.zthIm[at]! + t2.zthIm[at]! + t0.zthIm[at]!;
  const s2 = sr * sr + si * si;
  const i0r = e * sr / s2, i0i = -e * si / s2;
  let fr = 0, fi = 0;
  for (const t of [t1, t2, t0]) {
    const yr = via === "up" ? t.yUpRe[at]! : t.yBranchRe[child]!;
    const yi = via === "up" ? t.yUpIm[at]! : t.yBranchIm[child]!;
    fr += yr * t.zthRe[at]! - yi * t.zthIm[at]!;
    fi += yr * t.zthIm[at]! + yi * t.zthRe[at]!;
  }
  return magnitude(i0r * fr - i0i * fi, i0r * fi + i0i * fr);
}

function kappaOf(c: BusFaultCurrents): number {
  return c.ik3Ka > 0 ? c.ipKa / (Math.SQRT2 * c.ik3Ka) : 1.02;
}

/** √3·Un·ΣωC0 of the lines galvanically connected to each bus (no transformer between), A. */
function capacitiveEarthFaultA(form: FeederForm): Float64Array {
  const n = form.nBus;
  const root = Int32Array.from({ length: n }, (_, k) => k);
  const find = (k: number): number => (root[k] === k ? k : (root[k] = find(root[k]!)));
  for (let b = 0; b < form.nBranch; b++) {
    if (form.branchKind[b] === 1) continue; // a transformer separates galvanic zones
    const a = find(form.branchFrom[b]!), c = find(form.branchTo[b]!);
    if (a !== c) root[a] = c;
  }
  const b0 = new Float64Array(n);
  for (let b = 0; b < form.nBranch; b++) {
    if (form.branchKind[b] !== 0) continue;
    const z = find(form.branchTo[b]!);
    b0[z] = b0[z]! + form.b0S[b]!;
  }
  return Float64Array.from({ length: n }, (_, k) => SQRT3 * form.vnKv[k]! * 1000 * b0[find(k)]!);
}

/** The study with its figures rounded for the result files: 1 A, 1e-6 for ratios, 1e-4 %. */
export function roundFaultStudy(f: FaultStudy): FaultStudy {
  const ka = (v: number) => roundTo(v, 6);
  const cur = (c: BusFaultCurrents): BusFaultCurrents => ({
    ik3Ka: ka(c.ik3Ka),
    ik2Ka: ka(c.ik2Ka),
    ik1Ka: c.ik1Ka === null ? null : ka(c.ik1Ka),
    ikE2EKa: c.ikE2EKa === null ? null : ka(c.ikE2EKa),
    ipKa: ka(c.ipKa),
    rToX: roundTo(c.rToX, 6),
  });
  return {
    buses: f.buses.map((b) => ({
      ...b,
      max: cur(b.max),
      maxWithoutGeneration: cur(b.maxWithoutGeneration),
      min: cur(b.min),
      generationIncreasePercent: roundTo(b.generationIncreasePercent, 4),
      capacitiveEarthFaultA: b.capacitiveEarthFaultA === null
        ? null
        : roundTo(b.capacitiveEarthFaultA, 3),
    })),
    devices: f.devices.map((d) => ({
      ...d,
      forwardKa: ka(d.forwardKa),
      reverseKa: ka(d.reverseKa),
      dutyKa: ka(d.dutyKa),
      peakKa: ka(d.peakKa),
    })),
    diagnostics: f.diagnostics,
  };
}
