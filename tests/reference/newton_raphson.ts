/**
 * An independent reference load flow for tests: a dense, full Newton–Raphson power flow in
 * polar form, written from the textbook method (Grainger & Stevenson, *Power System
 * Analysis*, 1994, ch. 9 "Power-flow solutions", Newton–Raphson method; Glover, Sarma &
 * Overbye, *Power System Analysis and Design*, ch. 6 [memory for chapter numbers]). It shares
 * no code with src/solve: it reads only the FeederForm and follows the per-unit conventions
 * written in src/solve/load_flow_types.ts:
 *
 * - base 1 MVA; each bus's base voltage its nominal vnKv, so a branch's series impedance in
 *   pu is zOhm / vnKv_to² and a line's charging in pu is b1S · vnKv_to², half to each end;
 * - a transformer is an ideal complex ratio a = ratio·e^{j·shiftDeg·π/180} on its `from`
 *   side (V' = V_from / a, I_from = I / conj(a)) followed by its series impedance;
 * - switches are zero-impedance branches: the buses they join are merged before the bus
 *   admittance matrix is built (one electrical node per group);
 * - loads draw S = S₀·(z·|V|² + i·|V| + p) with S₀ the case's peak or minimum demand times
 *   demandScale; shunts inject Q = Q_rated·|V|²;
 * - generators inject P = pKw·generationScale and Q by their reactive mode: unity 0,
 *   fixed_power_factor ±P·tan(acos pf) (absorbing = negative injection), fixed_q the given
 *   qKvar UNSCALED (assumed convention: a fixed reactive set-point does not follow the
 *   active-power scaling), voltage_control holds |V| at vSetPu with no Q limits (a PV bus;
 *   by default also when generationScale is 0, the machine then runs as a condenser; the
 *   option zeroGenerationScale "out_of_service" disconnects every generator instead);
 * - the source bus (bus 0) is the slack at source.vSetPu∠source.angleDeg.
 *
 * Newton step: the mismatch F = [P_calc − P_spec(|V|); Q_calc − Q_spec(|V|)] over the
 * non-slack angles and the PQ magnitudes, with the analytic Jacobian of S_i = V_i·conj(I_i)
 * (derivatives written out below) plus the voltage dependence of the ZIP loads and shunts,
 * so the iteration stays quadratic. Dense matrices (ml-matrix, LU solve); for tests only.
 */
import { Matrix, solve } from "ml-matrix";
import { BRANCH_SWITCH, type FeederForm } from "../../src/model/feeder_form.ts";
import type { LoadFlowCase } from "../../src/solve/load_flow_types.ts";

export interface ReferenceNewtonOptions {
  /** Converged when the largest Newton correction (rad or pu) is at most this. */
  readonly tolerancePu: number;
  readonly maxIterations?: number;
  /**
   * What a generation scale of 0 means. "in_service" (the default, the literal reading of
   * load_flow_types.ts): P = 0, Q by the mode (fixed_q still injects), voltage control
   * still holds |V|. "out_of_service": generators are disconnected, no P, no Q, no voltage
   * control (the rule src/solve/_generator_setpoints.ts states for the no-generation case).
   */
  readonly zeroGenerationScale?: "in_service" | "out_of_service";
}

export interface ReferenceNewtonResult {
  readonly converged: boolean;
  readonly iterations: number;
  /** Largest correction of the last Newton step, rad or pu. */
  readonly stepPu: number;
  /** Largest power mismatch at the returned voltages, pu on 1 MVA. */
  readonly mismatchPu: number;
  /** Per form bus, pu of the bus's nominal voltage. */
  readonly vRePu: Float64Array;
  readonly vImPu: Float64Array;
  /** Series current at the `to` side per branch, pu of the `to` base; NaN for switches. */
  readonly iRePu: Float64Array;
  readonly iImPu: Float64Array;
  /** Power the source delivers into the feeder, loads on the slack node included, pu. */
  readonly sourcePPu: number;
  readonly sourceQPu: number;
  /** Σ |I|²·R over the series impedances, pu. */
  readonly lossesPPu: number;
  /** Per load, per generator (+ injection) and per shunt (+ injection), pu. */
  readonly loadPPu: Float64Array;
  readonly loadQPu: Float64Array;
  readonly genPPu: Float64Array;
  readonly genQPu: Float64Array;
  readonly shuntQPu: Float64Array;
}

const DEG = Math.PI / 180;
/** A step this small that no longer shrinks means round-off has been reached. */
const ROUND_OFF_STEP_PU = 1e-10;

