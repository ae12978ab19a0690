/**
 * The unit-cost table and remedy catalogue the remedy design prices its proposals with,
 * and the weights the ranking uses. Filled from the pipeline configuration (`costs`,
 * `ranking`); the defaults below are invented demonstration values, not market prices:
 * a company replaces them with its own unit costs.
 */
import type { NeedClass } from "./need.ts";

/** A conductor a line can be rebuilt with. */
export interface CatalogueConductor {
  /** Conductor class name, as the report shows it. */
  readonly conductorClass: string;
  readonly construction: "overhead" | "cable";
  /** Voltage level it is used at ("lv" at or below limits.lvMaxKv). */
  readonly level: "mv" | "lv";
  readonly r1OhmPerKm: number;
  readonly x1OhmPerKm: number;
  readonly ampacityA: number;
  /** Cost of rebuilding one km of line with it, in the table's currency. */
  readonly costPerKm: number;
}

export interface CostTable {
  /** Currency or unit of every cost, e.g. "k-NVK" (shown beside every figure). */
  readonly currency: string;
  /** Where the numbers come from (shown in the report and in ranking.csv's header). */
  readonly source: string;
  /** Changing the reactive-power mode of one generator (settings and the owner's tests). */
  readonly reactiveSettingPerGenerator: number;
  /** Changing the set-point of an on-load tap changer's voltage control. */
  readonly tapSetpointChange: number;
  /** A line voltage regulator installed on a feeder section, each. */
  readonly voltageRegulator: number;
  /** A new transformer: a fixed part plus a part per MVA of rating. */
  readonly transformerFixed: number;
  readonly transformerPerMva: number;
  /** Replacing a switching device with a higher-rated one, each. */
  readonly switchgearReplacement: number;
  /** Requiring a reactive-power strategy of the feeder's new generation connections (the rule, its checks). */
  readonly connectionRulePerFeeder: number;
  /** Requiring a stronger ride-through category of one generator (settings and the owner's tests). */
  readonly rideThroughPerGenerator: number;
  /** Adding a directional element to a relay (voltage transformers, relay function), each. */
  readonly directionalElement: number;
  /** New settings of one relay (study, test and commissioning). */
  readonly protectionSettingPerRelay: number;
  readonly conductors: readonly CatalogueConductor[];
}

/** What remedies may propose, besides the priced items. */
export interface RemedyOptions {
  /** Power factor the reactive-mode remedy sets generators to, absorbing. */
  readonly absorbingPowerFactor: number;
  /** Standard transformer ratings a replacement is chosen from, MVA ascending. */
  readonly transformerSizesMva: readonly number[];
  /** Standard switching-device ratings a replacement is chosen from, A ascending. */
  readonly switchRatingsA: readonly number[];
  /** Standard breaking currents a replacement is chosen from, kA ascending (making 2.5×). */
  readonly breakingRatingsKa: readonly number[];
  /** Range of a line voltage regulator, ± % of nominal. */
  readonly regulatorRangePercent: number;
  /** The headroom search looks for the connected generation times at most this factor. */
  readonly headroomMaxFactor: number;
}

export interface RankingOptions {
  /** "class-first": class, then benefit per cost; "weighted": class weight × benefit per cost. */
  readonly method: "class-first" | "weighted";
  readonly classOrder: readonly NeedClass[];
  readonly classWeights: Readonly<Record<NeedClass, number>>;
  /** Benefit points per customer, per MW of capacity unlocked, per % of excess over the limit. */
  readonly benefit: {
    readonly perCustomer: number;
    readonly perMwUnlocked: number;
    readonly perExcessPercent: number;
  };
}

export const DEMO_COST_SOURCE =
  "Invented demonstration values, not market prices: replace them with your own unit costs";

/** Invented demonstration values (see DEMO_COST_SOURCE). */
export const DEFAULT_COST_TABLE: CostTable = {
  currency: "k-NVK",
  source: DEMO_COST_SOURCE,
  reactiveSettingPerGenerator: 2,
  tapSetpointChange: 3,
  voltageRegulator: 95,
  transformerFixed: 40,
  transformerPerMva: 18,
  switchgearReplacement: 30,
  directionalElement: 12,
  rideThroughPerGenerator: 4,
  connectionRulePerFeeder: 5,
  protectionSettingPerRelay: 1.5,
  conductors: [
    {
      conductorClass: "MV overhead 150 mm² Al",
      construction: "overhead",
      level: "mv",
      r1OhmPerKm: 0.21,
      x1OhmPerKm: 0.33,
      ampacityA: 470,
      costPerKm: 60,
    },
    {
      conductorClass: "MV overhead 240 mm² Al",
      construction: "overhead",
      level: "mv",
      r1OhmPerKm: 0.125,
      x1OhmPerKm: 0.32,
      ampacityA: 645,
      costPerKm: 75,
    },
    {
      conductorClass: "MV cable 240 mm² Al",
      construction: "cable",
      level: "mv",
      r1OhmPerKm: 0.125,
      x1OhmPerKm: 0.11,
      ampacityA: 420,
      costPerKm: 180,
    },
    {
      conductorClass: "MV cable 400 mm² Al",
      construction: "cable",
      level: "mv",
      r1OhmPerKm: 0.078,
      x1OhmPerKm: 0.1,
      ampacityA: 540,
      costPerKm: 230,
    },
    {
      conductorClass: "LV cable 150 mm² Al",
      construction: "cable",
      level: "lv",
      r1OhmPerKm: 0.206,
      x1OhmPerKm: 0.07,
      ampacityA: 275,
      costPerKm: 110,
    },
    {
      conductorClass: "LV cable 240 mm² Al",
      construction: "cable",
      level: "lv",
      r1OhmPerKm: 0.125,
      x1OhmPerKm: 0.07,
      ampacityA: 360,
      costPerKm: 140,
    },
  ],
};

export const DEFAULT_REMEDY_OPTIONS: RemedyOptions = {
  absorbingPowerFactor: 0.95, // common practice for converter DG on rural MV feeders
  transformerSizesMva: [
    0.1,
    0.16,
    0.25,
    0.4,
    0.63,
    0.8,
    1,
    1.25,
    1.6,
    2.5,
    4,
    6.3,
    10,
    16,
    25,
    31.5,
    40,
    63,
  ],
  switchRatingsA: [100, 160, 200, 250, 315, 400, 630, 800, 1250, 1600, 2000], // common practice (IEC preferred ratings)
  // IEC 62271-100 preferred rated short-circuit breaking currents [memory]
  breakingRatingsKa: [8, 10, 12.5, 16, 20, 25, 31.5, 40, 50, 63],
  regulatorRangePercent: 10, // common practice: ±10 % in 32 steps
  headroomMaxFactor: 8,
};

export const DEFAULT_RANKING_OPTIONS: RankingOptions = {
  method: "class-first",
  classOrder: ["safety", "statutory", "planning", "hosting"],
  classWeights: { safety: 1000, statutory: 100, planning: 10, hosting: 1 },
  benefit: { perCustomer: 1, perMwUnlocked: 200, perExcessPercent: 20 },
};
