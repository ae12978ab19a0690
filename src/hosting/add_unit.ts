/**
 * A copy of a feeder's form with new generating units added at buses, each with a
 * reactive-power strategy: what the hosting study and the queue check solve. The original
 * form is never changed; only the generator arrays (and the strategies' curves) are new.
 */
import {
  type FeederForm,
  GENERATOR_CONVERTER,
  GENERATOR_SYNCHRONOUS,
} from "../model/feeder_form.ts";
import type { ReactiveCurve, ReactiveMode } from "../model/network.ts";
import { type HostingStrategy, unitRatingKva } from "./hosting_settings.ts";

export interface NewUnit {
  readonly id: string;
  readonly bus: number;
  /** Active power the unit delivers in the studied case, kW. */
  readonly pKw: number;
  readonly kind: "converter" | "synchronous";
  readonly strategy: HostingStrategy;
}

/** The curve id a strategy's curve gets inside the form. */
function curveIdOf(s: HostingStrategy): string {
  return `hosting:${s.id}`;
}

function modeOf(s: HostingStrategy): ReactiveMode {
  const r = s.reactive;
  switch (r.mode) {
    case "unity":
      return { mode: "unity" };
    case "fixed_power_factor":
      return { mode: "fixed_power_factor", powerFactor: r.powerFactor, sense: "absorbing" };
    case "volt_var":
      return { mode: "volt_var", curveId: curveIdOf(s) };
    case "power_factor_of_p":
      return { mode: "power_factor_of_p", curveId: curveIdOf(s) };
  }
}

/**
 * The form with `units` added. `generationScale` is the studied case's: each unit's stated
 * power is divided by it so that it delivers exactly pKw in that case.
 */
export function withUnitsAdded(
  form: FeederForm,
  units: readonly NewUnit[],
  generationScale: number,
): FeederForm {
  if (units.length === 0) return form;
  const g = form.generators, m = units.length, n = g.n + m;
  // Typed-array copies one longer per unit; each caller names the constructor (looking it up
  // on the array is a slow, megamorphic call in V8).
  const grow = <T extends Float64Array | Int32Array | Uint8Array>(
    make: new (length: number) => T,
    a: T,
    extra: number[],
  ): T => {
    const out = new make(n);
    out.set(a);
    out.set(extra, g.n);
    return out;
  };
  const scale = generationScale > 0 ? generationScale : 1;
  const curves: ReactiveCurve[] = [...form.reactiveCurves];
  const known = new Set(curves.map((c) => c.id));
  for (const u of units) {
    const r = u.strategy.reactive;
    const id = curveIdOf(u.strategy);
    if ((r.mode === "volt_var" || r.mode === "power_factor_of_p") && !known.has(id)) {
      known.add(id);
      curves.push({ id, kind: r.mode, points: r.points, at: { file: "pipeline config" } });
    }
  }
  return {
    ...form,
    generators: {
      n,
      ids: [...g.ids, ...units.map((u) => u.id)],
      bus: grow(Int32Array, g.bus, units.map((u) => u.bus)),
      kind: grow(
        Uint8Array,
        g.kind,
        units.map((u) => u.kind === "synchronous" ? GENERATOR_SYNCHRONOUS : GENERATOR_CONVERTER),
      ),
      sRatedKva: grow(
        Float64Array,
        g.sRatedKva,
        units.map((u) => unitRatingKva(u.strategy.reactive, u.pKw)),
      ),
      pKw: grow(Float64Array, g.pKw, units.map((u) => u.pKw / scale)),
      phases: grow(Uint8Array, g.phases, units.map((u) => form.busPhases[u.bus]!)),
      delta: grow(Uint8Array, g.delta, units.map(() => 0)),
      reactive: [...g.reactive, ...units.map((u) => modeOf(u.strategy))],
      faultCurrentLimitPu: grow(Float64Array, g.faultCurrentLimitPu, units.map(() => NaN)),
      xdSubtransientPu: grow(Float64Array, g.xdSubtransientPu, units.map(() => NaN)),
      rToX: grow(Float64Array, g.rToX, units.map(() => NaN)),
      lockedRotorRatio: grow(Float64Array, g.lockedRotorRatio, units.map(() => NaN)),
      rideThrough: [...g.rideThrough, ...units.map(() => null)],
    },
    reactiveCurves: curves,
  };
}
