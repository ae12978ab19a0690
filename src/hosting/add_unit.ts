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
  const grow = <T extends Float64Array | Int32Array | Uint8Array>(a: T, extra: number[]): T => {
    const out = new (a.constructor as new (n: number) => T)(n);
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
      bus: grow(g.bus, units.map((u) => u.bus)),
      kind: grow(
        g.kind,
        units.map((u) => u.kind === "synchronous" ? GENERATOR_SYNCHRONOUS : GENERATOR_CONVERTER),
      ),
      sRatedKva: grow(g.sRatedKva, units.map((u) => unitRatingKva(u.strategy.reactive, u.pKw))),
      pKw: grow(g.pKw, units.map((u) => u.pKw / scale)),
      phases: grow(g.phases, units.map((u) => form.busPhases[u.bus]!)),
      delta: grow(g.delta, units.map(() => 0)),
      reactive: [...g.reactive, ...units.map((u) => modeOf(u.strategy))],
      faultCurrentLimitPu: grow(g.faultCurrentLimitPu, units.map(() => NaN)),
      xdSubtransientPu: grow(g.xdSubtransientPu, units.map(() => NaN)),
      rToX: grow(g.rToX, units.map(() => NaN)),
      lockedRotorRatio: grow(g.lockedRotorRatio, units.map(() => NaN)),
      rideThrough: [...g.rideThrough, ...units.map(() => null)],
    },
    reactiveCurves: curves,
  };
}

/** The form with every transformer's tap at the given positions (a solved case's). */
export function withTapPositions(form: FeederForm, positions: Int32Array): FeederForm {
  return {
    ...form,
    transformers: form.transformers.map((t, i) =>
      t.tap.position === positions[i] ? t : { ...t, tap: { ...t.tap, position: positions[i]! } }
    ),
  };
}
