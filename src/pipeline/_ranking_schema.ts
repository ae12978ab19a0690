/**
 * Schemas of the pipeline config's `faults`, `costs`, `remedies` and `ranking` sections (the
 * short-circuit study's settings, the unit-cost table and catalogue the remedy design prices
 * with, and how the ranking orders needs). Private to pipeline_config.ts.
 */
import { z } from "zod";
import {
  type CatalogueConductor,
  type CostTable,
  DEFAULT_COST_TABLE,
  DEFAULT_RANKING_OPTIONS,
  DEFAULT_REMEDY_OPTIONS,
  type RankingOptions,
  type RemedyOptions,
} from "../rank/cost_table.ts";
import { NEED_CLASSES, type NeedClass } from "../rank/need.ts";
import { DEFAULT_FAULT_SETTINGS, type FaultSettings } from "../solve/fault_settings.ts";
import {
  DEFAULT_PROTECTION_SETTINGS,
  type ProtectionSettings,
} from "../solve/protection_settings.ts";

const cost = z.number().min(0);
const F = DEFAULT_FAULT_SETTINGS;
const cFactor = z.number().min(0.8).max(1.2);

const P = DEFAULT_PROTECTION_SETTINGS;

export const protectionSettingsSchema: z.ZodType<ProtectionSettings, unknown> = z.strictObject({
  enabled: z.boolean().default(P.enabled),
  coordinationIntervalS: z.number().gt(0).max(2).default(P.coordinationIntervalS),
  sensitivityFactor: z.number().min(1).max(5).default(P.sensitivityFactor),
  neighbourClearingS: z.number().gt(0).max(10).default(P.neighbourClearingS),
  loadMargin: z.number().min(1).max(5).default(P.loadMargin),
  minTms: z.number().gt(0).max(10).default(P.minTms),
  maxTms: z.number().gt(0).max(10).default(P.maxTms),
  maxBuses: z.number().int().min(2).max(100_000).default(P.maxBuses),
});

export const faultSettingsSchema: z.ZodType<FaultSettings, unknown> = z.strictObject({
  enabled: z.boolean().default(F.enabled),
  cMaxMv: cFactor.default(F.cMaxMv),
  cMinMv: cFactor.default(F.cMinMv),
  cMaxLv: cFactor.default(F.cMaxLv),
  cMinLv: cFactor.default(F.cMinLv),
  lineEndTemperatureC: z.number().min(20).max(250).default(F.lineEndTemperatureC),
  minWithGeneration: z.boolean().default(F.minWithGeneration),
  converterLimitPu: z.number().gt(0).max(5).default(F.converterLimitPu),
  synchronousPowerFactor: z.number().gt(0).max(1).default(F.synchronousPowerFactor),
  dutyWarnPercent: z.number().gt(0).max(100).default(F.dutyWarnPercent),
  generationIncreaseLimitPercent: z.number().gt(0).max(1000).default(
    F.generationIncreaseLimitPercent,
  ),
  meshedMaxBuses: z.number().int().min(2).max(20_000).default(F.meshedMaxBuses),
});
const C = DEFAULT_COST_TABLE, R = DEFAULT_REMEDY_OPTIONS, K = DEFAULT_RANKING_OPTIONS;

const conductorSchema: z.ZodType<CatalogueConductor, unknown> = z.strictObject({
  conductorClass: z.string().min(1),
  construction: z.enum(["overhead", "cable"]),
  level: z.enum(["mv", "lv"]),
  r1OhmPerKm: z.number().gt(0),
  x1OhmPerKm: z.number().min(0),
  ampacityA: z.number().gt(0),
  costPerKm: cost,
});

export const costTableSchema: z.ZodType<CostTable, unknown> = z.strictObject({
  currency: z.string().min(1).default(C.currency),
  source: z.string().min(1).default(C.source),
  reactiveSettingPerGenerator: cost.default(C.reactiveSettingPerGenerator),
  rideThroughPerGenerator: cost.default(C.rideThroughPerGenerator),
  connectionRulePerFeeder: cost.default(C.connectionRulePerFeeder),
  tapSetpointChange: cost.default(C.tapSetpointChange),
  voltageRegulator: cost.default(C.voltageRegulator),
  transformerFixed: cost.default(C.transformerFixed),
  transformerPerMva: cost.default(C.transformerPerMva),
  switchgearReplacement: cost.default(C.switchgearReplacement),
  directionalElement: cost.default(C.directionalElement),
  protectionSettingPerRelay: cost.default(C.protectionSettingPerRelay),
  conductors: z.array(conductorSchema).default(() => C.conductors.map((c) => ({ ...c }))),
});

const ascending = (name: string) => (xs: readonly number[], ctx: z.RefinementCtx) => {
  xs.forEach((x, i) => {
    if (i > 0 && x <= xs[i - 1]!) {
      ctx.addIssue({
        code: "custom",
        path: [i],
        input: x,
        message: `must be above the ${name} before it "${xs[i - 1]}" (ascending order)`,
      });
    }
  });
};

export const remedyOptionsSchema: z.ZodType<RemedyOptions, unknown> = z.strictObject({
  absorbingPowerFactor: z.number().gt(0).max(1).default(R.absorbingPowerFactor),
  transformerSizesMva: z.array(z.number().gt(0)).min(1).superRefine(ascending("size"))
    .default(() => [...R.transformerSizesMva]),
  switchRatingsA: z.array(z.number().gt(0)).min(1).superRefine(ascending("rating"))
    .default(() => [...R.switchRatingsA]),
  breakingRatingsKa: z.array(z.number().gt(0)).min(1).superRefine(ascending("rating"))
    .default(() => [...R.breakingRatingsKa]),
  regulatorRangePercent: z.number().gt(0).max(30).default(R.regulatorRangePercent),
  headroomMaxFactor: z.number().gt(1).max(100).default(R.headroomMaxFactor),
});

const classEnum = z.enum(NEED_CLASSES as [NeedClass, ...NeedClass[]]);
const weight = z.number().min(0);

export const rankingOptionsSchema: z.ZodType<RankingOptions, unknown> = z.strictObject({
  method: z.enum(["class-first", "weighted"]).default(K.method),
  classOrder: z.array(classEnum).superRefine((xs, ctx) => {
    const missing = NEED_CLASSES.filter((c) => !xs.includes(c));
    if (missing.length > 0 || new Set(xs).size !== xs.length) {
      ctx.addIssue({
        code: "custom",
        input: xs,
        params: { expected: `each of ${NEED_CLASSES.map((c) => `"${c}"`).join(", ")} once` },
        message: `must name each of ${NEED_CLASSES.map((c) => `"${c}"`).join(", ")} once`,
      });
    }
  }).default(() => [...K.classOrder]),
  classWeights: z.strictObject({
    safety: weight.default(K.classWeights.safety),
    statutory: weight.default(K.classWeights.statutory),
    planning: weight.default(K.classWeights.planning),
    hosting: weight.default(K.classWeights.hosting),
  }).prefault({}),
  benefit: z.strictObject({
    perCustomer: weight.default(K.benefit.perCustomer),
    perMwUnlocked: weight.default(K.benefit.perMwUnlocked),
    perExcessPercent: weight.default(K.benefit.perExcessPercent),
  }).prefault({}),
});
