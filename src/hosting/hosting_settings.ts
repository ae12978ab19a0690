/**
 * Settings of the hosting-capacity study: the reactive-power strategies a new unit is tried
 * with, the unit's kind, the limits that only this study applies (rapid voltage change when
 * the unit trips, reverse power), which fault-based criteria count, the search range and
 * tolerance, and the target a feeder's capacity is compared with.
 *
 * Volt-var presets: IEEE 1547-2018 default curves, Category A (0.90 pu / +25 %, 1.00 pu,
 * 1.10 pu / −25 %) and Category B (0.92 pu / +44 %, 0.98 and 1.02 pu dead band, 1.08 pu /
 * −44 %), Q in % of nameplate apparent power, + = injection, V_ref = 1 pu [memory]
 * (../shared/guide/REFERENCES.md). cos φ(P) preset: unity up to half output, then down to
 * 0.90 absorbing at full output — a shape several grid codes use (common practice [memory]).
 */
import type { CurvePoint } from "../model/network.ts";

/** The reactive behaviour of a new unit. */
export type StrategyReactive =
  | { readonly mode: "unity" }
  /** A fixed power factor, absorbing reactive power (lowers the voltage rise). */
  | { readonly mode: "fixed_power_factor"; readonly powerFactor: number }
  /** Q(U): x in pu of nominal voltage, y in pu of the unit's rated apparent power (+ = injection). */
  | { readonly mode: "volt_var"; readonly points: readonly CurvePoint[] }
  /** cos φ(P): x = P / rated, y = power factor (positive absorbing, the load flow's convention). */
  | { readonly mode: "power_factor_of_p"; readonly points: readonly CurvePoint[] };

export interface HostingStrategy {
  readonly id: string;
  readonly label: string;
  readonly reactive: StrategyReactive;
}

export interface HostingSettings {
  readonly enabled: boolean;
  /** The kind of unit placed at each bus: a converter (default) or a synchronous machine. */
  readonly unitKind: "converter" | "synchronous";
  /** Tried in order; the first is the reference ("present practice") for targets. */
  readonly strategies: readonly HostingStrategy[];
  /**
   * The load-flow case the units are added to; null picks the minimum-demand case with the
   * most generation (the highest voltages), else the case with the most generation.
   */
  readonly caseId: string | null;
  /** Voltage step when the new unit trips, tap changers frozen, % of nominal. */
  readonly rapidChange: { readonly mvLimitPercent: number; readonly lvLimitPercent: number };
  /** Reverse active power allowed at feeder-head devices and substation transformers, kW (null: no limit). */
  readonly reversePower: {
    readonly headLimitKw: number | null;
    readonly transformerLimitKw: number | null;
  };
  /** Breaking and making duty of switching devices (short-circuit study) as a criterion. */
  readonly breakerDuty: boolean;
  /** Protection findings the new unit causes as a criterion (protection study). */
  readonly protection: boolean;
  /** The protection criterion is checked on feeders up to this many buses (its cost grows with the square). */
  readonly protectionMaxBuses: number;
  /** Per-bus capacities are computed on feeders up to this many buses. */
  readonly maxBuses: number;
  /** Upper end of the search at a bus, MW. */
  readonly maxMw: number;
  /** Answers are exact to the larger of these (nonlinear load flows). */
  readonly toleranceKw: number;
  readonly tolerancePercent: number;
  /** Capacity target for every feeder, MW (a feeder's forecast, where given, replaces it). */
  readonly targetMw: number | null;
}

export const VOLT_VAR_PRESETS = {
  "ieee1547-cat-a": [
    { x: 0.9, y: 0.25 },
    { x: 1.0, y: 0 },
    { x: 1.1, y: -0.25 },
  ],
  "ieee1547-cat-b": [
    { x: 0.92, y: 0.44 },
    { x: 0.98, y: 0 },
    { x: 1.02, y: 0 },
    { x: 1.08, y: -0.44 },
  ],
} as const satisfies Record<string, readonly CurvePoint[]>;

export const POWER_FACTOR_OF_P_PRESETS = {
  "half-output-to-0.90": [
    { x: 0, y: 1 },
    { x: 0.5, y: 1 },
    { x: 1, y: 0.9 },
  ],
} as const satisfies Record<string, readonly CurvePoint[]>;

export const DEFAULT_STRATEGIES: readonly HostingStrategy[] = [
  { id: "unity", label: "unity power factor", reactive: { mode: "unity" } },
  {
    id: "pf-0.95",
    label: "fixed power factor 0.95 absorbing",
    reactive: { mode: "fixed_power_factor", powerFactor: 0.95 },
  },
  {
    id: "volt-var-b",
    label: "volt-var, IEEE 1547 Category B default",
    reactive: { mode: "volt_var", points: VOLT_VAR_PRESETS["ieee1547-cat-b"] },
  },
  {
    id: "cosphi-p",
    label: "cos φ(P), 0.90 absorbing at full output",
    reactive: {
      mode: "power_factor_of_p",
      points: POWER_FACTOR_OF_P_PRESETS["half-output-to-0.90"],
    },
  },
];

export const DEFAULT_HOSTING_SETTINGS: HostingSettings = {
  enabled: true,
  unitKind: "converter",
  strategies: DEFAULT_STRATEGIES,
  caseId: null,
  rapidChange: { mvLimitPercent: 3, lvLimitPercent: 5 }, // IEEE 1547-2018 [memory]
  reversePower: { headLimitKw: null, transformerLimitKw: null },
  breakerDuty: true,
  protection: true,
  protectionMaxBuses: 60,
  maxBuses: 5000,
  maxMw: 30,
  toleranceKw: 5,
  tolerancePercent: 0.5,
  targetMw: null,
};

/**
 * Apparent rating of a unit of active power pKw under a strategy: volt-var needs the
 * headroom for its largest reactive power at full output (S = P/√(1 − q²)); the others are
 * rated at their active power (fixed and P-dependent power factors are set on P).
 */
export function unitRatingKva(reactive: StrategyReactive, pKw: number): number {
  if (reactive.mode !== "volt_var") return pKw;
  let q = 0;
  for (const p of reactive.points) q = Math.max(q, Math.abs(p.y));
  return pKw / Math.sqrt(1 - Math.min(q, 0.95) ** 2);
}
