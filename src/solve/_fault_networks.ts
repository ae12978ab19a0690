/**
 * The sequence networks of a feeder for one short-circuit condition, per unit on 1 MVA and
 * each bus's nominal voltage (IEC 60909-0:2016; formulas in ../shared/guide/REFERENCES.md D,
 * [memory]). Loads and line capacitance are neglected, as the method says.
 *
 * - Network feeder at the source bus: ZQ = cQ·UnQ²/S″kQ with the source's R/X; zero
 *   sequence X0 = (X0/X1)·XQ, R0 = (R0/X0)·X0, earthed as the source says.
 * - Lines: R1 + jX1 and R0 + jX0; for minimum currents the resistances at the conductor end
 *   temperature, R = (1 + 0.004·(θe − 20 °C))·R20.
 * - Transformers: ZT from uk and the load losses, times KT = 0.95·cmax/(1 + 0.6·xT) for
 *   every transformer (network transformers); zero sequence by vector group: both windings
 *   earthed stars pass it in series (with 3·Zn of each star point); an earthed star facing a
 *   delta is a shunt to earth on its own side (ZT0 + 3·Zn); otherwise blocked.
 * - Synchronous generators: ZG = (RG + jX″d)·UrG²/SrG times KG = cmax/(1 + x″d·sin φrG)
 *   (UrG = Un), in the positive and negative sequence; unearthed in the zero sequence.
 * - Induction machines: ZM = (1/(ILR/IrM))·UrM²/SrM with RM/XM as given, else 0.1 at MV
 *   from 1 MVA, 0.15 at MV below, 0.42 at LV; positive and negative sequence.
 * - Full-size converters: positive-sequence current sources of their stated limit times
 *   rated current (superposed by the study, not part of these networks).
 */
import {
  BRANCH_LINE,
  BRANCH_TRANSFORMER,
  type FeederForm,
  GENERATOR_CONVERTER,
  GENERATOR_INDUCTION,
  GENERATOR_SYNCHRONOUS,
} from "../model/feeder_form.ts";
import type { Earthing, WindingConnection } from "../model/network.ts";
import { passesZeroSequence } from "../model/vector_group.ts";
import type { FaultSettings } from "./fault_settings.ts";

export type FaultCondition = "max" | "maxWithoutGeneration" | "min" | "minWithGeneration";

export interface SequenceNetworks {
  readonly condition: FaultCondition;
  /** Series impedance per branch, positive (= negative) and zero sequence; not finite = open. */
  readonly z1Re: Float64Array;
  readonly z1Im: Float64Array;
  readonly z0Re: Float64Array;
  readonly z0Im: Float64Array;
  /** Shunt admittance to earth per bus, per sequence. */
  readonly y1Re: Float64Array;
  readonly y1Im: Float64Array;
  readonly y2Re: Float64Array;
  readonly y2Im: Float64Array;
  readonly y0Re: Float64Array;
  readonly y0Im: Float64Array;
  /** Voltage factor c at each bus for this condition. */
  readonly c: Float64Array;
  /** Converter current sources: bus and current, pu of the bus's base current. */
  readonly converterBus: Int32Array;
  readonly converterIPu: Float64Array;
}

