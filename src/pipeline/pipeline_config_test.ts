import { deepStrictEqual, equal, notStrictEqual, ok as assert } from "node:assert/strict";
import fc from "fast-check";
import type { Diagnostic, Severity } from "../model/diagnostic.ts";
import { DEFAULT_LOAD_FLOW_OPTIONS, type LoadFlowOptions } from "../solve/load_flow_types.ts";
import {
  DEFAULT_PIPELINE,
  parsePipelineConfig,
  type PipelineConfig,
  VOLTAGE_BAND_PRESETS,
  type VoltageBandPresetName,
} from "./pipeline_config.ts";

// Sources used below:
// [STYLE] ../shared/guide/STYLE.md, "Errors and diagnostics": 1-based line and column, all
//   problems of a file in one pass; for JSON files the column is the character column.
// [REF-E] ../shared/guide/REFERENCES.md E: EN 50160 Un ± 10 % [memory]; ANSI C84.1 Range A
//   114–126 V and Range B 110–127 V on a 120 V base [memory].

const FILE = "p.json";

function parse(text: string) {
  return parsePipelineConfig(text, FILE);
}

function where(d: Diagnostic) {
  return { code: d.code, severity: d.severity, line: d.at?.line, column: d.at?.column };
}

/** Every leaf of a value, with its path, to show that nothing is left undefined. */
function leaves(value: unknown, path = ""): [string, unknown][] {
  if (value === null || typeof value !== "object") return [[path, value]];
  return Object.entries(value).flatMap(([k, v]) => leaves(v, `${path}.${k}`));
}

Deno.test("parsePipelineConfig() fills every omitted field with DEFAULT_PIPELINE", () => {
  const { value, diagnostics } = parse("{}");
  deepStrictEqual(diagnostics, []);
  deepStrictEqual(value, DEFAULT_PIPELINE);
  for (const [path, v] of leaves(value)) assert(v !== undefined, `${path} is undefined`);
  // Fresh objects, not the shared constant.
  notStrictEqual(value!.cases, DEFAULT_PIPELINE.cases);
  notStrictEqual(value!.limits.voltageBand.mv, DEFAULT_PIPELINE.limits.voltageBand.mv);
});

Deno.test("DEFAULT_PIPELINE holds the documented defaults and the load-flow options", () => {
  deepStrictEqual(DEFAULT_PIPELINE.cases, [
    { id: "peak-no-dg", demand: "peak", demandScale: 1, generationScale: 0 },
    { id: "min-full-dg", demand: "min", demandScale: 1, generationScale: 1 },
  ]);
  deepStrictEqual(DEFAULT_PIPELINE.solver, DEFAULT_LOAD_FLOW_OPTIONS);
  deepStrictEqual(DEFAULT_PIPELINE.limits, {
    voltageBand: {
      preset: "en50160-style",
      mv: { vMinPu: 0.9, vMaxPu: 1.1 },
      lv: { vMinPu: 0.9, vMaxPu: 1.1 },
    },
    lvMaxKv: 1.0,
    voltageChange: { mvLimitPercent: 2, lvLimitPercent: 3 },
    thermal: { limitPercent: 100, warnPercent: 90 },
    reversePower: { headLimitKw: 0, transformerLimitKw: 0 },
    losses: { warnPercent: 6 },
  });
});

Deno.test("parsePipelineConfig() fills the fields a partial config leaves out", () => {
  const { value, diagnostics } = parse(
    `{ "cases": [{ "id": "c1", "demand": "min", "generationScale": 0.5 }],
       "limits": { "thermal": { "warnPercent": 80 } }, "solver": { "tapControl": false } }`,
  );
  deepStrictEqual(diagnostics, []);
  deepStrictEqual(value!.cases, [{
    id: "c1",
    demand: "min",
    demandScale: 1,
    generationScale: 0.5,
  }]);
  deepStrictEqual(value!.limits.thermal, { limitPercent: 100, warnPercent: 80 });
  deepStrictEqual(value!.solver, { ...DEFAULT_LOAD_FLOW_OPTIONS, tapControl: false });
  deepStrictEqual(value!.checks, DEFAULT_PIPELINE.checks);
  // The solver block is what the load flow takes (a compile-time check as much as a run-time one).
  const options: LoadFlowOptions = value!.solver;
  equal(options.maxIterations, 100);
});

