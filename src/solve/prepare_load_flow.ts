/**
 * Per-feeder preparation of the balanced load flow, done once and reused for every case
 * (factor once, solve many): per-unit branch data, bus shunt susceptance, and the small
 * dense matrices of the compensation method — the breakpoint impedance matrix of the
 * loops and the reactance matrix of the voltage-controlled buses (Shirmohammadi et al.
 * 1988; Cheng & Shirmohammadi, IEEE Trans. Power Systems 10(2), 1995).
 */
import { invertComplexMatrix } from "../model/_complex_matrix.ts";
import { BRANCH_LINE, type FeederForm } from "../model/feeder_form.ts";

export interface PreparedLoadFlow {
  readonly n: number;
  /** Series impedance per branch, pu on the `to` bus's base. */
  readonly zRe: Float64Array;
  readonly zIm: Float64Array;
  /** Complex ratio per branch at the input tap positions (1 for lines and switches). */
  readonly aRe: Float64Array;
  readonly aIm: Float64Array;
  /** Shunt susceptance at each bus from line charging (half of each line), pu. */
  readonly lineChargingPu: Float64Array;
  /** Base current of each bus, A. */
  readonly baseCurrentA: Float64Array;
  /** Loop branches: their index, their buses, and the inverse breakpoint impedance matrix. */
  readonly loopBranch: Int32Array;
  readonly loopFrom: Int32Array;
  readonly loopTo: Int32Array;
  readonly loopZinvRe: Float64Array;
  readonly loopZinvIm: Float64Array;
  /** False when the breakpoint matrix is singular (a loop of zero impedance). */
  readonly loopsSolvable: boolean;
  /**
   * Inverse reactance matrices of voltage-controlled bus sets already computed, by the buses'
   * indices joined with ","; they depend on the tree only, so every case and every trial on
   * the same feeder shares them.
   */
  readonly pvInverses: Map<string, Float64Array | undefined>;
  /**
   * Working arrays the solver overwrites on every call (none of them is part of a result), so
   * the cases and trials of a feeder allocate them once. One solve at a time per preparation.
   */
  readonly work: LoadFlowWork;
}

export interface LoadFlowWork {
  /** Per bus: ZIP parts of the demand, shunt susceptance, draws, sums, generation. */
  readonly pz: Float64Array;
  readonly pi: Float64Array;
  readonly pp: Float64Array;
  readonly qz: Float64Array;
  readonly qi: Float64Array;
  readonly qp: Float64Array;
  readonly bShunt: Float64Array;
  readonly drawRe: Float64Array;
  readonly drawIm: Float64Array;
  readonly accRe: Float64Array;
  readonly accIm: Float64Array;
  readonly genP: Float64Array;
  readonly genQ: Float64Array;
  /** Per branch: complex ratio at the present taps and its current factor. */
  readonly aRe: Float64Array;
  readonly aIm: Float64Array;
  readonly gRe: Float64Array;
  readonly gIm: Float64Array;
  readonly hasRatio: Uint8Array;
}

function loadFlowWork(n: number, nb: number): LoadFlowWork {
  const bus = () => new Float64Array(n), branch = () => new Float64Array(nb);
  return {
    pz: bus(),
    pi: bus(),
    pp: bus(),
    qz: bus(),
    qi: bus(),
    qp: bus(),
    bShunt: bus(),
    drawRe: bus(),
    drawIm: bus(),
    accRe: bus(),
    accIm: bus(),
    genP: bus(),
    genQ: bus(),
    aRe: branch(),
    aIm: branch(),
    gRe: branch(),
    gIm: branch(),
    hasRatio: new Uint8Array(nb),
  };
}

/** Base power of the per-unit system, MVA. */
export const BASE_MVA = 1;

