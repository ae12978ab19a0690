/**
 * The pipeline configuration: which study cases to run, the limits each check applies, the
 * load-flow options, which checks run and what the report holds. A config is a JSON file
 * with comments (docs/pipeline.md); every problem in it becomes a diagnostic located at its
 * line and character column, all of them in one pass.
 *
 * Results of the studies a config drives are screening studies, to be verified by a licensed
 * engineer under local codes before anyone acts on them.
 */
import {
  findNodeAtLocation,
  getNodeValue,
  type Node,
  parseTree,
  printParseErrorCode,
} from "jsonc-parser";
import type { ParseError } from "jsonc-parser";
import { z } from "zod";
import { type Diagnostic, makeDiagnostic, type SourceLocation } from "../model/diagnostic.ts";
import {
  DEFAULT_LOAD_FLOW_OPTIONS,
  type LoadFlowCase,
  type LoadFlowOptions,
} from "../solve/load_flow_types.ts";

/** A voltage range in pu of the bus's nominal voltage. */
export interface VoltageRange {
  readonly vMinPu: number;
  readonly vMaxPu: number;
}

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

export interface PipelineLimits {
  readonly voltageBand: VoltageBand;
  /** Buses at or below this nominal voltage count as LV, kV. */
  readonly lvMaxKv: number;
  /** Voltage change caused by generation, planning limits in % of nominal. */
  readonly voltageChange: { readonly mvLimitPercent: number; readonly lvLimitPercent: number };
  /** Branch loading in % of rating: a finding above limitPercent, a warning above warnPercent. */
  readonly thermal: { readonly limitPercent: number; readonly warnPercent: number };
  /** Reverse active power above which a finding is raised, kW. */
  readonly reversePower: { readonly headLimitKw: number; readonly transformerLimitKw: number };
  /** Losses as a share of the power fed in (source import plus generation), %. */
  readonly losses: { readonly warnPercent: number };
}

export interface PipelineChecks {
  readonly voltageBand: boolean;
  readonly voltageChange: boolean;
  readonly thermal: boolean;
  readonly reversePower: boolean;
  readonly losses: boolean;
}

export interface PipelineOutput {
  readonly busResults: boolean;
  readonly branchResults: boolean;
}

/** A parsed pipeline config: every field filled, defaults included. */
export interface PipelineConfig {
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
  output: { busResults: true, branchResults: true },
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
  }).prefault({}),
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

type Path = readonly PropertyKey[];
type Locate = (offset: number, path: Path) => SourceLocation;

interface FlatIssue {
  readonly path: Path;
  readonly issue: z.core.$ZodIssue;
}

/** Rule text for zod's own checks, phrased to follow `path "value"`. */
function ruleFor(iss: z.core.$ZodRawIssue): string | undefined {
  switch (iss.code) {
    case "invalid_type":
      if (iss.input === undefined) return "is required";
      if (iss.expected === "int") return "must be a whole number";
      if (typeof iss.input === "number") return "must be a finite number";
      return `must be ${article(iss.expected)}, not ${article(jsonType(iss.input))}`;
    case "too_small":
    case "too_big": {
      const small = iss.code === "too_small";
      const bound = String(small ? iss.minimum : iss.maximum);
      if (iss.origin === "string") return "must not be empty";
      if (iss.origin === "array") {
        return `must hold ${small ? "at least" : "at most"} ${bound} entries`;
      }
      const word = iss.inclusive ? (small ? "at least" : "at most") : (small ? "above" : "below");
      return `must be ${word} ${bound}`;
    }
    case "invalid_value":
      return `must be one of ${quoteList(iss.values.map(String))}`;
    default:
      return undefined;
  }
}

function article(type: string): string {
  return type === "null" ? "null" : `${/^[aeiou]/.test(type) ? "an" : "a"} ${type}`;
}

function jsonType(value: unknown): string {
  return value === null ? "null" : Array.isArray(value) ? "array" : typeof value;
}

