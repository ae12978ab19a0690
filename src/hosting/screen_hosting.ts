/**
 * Screen of the hosting capacity at every bus from voltage and current sensitivities, in
 * O(n·depth) for the whole feeder — no load flow.
 *
 * On a radial tree a current J injected at bus k changes the voltage of every bus i by
 * Z_common(i, k)·J, the impedance of the path the two share to the source (the source holds
 * its voltage in the load flow), and the current of every branch on k's path by −J. A new
 * unit of active power P and reactive ratio q = Q/P injects J = P·(1 − jq)·e^{jθ_k}/|V_k|.
 * So, walking up from k, each ancestor m (k included) limits P by:
 * - the voltage terms: |V_m + P·Z_m·w| − |V_m| ≤ h(m), with h(m) the smallest headroom in
 *   m's subtree (every bus there whose path leaves k's at m rises as m does) — band upper
 *   edge, generation-caused change (planning limit minus the change already there) and
 *   rapid change when the unit trips (the rise it caused);
 * - the branch into m: |I_m − P·w| ≤ rating (a quadratic in P);
 * - reverse power at a feeder-head device or substation transformer on the path:
 *   P ≤ limit + power flowing forward there now.
 * The quadratics are solved exactly; what the screen leaves out (load voltage dependence,
 * other units' controls, tap changers, off-nominal ratios) is what the confirmation's full
 * load flows add (confirm_hosting.ts). Volt-var units: q follows the curve at the screened
 * voltage, three fixed-point passes.
 *
 * Converter breaking duty is linear in the unit's rating in the short-circuit study's model
 * (its current added in magnitude on the side it feeds), so the screen gives it exactly.
 */
import { magnitude } from "../model/magnitude.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { FaultStudy } from "../solve/study_faults.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import { interpolateCurve } from "../solve/interpolate_curve.ts";
import { qOfPowerFactor } from "../solve/_generator_setpoints.ts";
import { BRANCH_TRANSFORMER } from "../model/feeder_form.ts";
import type { HostingBase } from "./hosting_base.ts";
import type { HostingCriterion } from "./hosting_margin.ts";
import { type HostingStrategy, unitRatingKva } from "./hosting_settings.ts";

export interface ScreenedBus {
  /** Screened capacity, kW (maxMw·1000 when nothing binds inside the range). */
  readonly pKw: number;
  readonly criterion: HostingCriterion;
  readonly where: FindingPlace;
  /** d(margin)/dP of the binding term at pKw, margin units per kW (see hosting_margin.ts). */
  readonly slopePerKw: number;
  /** The binding term's check code, as the trial margin names it. */
  readonly code: string;
  /** Current the unit injects per pu of active power at the answer, pu (the trials' start). */
  readonly wRe: number;
  readonly wIm: number;
}

/** Q/P at a power factor from a cos φ(P) curve (positive absorbing, the load flow's convention). */
const qRatioOfCurve = (pf: number) => qOfPowerFactor(1, pf, pf > 0);

const TERMS = 3; // band, change, rapid
/** The trial margin's code of each criterion the screen can name. */
const CODE: Partial<Record<HostingCriterion, string>> & Record<"search_range", string> = {
  overvoltage: "voltage.above_band",
  voltage_change: "voltage.dg_change",
  rapid_change: "hosting.rapid_change",
  thermal: "thermal.overload",
  search_range: "hosting.range",
};
const CRITERIA: readonly HostingCriterion[] = ["overvoltage", "voltage_change", "rapid_change"];