export function prepareLoadFlow(form: FeederForm): PreparedLoadFlow {
  const n = form.nBus;
  const nb = form.nBranch;
  const zRe = new Float64Array(nb), zIm = new Float64Array(nb);
  const aRe = new Float64Array(nb), aIm = new Float64Array(nb);
  const lineChargingPu = new Float64Array(n);
  const baseCurrentA = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    baseCurrentA[k] = 1000 * BASE_MVA / (Math.sqrt(3) * form.vnKv[k]!);
  }
  for (let b = 0; b < nb; b++) {
    const to = form.branchTo[b]!, from = form.branchFrom[b]!;
    const zBase = form.vnKv[to]! * form.vnKv[to]! / BASE_MVA;
    zRe[b] = form.r1Ohm[b]! / zBase;
    zIm[b] = form.x1Ohm[b]! / zBase;
    const th = form.shiftDeg[b]! * Math.PI / 180;
    aRe[b] = form.ratio[b]! * Math.cos(th);
    aIm[b] = form.ratio[b]! * Math.sin(th);
    if (form.branchKind[b] === BRANCH_LINE) {
      const half = form.b1S[b]! * zBase / 2;
      lineChargingPu[from] = lineChargingPu[from]! + half;
      lineChargingPu[to] = lineChargingPu[to]! + half;
    }
  }

  // Loops: Z_bp = S·diag(z)·Sᵀ + diag(z_loop), with S the signed incidence of each loop's
  // two paths to the source (branches on both paths cancel).
  const nTree = n - 1;
  const nLoop = nb - nTree;
  const loopBranch = new Int32Array(nLoop);
  const loopFrom = new Int32Array(nLoop), loopTo = new Int32Array(nLoop);
  const sign = new Int8Array(nLoop * Math.max(nTree, 1));
  for (let l = 0; l < nLoop; l++) {
    const b = nTree + l;
    loopBranch[l] = b;
    loopFrom[l] = form.branchFrom[b]!;
    loopTo[l] = form.branchTo[b]!;
    for (let k = loopFrom[l]!; k > 0; k = form.parent[k]!) sign[l * nTree + k - 1]! += 1;
    for (let k = loopTo[l]!; k > 0; k = form.parent[k]!) sign[l * nTree + k - 1]! -= 1;
  }
  const zbRe = new Float64Array(nLoop * nLoop), zbIm = new Float64Array(nLoop * nLoop);
  for (let i = 0; i < nLoop; i++) {
    for (let j = 0; j < nLoop; j++) {
      let sr = 0, si = 0;
      for (let b = 0; b < nTree; b++) {
        const s = sign[i * nTree + b]! * sign[j * nTree + b]!;
        if (s !== 0) {
          sr += s * zRe[b]!;
          si += s * zIm[b]!;
        }
      }
      if (i === j) {
        sr += zRe[loopBranch[i]!]!;
        si += zIm[loopBranch[i]!]!;
      }
      zbRe[i * nLoop + j] = sr;
      zbIm[i * nLoop + j] = si;
    }
  }
  const loopZinvRe = new Float64Array(nLoop * nLoop), loopZinvIm = new Float64Array(nLoop * nLoop);
  const loopsSolvable = nLoop === 0 ||
    invertComplexMatrix(nLoop, zbRe, zbIm, loopZinvRe, loopZinvIm);
  return {
    n,
    zRe,
    zIm,
    aRe,
    aIm,
    lineChargingPu,
    baseCurrentA,
    loopBranch,
    loopFrom,
    loopTo,
    loopZinvRe,
    loopZinvIm,
    loopsSolvable,
    pvInverses: new Map(),
    work: loadFlowWork(n, nb),
  };
}

/**
 * Inverse of the reactance matrix of voltage-controlled buses: X_ij is the reactance of the
 * path the two buses share to the source (pu), so ΔQ = X⁻¹·Δ|V| is the reactive injection
 * that moves their voltages by Δ|V| (the PV-node compensation of Cheng & Shirmohammadi).
 */
export function pvReactanceInverse(
  form: FeederForm,
  zIm: Float64Array,
  buses: Int32Array,
): Float64Array | undefined {
  const m = buses.length;
  const x = new Float64Array(m * m);
  const onPath = new Uint8Array(form.nBus);
  for (let i = 0; i < m; i++) {
    onPath.fill(0);
    for (let k = buses[i]!; k > 0; k = form.parent[k]!) onPath[k] = 1;
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let k = buses[j]!; k > 0; k = form.parent[k]!) if (onPath[k]) s += zIm[k - 1]!;
      x[i * m + j] = s;
    }
  }
  const inv = new Float64Array(m * m), invIm = new Float64Array(m * m);
  return m === 0 || invertComplexMatrix(m, x, new Float64Array(m * m), inv, invIm)
    ? inv
    : undefined;
}