Deno.test("parsePipelineConfig() resolves each voltage band preset to its numbers", () => {
  // [REF-E]: the ANSI ranges are the service voltages over 120 V, rounded to 4 decimals.
  const cases: readonly [VoltageBandPresetName, number, number][] = [
    ["en50160-style", 0.9, 1.1],
    ["ansi-range-a-style", 114 / 120, 126 / 120],
    ["ansi-range-b-style", 110 / 120, 127 / 120],
  ];
  deepStrictEqual(cases.map((c) => c[0]).sort(), Object.keys(VOLTAGE_BAND_PRESETS).sort());
  for (const [name, vMinPu, vMaxPu] of cases) {
    const { value, diagnostics } = parse(`{ "limits": { "voltageBand": "${name}" } }`);
    deepStrictEqual(diagnostics, [], name);
    const band = value!.limits.voltageBand;
    equal(band.preset, name);
    for (const range of [band.mv, band.lv]) {
      assert(Math.abs(range.vMinPu - vMinPu) <= 5e-5, `${name} vMinPu ${range.vMinPu}`);
      assert(Math.abs(range.vMaxPu - vMaxPu) <= 5e-5, `${name} vMaxPu ${range.vMaxPu}`);
    }
    assert(VOLTAGE_BAND_PRESETS[name].source.includes("[memory]"), `${name} names its source`);
  }
});

Deno.test("parsePipelineConfig() keeps a written-out band with no preset name", () => {
  const { value, diagnostics } = parse(`{ "limits": { "voltageBand": {
    "mv": { "vMinPu": 0.93, "vMaxPu": 1.07 }, "lv": { "vMinPu": 0.9, "vMaxPu": 1.1 } } } }`);
  deepStrictEqual(diagnostics, []);
  deepStrictEqual(value!.limits.voltageBand, {
    preset: null,
    mv: { vMinPu: 0.93, vMaxPu: 1.07 },
    lv: { vMinPu: 0.9, vMaxPu: 1.1 },
  });
});

interface BadCase {
  readonly why: string;
  readonly lines: readonly string[];
  readonly code: string;
  readonly severity: Severity;
  readonly line: number;
  readonly column: number;
  readonly field?: string;
}

const CASE = `"demand": "peak", "generationScale": 0`;

