/**
 * The feeder just after a fault is cleared: the section the clearing device isolated has no
 * load and no generation left (its buses float, and are left out of every check), the
 * generators that tripped are gone, and the stalled motors draw their locked-rotor power as a
 * constant impedance (the rest of each such load keeps its own model). The original form is
 * never changed.
 */
import type { FeederForm, FormGenerators, FormLoads } from "../model/feeder_form.ts";

export interface PostFaultChange {
  /** 1 for a bus the clearing device cut off. */
  readonly isolated: Uint8Array;
  /** Generators out of service (tripped, or on an isolated bus). */
  readonly generatorsOut: ReadonlySet<number>;
  /** Loads whose motors stalled. */
  readonly stalled: ReadonlySet<number>;
  readonly lockedRotorRatio: number;
  readonly lockedRotorPowerFactor: number;
}

export function postFaultForm(form: FeederForm, c: PostFaultChange): FeederForm {
  return {
    ...form,
    loads: postFaultLoads(form.loads, c),
    generators: keptGenerators(form.generators, c.generatorsOut),
  };
}

function postFaultLoads(L: FormLoads, c: PostFaultChange): FormLoads {
  const scale = new Float64Array(L.n).fill(1);
  const extra: number[] = [];
  for (let i = 0; i < L.n; i++) {
    if (c.isolated[L.bus[i]!]) scale[i] = 0;
    else if (c.stalled.has(i)) {
      scale[i] = 1 - L.motorShare[i]!;
      extra.push(i);
    }
  }
  const m = extra.length;
  const grow = <T extends Float64Array | Int32Array | Uint8Array>(
    a: T,
    value: (i: number) => number,
  ): T => {
    const out = new (a.constructor as new (n: number) => T)(L.n + m);
    out.set(a);
    extra.forEach((i, j) => (out[L.n + j] = value(i)));
    return out;
  };
  const scaled = (a: Float64Array) => {
    const out = grow(a, () => 0);
    for (let i = 0; i < L.n; i++) out[i] = a[i]! * scale[i]!;
    return out;
  };
  // Locked rotor: ratio × the motor's running apparent power, at its power factor, taken as
  // an impedance (power at 1 pu).
  const sin = Math.sqrt(1 - c.lockedRotorPowerFactor ** 2);
  const motorS = (i: number, p: Float64Array, q: Float64Array) =>
    L.motorShare[i]! * Math.hypot(p[i]!, q[i]!) * c.lockedRotorRatio;
  const peakP = scaled(L.peakPKw), peakQ = scaled(L.peakQKvar);
  const minP = scaled(L.minPKw), minQ = scaled(L.minQKvar);
  extra.forEach((i, j) => {
    const sp = motorS(i, L.peakPKw, L.peakQKvar), sm = motorS(i, L.minPKw, L.minQKvar);
    peakP[L.n + j] = sp * c.lockedRotorPowerFactor;
    peakQ[L.n + j] = sp * sin;
    minP[L.n + j] = sm * c.lockedRotorPowerFactor;
    minQ[L.n + j] = sm * sin;
  });
  return {
    n: L.n + m,
    ids: [...L.ids, ...extra.map((i) => `${L.ids[i]} (stalled motors)`)],
    bus: grow(L.bus, (i) => L.bus[i]!),
    peakPKw: peakP,
    peakQKvar: peakQ,
    minPKw: minP,
    minQKvar: minQ,
    zipZ: grow(L.zipZ, () => 1),
    zipI: grow(L.zipI, () => 0),
    zipP: grow(L.zipP, () => 0),
    motorShare: grow(L.motorShare, () => 0),
    stallVoltagePu: grow(L.stallVoltagePu, () => NaN),
    stallTimeS: grow(L.stallTimeS, () => NaN),
    phases: grow(L.phases, (i) => L.phases[i]!),
    delta: grow(L.delta, (i) => L.delta[i]!),
    customers: grow(L.customers, () => 0),
  };
}

function keptGenerators(g: FormGenerators, out: ReadonlySet<number>): FormGenerators {
  if (out.size === 0) return g;
  const keep: number[] = [];
  for (let i = 0; i < g.n; i++) if (!out.has(i)) keep.push(i);
  const pick = <T extends Float64Array | Int32Array | Uint8Array>(a: T): T => {
    const r = new (a.constructor as new (n: number) => T)(keep.length);
    keep.forEach((i, j) => (r[j] = a[i]!));
    return r;
  };
  return {
    n: keep.length,
    ids: keep.map((i) => g.ids[i]!),
    bus: pick(g.bus),
    kind: pick(g.kind),
    sRatedKva: pick(g.sRatedKva),
    pKw: pick(g.pKw),
    phases: pick(g.phases),
    delta: pick(g.delta),
    reactive: keep.map((i) => g.reactive[i]!),
    faultCurrentLimitPu: pick(g.faultCurrentLimitPu),
    xdSubtransientPu: pick(g.xdSubtransientPu),
    rToX: pick(g.rToX),
    lockedRotorRatio: pick(g.lockedRotorRatio),
    rideThrough: keep.map((i) => g.rideThrough[i]!),
  };
}