/** The screened load-flow capacity of every bus (index 0, the source bus, gets the range). */
export function screenHosting(base: HostingBase, strategy: HostingStrategy): ScreenedBus[] {
  const { form, solved, withoutGeneration: b0, settings, hosting, prepared } = base;
  const n = form.nBus, parent = form.parent;
  const { limits, checks } = settings;
  const maxPu = hosting.maxMw;
  const { zpRe, zpIm } = base;
  // Smallest headroom of each voltage term in each subtree, and where.
  const h = new Float64Array(n * TERMS).fill(Infinity), at = new Int32Array(n * TERMS).fill(-1);
  for (let i = 0; i < n; i++) {
    const lv = form.vnKv[i]! <= limits.lvMaxKv, v = solved.vMagPu[i]!;
    const band = lv ? limits.voltageBand.lv : limits.voltageBand.mv;
    const own = [
      checks.voltageBand && !base.skip.has(`voltage.above_band|${i}`) &&
        !base.skip.has(`voltage.below_band|${i}`)
        ? band.vMaxPu - v
        : Infinity,
      checks.voltageChange && !base.skip.has(`voltage.dg_change|${i}`)
        ? (lv ? limits.voltageChange.lvLimitPercent : limits.voltageChange.mvLimitPercent) / 100 -
          (v - b0.vMagPu[i]!)
        : Infinity,
      (lv ? hosting.rapidChange.lvLimitPercent : hosting.rapidChange.mvLimitPercent) / 100,
    ];
    for (let t = 0; t < TERMS; t++) {
      if (own[t]! < h[i * TERMS + t]!) {
        h[i * TERMS + t] = own[t]!;
        at[i * TERMS + t] = i;
      }
    }
  }
  for (let k = n - 1; k > 0; k--) {
    const p = parent[k]!;
    for (let t = 0; t < TERMS; t++) {
      if (h[k * TERMS + t]! < h[p * TERMS + t]!) {
        h[p * TERMS + t] = h[k * TERMS + t]!;
        at[p * TERMS + t] = at[k * TERMS + t]!;
      }
    }
  }
  // Thermal limit of the branch into each bus, pu current (Infinity: none).
  const iLim = new Float64Array(n).fill(Infinity);
  if (checks.thermal) {
    for (let k = 1; k < n; k++) {
      const b = k - 1, rating = form.ratingA[b]!;
      if (!(rating > 0) || !Number.isFinite(rating) || base.skip.has(`thermal.overload|${b}`)) {
        continue;
      }
      iLim[k] = limits.thermal.limitPercent / 100 * rating / prepared.baseCurrentA[k]!;
    }
  }
  // Reverse power: the tightest limit on the path, kW (limit + forward flow there now).
  const revKw = new Float64Array(n).fill(Infinity), revAt = new Int32Array(n).fill(-1);
  const { headLimitKw, transformerLimitKw } = hosting.reversePower;
  const ownRev = new Float64Array(n).fill(Infinity);
  // The element the trial margin names (device or transformer id) and its code.
  const revId: string[] = new Array(n).fill(""), revCode: string[] = new Array(n).fill("");
  if (headLimitKw !== null) {
    for (const d of form.devices) {
      if (!d.isHead || d.branch >= n - 1 || -solved.pFromKw[d.branch]! > headLimitKw) continue;
      const k = d.branch + 1, lim = headLimitKw + solved.pFromKw[d.branch]!;
      if (lim < ownRev[k]!) {
        ownRev[k] = lim;
        revId[k] = d.id;
        revCode[k] = "flow.reverse_head";
      }
    }
  }
  if (transformerLimitKw !== null) {
    for (const t of form.transformers) {
      const b = t.branch;
      if (b >= n - 1 || form.branchTo[b]! >= form.substationBusCount) continue;
      if (form.branchKind[b] !== BRANCH_TRANSFORMER || -solved.pFromKw[b]! > transformerLimitKw) {
        continue;
      }
      const lim = transformerLimitKw + solved.pFromKw[b]!;
      if (lim < ownRev[b + 1]!) {
        ownRev[b + 1] = lim;
        revId[b + 1] = t.id;
        revCode[b + 1] = "flow.reverse_transformer";
      }
    }
  }
  for (let k = 1; k < n; k++) {
    const p = parent[k]!;
    revKw[k] = revKw[p]!;
    revAt[k] = revAt[p]!;
    if (ownRev[k]! < revKw[k]!) {
      revKw[k] = ownRev[k]!;
      revAt[k] = k;
    }
  }

  const r = strategy.reactive;
  const oversize = unitRatingKva(r, 1);
  const out: ScreenedBus[] = [];
  out.push({
    pKw: maxPu * 1000,
    criterion: "search_range",
    where: place(form, "bus", 0),
    slopePerKw: 0,
    code: CODE.search_range,
    wRe: 0,
    wIm: 0,
  });
  for (let k = 1; k < n; k++) {
    const vr0 = solved.vRePu[k]!, vi0 = solved.vImPu[k]!, v0 = magnitude(vr0, vi0);
    const cth = vr0 / v0, sth = vi0 / v0;
    let q = r.mode === "fixed_power_factor"
      ? -Math.sqrt(1 - r.powerFactor ** 2) / r.powerFactor
      : r.mode === "power_factor_of_p"
      ? qRatioOfCurve(interpolateCurve(r.points, 1))
      : 0;
    let vk = v0;
    let best: ScreenedBus = out[0]!;
    // Passes: |V_k| at the answer (the unit's current shrinks as its voltage rises), and
    // volt-var's Q at that voltage.
    for (let pass = 0; pass < (r.mode === "volt_var" ? 3 : 2); pass++) {
      if (r.mode === "volt_var") q = interpolateCurve(r.points, vk) * oversize;
      // w = (1 − jq)·e^{jθ}/|V_k|: injected current per pu of active power.
      const wr = (cth + q * sth) / vk, wi = (sth - q * cth) / vk;
      let pBest = maxPu, crit: HostingCriterion = "search_range", where = place(form, "bus", k);
      let slope = 0, code = CODE.search_range;
      for (let m = k; m > 0; m = parent[m]!) {
        const ur = zpRe[m]! * wr - zpIm[m]! * wi, ui = zpRe[m]! * wi + zpIm[m]! * wr;
        const vmr = solved.vRePu[m]!, vmi = solved.vImPu[m]!, vm = magnitude(vmr, vmi);
        for (let t = 0; t < TERMS; t++) {
          const ht = h[m * TERMS + t]!;
          if (!Number.isFinite(ht)) continue;
          const p = rootOfMagnitude(vmr, vmi, ur, ui, vm + Math.max(ht, 0));
          if (p < pBest) {
            pBest = p;
            crit = CRITERIA[t]!;
            where = place(form, "bus", at[m * TERMS + t]!);
            slope = magnitudeSlope(vmr, vmi, ur, ui, p) / 1000;
          }
        }
        const lim = iLim[m]!;
        if (Number.isFinite(lim)) {
          const ir = solved.iRePu[m - 1]!, ii = solved.iImPu[m - 1]!;
          const p = rootOfMagnitude(ir, ii, -wr, -wi, lim);
          if (p < pBest) {
            pBest = p;
            crit = "thermal";
            where = place(form, "branch", m - 1);
            const ratingPu = lim / (limits.thermal.limitPercent / 100);
            slope = magnitudeSlope(ir, ii, -wr, -wi, p) / ratingPu / 1000;
          }
        }
      }
      if (revKw[k]! / 1000 < pBest) {
        pBest = Math.max(revKw[k]! / 1000, 0);
        crit = "reverse_power";
        where = { kind: "branch", id: revId[revAt[k]!]! };
        code = revCode[revAt[k]!]!;
        slope = 1 / 1000;
      } else code = CODE[crit] ?? CODE.search_range;
      best = {
        pKw: pBest * 1000,
        criterion: crit,
        where,
        slopePerKw: slope,
        code,
        wRe: wr,
        wIm: wi,
      };
      vk = magnitude(
        vr0 + pBest * (zpRe[k]! * wr - zpIm[k]! * wi),
        vi0 + pBest * (zpRe[k]! * wi + zpIm[k]! * wr),
      );
      if (!Number.isFinite(vk)) vk = v0;
    }
    out.push(best);
  }
  return out;
}