/** What was expected, in words, for the `expected` field of a diagnostic. */
function expectedFor(issue: z.core.$ZodIssue): string {
  if (issue.code === "invalid_type") {
    return issue.expected === "int" ? "a whole number" : article(issue.expected);
  }
  const given = issue.code === "custom" ? issue.params?.["expected"] : undefined;
  return typeof given === "string" ? given : issue.message.replace(/^(must be|must|is) /, "");
}

function quoteList(names: readonly string[]): string {
  return names.map((n) => `"${n}"`).join(", ");
}

/** Spreads union issues into the issues of the branch that fits the value's type. */
function flatten(issues: readonly z.core.$ZodIssue[], prefix: Path): FlatIssue[] {
  const out: FlatIssue[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === "invalid_union") {
      const fitting = issue.errors.filter((b) =>
        !(b.length === 1 && b[0]!.code === "invalid_type" && b[0]!.path.length === 0)
      );
      if (fitting.length === 1) {
        out.push(...flatten(fitting[0]!, path));
        continue;
      }
    }
    out.push({ path, issue });
  }
  return out;
}

function pathText(path: Path): string {
  let s = "";
  for (const p of path) {
    s += typeof p === "number" ? `[${p}]` : `${s === "" ? "" : "."}${String(p)}`;
  }
  return s;
}

function valueAt(value: unknown, path: Path): Record<PropertyKey, unknown> {
  let v = value;
  for (const p of path) v = (v as Record<PropertyKey, unknown>)[p];
  return v as Record<PropertyKey, unknown>;
}

/** The node at `path`, or else its nearest ancestor that exists. */
function nearestNode(root: Node, path: Path): { node: Node; exact: boolean } {
  for (let n = path.length; n >= 0; n--) {
    const node = findNodeAtLocation(root, path.slice(0, n) as (string | number)[]);
    if (node !== undefined) return { node, exact: n === path.length };
  }
  return { node: root, exact: false };
}

function foundText(body: string, node: Node): string {
  if (node.type === "object") return "{…}";
  if (node.type === "array") return "[…]";
  const s = node.type === "string"
    ? String(node.value)
    : body.slice(node.offset, node.offset + node.length);
  return s.length > 60 ? `${s.slice(0, 59)}…` : s;
}

function issueDiagnostic(root: Node, body: string, f: FlatIssue, locate: Locate): Diagnostic {
  const { node, exact } = nearestNode(root, f.path);
  const what = f.path.length === 0 ? "the top level" : pathText(f.path);
  const found = exact ? foundText(body, node) : undefined;
  const rule = f.issue.message;
  const preset = f.issue.code === "custom" && f.issue.params?.["code"] === "config.preset";
  return makeDiagnostic(
    preset ? "config.preset" : "config.invalid",
    "error",
    `Cannot use pipeline config: ${what}${found === undefined ? "" : ` "${found}"`} ${rule}`,
    {
      at: locate(node.offset, f.path),
      found,
      expected: expectedFor(f.issue),
    },
  );
}

function unknownKeyDiagnostics(root: Node, f: FlatIssue, locate: Locate): Diagnostic[] {
  const keys = (f.issue as z.core.$ZodIssueUnrecognizedKeys).keys;
  return keys.map((key) => {
    const value = findNodeAtLocation(root, [...f.path, key] as (string | number)[]);
    const keyNode = value?.parent?.children?.[0] ?? root;
    const where = f.path.length === 0 ? "at the top level" : `in ${pathText(f.path)}`;
    return makeDiagnostic(
      "config.unknown_key",
      "warning",
      `Pipeline config: unknown key "${key}" ${where} is ignored`,
      {
        at: locate(keyNode.offset, [...f.path, key]),
        found: key,
        expected: "a key listed in docs/pipeline.md",
      },
    );
  });
}