/** Groups of buses joined by closed switches; group 0 holds bus 0. */
export function mergeSwitchedBuses(form: FeederForm): { group: Int32Array; nGroup: number } {
  const root = Int32Array.from({ length: form.nBus }, (_, k) => k);
  const find = (k: number): number => {
    while (root[k] !== k) k = root[k] = root[root[k]!]!;
    return k;
  };
  for (let b = 0; b < form.nBranch; b++) {
    if (form.branchKind[b] !== BRANCH_SWITCH) continue;
    const ra = find(form.branchFrom[b]!), rb = find(form.branchTo[b]!);
    if (ra !== rb) root[Math.max(ra, rb)] = Math.min(ra, rb);
  }
  const group = new Int32Array(form.nBus);
  const number = new Map<number, number>();
  for (let k = 0; k < form.nBus; k++) {
    const r = find(k);
    if (!number.has(r)) number.set(r, number.size);
    group[k] = number.get(r)!;
  }
  return { group, nGroup: number.size };
}

/** Reactive injection of a generator that does not control voltage, pu (+ injection). */
function generatorQPu(form: FeederForm, g: number, pPu: number): number {
  const mode = form.generators.reactive[g]!;
  switch (mode.mode) {
    case "unity":
      return 0;
    case "fixed_power_factor": {
      const pf = mode.powerFactor;
      const q = pPu * Math.sqrt(1 - pf * pf) / pf;
      return mode.sense === "absorbing" ? -q : q;
    }
    case "fixed_q":
      return mode.qKvar / 1000;
    default:
      throw new Error(`reference load flow: reactive mode "${mode.mode}" is not modelled`);
  }
}