/** The smallest P ≥ 0 with |a + P·u| = target (Infinity when never). */
function rootOfMagnitude(ar: number, ai: number, ur: number, ui: number, target: number): number {
  const A = ur * ur + ui * ui, B = 2 * (ar * ur + ai * ui), C = ar * ar + ai * ai - target * target;
  if (C >= 0) return 0;
  if (A === 0) return Infinity;
  return (-B + Math.sqrt(B * B - 4 * A * C)) / (2 * A);
}

/** d|a + P·u|/dP at P. */
function magnitudeSlope(ar: number, ai: number, ur: number, ui: number, p: number): number {
  const xr = ar + p * ur, xi = ai + p * ui, m = magnitude(xr, xi);
  return m > 0 ? (xr * ur + xi * ui) / m : 0;
}

function place(form: FeederForm, kind: "bus" | "branch", i: number): FindingPlace {
  return { kind, id: kind === "bus" ? form.busIds[i]! : form.branchIds[i]! };
}

/**
 * Largest converter (active power, kW) at each bus before a switching device's breaking or
 * making duty goes past its rating, from the base short-circuit study: the unit's fault
 * current (limit × rating) adds to the side of each device it feeds. Devices already past
 * their rating without the unit do not bind. Infinity where nothing limits; the device that
 * does, per bus.
 */
