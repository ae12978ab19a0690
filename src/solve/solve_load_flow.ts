/**
 * Balanced (positive-sequence) load flow of one feeder and one case: backward/forward
 * sweep on the tree, the compensation method for loops and voltage-controlled generators,
 * volt-var as a damped fixed point inside the iteration, and on-load tap changers as an
 * outer control loop. Conventions: see load_flow_types.ts.
 */
import { magnitude } from "../model/magnitude.ts";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { transformerRatio } from "../model/transformer_ratio.ts";
import {
  DEFAULT_LOAD_FLOW_OPTIONS,
  type LoadFlowCase,
  type LoadFlowFailure,
  type LoadFlowOptions,
  type LoadFlowResult,
} from "./load_flow_types.ts";
import {
  BASE_MVA,
  type PreparedLoadFlow,
  prepareLoadFlow,
  pvReactanceInverse,
} from "./prepare_load_flow.ts";
import { ratioFactors, sweepBalanced } from "./sweep_kernel.ts";
import { generatorSetpoints, Q_VOLT_VAR, Q_VOLTAGE_CONTROL } from "./_generator_setpoints.ts";
import { interpolateCurve } from "./interpolate_curve.ts";

export interface SolvedCase {
  readonly value: LoadFlowResult;
  readonly diagnostics: Diagnostic[];
}

