/**
 * The pipeline configuration: which study cases to run, the limits each check applies, the
 * load-flow options, which checks run and what the report holds. A config is a JSON file
 * with comments (docs/pipeline.md); every problem in it becomes a diagnostic located at its
 * line and character column, all of them in one pass.
 *
 * Results of the studies a config drives are screening studies, to be verified by a licensed
 * engineer under local codes before anyone acts on them.
 */
import { getNodeValue, parseTree } from "jsonc-parser";
import type { ParseError } from "jsonc-parser";
import { z } from "zod";
import type { Diagnostic } from "../model/diagnostic.ts";
import {
  duplicateKeys,
  flatten,
  issueDiagnostic,
  locator,
  quoteList,
  ruleFor,
  syntaxDiagnostics,
  unknownKeyDiagnostics,
  valueAt,
} from "./_config_diagnostics.ts";
import {
  DEFAULT_LOAD_FLOW_OPTIONS,
  type LoadFlowCase,
  type LoadFlowOptions,
} from "../solve/load_flow_types.ts";
import type { CheckLimits, CheckSelection, VoltageRange } from "../checks/check_options.ts";
import {
  type CostTable,
  DEFAULT_COST_TABLE,
  DEFAULT_RANKING_OPTIONS,
  DEFAULT_REMEDY_OPTIONS,
  type RankingOptions,
  type RemedyOptions,
} from "../rank/cost_table.ts";
import {
  costTableSchema,
  faultSettingsSchema,
  protectionSettingsSchema,
  rankingOptionsSchema,
  remedyOptionsSchema,
} from "./_ranking_schema.ts";
import { hostingSettingsSchema } from "./_hosting_schema.ts";
import { recoverySettingsSchema } from "./_recovery_schema.ts";
import { DEFAULT_RECOVERY_SETTINGS, type RecoverySettings } from "../recovery/recovery_settings.ts";
import { DEFAULT_HOSTING_SETTINGS, type HostingSettings } from "../hosting/hosting_settings.ts";
import { DEFAULT_FAULT_SETTINGS, type FaultSettings } from "../solve/fault_settings.ts";
import {
  DEFAULT_PROTECTION_SETTINGS,
  type ProtectionSettings,
} from "../solve/protection_settings.ts";

export type { VoltageRange };

/** The resolved voltage band, with the preset it came from (null when written out). */
export interface VoltageBand {
  readonly preset: VoltageBandPresetName | null;
  readonly mv: VoltageRange;
  readonly lv: VoltageRange;
}

/** A study case: a load-flow case with an optional label for the report. */
export interface PipelineCase extends LoadFlowCase {
  readonly label?: string | undefined;
}

/** The check limits, with the voltage band's preset kept for provenance. */
export interface PipelineLimits extends CheckLimits {
  readonly voltageBand: VoltageBand;
}

export type PipelineChecks = CheckSelection;

export interface PipelineOutput {
  readonly busResults: boolean;
  readonly branchResults: boolean;
  /** report.html holds a section for at most this many feeders (those with needs first). */
  readonly reportFeederPages: number;
}

/** A parsed pipeline config: every field filled, defaults included. */
export interface PipelineConfig {
  readonly faults: FaultSettings;
  readonly protection: ProtectionSettings;
  readonly costs: CostTable;
  readonly remedies: RemedyOptions;
  readonly ranking: RankingOptions;
  readonly hosting: HostingSettings;
  readonly recovery: RecoverySettings;
  readonly name?: string | undefined;
  readonly description?: string | undefined;
  readonly cases: readonly PipelineCase[];
  readonly limits: PipelineLimits;
  readonly solver: LoadFlowOptions;
  readonly checks: PipelineChecks;
  readonly output: PipelineOutput;
}

export interface VoltageBandPreset {
  /** Where the numbers come from. */
  readonly source: string;
  readonly mv: VoltageRange;
  readonly lv: VoltageRange;
}

/** Named voltage bands. Sources: ../shared/guide/REFERENCES.md section E. */
export const VOLTAGE_BAND_PRESETS = {
  "en50160-style": {
    source: "EN 50160: supply voltage within Un ± 10 % [memory]; applied at MV as well as LV",
    mv: { vMinPu: 0.9, vMaxPu: 1.1 },
    lv: { vMinPu: 0.9, vMaxPu: 1.1 },
  },
  "ansi-range-a-style": {
    source: "ANSI C84.1 Range A: 114–126 V on 120 V [memory]; applied at MV as well as LV",
    mv: { vMinPu: 0.95, vMaxPu: 1.05 },
    lv: { vMinPu: 0.95, vMaxPu: 1.05 },
  },
  "ansi-range-b-style": {
    source: "ANSI C84.1 Range B: 110–127 V on 120 V [memory]; applied at MV as well as LV",
    mv: { vMinPu: 0.9167, vMaxPu: 1.0583 },
    lv: { vMinPu: 0.9167, vMaxPu: 1.0583 },
  },
} as const satisfies Record<string, VoltageBandPreset>;