export function screenConverterDuty(
  form: FeederForm,
  faults: FaultStudy,
  fault: FaultSettings,
  strategy: HostingStrategy,
): { readonly limitKw: Float64Array; readonly device: readonly (string | null)[] } {
  const n = form.nBus;
  const out = new Float64Array(n).fill(Infinity);
  const device: (string | null)[] = new Array(n).fill(null);
  if (faults.devices.length === 0) return { limitKw: out, device };
  // Euler numbering: bus i is in the subtree of m when tin[m] ≤ tin[i] < tout[m].
  const size = new Int32Array(n).fill(1);
  for (let k = n - 1; k > 0; k--) size[form.parent[k]!]! += size[k]!;
  const tin = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    let c0 = tin[k]! + 1;
    for (let c = form.childStart[k]!; c < form.childStart[k + 1]!; c++) {
      const ch = form.children[c]!;
      tin[ch] = c0;
      c0 += size[ch]!;
    }
  }
  // kA of fault current per kW of active power, at a bus of voltage vn.
  const kaPerKw = (vn: number) =>
    fault.converterLimitPu * unitRatingKva(strategy.reactive, 1) / 1000 / (Math.sqrt(3) * vn);
  const byId = new Map(form.devices.map((d) => [d.id, d]));
  for (const row of faults.devices) {
    const d = byId.get(row.id);
    if (d === undefined || d.branch >= n - 1) continue;
    const m = d.branch + 1, p = form.parent[m]!;
    const peakRatio = row.dutyKa > 0 ? row.peakKa / row.dutyKa : 2 * Math.SQRT2;
    let limitKa = Infinity;
    if (row.breakingCurrentA !== null) limitKa = row.breakingCurrentA / 1000;
    if (row.makingCurrentA !== null) {
      limitKa = Math.min(limitKa, row.makingCurrentA / 1000 / peakRatio);
    }
    if (!Number.isFinite(limitKa) || row.dutyKa > limitKa) continue;
    // Inside m's subtree the unit feeds faults on the source side (reverse, at p's level);
    // elsewhere it feeds faults beyond the device (forward, at m's level).
    const inside = (limitKa - row.reverseKa) / kaPerKw(form.vnKv[p]!);
    const outside = (limitKa - row.forwardKa) / kaPerKw(form.vnKv[m]!);
    for (let k = 1; k < n; k++) {
      const sub = tin[k]! >= tin[m]! && tin[k]! < tin[m]! + size[m]!;
      const lim = sub ? inside : outside;
      if (lim < out[k]!) {
        out[k] = lim;
        device[k] = row.id;
      }
    }
  }
  return { limitKw: out, device };
}