export function solveLoadFlow(
  form: FeederForm,
  lfCase: LoadFlowCase,
  options: LoadFlowOptions = DEFAULT_LOAD_FLOW_OPTIONS,
  prepared: PreparedLoadFlow = prepareLoadFlow(form),
  /** Start voltages (pu) instead of the flat start: a solved neighbouring case. */
  start?: { readonly vRePu: Float64Array; readonly vImPu: Float64Array },
): SolvedCase {
  const n = form.nBus;
  const nb = form.nBranch;
  const nTree = n - 1;
  const nLoop = nb - nTree;
  const diagnostics: Diagnostic[] = [];
  const pre = prepared;

  // Case data per bus (pu): ZIP parts of the demand and fixed shunt susceptance.
  const w = pre.work;
  const { pz, pi, pp, qz, qi, qp } = w;
  for (const a of [pz, pi, pp, qz, qi, qp]) a.fill(0);
  const L = form.loads;
  const scale = lfCase.demandScale / 1000 / BASE_MVA;
  for (let i = 0; i < L.n; i++) {
    const k = L.bus[i]!;
    const p0 = (lfCase.demand === "peak" ? L.peakPKw[i]! : L.minPKw[i]!) * scale;
    const q0 = (lfCase.demand === "peak" ? L.peakQKvar[i]! : L.minQKvar[i]!) * scale;
    pz[k] = pz[k]! + p0 * L.zipZ[i]!;
    pi[k] = pi[k]! + p0 * L.zipI[i]!;
    pp[k] = pp[k]! + p0 * L.zipP[i]!;
    qz[k] = qz[k]! + q0 * L.zipZ[i]!;
    qi[k] = qi[k]! + q0 * L.zipI[i]!;
    qp[k] = qp[k]! + q0 * L.zipP[i]!;
  }
  const bShunt = w.bShunt;
  bShunt.set(pre.lineChargingPu);
  for (let i = 0; i < form.shunts.n; i++) {
    const k = form.shunts.bus[i]!;
    bShunt[k] = bShunt[k]! + form.shunts.qRatedKvar[i]! / 1000 / BASE_MVA;
  }
  const gen = generatorSetpoints(form, lfCase.generationScale);
  const G = form.generators;
  const pvIdx = Int32Array.from(
    Array.from({ length: G.n }, (_, i) => i).filter((i) => gen.mode[i] === Q_VOLTAGE_CONTROL),
  );
  const pvBus = Int32Array.from(pvIdx, (i) => G.bus[i]!);
  const pvKey = pvBus.join(",");
  if (!pre.pvInverses.has(pvKey)) {
    pre.pvInverses.set(pvKey, pvReactanceInverse(form, pre.zIm, pvBus));
  }
  const pvInv = pre.pvInverses.get(pvKey);
  const m = pvIdx.length;
  if (pvInv === undefined) {
    diagnostics.push(makeDiagnostic(
      "loadflow.voltage_control",
      "warning",
      `Feeder "${form.feederId}": voltage-controlled generators share a bus or sit at the source; they are held at fixed reactive power`,
      { feederId: form.feederId },
    ));
  }

  // Working arrays: the preparation's (overwritten here), and the ones the result keeps.
  const { aRe, aIm, gRe, gIm, hasRatio, accRe, accIm, drawRe, drawIm, genP, genQ } = w;
  aRe.set(pre.aRe);
  aIm.set(pre.aIm);
  const vRe = new Float64Array(n), vIm = new Float64Array(n);
  const jRe = new Float64Array(nb), jIm = new Float64Array(nb);
  const dv = new Float64Array(m);
  const eRe = new Float64Array(nLoop), eIm = new Float64Array(nLoop);
  const taps = Int32Array.from(form.transformers, (t) => t.tap.position);

  const setRatio = (ti: number) => {
    const t = form.transformers[ti]!;
    const b = t.branch;
    const r = transformerRatio(
      t,
      taps[ti]!,
      form.vnKv[form.branchFrom[b]!]!,
      form.vnKv[form.branchTo[b]!]!,
    );
    const th = form.shiftDeg[b]! * Math.PI / 180;
    aRe[b] = r * Math.cos(th);
    aIm[b] = r * Math.sin(th);
  };
  form.transformers.forEach((_, ti) => setRatio(ti));
  ratioFactors(aRe, aIm, gRe, gIm, hasRatio);

  // Flat start rotated through the transformers (a sweep with no current), or the start given.
  const th0 = form.source.angleDeg * Math.PI / 180;
  vRe[0] = form.source.vSetPu * Math.cos(th0);
  vIm[0] = form.source.vSetPu * Math.sin(th0);
  const sweep = () =>
    sweepBalanced(
      n,
      form.parent,
      pre.zRe,
      pre.zIm,
      gRe,
      gIm,
      hasRatio,
      drawRe,
      drawIm,
      vRe,
      vIm,
      jRe,
      jIm,
      accRe,
      accIm,
    );
  if (start === undefined) sweep();
  else {
    vRe.set(start.vRePu.subarray(1, n), 1);
    vIm.set(start.vImPu.subarray(1, n), 1);
  }

  let iterations = 0;
  let residual = Infinity;
  let failure: LoadFlowFailure | null = null;
  const tol = options.tolerancePu;
  const alpha = options.reactiveDamping;

  /** Inner loop to convergence at the present tap positions. */
  const solveInner = (): boolean => {
    for (let it = 0; it < options.maxIterations; it++) {
      iterations++;
      // Generator injections per bus.
      genP.fill(0);
      genQ.fill(0);
      for (let i = 0; i < G.n; i++) {
        const k = G.bus[i]!;
        genP[k] = genP[k]! + gen.pPu[i]!;
        genQ[k] = genQ[k]! + gen.qPu[i]!;
      }
      // Draw currents: I = conj(S/V) + jB·V, S = ZIP demand − generation.
      for (let k = 0; k < n; k++) {
        const vr = vRe[k]!, vi = vIm[k]!;
        const v2 = vr * vr + vi * vi;
        const v = Math.sqrt(v2);
        const sp = pp[k]! + pi[k]! * v + pz[k]! * v2 - genP[k]!;
        const sq = qp[k]! + qi[k]! * v + qz[k]! * v2 - genQ[k]!;
        // conj(S/V) = (sp − j·sq)/(vr − j·vi) = ((sp·vr + sq·vi) + j(sp·vi − sq·vr)) / v2
        const b = bShunt[k]!;
        drawRe[k] = (sp * vr + sq * vi) / v2 - b * vi;
        drawIm[k] = (sp * vi - sq * vr) / v2 + b * vr;
      }
      // Loop branch currents: drawn at the `from` bus (through the ratio), fed at the `to` bus.
      for (let l = 0; l < nLoop; l++) {
        const b = pre.loopBranch[l]!;
        const ar = aRe[b]!, ai = aIm[b]!, mm = ar * ar + ai * ai;
        const jr = jRe[b]!, ji = jIm[b]!;
        const f = pre.loopFrom[l]!, t = pre.loopTo[l]!;
        drawRe[f] = drawRe[f]! + (jr * ar - ji * ai) / mm;
        drawIm[f] = drawIm[f]! + (jr * ai + ji * ar) / mm;
        drawRe[t] = drawRe[t]! - jr;
        drawIm[t] = drawIm[t]! - ji;
      }
      let change = sweep();
      // Breakpoint mismatch E = V_from/a − V_to − z·J; correct J by Z_bp⁻¹·E.
      for (let l = 0; l < nLoop; l++) {
        const b = pre.loopBranch[l]!;
        const f = pre.loopFrom[l]!, t = pre.loopTo[l]!;
        const ar = aRe[b]!, ai = aIm[b]!, mm = ar * ar + ai * ai;
        const jr = jRe[b]!, ji = jIm[b]!;
        const zr = pre.zRe[b]!, zi = pre.zIm[b]!;
        eRe[l] = (vRe[f]! * ar + vIm[f]! * ai) / mm - vRe[t]! - (zr * jr - zi * ji);
        eIm[l] = (vIm[f]! * ar - vRe[f]! * ai) / mm - vIm[t]! - (zr * ji + zi * jr);
        const e = magnitude(eRe[l]!, eIm[l]!);
        if (e > change) change = e;
      }
      for (let l = 0; l < nLoop; l++) {
        let dr = 0, di = 0;
        for (let c = 0; c < nLoop; c++) {
          const zr = pre.loopZinvRe[l * nLoop + c]!, zi = pre.loopZinvIm[l * nLoop + c]!;
          dr += zr * eRe[c]! - zi * eIm[c]!;
          di += zr * eIm[c]! + zi * eRe[c]!;
        }
        const b = pre.loopBranch[l]!;
        jRe[b] = jRe[b]! + dr;
        jIm[b] = jIm[b]! + di;
      }
      // Voltage-controlled generators: ΔQ = X⁻¹·Δ|V|, within their limits.
      if (pvInv !== undefined && m > 0) {
        for (let i = 0; i < m; i++) {
          dv[i] = gen.vSetPu[pvIdx[i]!]! - magnitude(vRe[pvBus[i]!]!, vIm[pvBus[i]!]!);
        }
        for (let i = 0; i < m; i++) {
          const g = pvIdx[i]!;
          let dq = 0;
          for (let j = 0; j < m; j++) dq += pvInv[i * m + j]! * dv[j]!;
          const q = Math.max(-gen.qMaxPu[g]!, Math.min(gen.qMaxPu[g]!, gen.qPu[g]! + dq));
          const atLimit = Math.abs(q) >= gen.qMaxPu[g]! * (1 - 1e-12) && dq * q > 0;
          if (!atLimit && Math.abs(dv[i]!) > change) change = Math.abs(dv[i]!);
          gen.qPu[g] = q;
        }
      }
      // Volt-var: damped fixed point Q ← Q + α·(Q(U) − Q).
      for (let g = 0; g < G.n; g++) {
        if (gen.mode[g] !== Q_VOLT_VAR) continue;
        const k = G.bus[g]!;
        const sRated = G.sRatedKva[g]! / 1000 / BASE_MVA;
        const target = Math.max(
          -gen.qMaxPu[g]!,
          Math.min(
            gen.qMaxPu[g]!,
            interpolateCurve(gen.curves[g]!, magnitude(vRe[k]!, vIm[k]!)) * sRated,
          ),
        );
        const gap = target - gen.qPu[g]!;
        if (Math.abs(gap) > change) change = Math.abs(gap);
        gen.qPu[g] = gen.qPu[g]! + alpha * gap;
      }
      residual = change;
      let lowest = Infinity;
      for (let k = 0; k < n; k++) {
        const v = magnitude(vRe[k]!, vIm[k]!);
        if (!(v >= lowest)) lowest = v; // NaN-safe
      }
      if (!(lowest >= options.collapseVoltagePu)) {
        failure = "collapse";
        return false;
      }
      if (change < tol) return true;
    }
    failure = "not_converged";
    return false;
  };

  let converged = solveInner();
  // Outer loop: on-load tap changers step toward their band.
  const oltc = form.transformers.map((t, ti) => ({ t, ti })).filter(({ t }) =>
    t.tap.onLoad && t.tap.control
  );
  const seen = new Set<string>();
  let hunting = false;
  for (
    let step = 0;
    converged && options.tapControl && oltc.length > 0 && step < options.maxTapSteps;
    step++
  ) {
    let moved = false;
    for (const { t, ti } of oltc) {
      const c = t.tap.control!;
      const b = t.branch;
      const k = t.hvIsFrom ? form.branchTo[b]! : form.branchFrom[b]!;
      const zBase = form.vnKv[k]! * form.vnKv[k]! / BASE_MVA;
      const lr = c.ldcROhm / zBase, lx = c.ldcXOhm / zBase;
      const vr = vRe[k]! - (lr * jRe[b]! - lx * jIm[b]!);
      const vi = vIm[k]! - (lr * jIm[b]! + lx * jRe[b]!);
      const dev = magnitude(vr, vi) - c.vSetPu;
      if (Math.abs(dev) <= c.bandPu / 2 || t.tap.stepPercent <= 0) continue;
      const steps = Math.max(1, Math.round(Math.abs(dev) / (t.tap.stepPercent / 100)));
      // Raising an HV-side tap lowers the LV voltage; an LV-side tap raises it.
      const lowerLv = dev > 0;
      const up = (t.tap.side === "hv") === lowerLv;
      const next = Math.max(t.tap.min, Math.min(t.tap.max, taps[ti]! + (up ? steps : -steps)));
      if (next === taps[ti]) {
        diagnostics.push(makeDiagnostic(
          "loadflow.tap_limit",
          "warning",
          `Feeder "${form.feederId}", case "${lfCase.id}": tap changer of "${t.id}" is at its limit ${next} with the controlled voltage ${
            (c.vSetPu + dev).toFixed(4)
          } pu outside its band`,
          { feederId: form.feederId },
        ));
        continue;
      }
      taps[ti] = next;
      setRatio(ti);
      ratioFactors(aRe, aIm, gRe, gIm, hasRatio);
      moved = true;
    }
    if (!moved) break;
    const key = taps.join(",");
    if (seen.has(key)) {
      hunting = true;
      break;
    }
    seen.add(key);
    converged = solveInner();
  }
  if (hunting) {
    diagnostics.push(makeDiagnostic(
      "loadflow.tap_hunting",
      "warning",
      `Feeder "${form.feederId}", case "${lfCase.id}": tap changers return to earlier positions; the band is narrower than a tap step`,
      { feederId: form.feederId },
    ));
  }
  if (!converged) {
    diagnostics.push(makeDiagnostic(
      failure === "collapse" ? "loadflow.collapse" : "loadflow.not_converged",
      "error",
      failure === "collapse"
        ? `Feeder "${form.feederId}", case "${lfCase.id}": voltage collapse — a bus fell below ${options.collapseVoltagePu} pu after ${iterations} iterations (largest mismatch ${
          residual.toExponential(2)
        } pu); the demand cannot be supplied`
        : `Feeder "${form.feederId}", case "${lfCase.id}": load flow did not converge in ${iterations} iterations; largest voltage mismatch ${
          residual.toExponential(2)
        } pu`,
      { feederId: form.feederId },
    ));
  }
  return {
    value: collectResult(
      form,
      pre,
      lfCase,
      { vRe, vIm, jRe, jIm, aRe, aIm, bShunt, pz, pi, pp, qz, qi, qp },
      gen,
      {
        converged,
        failure: converged ? null : failure,
        iterations,
        residual,
        taps,
      },
    ),
    diagnostics,
  };
}