/** One bad config per rule, each with the one diagnostic it gives and where [STYLE]. */
const BAD_CASES: readonly BadCase[] = [
  {
    why: "a missing comma is a syntax error at the token after it",
    lines: ["{", `  "name": "x"`, `  "cases": []`, "}"],
    code: "config.syntax",
    severity: "error",
    line: 3,
    column: 3,
  },
  {
    why: "a file that ends inside an object is a syntax error at the end",
    lines: ["{", `  "name": "x"`],
    code: "config.syntax",
    severity: "error",
    line: 2,
    column: 14,
  },
  {
    why: "a single-quoted string is a syntax error at the quote",
    lines: [`{ "name": 'x' }`],
    code: "config.syntax",
    severity: "error",
    line: 1,
    column: 11,
  },
  {
    why: "a key without quotes is one syntax error, not its echoes",
    lines: [`{`, `  name: "x" }`],
    code: "config.syntax",
    severity: "error",
    line: 2,
    column: 3,
  },
  {
    why: "a comment that is not closed",
    lines: [`{ "name": "x" /* the name`, "}"],
    code: "config.syntax",
    severity: "error",
    line: 1,
    column: 15,
  },
  {
    why: "an empty file",
    lines: [""],
    code: "config.syntax",
    severity: "error",
    line: 1,
    column: 1,
  },
  {
    why: "a number written as a string is the wrong type",
    lines: ["{", `  "cases": [{ "id": "a", ${CASE}, "demandScale": "1.1" }]`, "}"],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 81,
    field: "cases[0].demandScale",
  },
  {
    why: "a boolean flag given as null is the wrong type",
    lines: [`{ "checks": {`, `  "thermal": null } }`],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 14,
    field: "checks.thermal",
  },
  {
    why: "maxIterations below 1 is out of range",
    lines: [`{ "solver": { "maxIterations": 0 } }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 32,
    field: "solver.maxIterations",
  },
  {
    why: "tolerancePu above 1e-3 is out of range",
    lines: [`{ "solver": {`, `    "tolerancePu": 1e-2`, `} }`],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 20,
    field: "solver.tolerancePu",
  },
  {
    why: "maxIterations must be a whole number",
    lines: [`{ "solver": { "maxIterations": 2.5 } }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 32,
    field: "solver.maxIterations",
  },
  {
    why: "reactiveDamping 0 is outside 0 < α ≤ 1",
    lines: [`{ "solver": { "reactiveDamping": 0 } }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 34,
    field: "solver.reactiveDamping",
  },
  {
    why: "a negative generationScale is out of range",
    lines: [`{ "cases": [{ "id": "a", "demand": "min", "generationScale": -0.1 }] }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 62,
    field: "cases[0].generationScale",
  },
  {
    why: "a demand that is neither peak nor min",
    lines: [`{ "cases": [{ "id": "a", "demand": "max", "generationScale": 0 }] }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 36,
    field: "cases[0].demand",
  },
  {
    why: "a case id with a space is not an identifier",
    lines: [`{ "cases": [{ "id": "peak 1", ${CASE} }] }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 21,
    field: "cases[0].id",
  },
  {
    why: "a missing required key is located at its parent object",
    lines: ["{", `  "cases": [`, `    { "id": "a", "demand": "peak" }`, "  ]", "}"],
    code: "config.invalid",
    severity: "error",
    line: 3,
    column: 5,
    field: "cases[0].generationScale",
  },
  {
    why: "vMinPu equal to vMaxPu is located at vMinPu",
    lines: [
      `{ "limits": { "voltageBand": {`,
      `  "mv": { "vMinPu": 1.0, "vMaxPu": 1.0 },`,
      `  "lv": { "vMinPu": 0.9, "vMaxPu": 1.1 } } } }`,
    ],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 21,
    field: "limits.voltageBand.mv.vMinPu",
  },
  {
    why: "vMinPu above vMaxPu in the LV range",
    lines: [
      `{ "limits": { "voltageBand": {`,
      `  "mv": { "vMinPu": 0.9, "vMaxPu": 1.1 },`,
      `  "lv": { "vMinPu": 1.2, "vMaxPu": 0.8 } } } }`,
    ],
    code: "config.invalid",
    severity: "error",
    line: 3,
    column: 21,
    field: "limits.voltageBand.lv.vMinPu",
  },
  {
    why: "a band bound outside 0.5–1.5 pu",
    lines: [
      `{ "limits": { "voltageBand": {`,
      `  "mv": { "vMinPu": 0.9, "vMaxPu": 1.6 },`,
      `  "lv": { "vMinPu": 0.9, "vMaxPu": 1.1 } } } }`,
    ],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 36,
    field: "limits.voltageBand.mv.vMaxPu",
  },
  {
    why: "a written-out band without lv is located at the band object",
    lines: [`{ "limits": {`, `  "voltageBand": { "mv": { "vMinPu": 0.9, "vMaxPu": 1.1 } } } }`],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 18,
    field: "limits.voltageBand.lv",
  },
  {
    why: "a band that is neither a name nor an object",
    lines: [`{ "limits": { "voltageBand": 0.9 } }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 30,
    field: "limits.voltageBand",
  },
  {
    why: "an unknown preset name",
    lines: [`{ "limits": {`, `  "voltageBand": "en50160" } }`],
    code: "config.preset",
    severity: "error",
    line: 2,
    column: 18,
    field: "limits.voltageBand",
  },
  {
    why: "warnPercent at or above limitPercent is located at warnPercent",
    lines: [`{ "limits": { "thermal": { "limitPercent": 90, "warnPercent": 90 } } }`],
    code: "config.invalid",
    severity: "error",
    line: 1,
    column: 63,
    field: "limits.thermal.warnPercent",
  },
  {
    why: "a duplicate case id is located at the second id, ignoring case",
    lines: [
      "{",
      `  "cases": [`,
      `    { "id": "peak", ${CASE} },`,
      `    { "id": "PEAK", ${CASE} }`,
      "  ]",
      "}",
    ],
    code: "config.invalid",
    severity: "error",
    line: 4,
    column: 13,
    field: "cases[1].id",
  },
  {
    why: "an empty case list is located at the list",
    lines: ["{", `  "cases": [ ]`, "}"],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 12,
    field: "cases",
  },
  {
    why: "a key written twice in one object is located at the second",
    lines: [`{ "name": "a",`, `  "name": "b" }`],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 3,
    field: "name",
  },
  {
    why: "a config that is not an object is located at its start",
    lines: ["", `  [ "peak" ]`],
    code: "config.invalid",
    severity: "error",
    line: 2,
    column: 3,
  },
  {
    why: "an unknown key is a warning located at the key",
    lines: [`{ "limits": {`, `  "thermal": { "limitPercent": 100, "colour": "red" } } }`],
    code: "config.unknown_key",
    severity: "warning",
    line: 2,
    column: 37,
    field: "limits.thermal.colour",
  },
  {
    why: "an unknown key at the top level",
    lines: [`{`, ` "sovler": {} }`],
    code: "config.unknown_key",
    severity: "warning",
    line: 2,
    column: 2,
    field: "sovler",
  },
];

Deno.test("parsePipelineConfig() reports each bad config with its code and location", () => {
  for (const c of BAD_CASES) {
    const { value, diagnostics } = parse(c.lines.join("\n"));
    deepStrictEqual(
      diagnostics.map(where),
      [{ code: c.code, severity: c.severity, line: c.line, column: c.column }],
      `${c.why}: ${JSON.stringify(diagnostics, null, 1)}`,
    );
    const d = diagnostics[0]!;
    equal(d.at?.file, FILE, c.why);
    equal(d.at?.field, c.field, c.why);
    assert(/^[A-Z]/.test(d.message), `${c.why}: sentence case "${d.message}"`);
    assert(d.expected !== undefined && d.expected !== "", `${c.why}: says what was expected`);
    equal(value === undefined, c.severity === "error", `${c.why}: value only without errors`);
  }
});

Deno.test("parsePipelineConfig() quotes the value found and what was expected", () => {
  const cases: readonly [string, string, string, string][] = [
    [`{ "solver": { "maxIterations": 0 } }`, "0", "at least 1", `solver.maxIterations "0"`],
    [`{ "lvMaxKv": 1 }`, "lvMaxKv", "a key listed in docs/pipeline.md", `unknown key "lvMaxKv"`],
    [
      `{ "solver": { "tolerancePu": "1e-9" } }`,
      "1e-9",
      "a number",
      `solver.tolerancePu "1e-9" must be a number, not a string`,
    ],
    [
      `{ "limits": { "voltageBand": "x" } }`,
      "x",
      `one of "en50160-style", "ansi-range-a-style", "ansi-range-b-style"`,
      `limits.voltageBand "x" is not a known voltage band preset`,
    ],
  ];
  for (const [text, found, expected, inMessage] of cases) {
    const [d, ...more] = parse(text).diagnostics;
    equal(more.length, 0, text);
    equal(d?.found, found, text);
    equal(d?.expected, expected, text);
    assert(d?.message.includes(inMessage), `${text}: ${d?.message}`);
  }
});

Deno.test("parsePipelineConfig() reports every problem of a file in one pass", () => {
  const text = [
    "{", //                                                                              1
    `  "cases": [`, //                                                                   2
    `    { "id": "a", "demand": "max", "generationScale": 0 },`, //                     3
    `    { "id": "A", "demand": "peak", "generationScale": -1, "weight": 2 }`, //       4
    "  ],", //                                                                           5
    `  "limits": {`, //                                                                  6
    `    "voltageBand": "ansi",`, //                                                     7
    `    "thermal": { "limitPercent": 90, "warnPercent": 95, "note": "x" }`, //          8
    "  },", //                                                                           9
    `  "solver": { "maxIterations": 0, "tapControl": "yes" },`, //                      10
    `  "extra": true`, //                                                                11
    "}",
  ].join("\n");
  const { value, diagnostics } = parse(text);
  equal(value, undefined);
  deepStrictEqual(
    diagnostics.map((d) => [d.code, d.at?.line, d.at?.column]).sort((a, b) =>
      (a[1] as number) - (b[1] as number) || (a[2] as number) - (b[2] as number)
    ),
    [
      ["config.invalid", 3, 28],
      ["config.invalid", 4, 13],
      ["config.invalid", 4, 55],
      ["config.unknown_key", 4, 59],
      ["config.preset", 7, 20],
      ["config.invalid", 8, 53],
      ["config.unknown_key", 8, 57],
      ["config.invalid", 10, 32],
      ["config.invalid", 10, 49],
      ["config.unknown_key", 11, 3],
    ].sort((a, b) => (a[1] as number) - (b[1] as number) || (a[2] as number) - (b[2] as number)),
  );
});

Deno.test("parsePipelineConfig() accepts comments, trailing commas and a byte-order mark", () => {
  const text = [
    "\uFEFF// A config with comments",
    "{",
    "  /* the cases */",
    `  "cases": [`,
    `    { "id": "c1", "demand": "peak", "generationScale": 0, }, // trailing comma`,
    "  ],",
    `  "limits": { "voltageBand": "ansi-range-b-style", /* end */ },`,
    "}",
    "// the end",
  ].join("\r\n");
  const { value, diagnostics } = parse(text);
  deepStrictEqual(diagnostics, []);
  deepStrictEqual(value!.cases, [{ id: "c1", demand: "peak", demandScale: 1, generationScale: 0 }]);
  equal(value!.limits.voltageBand.preset, "ansi-range-b-style");
});

Deno.test("parsePipelineConfig() counts columns in characters, on any line ending", () => {
  // "Süd 🌞": ü is one UTF-16 unit, 🌞 two; each counts as one column.
  const line = `{ "name": "Süd 🌞", "solver": { "maxIterations": -1 } }`;
  for (const eol of ["\n", "\r\n", "\r"]) {
    const { diagnostics } = parse(["// first", line].join(eol));
    deepStrictEqual(diagnostics.map(where), [
      { code: "config.invalid", severity: "error", line: 2, column: 49 },
    ], JSON.stringify(eol));
  }
});

Deno.test("parsePipelineConfig() leaves unknown keys out of the value", () => {
  const { value, diagnostics } = parse(
    `{ "note": "x", "limits": { "losses": { "warnPercent": 5, "unit": "%" } } }`,
  );
  deepStrictEqual(diagnostics.map((d) => d.code), ["config.unknown_key", "config.unknown_key"]);
  const expected: PipelineConfig = {
    ...DEFAULT_PIPELINE,
    limits: { ...DEFAULT_PIPELINE.limits, losses: { warnPercent: 5 } },
  };
  deepStrictEqual(value, expected);
});

Deno.test("parsePipelineConfig() never throws and locates every problem inside the text", () => {
  const base = Deno.readTextFileSync(new URL("../../pipelines/nightly.json", import.meta.url));
  const checkText = (text: string) => {
    const { value, diagnostics } = parse(text);
    const lineCount = text.split(/\r\n|\r|\n/).length;
    for (const d of diagnostics) {
      const line = d.at?.line ?? 0;
      assert(line >= 1 && line <= lineCount, `line ${line} of ${lineCount}: ${d.message}`);
      assert((d.at?.column ?? 0) >= 1, d.message);
    }
    equal(value === undefined, diagnostics.some((d) => d.severity === "error"));
  };
  fc.assert(
    fc.property(fc.jsonValue(), (v) => checkText(JSON.stringify(v, null, 2))),
    { numRuns: 300, seed: 7 },
  );
  // Random edits of a valid config: cut a span, or put a random snippet in its place.
  fc.assert(
    fc.property(
      fc.nat(base.length - 1),
      fc.nat(12),
      fc.constantFrom("", "{", "}", ",", '"', "-", "1e9", "null", "/*", "[", "x"),
      (at, cut, put) => checkText(base.slice(0, at) + put + base.slice(at + cut)),
    ),
    { numRuns: 500, seed: 11 },
  );
});

Deno.test("parsePipelineConfig() reads the cost table, remedy and ranking sections with located errors", () => {
  const ok = parse(
    `{ "ranking": { "method": "weighted", "classWeights": { "safety": 5 } },
       "costs": { "currency": "units", "voltageRegulator": 80 } }`,
  );
  deepStrictEqual(ok.diagnostics, []);
  equal(ok.value!.ranking.method, "weighted");
  equal(ok.value!.ranking.classWeights.safety, 5);
  equal(ok.value!.ranking.classWeights.statutory, 100); // the default of the others stays
  equal(ok.value!.costs.voltageRegulator, 80);
  deepStrictEqual(ok.value!.costs.conductors, DEFAULT_PIPELINE.costs.conductors);

  const bad = parse(`{
  "ranking": { "classOrder": ["safety", "statutory", "planning"] },
  "costs": { "conductors": [{ "conductorClass": "X", "construction": "cable", "level": "mv",
    "r1OhmPerKm": 0.1, "x1OhmPerKm": 0.1, "ampacityA": -5, "costPerKm": 1 }] },
  "remedies": { "transformerSizesMva": [1, 0.63] }
}`);
  equal(bad.value, undefined);
  // The bad ampacity, the size out of order, and the list that lacks a class (schema order).
  deepStrictEqual(bad.diagnostics.map(where), [
    { code: "config.invalid", severity: "error", line: 4, column: 56 },
    { code: "config.invalid", severity: "error", line: 5, column: 44 },
    { code: "config.invalid", severity: "error", line: 2, column: 30 },
  ]);
  assert(bad.diagnostics[2]!.message.includes(`"hosting"`));
});

Deno.test("parsePipelineConfig() reads hosting strategies: presets (IEEE 1547-2018 Cat. A/B volt-var [memory]), custom points, fixed power factor", () => {
  const r = parse(JSON.stringify({
    hosting: {
      strategies: [
        { id: "unity", reactive: { mode: "unity" } },
        { id: "vv-a", reactive: { mode: "volt_var", preset: "ieee1547-cat-a" } },
        {
          id: "own",
          label: "our curve",
          reactive: { mode: "volt_var", points: [{ x: 0.95, y: 0.3 }, { x: 1.05, y: -0.3 }] },
        },
        { id: "pf", reactive: { mode: "fixed_power_factor", powerFactor: 0.97 } },
      ],
      reversePower: { headLimitKw: 1500 },
      targetMw: 4,
    },
  }));
  const h = r.value!.hosting;
  deepStrictEqual(h.strategies.map((s) => s.id), ["unity", "vv-a", "own", "pf"]);
  // Category A: 0.90 pu / +25 %, 1.00 pu / 0, 1.10 pu / −25 % of nameplate VA [memory].
  deepStrictEqual(h.strategies[1]!.reactive, {
    mode: "volt_var",
    points: [{ x: 0.9, y: 0.25 }, { x: 1, y: 0 }, { x: 1.1, y: -0.25 }],
  });
  deepStrictEqual(h.strategies[2]!.label, "our curve");
  deepStrictEqual(h.reversePower, { headLimitKw: 1500, transformerLimitKw: null });
  deepStrictEqual(h.targetMw, 4);
  deepStrictEqual(h.rapidChange, { mvLimitPercent: 3, lvLimitPercent: 5 });
});

Deno.test("parsePipelineConfig() rejects bad hosting strategies with their place", () => {
  const r = parse(JSON.stringify({
    hosting: {
      strategies: [
        { id: "a", reactive: { mode: "volt_var", points: [{ x: 1.05, y: 0 }, { x: 1.0, y: 0 }] } },
        { id: "A", reactive: { mode: "unity" } },
      ],
    },
  }));
  deepStrictEqual(r.value, undefined);
  const paths = r.diagnostics.map((d) => d.at?.field ?? d.message);
  assert(paths.some((p) => p.includes("strategies") && p.includes("points")), paths.join("; "));
  assert(paths.some((p) => p.includes("strategies") && p.includes("id")), paths.join("; "));
});

Deno.test("parsePipelineConfig() reads recovery settings: custom ride-through categories beside the presets, an unknown default category is an error", () => {
  const r = parse(JSON.stringify({
    recovery: {
      recoveryThresholdPu: 0.85,
      defaultCategory: "grid-code-b",
      categories: {
        "grid-code-b": { trip: [{ vPu: 0.15, seconds: 0.25 }], cessationPu: 0.2 },
      },
      motor: { stallTimeS: 0.2 },
    },
  }));
  const rec = r.value!.recovery;
  deepStrictEqual(Object.keys(rec.categories).sort(), ["I", "II", "III", "grid-code-b"]);
  deepStrictEqual(rec.categories["grid-code-b"], {
    label: "grid-code-b",
    trip: [{ vPu: 0.15, seconds: 0.25 }],
    cessationPu: 0.2,
  });
  equal(rec.motor.stallTimeS, 0.2);
  equal(rec.motor.stallVoltagePu, 0.7);
  const bad = parse(JSON.stringify({ recovery: { defaultCategory: "IV" } }));
  equal(bad.value, undefined);
  assert(bad.diagnostics.some((d) => d.message.includes("ride-through category")));
});
