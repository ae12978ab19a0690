/**
 * The solver form of one feeder: structure-of-arrays in breadth-first order, compiled
 * once and handed to every kernel (load flow, faults, protection, hosting capacity).
 * Plain data and typed arrays only, so a worker receives it by structured clone with
 * the array buffers transferred (see listTransferables).
 *
 * Conventions:
 * - Bus 0 is the source bus; every other bus k has parent[k] < k and the tree branch
 *   k − 1 joins it to its parent (branchFrom = parent side, branchTo = bus k).
 * - Branches nBus − 1 … nBranch − 1 are loop branches (closed edges outside the tree).
 * - Series data of a transformer branch is referred to its `to` side; `ratio` is the
 *   off-nominal turns ratio in pu (1 for lines and switches), `shiftDeg` its phase shift.
 * - Phase-frame matrices hold 9 entries per branch (rows/columns A, B, C), zero for
 *   phases the branch does not have.
 */
import type { Earthing, FuseCurve, ReactiveCurve, ReactiveMode, Relay } from "./network.ts";
import type { OpenPoint } from "./split_feeders.ts";

export const BRANCH_LINE = 0;
export const BRANCH_TRANSFORMER = 1;
export const BRANCH_SWITCH = 2;

export const GENERATOR_CONVERTER = 0;
export const GENERATOR_SYNCHRONOUS = 1;
export const GENERATOR_INDUCTION = 2;

export interface FormSource {
  readonly id: string;
  readonly vnKv: number;
  readonly skMaxMva: number;
  readonly skMinMva: number;
  readonly rToX: number;
  readonly x0ToX1: number;
  readonly r0ToX0: number;
  readonly vSetPu: number;
  readonly angleDeg: number;
  readonly earthing: Earthing;
}

export interface FormTransformer {
  readonly id: string;
  readonly branch: number;
  /** True when the tree runs HV → LV through this transformer. */
  readonly hvIsFrom: boolean;
  readonly sRatedMva: number;
  readonly hvKv: number;
  readonly lvKv: number;
  readonly ukPercent: number;
  readonly uk0Percent: number;
  readonly loadLossKw: number;
  readonly noLoadLossKw: number;
  readonly vectorGroup: { readonly hv: string; readonly lv: string; readonly clock: number };
  readonly tap: {
    readonly side: "hv" | "lv";
    readonly min: number;
    readonly max: number;
    readonly neutral: number;
    readonly position: number;
    readonly stepPercent: number;
    readonly onLoad: boolean;
    readonly control?: {
      readonly vSetPu: number;
      readonly bandPu: number;
      readonly ldcROhm: number;
      readonly ldcXOhm: number;
    };
  };
  readonly hvEarthing: Earthing;
  readonly lvEarthing: Earthing;
}

export interface FormDevice {
  readonly id: string;
  readonly kind: "breaker" | "recloser" | "fuse" | "load_break_switch" | "disconnector";
  readonly branch: number;
  readonly isHead: boolean;
  readonly ratedCurrentA?: number;
  readonly breakingCurrentA?: number;
  readonly makingCurrentA?: number;
  readonly fuseCurve?: FuseCurve;
  readonly relays: readonly Relay[];
  readonly fastShots: number;
  readonly delayedShots: number;
}

export interface FormLoads {
  readonly n: number;
  readonly ids: readonly string[];
  readonly bus: Int32Array;
  readonly peakPKw: Float64Array;
  readonly peakQKvar: Float64Array;
  readonly minPKw: Float64Array;
  readonly minQKvar: Float64Array;
  readonly zipZ: Float64Array;
  readonly zipI: Float64Array;
  readonly zipP: Float64Array;
  readonly motorShare: Float64Array;
  /** NaN where not given (later stages apply their defaults). */
  readonly stallVoltagePu: Float64Array;
  readonly stallTimeS: Float64Array;
  readonly phases: Uint8Array;
  /** 1 for delta-connected, 0 for wye. */
  readonly delta: Uint8Array;
  readonly customers: Int32Array;
}

