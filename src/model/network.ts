/**
 * The internal network model: one fleet of feeders, all quantities in internal units
 * (names carry the unit). Plain, readonly, structured-clone-safe data; built by
 * buildNetwork from validated tables (CSV today, CIM RDF/XML later) and consumed by the
 * topology stage. Phases are bitmasks (see phases.ts).
 */
import type { PhaseMatrix } from "./line_impedance.ts";
import type { SourceLocation } from "./diagnostic.ts";

export type EarthingKind = "solid" | "impedance" | "isolated" | "resonant";

/** How a star point (or a grid source's neutral) is earthed. */
export interface Earthing {
  readonly kind: EarthingKind;
  readonly rOhm: number;
  readonly xOhm: number;
}

export interface Bus {
  readonly id: string;
  readonly vnKv: number;
  readonly xM?: number;
  readonly yM?: number;
  readonly customers: number;
  /** Feeder named in the input, checked against connectivity. */
  readonly feederHint?: string;
  readonly name?: string;
  readonly at: SourceLocation;
}

export interface GridSource {
  readonly id: string;
  readonly busId: string;
  readonly vnKv: number;
  readonly skMaxMva: number;
  readonly skMinMva: number;
  readonly rToX: number;
  readonly x0ToX1: number;
  readonly r0ToX0: number;
  readonly vSetPu: number;
  readonly angleDeg: number;
  readonly earthing: Earthing;
  readonly at: SourceLocation;
}

/** Per-length electrical data of a line type, whatever form it was given in. */
export interface LineType {
  readonly id: string;
  readonly form: "sequence" | "matrix" | "geometry";
  readonly construction: "overhead" | "cable";
  readonly conductorClass?: string;
  readonly r1OhmPerKm: number;
  readonly x1OhmPerKm: number;
  readonly r0OhmPerKm: number;
  readonly x0OhmPerKm: number;
  readonly b1UsPerKm: number;
  readonly b0UsPerKm: number;
  /** Phase-frame series impedance per km (always present; from sequence data if need be). */
  readonly zPhase: PhaseMatrix;
  /** Phase-frame shunt susceptance per km, µS/km in the imaginary part. */
  readonly bPhase: PhaseMatrix;
  readonly ampacityA: number;
  readonly ampacityEmergencyA?: number;
  readonly at: SourceLocation;
}

export interface Line {
  readonly id: string;
  readonly fromBusId: string;
  readonly toBusId: string;
  readonly typeId: string;
  readonly lengthKm: number;
  readonly phases: number;
  readonly inService: boolean;
  readonly at: SourceLocation;
}

export type WindingConnection = "D" | "Y" | "YN" | "Z" | "ZN";

export interface VectorGroup {
  readonly hv: WindingConnection;
  readonly lv: WindingConnection;
  /** Clock number: the LV side lags the HV side by clock × 30°. */
  readonly clock: number;
  readonly text: string;
}

export interface TapChanger {
  readonly side: "hv" | "lv";
  readonly min: number;
  readonly max: number;
  readonly neutral: number;
  readonly position: number;
  readonly stepPercent: number;
  readonly onLoad: boolean;
  /** On-load control: voltage set-point and band at the controlled (LV) bus. */
  readonly control?: {
    readonly vSetPu: number;
    readonly bandPu: number;
    readonly ldcROhm: number;
    readonly ldcXOhm: number;
  };
}

export interface Transformer {
  readonly id: string;
  readonly hvBusId: string;
  readonly lvBusId: string;
  readonly sRatedMva: number;
  readonly hvKv: number;
  readonly lvKv: number;
  readonly ukPercent: number;
  readonly loadLossKw: number;
  readonly noLoadLossKw: number;
  /** Zero-sequence short-circuit voltage; defaults to ukPercent where not given. */
  readonly uk0Percent: number;
  readonly vectorGroup: VectorGroup;
  readonly tap: TapChanger;
  readonly hvEarthing: Earthing;
  readonly lvEarthing: Earthing;
  readonly at: SourceLocation;
}

export type SwitchKind = "breaker" | "recloser" | "fuse" | "load_break_switch" | "disconnector";

export interface SwitchDevice {
  readonly id: string;
  readonly fromBusId: string;
  readonly toBusId: string;
  readonly kind: SwitchKind;
  readonly normallyClosed: boolean;
  /** Feeder this device heads, when it is a feeder-head device. */
  readonly headsFeeder?: string;
  readonly ratedCurrentA?: number;
  readonly breakingCurrentA?: number;
  readonly makingCurrentA?: number;
  readonly fuseCurveId?: string;
  readonly fastShots: number;
  readonly delayedShots: number;
  readonly phases: number;
  readonly at: SourceLocation;
}

export interface Load {
  readonly id: string;
  readonly busId: string;
  readonly peakPKw: number;
  readonly peakQKvar: number;
  readonly minPKw: number;
  readonly minQKvar: number;
  /** ZIP shares (sum 1): constant impedance, current and power. */
  readonly zip: { readonly z: number; readonly i: number; readonly p: number };
  /** Share of the load that is induction motors, 0–1. */
  readonly motorShare: number;
  readonly stallVoltagePu?: number;
  readonly stallTimeS?: number;
  readonly customers: number;
  readonly phases: number;
  readonly connection: "wye" | "delta";
  readonly at: SourceLocation;
}