export function buildSequenceNetworks(
  form: FeederForm,
  condition: FaultCondition,
  s: FaultSettings,
  lvMaxKv: number,
): SequenceNetworks {
  const n = form.nBus, nb = form.nBranch;
  const max = condition === "max" || condition === "maxWithoutGeneration";
  const lv = (k: number) => form.vnKv[k]! <= lvMaxKv;
  const c = Float64Array.from(
    { length: n },
    (_, k) => max ? (lv(k) ? s.cMaxLv : s.cMaxMv) : (lv(k) ? s.cMinLv : s.cMinMv),
  );
  const cMaxAt = (k: number) => (lv(k) ? s.cMaxLv : s.cMaxMv);
  const z1Re = new Float64Array(nb), z1Im = new Float64Array(nb);
  const z0Re = new Float64Array(nb), z0Im = new Float64Array(nb);
  const y1Re = new Float64Array(n), y1Im = new Float64Array(n);
  const y2Re = new Float64Array(n), y2Im = new Float64Array(n);
  const y0Re = new Float64Array(n), y0Im = new Float64Array(n);
  const addShunt = (re: Float64Array, im: Float64Array, k: number, zr: number, zi: number) => {
    const d = zr * zr + zi * zi;
    if (!(d > 0) || !Number.isFinite(d)) return;
    re[k] = re[k]! + zr / d;
    im[k] = im[k]! - zi / d;
  };
  const zBase = (k: number) => form.vnKv[k]! * form.vnKv[k]!;
  const tempFactor = max ? 1 : 1 + 0.004 * (s.lineEndTemperatureC - 20);

  // Network feeder.
  const src = form.source;
  const sk = max ? src.skMaxMva : src.skMinMva;
  const zq = c[0]! / sk; // pu: cQ·UnQ²/S″kQ over UnQ²/1 MVA
  const xq = zq / Math.sqrt(1 + src.rToX * src.rToX), rq = src.rToX * xq;
  addShunt(y1Re, y1Im, 0, rq, xq);
  addShunt(y2Re, y2Im, 0, rq, xq);
  const x0q = src.x0ToX1 * xq, r0q = src.r0ToX0 * x0q;
  const srcEarth = earthingPu(src.earthing, zBase(0));
  if (srcEarth !== null) addShunt(y0Re, y0Im, 0, r0q + srcEarth.re, x0q + srcEarth.im);

  for (let b = 0; b < nb; b++) {
    const to = form.branchTo[b]!;
    const base = zBase(to);
    if (form.branchKind[b] === BRANCH_LINE) {
      z1Re[b] = tempFactor * form.r1Ohm[b]! / base;
      z1Im[b] = form.x1Ohm[b]! / base;
      z0Re[b] = tempFactor * form.r0Ohm[b]! / base;
      z0Im[b] = form.x0Ohm[b]! / base;
    } else if (form.branchKind[b] !== BRANCH_TRANSFORMER) {
      // A closed switching device: no impedance in any sequence.
    } else {
      z0Re[b] = Infinity;
      z0Im[b] = Infinity;
    }
  }
  for (const t of form.transformers) {
    const b = t.branch, from = form.branchFrom[b]!, to = form.branchTo[b]!;
    const ratedBase = (t.hvIsFrom ? t.lvKv : t.hvKv) ** 2 / t.sRatedMva;
    const xT = form.x1Ohm[b]! / ratedBase;
    const kt = 0.95 * cMaxAt(t.hvIsFrom ? to : from) / (1 + 0.6 * xT);
    const base = zBase(to);
    z1Re[b] = kt * form.r1Ohm[b]! / base;
    z1Im[b] = kt * form.x1Ohm[b]! / base;
    const z0r = kt * form.r0Ohm[b]! / base, z0i = kt * form.x0Ohm[b]! / base;
    const hvBus = t.hvIsFrom ? from : to, lvBus = t.hvIsFrom ? to : from;
    const hvPass = passesZeroSequence(t.vectorGroup.hv as WindingConnection),
      lvPass = passesZeroSequence(t.vectorGroup.lv as WindingConnection);
    const hvN = hvPass ? earthingPu(t.hvEarthing, zBase(hvBus)) : null;
    const lvN = lvPass ? earthingPu(t.lvEarthing, zBase(lvBus)) : null;
    if (hvN !== null && lvN !== null) {
      z0Re[b] = z0r + hvN.re + lvN.re;
      z0Im[b] = z0i + hvN.im + lvN.im;
    } else if (hvN !== null && t.vectorGroup.lv === "D") {
      addShunt(y0Re, y0Im, hvBus, z0r + hvN.re, z0i + hvN.im);
    } else if (lvN !== null && t.vectorGroup.hv === "D") {
      addShunt(y0Re, y0Im, lvBus, z0r + lvN.re, z0i + lvN.im);
    }
  }

  // Machines and converters.
  const g = form.generators;
  const withGeneration = condition === "max" || condition === "minWithGeneration" ||
    (condition === "min" && s.minWithGeneration);
  const convBus: number[] = [], convI: number[] = [];
  const sinPhi = Math.sqrt(Math.max(0, 1 - s.synchronousPowerFactor ** 2));
  for (let i = 0; withGeneration && i < g.n; i++) {
    const k = g.bus[i]!, sMva = g.sRatedKva[i]! / 1000;
    if (!(sMva > 0)) continue;
    if (g.kind[i] === GENERATOR_SYNCHRONOUS) {
      const xd = Number.isFinite(g.xdSubtransientPu[i]!) ? g.xdSubtransientPu[i]! : 0.15;
      const rx = Number.isFinite(g.rToX[i]!) ? g.rToX[i]! : (lv(k) ? 0.15 : 0.07);
      const kg = cMaxAt(k) / (1 + xd * sinPhi);
      const x = kg * xd / sMva, r = rx * x;
      addShunt(y1Re, y1Im, k, r, x);
      addShunt(y2Re, y2Im, k, r, x);
    } else if (g.kind[i] === GENERATOR_INDUCTION) {
      const lr = Number.isFinite(g.lockedRotorRatio[i]!) ? g.lockedRotorRatio[i]! : 6;
      const rx = Number.isFinite(g.rToX[i]!) ? g.rToX[i]! : lv(k) ? 0.42 : sMva >= 1 ? 0.1 : 0.15;
      const zm = 1 / (lr * sMva), x = zm / Math.sqrt(1 + rx * rx), r = rx * x;
      addShunt(y1Re, y1Im, k, r, x);
      addShunt(y2Re, y2Im, k, r, x);
    } else if (g.kind[i] === GENERATOR_CONVERTER) {
      const limit = Number.isFinite(g.faultCurrentLimitPu[i]!)
        ? g.faultCurrentLimitPu[i]!
        : s.converterLimitPu;
      convBus.push(k);
      convI.push(limit * sMva); // rated current in pu of the bus base (1 MVA) is SrG in MVA
    }
  }
  return {
    condition,
    z1Re,
    z1Im,
    z0Re,
    z0Im,
    y1Re,
    y1Im,
    y2Re,
    y2Im,
    y0Re,
    y0Im,
    c,
    converterBus: Int32Array.from(convBus),
    converterIPu: Float64Array.from(convI),
  };
}

/** 3·Zn of an earthed star point in pu of its side's base; null where it is not earthed. */
function earthingPu(e: Earthing, zBaseOhm: number): { re: number; im: number } | null {
  if (e.kind === "solid") return { re: 0, im: 0 };
  if (e.kind === "impedance") return { re: 3 * e.rOhm / zBaseOhm, im: 3 * e.xOhm / zBaseOhm };
  return null; // isolated or resonant: no zero-sequence path to earth worth a fault current
}
