/**
 * Generator set-points of one case: active power, the reactive control mode and its data.
 * A generation scale of 0 takes every generator out of service (no P and no Q); otherwise
 * P scales and Q follows the mode: unity 0; fixed power factor ∓P·tan φ; fixed Q as given;
 * cos φ(P) from the curve at P/S_rated; volt-var and voltage control are solved inside
 * the load flow, limited to ±√(S² − P²).
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { CurvePoint } from "../model/network.ts";
import { interpolateCurve } from "./interpolate_curve.ts";
import { BASE_MVA } from "./prepare_load_flow.ts";

/** Reactive modes solved inside the load flow (0 = fixed for the whole case). */
export const Q_VOLT_VAR = 1;
export const Q_VOLTAGE_CONTROL = 2;

export interface GeneratorSetpoints {
  readonly pPu: Float64Array;
  /** Reactive injection; the start value for the solved modes. */
  readonly qPu: Float64Array;
  readonly qMaxPu: Float64Array;
  readonly mode: Uint8Array;
  readonly vSetPu: Float64Array;
  /** Volt-var curve per generator (empty for other modes), Q in pu of rated power. */
  readonly curves: readonly (readonly CurvePoint[])[];
}

/** Reactive power for a power factor: absorbing gives a negative injection. */
export function qOfPowerFactor(p: number, pf: number, absorbing: boolean): number {
  const c = Math.min(Math.abs(pf), 1);
  const q = c > 0 ? p * Math.sqrt(1 - c * c) / c : 0;
  return absorbing ? -q : q;
}

export function generatorSetpoints(form: FeederForm, generationScale: number): GeneratorSetpoints {
  const g = form.generators;
  const pPu = new Float64Array(g.n), qPu = new Float64Array(g.n), qMaxPu = new Float64Array(g.n);
  const mode = new Uint8Array(g.n), vSetPu = new Float64Array(g.n);
  const curves: (readonly CurvePoint[])[] = [];
  const curveById = new Map(form.reactiveCurves.map((c) => [c.id.toLowerCase(), c.points]));
  const inService = generationScale > 0;
  for (let i = 0; i < g.n; i++) {
    const sRated = g.sRatedKva[i]! / 1000 / BASE_MVA;
    const p = inService ? Math.min(g.pKw[i]! * generationScale / 1000 / BASE_MVA, sRated) : 0;
    pPu[i] = p;
    qMaxPu[i] = inService ? Math.sqrt(Math.max(sRated * sRated - p * p, 0)) : 0;
    curves.push([]);
    if (!inService) continue;
    const r = g.reactive[i]!;
    switch (r.mode) {
      case "fixed_power_factor":
        qPu[i] = qOfPowerFactor(p, r.powerFactor, r.sense === "absorbing");
        break;
      case "fixed_q":
        qPu[i] = r.qKvar / 1000 / BASE_MVA;
        break;
      case "power_factor_of_p": {
        const y = interpolateCurve(curveById.get(r.curveId.toLowerCase()) ?? [], p / sRated);
        qPu[i] = qOfPowerFactor(p, y, y > 0);
        break;
      }
      case "volt_var":
        mode[i] = Q_VOLT_VAR;
        curves[i] = curveById.get(r.curveId.toLowerCase()) ?? [];
        qPu[i] = Math.max(
          -qMaxPu[i]!,
          Math.min(qMaxPu[i]!, interpolateCurve(curves[i]!, 1) * sRated),
        );
        break;
      case "voltage_control":
        mode[i] = Q_VOLTAGE_CONTROL;
        vSetPu[i] = r.vSetPu;
        break;
      default:
        break;
    }
  }
  return { pPu, qPu, qMaxPu, mode, vSetPu, curves };
}