/** A shunt capacitor (positive) or reactor (negative), constant impedance. */
export interface Shunt {
  readonly id: string;
  readonly busId: string;
  /** Reactive power injected at nominal voltage; positive for a capacitor. */
  readonly qRatedKvar: number;
  readonly phases: number;
  readonly at: SourceLocation;
}

export type GeneratorKind = "converter" | "synchronous" | "induction";

export type ReactiveMode =
  | { readonly mode: "unity" }
  | {
    readonly mode: "fixed_power_factor";
    readonly powerFactor: number;
    readonly sense: "absorbing" | "injecting";
  }
  | { readonly mode: "fixed_q"; readonly qKvar: number }
  | { readonly mode: "volt_var"; readonly curveId: string }
  | { readonly mode: "power_factor_of_p"; readonly curveId: string }
  | { readonly mode: "voltage_control"; readonly vSetPu: number };

export interface Generator {
  readonly id: string;
  readonly busId: string;
  readonly kind: GeneratorKind;
  readonly sRatedKva: number;
  readonly pKw: number;
  readonly phases: number;
  readonly connection: "wye" | "delta";
  readonly reactive: ReactiveMode;
  readonly rideThrough?: string;
  /** Converter fault current limit in pu of rated current. */
  readonly faultCurrentLimitPu?: number;
  readonly xdSubtransientPu?: number;
  readonly rToX?: number;
  readonly lockedRotorRatio?: number;
  readonly at: SourceLocation;
}

export interface CurvePoint {
  readonly x: number;
  readonly y: number;
}

export interface ReactiveCurve {
  readonly id: string;
  readonly kind: "volt_var" | "power_factor_of_p";
  /** Points in ascending x. */
  readonly points: readonly CurvePoint[];
  readonly at: SourceLocation;
}

export type RelayCharacteristic =
  | "iec_standard_inverse"
  | "iec_very_inverse"
  | "iec_extremely_inverse"
  | "iec_long_time_inverse"
  | "ieee_moderately_inverse"
  | "ieee_very_inverse"
  | "ieee_extremely_inverse"
  | "definite_time"
  | "instantaneous";

export interface RelayStage {
  readonly stage: number;
  readonly element: "phase" | "earth";
  readonly characteristic: RelayCharacteristic;
  readonly pickupA: number;
  readonly timeMultiplier?: number;
  readonly delayS?: number;
  readonly direction: "forward" | "reverse" | "non_directional";
  readonly curveSet: "fast" | "delayed" | "both";
}

export interface Relay {
  readonly id: string;
  readonly deviceId: string;
  /** Stages in ascending stage number. */
  readonly stages: readonly RelayStage[];
  readonly at: SourceLocation;
}

/** Fuse time–current characteristic: current in A, time in s, ascending current. */
export interface FuseCurve {
  readonly id: string;
  readonly melt: readonly CurvePoint[];
  readonly clear: readonly CurvePoint[];
  readonly at: SourceLocation;
}

/** A generation application waiting to connect (generation_queue.csv). */
export interface Application {
  readonly id: string;
  readonly busId: string;
  readonly pKw: number;
  readonly kind: "converter" | "synchronous";
  /** Id of a reactive-power strategy of the pipeline, or null for the first one. */
  readonly strategy: string | null;
  /** Place in the queue, 1 first. */
  readonly position: number;
  readonly at: SourceLocation;
}

/** Forecast generation of one feeder (generation_forecast.csv). */
export interface GenerationForecast {
  /** As the table spells it; matched to feeders case-insensitively. */
  readonly feederId: string;
  readonly pKw: number;
  readonly at: SourceLocation;
}

export interface NetworkSettings {
  readonly company?: string;
  readonly frequencyHz: number;
  readonly earthResistivityOhmM: number;
}

/** A whole fleet as read from one export. */
export interface Network {
  readonly settings: NetworkSettings;
  readonly buses: readonly Bus[];
  readonly sources: readonly GridSource[];
  readonly lineTypes: readonly LineType[];
  readonly lines: readonly Line[];
  readonly transformers: readonly Transformer[];
  readonly switches: readonly SwitchDevice[];
  readonly loads: readonly Load[];
  /** In-service shunt capacitors and reactors. */
  readonly shunts: readonly Shunt[];
  readonly generators: readonly Generator[];
  readonly reactiveCurves: readonly ReactiveCurve[];
  readonly relays: readonly Relay[];
  readonly fuseCurves: readonly FuseCurve[];
  /** Generation applications whose bus exists, in queue order (position ascending). */
  readonly applications: readonly Application[];
  /** Forecast generation per feeder id, in file order. */
  readonly generationForecasts: readonly GenerationForecast[];
  /**
   * Buses that some input problem makes untrustworthy: the feeders holding them are set
   * aside. Keys are lower-case bus ids.
   */
  readonly taintedBuses: Readonly<Record<string, readonly Taint[]>>;
  /** Header column names per input file, to locate a field of a row in later stages. */
  readonly headers: Readonly<Record<string, readonly string[]>>;
  /** Ids of buses whose rows could not be read; kept for connectivity only. */
  readonly placeholderBuses: readonly string[];
  /** Connections from rows that could not be used; kept for connectivity only. */
  readonly placeholderEdges: readonly PlaceholderEdge[];
}

/** Why a bus is untrustworthy: the problem's code and the row that caused it. */
export interface Taint {
  readonly code: string;
  readonly file: string;
  readonly line: number;
}

export interface PlaceholderEdge {
  readonly id: string;
  readonly aBusId: string;
  readonly bBusId: string;
}