/** Solves the balanced load flow of `form` for one case by full Newton–Raphson. */
export function solveReferenceNewton(
  form: FeederForm,
  loadFlowCase: LoadFlowCase,
  options: ReferenceNewtonOptions,
): ReferenceNewtonResult {
  const { group, nGroup: n } = mergeSwitchedBuses(form);
  const maxIterations = options.maxIterations ?? 40;

  // Bus admittance matrix Y = G + jB of the merged nodes (dense, row-major).
  const G = new Float64Array(n * n), B = new Float64Array(n * n);
  const add = (i: number, j: number, re: number, im: number) => {
    G[i * n + j]! += re;
    B[i * n + j]! += im;
  };
  const yRe = new Float64Array(form.nBranch), yIm = new Float64Array(form.nBranch);
  const aRe = new Float64Array(form.nBranch), aIm = new Float64Array(form.nBranch);
  for (let b = 0; b < form.nBranch; b++) {
    if (form.branchKind[b] === BRANCH_SWITCH) continue;
    const vb = form.vnKv[form.branchTo[b]!]!;
    const zr = form.r1Ohm[b]! / (vb * vb), zx = form.x1Ohm[b]! / (vb * vb);
    const zz = zr * zr + zx * zx;
    if (!(zz > 0)) throw new Error(`branch "${form.branchIds[b]}" has zero series impedance`);
    const yr = zr / zz, yi = -zx / zz;
    const ar = form.ratio[b]! * Math.cos(form.shiftDeg[b]! * DEG);
    const ai = form.ratio[b]! * Math.sin(form.shiftDeg[b]! * DEG);
    yRe[b] = yr, yIm[b] = yi, aRe[b] = ar, aIm[b] = ai;
    const f = group[form.branchFrom[b]!]!, t = group[form.branchTo[b]!]!;
    const a2 = ar * ar + ai * ai;
    // I_from = y·V_from/|a|² − y·V_to/conj(a); I_to = y·V_to − y·V_from/a.
    add(f, f, yr / a2, yi / a2);
    add(t, t, yr, yi);
    // −y/conj(a) = −y·a/|a|²;  −y/a = −y·conj(a)/|a|².
    add(f, t, -(yr * ar - yi * ai) / a2, -(yr * ai + yi * ar) / a2);
    add(t, f, -(yr * ar + yi * ai) / a2, -(yi * ar - yr * ai) / a2);
    const half = form.b1S[b]! * vb * vb / 2;
    add(f, f, 0, half);
    add(t, t, 0, half);
  }

  // Specified injections per node: ZIP load coefficients, generation, shunts.
  const peak = loadFlowCase.demand === "peak";
  const L = form.loads;
  const pz = new Float64Array(n), pi = new Float64Array(n), pp = new Float64Array(n);
  const qz = new Float64Array(n), qi = new Float64Array(n), qp = new Float64Array(n);
  const load0P = new Float64Array(L.n), load0Q = new Float64Array(L.n);
  for (let l = 0; l < L.n; l++) {
    const p0 = (peak ? L.peakPKw[l]! : L.minPKw[l]!) * loadFlowCase.demandScale / 1000;
    const q0 = (peak ? L.peakQKvar[l]! : L.minQKvar[l]!) * loadFlowCase.demandScale / 1000;
    load0P[l] = p0, load0Q[l] = q0;
    const k = group[L.bus[l]!]!;
    pz[k]! += p0 * L.zipZ[l]!, pi[k]! += p0 * L.zipI[l]!, pp[k]! += p0 * L.zipP[l]!;
    qz[k]! += q0 * L.zipZ[l]!, qi[k]! += q0 * L.zipI[l]!, qp[k]! += q0 * L.zipP[l]!;
  }
  const Gn = form.generators;
  const pGen = new Float64Array(n), qGen = new Float64Array(n);
  const genP = new Float64Array(Gn.n), genQ = new Float64Array(Gn.n);
  const vSetPv = new Float64Array(n).fill(NaN);
  const pvGen = new Int32Array(n).fill(-1);
  const disconnected = options.zeroGenerationScale === "out_of_service" &&
    loadFlowCase.generationScale <= 0;
  for (let g = 0; g < Gn.n && !disconnected; g++) {
    const k = group[Gn.bus[g]!]!;
    genP[g] = Gn.pKw[g]! * loadFlowCase.generationScale / 1000;
    pGen[k]! += genP[g]!;
    const mode = Gn.reactive[g]!;
    if (mode.mode === "voltage_control") {
      if (k === 0) throw new Error(`generator "${Gn.ids[g]}" controls the slack node`);
      if (pvGen[k]! >= 0) throw new Error(`two voltage-controlled generators at one node`);
      pvGen[k] = g;
      vSetPv[k] = mode.vSetPu;
    } else {
      genQ[g] = generatorQPu(form, g, genP[g]!);
      qGen[k]! += genQ[g]!;
    }
  }
  const qShunt = new Float64Array(n);
  for (let s = 0; s < form.shunts.n; s++) {
    qShunt[group[form.shunts.bus[s]!]!]! += form.shunts.qRatedKvar[s]! / 1000;
  }

  // Unknowns: angles of every node but the slack, magnitudes of the PQ nodes.
  const angleIndex = new Int32Array(n).fill(-1), magIndex = new Int32Array(n).fill(-1);
  let m = 0;
  for (let k = 1; k < n; k++) angleIndex[k] = m++;
  for (let k = 1; k < n; k++) if (pvGen[k]! < 0) magIndex[k] = m++;

  // Start: source voltage carried down the tree through the transformer ratios (the flat
  // start rotated by the phase shifts), PV magnitudes at their set-points.
  const busRe = new Float64Array(form.nBus), busIm = new Float64Array(form.nBus);
  busRe[0] = form.source.vSetPu * Math.cos(form.source.angleDeg * DEG);
  busIm[0] = form.source.vSetPu * Math.sin(form.source.angleDeg * DEG);
  for (let k = 1; k < form.nBus; k++) {
    const b = k - 1, p = form.parent[k]!;
    if (form.branchKind[b] === BRANCH_SWITCH) {
      busRe[k] = busRe[p]!, busIm[k] = busIm[p]!;
    } else {
      const a2 = aRe[b]! * aRe[b]! + aIm[b]! * aIm[b]!;
      busRe[k] = (busRe[p]! * aRe[b]! + busIm[p]! * aIm[b]!) / a2;
      busIm[k] = (busIm[p]! * aRe[b]! - busRe[p]! * aIm[b]!) / a2;
    }
  }
  const vm = new Float64Array(n).fill(NaN), va = new Float64Array(n).fill(NaN);
  for (let k = 0; k < form.nBus; k++) {
    const g = group[k]!;
    if (Number.isNaN(vm[g]!)) {
      vm[g] = Math.hypot(busRe[k]!, busIm[k]!);
      va[g] = Math.atan2(busIm[k]!, busRe[k]!);
    }
  }
  for (let k = 1; k < n; k++) if (pvGen[k]! >= 0) vm[k] = vSetPv[k]!;

  const vr = new Float64Array(n), vi = new Float64Array(n);
  const ir = new Float64Array(n), ii = new Float64Array(n);
  const mismatch = new Float64Array(m);
  /** Node voltages, node currents I = Y·V and the mismatch vector; returns max |F|. */
  const evaluate = (): number => {
    for (let k = 0; k < n; k++) {
      vr[k] = vm[k]! * Math.cos(va[k]!), vi[k] = vm[k]! * Math.sin(va[k]!);
    }
    let worst = 0;
    for (let k = 0; k < n; k++) {
      let sr = 0, si = 0;
      for (let j = 0; j < n; j++) {
        const g = G[k * n + j]!, b = B[k * n + j]!;
        sr += g * vr[j]! - b * vi[j]!;
        si += g * vi[j]! + b * vr[j]!;
      }
      ir[k] = sr, ii[k] = si;
      if (k === 0) continue;
      const v = vm[k]!;
      const pCalc = vr[k]! * sr + vi[k]! * si, qCalc = vi[k]! * sr - vr[k]! * si;
      const pSpec = pGen[k]! - (pz[k]! * v * v + pi[k]! * v + pp[k]!);
      const qSpec = qGen[k]! + qShunt[k]! * v * v - (qz[k]! * v * v + qi[k]! * v + qp[k]!);
      mismatch[angleIndex[k]!] = pCalc - pSpec;
      worst = Math.max(worst, Math.abs(pCalc - pSpec));
      if (magIndex[k]! >= 0) {
        mismatch[magIndex[k]!] = qCalc - qSpec;
        worst = Math.max(worst, Math.abs(qCalc - qSpec));
      }
    }
    return worst;
  };

  let iterations = 0, stepPu = Infinity, previousStep = Infinity, converged = false;
  let mismatchPu = evaluate();
  const J = Matrix.zeros(m, m);
  while (iterations < maxIterations && m > 0) {
    // Jacobian of S_i = V_i·conj(I_i), I = Y·V, V_k = |V_k|·e^{jθ_k}:
    //   ∂S_i/∂θ_k   = −j·V_i·conj(Y_ik·V_k)                          (k ≠ i)
    //   ∂S_i/∂θ_i   =  j·V_i·conj(I_i) − j·V_i·conj(Y_ii·V_i)
    //   ∂S_i/∂|V_k| =  V_i·conj(Y_ik·V_k)/|V_k|                        (k ≠ i)
    //   ∂S_i/∂|V_i| =  V_i·conj(Y_ii·V_i)/|V_i| + conj(I_i)·V_i/|V_i|
    // and −∂S_spec/∂|V_i| = (2·z·|V| + i)·S₀ of the loads − 2·Q_sh·|V| (diagonal only).
    J.mul(0);
    for (let i = 1; i < n; i++) {
      const rowP = angleIndex[i]!, rowQ = magIndex[i]!;
      for (let k = 0; k < n; k++) {
        const colA = angleIndex[k]!, colM = magIndex[k]!;
        if (colA < 0 && colM < 0) continue;
        const g = G[i * n + k]!, b = B[i * n + k]!;
        // c = V_i·conj(Y_ik·V_k)
        const yvr = g * vr[k]! - b * vi[k]!, yvi = g * vi[k]! + b * vr[k]!;
        const cr = vr[i]! * yvr + vi[i]! * yvi, ci = vi[i]! * yvr - vr[i]! * yvi;
        let dAr = ci, dAi = -cr; // −j·c
        let dMr = cr / vm[k]!, dMi = ci / vm[k]!;
        if (k === i) {
          // + j·V_i·conj(I_i) to the angle term, + conj(I_i)·V_i/|V_i| to the magnitude term
          const er = vr[i]! * ir[i]! + vi[i]! * ii[i]!, ei = vi[i]! * ir[i]! - vr[i]! * ii[i]!;
          dAr += -ei, dAi += er;
          dMr += er / vm[i]!, dMi += ei / vm[i]!;
          const v = vm[i]!;
          dMr += 2 * pz[i]! * v + pi[i]!;
          dMi += 2 * qz[i]! * v + qi[i]! - 2 * qShunt[i]! * v;
        }
        if (colA >= 0) {
          J.set(rowP, colA, dAr);
          if (rowQ >= 0) J.set(rowQ, colA, dAi);
        }
        if (colM >= 0) {
          J.set(rowP, colM, dMr);
          if (rowQ >= 0) J.set(rowQ, colM, dMi);
        }
      }
    }
    const dx = solve(J, Matrix.columnVector(Array.from(mismatch, (f) => -f)));
    stepPu = 0;
    for (let k = 1; k < n; k++) {
      const da = dx.get(angleIndex[k]!, 0);
      va[k]! += da;
      stepPu = Math.max(stepPu, Math.abs(da));
      if (magIndex[k]! >= 0) {
        const dm = dx.get(magIndex[k]!, 0);
        vm[k]! += dm;
        stepPu = Math.max(stepPu, Math.abs(dm));
      }
    }
    iterations++;
    mismatchPu = evaluate();
    if (!Number.isFinite(stepPu)) break;
    if (stepPu <= options.tolerancePu) {
      converged = true;
      break;
    }
    if (stepPu <= ROUND_OFF_STEP_PU && stepPu > previousStep / 4) {
      converged = true;
      break;
    }
    previousStep = stepPu;
  }
  if (m === 0) {
    converged = true;
    stepPu = 0;
  }

  // Results per form bus, branch, load, generator and shunt.
  const vRePu = new Float64Array(form.nBus), vImPu = new Float64Array(form.nBus);
  for (let k = 0; k < form.nBus; k++) vRePu[k] = vr[group[k]!]!, vImPu[k] = vi[group[k]!]!;
  const iRePu = new Float64Array(form.nBranch).fill(NaN);
  const iImPu = new Float64Array(form.nBranch).fill(NaN);
  let lossesPPu = 0;
  for (let b = 0; b < form.nBranch; b++) {
    if (form.branchKind[b] === BRANCH_SWITCH) continue;
    const f = form.branchFrom[b]!, t = form.branchTo[b]!;
    const a2 = aRe[b]! * aRe[b]! + aIm[b]! * aIm[b]!;
    // V' = V_from / a;  I = y·(V' − V_to)
    const pr = (vRePu[f]! * aRe[b]! + vImPu[f]! * aIm[b]!) / a2 - vRePu[t]!;
    const pq = (vImPu[f]! * aRe[b]! - vRePu[f]! * aIm[b]!) / a2 - vImPu[t]!;
    iRePu[b] = yRe[b]! * pr - yIm[b]! * pq;
    iImPu[b] = yRe[b]! * pq + yIm[b]! * pr;
    const vb = form.vnKv[t]!;
    lossesPPu += (iRePu[b]! ** 2 + iImPu[b]! ** 2) * form.r1Ohm[b]! / (vb * vb);
  }
  const loadPPu = new Float64Array(L.n), loadQPu = new Float64Array(L.n);
  for (let l = 0; l < L.n; l++) {
    const v = vm[group[L.bus[l]!]!]!;
    const shape = (z: number, i: number, p: number) => z * v * v + i * v + p;
    loadPPu[l] = load0P[l]! * shape(L.zipZ[l]!, L.zipI[l]!, L.zipP[l]!);
    loadQPu[l] = load0Q[l]! * shape(L.zipZ[l]!, L.zipI[l]!, L.zipP[l]!);
  }
  const shuntQPu = Float64Array.from(
    { length: form.shunts.n },
    (_, s) => form.shunts.qRatedKvar[s]! / 1000 * vm[group[form.shunts.bus[s]!]!]! ** 2,
  );
  /** Q the node's network connections draw out of it: Im(V·conj(I)). */
  const qOut = (k: number) => vi[k]! * ir[k]! - vr[k]! * ii[k]!;
  for (let k = 1; k < n; k++) {
    const g = pvGen[k]!;
    if (g < 0) continue;
    const v = vm[k]!;
    genQ[g] = qOut(k) + (qz[k]! * v * v + qi[k]! * v + qp[k]!) - qGen[k]! - qShunt[k]! * v * v;
  }
  const v0 = vm[0]!;
  const sourcePPu = vr[0]! * ir[0]! + vi[0]! * ii[0]! + (pz[0]! * v0 * v0 + pi[0]! * v0 + pp[0]!) -
    pGen[0]!;
  const sourceQPu = qOut(0) + (qz[0]! * v0 * v0 + qi[0]! * v0 + qp[0]!) - qGen[0]! -
    qShunt[0]! * v0 * v0;
  return {
    converged,
    iterations,
    stepPu,
    mismatchPu,
    vRePu,
    vImPu,
    iRePu,
    iImPu,
    sourcePPu,
    sourceQPu,
    lossesPPu,
    loadPPu,
    loadQPu,
    genPPu: genP,
    genQPu: genQ,
    shuntQPu,
  };
}