interface State {
  vRe: Float64Array;
  vIm: Float64Array;
  jRe: Float64Array;
  jIm: Float64Array;
  aRe: Float64Array;
  aIm: Float64Array;
  bShunt: Float64Array;
  pz: Float64Array;
  pi: Float64Array;
  pp: Float64Array;
  qz: Float64Array;
  qi: Float64Array;
  qp: Float64Array;
}

function collectResult(
  form: FeederForm,
  pre: PreparedLoadFlow,
  lfCase: LoadFlowCase,
  s: State,
  gen: ReturnType<typeof generatorSetpoints>,
  status: {
    converged: boolean;
    failure: LoadFlowFailure | null;
    iterations: number;
    residual: number;
    taps: Int32Array;
  },
): LoadFlowResult {
  const n = form.nBus, nb = form.nBranch;
  const kw = 1000 * BASE_MVA;
  const vMagPu = new Float64Array(n);
  for (let k = 0; k < n; k++) vMagPu[k] = magnitude(s.vRe[k]!, s.vIm[k]!);
  const iA = new Float64Array(nb);
  const pFromKw = new Float64Array(nb), qFromKvar = new Float64Array(nb);
  const pToKw = new Float64Array(nb), qToKvar = new Float64Array(nb);
  let lossesKw = 0, lossesKvar = 0;
  for (let b = 0; b < nb; b++) {
    const f = form.branchFrom[b]!, t = form.branchTo[b]!;
    const jr = s.jRe[b]!, ji = s.jIm[b]!;
    iA[b] = magnitude(jr, ji) * pre.baseCurrentA[t]!;
    // S_to = V_to·conj(J); S_from = V_from·conj(J)/a (power into the ideal ratio).
    pToKw[b] = (s.vRe[t]! * jr + s.vIm[t]! * ji) * kw;
    qToKvar[b] = (s.vIm[t]! * jr - s.vRe[t]! * ji) * kw;
    const sr = s.vRe[f]! * jr + s.vIm[f]! * ji, si = s.vIm[f]! * jr - s.vRe[f]! * ji;
    const ar = s.aRe[b]!, ai = s.aIm[b]!, mm = ar * ar + ai * ai;
    pFromKw[b] = ((sr * ar + si * ai) / mm) * kw;
    qFromKvar[b] = ((si * ar - sr * ai) / mm) * kw;
    lossesKw += pFromKw[b]! - pToKw[b]!;
    lossesKvar += qFromKvar[b]! - qToKvar[b]!;
  }
  const L = form.loads;
  const loadPKw = new Float64Array(L.n), loadQKvar = new Float64Array(L.n);
  const scale = lfCase.demandScale;
  for (let i = 0; i < L.n; i++) {
    const v = vMagPu[L.bus[i]!]!;
    const f = L.zipZ[i]! * v * v + L.zipI[i]! * v + L.zipP[i]!;
    loadPKw[i] = (lfCase.demand === "peak" ? L.peakPKw[i]! : L.minPKw[i]!) * scale * f;
    loadQKvar[i] = (lfCase.demand === "peak" ? L.peakQKvar[i]! : L.minQKvar[i]!) * scale * f;
  }
  const genPKw = Float64Array.from(gen.pPu, (p) => p * kw);
  const genQKvar = Float64Array.from(gen.qPu, (q) => q * kw);
  // The source's power from its own current: what the branches leaving bus 0 carry (seen
  // through their ratios) plus what bus 0 itself draws, at the solution voltages.
  let iRe = 0, iIm = 0;
  for (let b = 0; b < nb; b++) {
    if (form.branchFrom[b] !== 0) continue;
    const ar = s.aRe[b]!, ai = s.aIm[b]!, mm = ar * ar + ai * ai;
    iRe += (s.jRe[b]! * ar - s.jIm[b]! * ai) / mm;
    iIm += (s.jRe[b]! * ai + s.jIm[b]! * ar) / mm;
  }
  for (let b = 0; b < nb; b++) {
    if (form.branchTo[b] !== 0) continue;
    iRe -= s.jRe[b]!;
    iIm -= s.jIm[b]!;
  }
  {
    const vr = s.vRe[0]!, vi = s.vIm[0]!, v2 = vr * vr + vi * vi, v = Math.sqrt(v2);
    let sp = s.pp[0]! + s.pi[0]! * v + s.pz[0]! * v2, sq = s.qp[0]! + s.qi[0]! * v + s.qz[0]! * v2;
    for (let g = 0; g < form.generators.n; g++) {
      if (form.generators.bus[g] !== 0) continue;
      sp -= gen.pPu[g]!;
      sq -= gen.qPu[g]!;
    }
    iRe += (sp * vr + sq * vi) / v2 - s.bShunt[0]! * vi;
    iIm += (sp * vi - sq * vr) / v2 + s.bShunt[0]! * vr;
  }
  const sourcePKw = (s.vRe[0]! * iRe + s.vIm[0]! * iIm) * kw;
  const sourceQKvar = (s.vIm[0]! * iRe - s.vRe[0]! * iIm) * kw;
  return {
    caseId: lfCase.id,
    converged: status.converged,
    failure: status.failure,
    iterations: status.iterations,
    residualPu: status.residual,
    vRePu: s.vRe,
    vImPu: s.vIm,
    vMagPu,
    iRePu: s.jRe,
    iImPu: s.jIm,
    iA,
    pFromKw,
    qFromKvar,
    pToKw,
    qToKvar,
    sourcePKw,
    sourceQKvar,
    lossesKw,
    lossesKvar,
    loadPKw,
    loadQKvar,
    genPKw,
    genQKvar,
    tapPositions: status.taps,
  };
}
