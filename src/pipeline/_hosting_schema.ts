/**
 * Schema of the pipeline config's `hosting` section: the hosting-capacity study's settings
 * (src/hosting/hosting_settings.ts). Strategies name a preset curve or give their own
 * points. Private to pipeline_config.ts.
 */
import { z } from "zod";
import {
  DEFAULT_HOSTING_SETTINGS,
  type HostingSettings,
  type HostingStrategy,
  POWER_FACTOR_OF_P_PRESETS,
  type StrategyReactive,
  VOLT_VAR_PRESETS,
} from "../hosting/hosting_settings.ts";

const H = DEFAULT_HOSTING_SETTINGS;
const point = z.strictObject({ x: z.number(), y: z.number() });
const points = z.array(point).min(2).superRefine((ps, ctx) => {
  for (let i = 1; i < ps.length; i++) {
    if (!(ps[i]!.x > ps[i - 1]!.x)) {
      ctx.addIssue({
        code: "custom",
        path: [i, "x"],
        input: ps[i]!.x,
        message: "must be above the previous point's x (points in ascending x)",
      });
    }
  }
});

const presetOf = <T extends Record<string, readonly { x: number; y: number }[]>>(
  presets: T,
) => z.enum(Object.keys(presets) as [string, ...string[]]).transform((name) => presets[name]!);

/** A curve-driven mode: a preset's name or points of one's own. */
function curveMode<M extends "volt_var" | "power_factor_of_p">(
  mode: M,
  presets: Record<string, readonly { x: number; y: number }[]>,
) {
  return z.strictObject({
    mode: z.literal(mode),
    preset: presetOf(presets).optional(),
    points: points.optional(),
  }).transform((r, ctx): StrategyReactive => {
    const p = r.points ?? r.preset;
    if (p === undefined) {
      ctx.addIssue({ code: "custom", input: r, message: "needs a preset or points" });
      return z.NEVER;
    }
    return { mode, points: p };
  });
}

const reactiveSchema: z.ZodType<StrategyReactive, unknown> = z.discriminatedUnion("mode", [
  z.strictObject({ mode: z.literal("unity") }),
  z.strictObject({
    mode: z.literal("fixed_power_factor"),
    powerFactor: z.number().min(0.7).max(1),
  }),
  curveMode("volt_var", VOLT_VAR_PRESETS),
  curveMode("power_factor_of_p", POWER_FACTOR_OF_P_PRESETS),
]);

const strategySchema: z.ZodType<HostingStrategy, unknown> = z.strictObject({
  id: z.string().regex(/^[A-Za-z][A-Za-z0-9._-]{0,63}$/, {
    error: "must start with a letter and hold only letters, digits, ., - and _ (64 at most)",
  }),
  label: z.string().optional(),
  reactive: reactiveSchema,
}).transform((s) => ({ id: s.id, label: s.label ?? s.id, reactive: s.reactive }));

const kw = z.number().min(0).nullable();

export const hostingSettingsSchema: z.ZodType<HostingSettings, unknown> = z.strictObject({
  enabled: z.boolean().default(H.enabled),
  unitKind: z.enum(["converter", "synchronous"]).default(H.unitKind),
  strategies: z.array(strategySchema).min(1).superRefine((ss, ctx) => {
    const seen = new Set<string>();
    ss.forEach((s, i) => {
      if (seen.has(s.id.toLowerCase())) {
        ctx.addIssue({
          code: "custom",
          path: [i, "id"],
          input: s.id,
          message: "is already used by another strategy (ids are compared ignoring case)",
        });
      }
      seen.add(s.id.toLowerCase());
    });
  }).default(() => [...H.strategies]),
  caseId: z.string().nullable().default(H.caseId),
  rapidChange: z.strictObject({
    mvLimitPercent: z.number().gt(0).max(50).default(H.rapidChange.mvLimitPercent),
    lvLimitPercent: z.number().gt(0).max(50).default(H.rapidChange.lvLimitPercent),
  }).prefault({}),
  reversePower: z.strictObject({
    headLimitKw: kw.default(H.reversePower.headLimitKw),
    transformerLimitKw: kw.default(H.reversePower.transformerLimitKw),
  }).prefault({}),
  breakerDuty: z.boolean().default(H.breakerDuty),
  protection: z.boolean().default(H.protection),
  protectionMaxBuses: z.number().int().min(2).max(100_000).default(H.protectionMaxBuses),
  maxBuses: z.number().int().min(2).max(1_000_000).default(H.maxBuses),
  maxMw: z.number().gt(0).max(10_000).default(H.maxMw),
  toleranceKw: z.number().gt(0).max(1000).default(H.toleranceKw),
  tolerancePercent: z.number().gt(0).max(10).default(H.tolerancePercent),
  targetMw: z.number().min(0).nullable().default(H.targetMw),
});
