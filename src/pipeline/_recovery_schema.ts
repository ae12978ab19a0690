/**
 * Schema of the pipeline config's `recovery` section: the post-fault recovery screen's
 * settings (src/recovery/recovery_settings.ts). Categories given here are added to the
 * presets (a preset's name given again replaces it). Private to pipeline_config.ts.
 */
import { z } from "zod";
import {
  DEFAULT_RECOVERY_SETTINGS,
  type RecoverySettings,
  RIDE_THROUGH_PRESETS,
} from "../recovery/recovery_settings.ts";

const R = DEFAULT_RECOVERY_SETTINGS;
const pu = z.number().gt(0).max(1.5);

const categorySchema = z.strictObject({
  label: z.string().optional(),
  trip: z.array(z.strictObject({ vPu: pu, seconds: z.number().min(0).max(3600) })),
  cessationPu: pu.nullable().default(null),
});

export const recoverySettingsSchema: z.ZodType<RecoverySettings, unknown> = z.strictObject({
  enabled: z.boolean().default(R.enabled),
  demandScale: z.number().gt(0).max(10).default(R.demandScale),
  generationScale: z.number().min(0).max(10).default(R.generationScale),
  recoveryThresholdPu: pu.default(R.recoveryThresholdPu),
  breakerOpeningS: z.number().min(0).max(1).default(R.breakerOpeningS),
  unclearedS: z.number().gt(0).max(3600).default(R.unclearedS),
  defaultCategory: z.string().min(1).default(R.defaultCategory),
  categories: z.record(z.string().min(1), categorySchema).default({}),
  motor: z.strictObject({
    stallVoltagePu: pu.default(R.motor.stallVoltagePu),
    stallTimeS: z.number().min(0).max(60).default(R.motor.stallTimeS),
    lockedRotorRatio: z.number().min(1).max(15).default(R.motor.lockedRotorRatio),
    lockedRotorPowerFactor: z.number().gt(0).max(1).default(R.motor.lockedRotorPowerFactor),
  }).prefault({}),
  maxBuses: z.number().int().min(2).max(100_000).default(R.maxBuses),
  maxFaultsListed: z.number().int().min(0).max(100_000).default(R.maxFaultsListed),
}).transform((r, ctx): RecoverySettings => {
  const categories = {
    ...RIDE_THROUGH_PRESETS,
    ...Object.fromEntries(
      Object.entries(r.categories).map(([id, c]) => [id, { ...c, label: c.label ?? id }]),
    ),
  };
  if (!Object.hasOwn(categories, r.defaultCategory)) {
    ctx.addIssue({
      code: "custom",
      path: ["defaultCategory"],
      input: r.defaultCategory,
      message: `is not a ride-through category; expected one of ${
        Object.keys(categories).join(", ")
      }`,
    });
    return z.NEVER;
  }
  return { ...r, categories };
});