export type VoltageBandPresetName = keyof typeof VOLTAGE_BAND_PRESETS;

const PRESET_NAMES = Object.keys(VOLTAGE_BAND_PRESETS) as VoltageBandPresetName[];

function resolvePreset(name: VoltageBandPresetName): VoltageBand {
  const p = VOLTAGE_BAND_PRESETS[name];
  return { preset: name, mv: { ...p.mv }, lv: { ...p.lv } };
}

/** What an omitted field becomes. */
export const DEFAULT_PIPELINE: PipelineConfig = {
  cases: [
    { id: "peak-no-dg", demand: "peak", demandScale: 1, generationScale: 0 },
    { id: "min-full-dg", demand: "min", demandScale: 1, generationScale: 1 },
  ],
  limits: {
    voltageBand: resolvePreset("en50160-style"),
    lvMaxKv: 1.0, // common practice: LV up to 1 kV
    voltageChange: { mvLimitPercent: 2, lvLimitPercent: 3 }, // common practice, REFERENCES.md F
    thermal: { limitPercent: 100, warnPercent: 90 }, // common practice
    reversePower: { headLimitKw: 0, transformerLimitKw: 0 }, // any reverse flow is reported
    losses: { warnPercent: 6 }, // common practice [memory]
  },
  solver: { ...DEFAULT_LOAD_FLOW_OPTIONS },
  checks: {
    voltageBand: true,
    voltageChange: true,
    thermal: true,
    reversePower: true,
    losses: true,
  },
  output: { busResults: true, branchResults: true, reportFeederPages: 200 },
  faults: DEFAULT_FAULT_SETTINGS,
  protection: DEFAULT_PROTECTION_SETTINGS,
  costs: DEFAULT_COST_TABLE,
  remedies: DEFAULT_REMEDY_OPTIONS,
  ranking: DEFAULT_RANKING_OPTIONS,
  hosting: DEFAULT_HOSTING_SETTINGS,
  recovery: DEFAULT_RECOVERY_SETTINGS,
};

const L = DEFAULT_PIPELINE.limits, S = DEFAULT_PIPELINE.solver;

/** A case id: a letter, then letters, digits, `-` or `_`; 64 characters at most. */
const CASE_ID = /^[A-Za-z][A-Za-z0-9_-]{0,63}$/;

const puBound = z.number().min(0.5).max(1.5);
const rangeSchema = z.strictObject({ vMinPu: puBound, vMaxPu: puBound }).superRefine((r, ctx) => {
  if (r.vMinPu >= r.vMaxPu) {
    ctx.addIssue({
      code: "custom",
      path: ["vMinPu"],
      input: r.vMinPu,
      message: `must be below vMaxPu "${r.vMaxPu}"`,
    });
  }
});

const presetSchema = z.string().transform((name, ctx): VoltageBand => {
  if (Object.hasOwn(VOLTAGE_BAND_PRESETS, name)) {
    return resolvePreset(name as VoltageBandPresetName);
  }
  ctx.issues.push({
    code: "custom",
    input: name,
    params: { code: "config.preset", expected: `one of ${quoteList(PRESET_NAMES)}` },
    message: `is not a known voltage band preset; expected one of ${quoteList(PRESET_NAMES)}`,
  });
  return z.NEVER;
});

const voltageBandSchema = z.union([
  presetSchema,
  z.strictObject({ mv: rangeSchema, lv: rangeSchema }).transform((b): VoltageBand => ({
    preset: null,
    ...b,
  })),
], { error: `must be a preset name (${PRESET_NAMES.join(", ")}) or an object { mv, lv }` });

const caseSchema = z.strictObject({
  id: z.string().regex(CASE_ID, {
    error: "must start with a letter and hold only letters, digits, - and _ (64 at most)",
  }),
  label: z.string().optional(),
  demand: z.enum(["peak", "min"]),
  demandScale: z.number().gt(0).default(1),
  generationScale: z.number().min(0),
});

const casesSchema = z.array(caseSchema).min(1, { error: "must list at least one case" })
  .superRefine((cases, ctx) => {
    const seen = new Map<string, number>();
    cases.forEach((c, i) => {
      const id: unknown = (c as { id?: unknown } | undefined)?.id;
      if (typeof id !== "string") return;
      const first = seen.get(id.toLowerCase());
      if (first === undefined) seen.set(id.toLowerCase(), i);
      else {
        ctx.addIssue({
          code: "custom",
          path: [i, "id"],
          input: id,
          params: { expected: "an id that no other case uses" },
          message: `is already used by cases[${first}] (ids are compared ignoring case)`,
        });
      }
    });
  }, { when: () => true });

const percent = (maxPercent: number) => z.number().gt(0).max(maxPercent);