export interface FormShunts {
  readonly n: number;
  readonly ids: readonly string[];
  readonly bus: Int32Array;
  /** Reactive power injected at nominal voltage (positive for a capacitor). */
  readonly qRatedKvar: Float64Array;
}

export interface FormGenerators {
  readonly n: number;
  readonly ids: readonly string[];
  readonly bus: Int32Array;
  readonly kind: Uint8Array;
  readonly sRatedKva: Float64Array;
  readonly pKw: Float64Array;
  readonly phases: Uint8Array;
  readonly delta: Uint8Array;
  readonly reactive: readonly ReactiveMode[];
  /** NaN where not given. */
  readonly faultCurrentLimitPu: Float64Array;
  readonly xdSubtransientPu: Float64Array;
  readonly rToX: Float64Array;
  readonly lockedRotorRatio: Float64Array;
  readonly rideThrough: readonly (string | null)[];
}

/** A generation application waiting to connect, as the queue table gives it. */
export interface FormApplication {
  readonly id: string;
  /** Bus index in this form. */
  readonly bus: number;
  readonly pKw: number;
  readonly kind: "converter" | "synchronous";
  /** Id of a reactive-power strategy of the pipeline, or null for the first one. */
  readonly strategy: string | null;
  readonly position: number;
}

export interface FeederForm {
  readonly feederId: string;
  readonly feederIds: readonly string[];
  readonly frequencyHz: number;
  readonly source: FormSource;
  readonly meshed: boolean;

  readonly nBus: number;
  readonly busIds: readonly string[];
  readonly substationBusCount: number;
  readonly vnKv: Float64Array;
  readonly busPhases: Uint8Array;
  readonly customers: Int32Array;
  readonly parent: Int32Array;
  /** Children of bus k are children[childStart[k] … childStart[k + 1] − 1]. */
  readonly childStart: Int32Array;
  readonly children: Int32Array;
  /** Length of line along the path from the source bus. */
  readonly distanceKm: Float64Array;

  readonly nBranch: number;
  readonly branchIds: readonly string[];
  readonly branchKind: Uint8Array;
  readonly branchFrom: Int32Array;
  readonly branchTo: Int32Array;
  readonly branchPhases: Uint8Array;
  readonly lengthKm: Float64Array;
  readonly r1Ohm: Float64Array;
  readonly x1Ohm: Float64Array;
  readonly r0Ohm: Float64Array;
  readonly x0Ohm: Float64Array;
  readonly b1S: Float64Array;
  readonly b0S: Float64Array;
  readonly zPhaseReOhm: Float64Array;
  readonly zPhaseImOhm: Float64Array;
  readonly bPhaseS: Float64Array;
  /** Thermal rating in A at the branch's `to` side; Infinity where none applies. */
  readonly ratingA: Float64Array;
  readonly ratio: Float64Array;
  readonly shiftDeg: Float64Array;
  /** Line types' construction: 1 for cable, 0 for overhead, 255 for non-lines. */
  readonly cable: Uint8Array;
  readonly conductorClass: readonly (string | null)[];

  readonly transformers: readonly FormTransformer[];
  readonly devices: readonly FormDevice[];
  readonly loads: FormLoads;
  readonly shunts: FormShunts;
  readonly generators: FormGenerators;
  readonly reactiveCurves: readonly ReactiveCurve[];
  readonly openPoints: readonly OpenPoint[];
  /** Generation applications on this feeder's buses, in queue order (position ascending). */
  readonly applications: readonly FormApplication[];
  /** Forecast generation for this feeder, MW, or null where the forecast table has no row. */
  readonly forecastGenerationMw: number | null;
}

/** The array buffers of a form, for postMessage(form, { transfer }). */
export function listTransferables(form: FeederForm): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  const visit = (o: object) => {
    for (const v of Object.values(o)) {
      if (ArrayBuffer.isView(v) && v.buffer instanceof ArrayBuffer) out.add(v.buffer);
    }
  };
  visit(form);
  visit(form.loads);
  visit(form.shunts);
  visit(form.generators);
  return [...out];
}