/** A key written twice in one object: JSON keeps the last silently, so it is an error. */
function duplicateKeys(root: Node, locate: Locate): Diagnostic[] {
  const out: Diagnostic[] = [];
  const walk = (node: Node, path: Path): void => {
    const first = new Map<string, Node>();
    for (const [i, child] of (node.children ?? []).entries()) {
      if (node.type === "array") walk(child, [...path, i]);
      if (node.type !== "object") continue;
      const [keyNode, valueNode] = child.children ?? [];
      if (keyNode === undefined) continue;
      const key = String(keyNode.value);
      const earlier = first.get(key);
      if (earlier === undefined) first.set(key, keyNode);
      else {
        const at = locate(keyNode.offset, [...path, key]);
        out.push(makeDiagnostic(
          "config.invalid",
          "error",
          `Cannot use pipeline config: key "${key}" appears twice in ${
            path.length === 0 ? "the top level" : pathText(path)
          } (first on line ${locate(earlier.offset, []).line})`,
          { at, found: key, expected: "each key once per object" },
        ));
      }
      if (valueNode !== undefined) walk(valueNode, [...path, key]);
    }
  };
  walk(root, []);
  return out;
}

/** What each JSON syntax error means, and what was expected instead. */
const SYNTAX_WORDS: Readonly<Record<string, readonly [string, string]>> = {
  InvalidSymbol: ["unexpected character", "a JSON value, key or punctuation"],
  InvalidNumberFormat: ["malformed number", "a JSON number such as 0.5 or 1e-9"],
  PropertyNameExpected: ["expected a key in double quotes", "a key in double quotes"],
  ValueExpected: ["expected a value", "a value"],
  ColonExpected: ["expected a colon after the key", "a colon"],
  CommaExpected: ["expected a comma", "a comma"],
  CloseBraceExpected: ["expected a closing brace", "}"],
  CloseBracketExpected: ["expected a closing bracket", "]"],
  EndOfFileExpected: ["expected the end of the file", "the end of the file"],
  InvalidCommentToken: ["malformed comment", "a // or /* */ comment"],
  UnexpectedEndOfComment: ["comment not closed", "*/ to close the comment"],
  UnexpectedEndOfString: ["string not closed", "a closing double quote"],
  UnexpectedEndOfNumber: ["number ends too early", "digits to end the number"],
  InvalidUnicode: ["malformed unicode escape", "\\u and four hex digits"],
  InvalidEscapeCharacter: [
    "unknown escape in a string",
    'one of \\" \\\\ \\/ \\b \\f \\n \\r \\t \\u',
  ],
  InvalidCharacter: ["control character in a string", "an escape such as \\t instead"],
};

/**
 * The syntax errors worth reporting: after an error the parser guesses, so a later error on
 * the same line, or inside the span of the previous one (an unclosed comment or string runs
 * to the end), is left out as an echo of it.
 */
function syntaxDiagnostics(
  body: string,
  errors: readonly ParseError[],
  locate: Locate,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  let lastLine = 0, lastEnd = -1;
  for (const e of errors) {
    const at = locate(e.offset, []);
    if (at.line === lastLine || e.offset <= lastEnd) continue;
    lastLine = at.line ?? 0;
    lastEnd = e.offset + e.length;
    const [words, expected] = SYNTAX_WORDS[printParseErrorCode(e.error)] ??
      ["malformed JSON", "JSON with comments"];
    const end = e.offset >= body.length;
    const span = body.slice(e.offset, e.offset + Math.max(e.length, 1)).split(/\r\n|\r|\n/)[0]!;
    const found = end ? "end of file" : span.length > 40 ? `${span.slice(0, 39)}…` : span;
    const shown = end ? "the end of the file" : found.startsWith('"') ? found : `"${found}"`;
    out.push(makeDiagnostic(
      "config.syntax",
      "error",
      `Cannot read pipeline config: ${words}, found ${shown}`,
      { at, found, expected },
    ));
  }
  return out;
}

/** Offset → 1-based line and character column (code points; CR, LF and CRLF end lines). */
function locator(body: string, file: string): Locate {
  const starts = [0];
  for (let i = 0; i < body.length; i++) {
    const c = body.charCodeAt(i);
    if (c === 10 || (c === 13 && body.charCodeAt(i + 1) !== 10)) starts.push(i + 1);
  }
  return (offset, path) => {
    let lo = 0, hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid]! <= offset) lo = mid;
      else hi = mid - 1;
    }
    const column = [...body.slice(starts[lo]!, offset)].length + 1;
    const field = pathText(path);
    return field === "" ? { file, line: lo + 1, column } : { file, line: lo + 1, column, field };
  };
}