const limitsSchema = z.strictObject({
  voltageBand: voltageBandSchema.prefault(L.voltageBand.preset ?? "en50160-style"),
  lvMaxKv: z.number().gt(0).default(L.lvMaxKv),
  voltageChange: z.strictObject({
    mvLimitPercent: percent(100).default(L.voltageChange.mvLimitPercent),
    lvLimitPercent: percent(100).default(L.voltageChange.lvLimitPercent),
  }).prefault({}),
  thermal: z.strictObject({
    limitPercent: percent(1000).default(L.thermal.limitPercent),
    warnPercent: percent(1000).default(L.thermal.warnPercent),
  }).superRefine((t, ctx) => {
    if (t.warnPercent >= t.limitPercent) {
      ctx.addIssue({
        code: "custom",
        path: ["warnPercent"],
        input: t.warnPercent,
        message: `must be below limitPercent "${t.limitPercent}"`,
      });
    }
  }).prefault({}),
  reversePower: z.strictObject({
    headLimitKw: z.number().min(0).default(L.reversePower.headLimitKw),
    transformerLimitKw: z.number().min(0).default(L.reversePower.transformerLimitKw),
  }).prefault({}),
  losses: z.strictObject({ warnPercent: percent(100).default(L.losses.warnPercent) }).prefault({}),
});

const solverSchema = z.strictObject({
  tolerancePu: z.number().min(1e-14).max(1e-3).default(S.tolerancePu),
  maxIterations: z.number().int().min(1).max(10000).default(S.maxIterations),
  maxTapSteps: z.number().int().min(1).max(1000).default(S.maxTapSteps),
  reactiveDamping: z.number().gt(0).max(1).default(S.reactiveDamping),
  collapseVoltagePu: z.number().gt(0).lt(1).default(S.collapseVoltagePu),
  tapControl: z.boolean().default(S.tapControl),
});

const flag = (on: boolean) => z.boolean().default(on);
const C = DEFAULT_PIPELINE.checks, O = DEFAULT_PIPELINE.output;

/** The schema of a pipeline config file, defaults included. */
export const pipelineConfigSchema: z.ZodType<PipelineConfig, unknown> = z.strictObject({
  name: z.string().min(1).optional(),
  description: z.string().optional(),
  cases: casesSchema.default(() => DEFAULT_PIPELINE.cases.map((c) => ({ ...c }))),
  limits: limitsSchema.prefault({}),
  solver: solverSchema.prefault({}),
  checks: z.strictObject({
    voltageBand: flag(C.voltageBand),
    voltageChange: flag(C.voltageChange),
    thermal: flag(C.thermal),
    reversePower: flag(C.reversePower),
    losses: flag(C.losses),
  }).prefault({}),
  output: z.strictObject({
    busResults: flag(O.busResults),
    branchResults: flag(O.branchResults),
    reportFeederPages: z.number().int().min(0).max(100_000).default(O.reportFeederPages),
  }).prefault({}),
  faults: faultSettingsSchema.prefault({}),
  protection: protectionSettingsSchema.prefault({}),
  costs: costTableSchema.prefault({}),
  remedies: remedyOptionsSchema.prefault({}),
  ranking: rankingOptionsSchema.prefault({}),
  hosting: hostingSettingsSchema.prefault({}),
  recovery: recoverySettingsSchema.prefault({}),
});

/**
 * Parses the text of a pipeline config file. Comments and trailing commas are accepted;
 * unknown keys are warnings and are left out of the value; any error leaves value undefined.
 */
export function parsePipelineConfig(
  text: string,
  file: string,
): { value: PipelineConfig | undefined; diagnostics: Diagnostic[] } {
  const body = text.startsWith("\uFEFF") ? text.slice(1) : text;
  const locate = locator(body, file);
  const errors: ParseError[] = [];
  const root = parseTree(body, errors, { allowTrailingComma: true, disallowComments: false });
  const diagnostics = syntaxDiagnostics(body, errors, locate);
  if (root === undefined || errors.length > 0) return { value: undefined, diagnostics };
  diagnostics.push(...duplicateKeys(root, locate));

  // Pass 1 finds the unknown keys; pass 2 validates without them, so that checks of an
  // object holding an unknown key still run, and the value leaves the keys out.
  let result = pipelineConfigSchema.safeParse(getNodeValue(root), { error: ruleFor });
  const first = result.success ? [] : flatten(result.error.issues, []);
  const unknown = first.filter((f) => f.issue.code === "unrecognized_keys");
  if (unknown.length > 0) {
    const stripped: unknown = getNodeValue(root);
    for (const f of unknown) {
      const holder = valueAt(stripped, f.path);
      for (const key of (f.issue as z.core.$ZodIssueUnrecognizedKeys).keys) delete holder[key];
      diagnostics.push(...unknownKeyDiagnostics(root, f, locate));
    }
    result = pipelineConfigSchema.safeParse(stripped, { error: ruleFor });
  }
  const rest = result.success ? [] : flatten(result.error.issues, []);
  for (const f of rest) diagnostics.push(issueDiagnostic(root, body, f, locate));
  const failed = diagnostics.some((d) => d.severity === "error");
  return { value: failed || !result.success ? undefined : result.data, diagnostics };
}
