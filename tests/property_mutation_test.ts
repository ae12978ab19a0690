/**
 * Property test of the whole validation on randomly damaged input: whatever is done to
 * the two-feeder fixture, validateFleet() must not throw, and every problem must come
 * out as a well-formed, located diagnostic (STYLE.md, "Errors and diagnostics": a
 * diagnostic is data with code, severity, message and a 1-based location; throw only for
 * programmer mistakes; a bad feeder is set aside, the good ones go on).
 */
import { deepStrictEqual, equal, ok as assert } from "node:assert/strict";
import fc from "fast-check";
import type { Diagnostic } from "../src/model/diagnostic.ts";
import { memorySource, TABLES } from "../src/ingest/read_network.ts";
import { validateFleet } from "../src/pipeline/validate_fleet.ts";
import { TWO_FEEDERS } from "./fixtures/two_feeders.ts";

/** Runs of the property, and the seed that makes them repeatable. */
const NUM_RUNS = 200;
const SEED = 20_240_611;

/** Every file name of the network format: the only names a diagnostic may point at. */
const FORMAT_FILES: ReadonlySet<string> = new Set(Object.values(TABLES).map((s) => s.file));
const REQUIRED_FILES = Object.values(TABLES).filter((s) => s.required).map((s) => s.file);
const OPTIONAL_FILES = Object.values(TABLES).filter((s) => !s.required).map((s) => s.file);

type Mutation =
  | { kind: "cell"; file: number; row: number; col: number; text: string; quoted: boolean }
  | { kind: "deleteRow"; file: number; row: number }
  | { kind: "duplicateRow"; file: number; row: number }
  | { kind: "dropHeaderCell"; file: number; col: number }
  | { kind: "addColumn"; file: number; name: string; value: string }
  | { kind: "truncate"; file: number; at: number }
  | { kind: "swapHeader"; file: number; a: number; b: number }
  | { kind: "deleteTable"; file: number }
  | { kind: "renameTable"; file: number; to: string };

/** Cell text that breaks parsers: empty, unicode, decimal commas, huge, NaN-like, quotes. */
const nastyText: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom(
    "",
    " ",
    "0",
    "-0",
    "-1",
    "-0.3",
    "1,5",
    "1.5e3",
    "1e999",
    "-1e999",
    "1e-400",
    "NaN",
    "Infinity",
    "-Infinity",
    "0x1F",
    "1_000",
    "  7  ",
    '"',
    '""',
    'a"b',
    '"open',
    "\n",
    "\r\n",
    ",",
    ";",
    "yes",
    "no",
    "ABC",
    "CBA",
    "AA",
    "N",
    "open",
    "closed",
    "fuse",
    "breaker",
    "matrix",
    "geometry",
    "Dyn11",
    "YNyn0",
    "Dyn13",
    "ü",
    "Ω",
    "µ",
    "\u{1F50C}",
    "\u0000",
    "\uFEFF",
    "\u202E",
    "x".repeat(600),
    "9".repeat(400),
    "HV",
    "BB",
    "SA1",
    "A1",
    "A2",
    "B2",
    "X1",
    "F1",
    "F2",
    "CAB240",
    "OH50",
    "K25",
    "T1",
    "CB1",
    "NO1",
  ),
  fc.string({ maxLength: 8 }),
  fc.string({ unit: "grapheme", maxLength: 6 }),
  fc.double().map(String),
  fc.integer().map(String),
  fc.double({ min: -1e6, max: 1e6, noNaN: true }).map((x) => String(x).replace(".", ",")),
);

/** Header cells to add: format columns with and without units, and garbage. */
const headerText: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom(
    "colour",
    "id",
    "feeder",
    "phases",
    "in_service",
    "kind",
    "customers",
    "length [mi]",
    "x [m]",
    "peak_q [kvar]",
    "r1 [ohm/mi]",
    "name [kW]",
    "nominal_voltage [V]",
    "time [ms]",
    "frequency [Hz]",
    "sc_voltage [pu]",
    "[km]",
    "bad cell",
    "",
  ),
  nastyText,
);

const index = fc.nat({ max: 1_000 });

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  {
    arbitrary: fc.record({
      kind: fc.constant("cell" as const),
      file: index,
      row: index,
      col: index,
      text: nastyText,
      quoted: fc.boolean(),
    }),
    weight: 5,
  },
  {
    arbitrary: fc.record({ kind: fc.constant("deleteRow" as const), file: index, row: index }),
    weight: 1,
  },
  {
    arbitrary: fc.record({ kind: fc.constant("duplicateRow" as const), file: index, row: index }),
    weight: 1,
  },
  {
    arbitrary: fc.record({ kind: fc.constant("dropHeaderCell" as const), file: index, col: index }),
    weight: 1,
  },
  {
    arbitrary: fc.record({
      kind: fc.constant("addColumn" as const),
      file: index,
      name: headerText,
      value: nastyText,
    }),
    weight: 1,
  },
  {
    arbitrary: fc.record({ kind: fc.constant("truncate" as const), file: index, at: fc.nat() }),
    weight: 1,
  },
  {
    arbitrary: fc.record({
      kind: fc.constant("swapHeader" as const),
      file: index,
      a: index,
      b: index,
    }),
    weight: 1,
  },
  { arbitrary: fc.record({ kind: fc.constant("deleteTable" as const), file: index }), weight: 1 },
  {
    arbitrary: fc.record({
      kind: fc.constant("renameTable" as const),
      file: index,
      to: fc.constantFrom("Buses.csv", "buses.txt", "lines_old.csv", "line-types.csv", ""),
    }),
    weight: 1,
  },
);

function pick<T>(items: readonly T[], n: number): T | undefined {
  return items.length === 0 ? undefined : items[n % items.length];
}

/** Lines of a file as cells, split naively (the fixture has no quoted fields). */
function toGrid(text: string): string[][] {
  const lines = text.split("\n");
  if (lines.at(-1) === "") lines.pop();
  return lines.map((l) => l.split(","));
}

function fromGrid(grid: readonly (readonly string[])[]): string {
  return grid.map((cells) => cells.join(",")).join("\n") + "\n";
}

function applyMutation(files: Record<string, string>, m: Mutation): void {
  const present = Object.keys(files).sort();
  if (m.kind === "deleteTable") {
    const file = pick(OPTIONAL_FILES.filter((f) => f in files), m.file);
    if (file !== undefined) delete files[file];
    return;
  }
  if (m.kind === "renameTable") {
    const file = pick(REQUIRED_FILES.filter((f) => f in files), m.file);
    if (file === undefined) return;
    const text = files[file]!;
    delete files[file];
    if (m.to !== "") files[m.to] = text;
    return;
  }
  const file = pick(present, m.file);
  if (file === undefined) return;
  const text = files[file]!;
  if (m.kind === "truncate") {
    files[file] = text.slice(0, m.at % (text.length + 1));
    return;
  }
  const grid = toGrid(text);
  const header = grid[0];
  switch (m.kind) {
    case "cell": {
      const row = pick(grid, m.row);
      if (row === undefined || row.length === 0) return;
      row[m.col % row.length] = m.quoted ? `"${m.text.replaceAll('"', '""')}"` : m.text;
      break;
    }
    case "deleteRow":
      if (grid.length > 0) grid.splice(m.row % grid.length, 1);
      break;
    case "duplicateRow":
      if (grid.length > 0) {
        const i = m.row % grid.length;
        grid.splice(i, 0, [...grid[i]!]);
      }
      break;
    case "dropHeaderCell":
      if (header !== undefined && header.length > 0) header.splice(m.col % header.length, 1);
      break;
    case "addColumn":
      grid.forEach((cells, i) => cells.push(i === 0 ? m.name : m.value));
      break;
    case "swapHeader":
      if (header !== undefined && header.length > 0) {
        const a = m.a % header.length, b = m.b % header.length;
        [header[a], header[b]] = [header[b]!, header[a]!];
      }
      break;
  }
  files[file] = fromGrid(grid);
}

function mutate(mutations: readonly Mutation[]): Record<string, string> {
  const files: Record<string, string> = { ...TWO_FEEDERS };
  for (const m of mutations) applyMutation(files, m);
  return files;
}

/** Number of lines of a text as an editor counts them (any line break). */
function lineCount(text: string): number {
  return text.split(/\r\n|\r|\n/).length;
}

function checkDiagnostic(
  d: Diagnostic,
  files: Readonly<Record<string, string>>,
): void {
  const label = JSON.stringify(d);
  assert(typeof d.code === "string" && /^[a-z_]+(\.[a-z_0-9]+)+$/.test(d.code), label);
  assert(d.severity === "error" || d.severity === "warning" || d.severity === "info", label);
  assert(typeof d.message === "string" && d.message.trim().length > 0, label);
  assert(d.at !== undefined, `not located: ${label}`);
  assert(FORMAT_FILES.has(d.at.file), `unknown file: ${label}`);
  if (d.at.line !== undefined) {
    assert(Number.isInteger(d.at.line) && d.at.line >= 1, `line: ${label}`);
    const text = files[d.at.file];
    if (text !== undefined) assert(d.at.line <= lineCount(text), `line past the end: ${label}`);
  }
  if (d.at.column !== undefined) {
    assert(Number.isInteger(d.at.column) && d.at.column >= 1, `column: ${label}`);
  }
}

/** What the runs produced, to show the mutations reach the checks at all. */
interface RunStats {
  runs: number;
  withErrors: number;
  withSetAside: number;
}

/** The property: validateFleet() on mutated input never throws and reports cleanly. */
function mutationProperty(stats: RunStats) {
  return fc.asyncProperty(
    fc.array(mutation, { minLength: 1, maxLength: 3 }),
    async (mutations) => {
      const files = mutate(mutations);
      const { value, diagnostics } = await validateFleet(memorySource(files));
      for (const d of diagnostics) checkDiagnostic(d, files);
      const errors = diagnostics.filter((d) => d.severity === "error");
      const setAside = value.feeders.filter((f) => f.status === "set_aside");
      for (const e of errors) {
        assert(setAside.length > 0 || FORMAT_FILES.has(e.at?.file ?? ""), JSON.stringify(e));
      }
      // An error tagged with feeders sets each of them aside; only valid feeders compile.
      const byId = new Map(value.feeders.map((f) => [f.feederId, f]));
      for (const e of errors) {
        for (const id of e.feederId?.split(",") ?? []) {
          equal(byId.get(id)?.status, "set_aside", `${id}: ${JSON.stringify(e)}`);
        }
      }
      equal(value.forms.length, value.feeders.length - setAside.length);
      stats.runs++;
      if (errors.length > 0) stats.withErrors++;
      if (setAside.length > 0) stats.withSetAside++;
    },
  );
}

Deno.test("validateFleet() gives no errors for the unmutated two-feeder fixture", async () => {
  // Sanity check of the property below: the fixture is described by its author as two
  // valid feeders, F1 radial and F2 with one loop, plus an island X1–X2 behind NO2.
  const { value, diagnostics } = await validateFleet(memorySource(TWO_FEEDERS));
  deepStrictEqual(diagnostics.filter((d) => d.severity === "error"), []);
  deepStrictEqual(
    value.feeders.map((f) => [f.feederId, f.status, f.structure]),
    [["F1", "valid", "radial"], ["F2", "valid", "meshed"]],
  );
  equal(value.forms.length, 2);
  deepStrictEqual(value.islands.map((i) => [...i.busIds].sort()), [["X1", "X2"]]);
  for (const d of diagnostics) checkDiagnostic(d, TWO_FEEDERS);
});

Deno.test("validateFleet() never throws on mutated input and locates every diagnostic", async () => {
  // Regression: with this seed a rejected buses.csv row came within about 10 runs and was
  // once reported as an unlocated island (see the next test).
  const stats: RunStats = { runs: 0, withErrors: 0, withSetAside: 0 };
  await fc.assert(mutationProperty(stats), { numRuns: NUM_RUNS, seed: SEED });
  // The mutations bite: many runs give errors and some set a feeder aside.
  equal(stats.runs, NUM_RUNS);
  assert(stats.withErrors >= NUM_RUNS / 2, JSON.stringify(stats));
  assert(stats.withSetAside >= NUM_RUNS / 4, JSON.stringify(stats));
});

Deno.test(
  "validateFleet() reports a rejected, unconnected bus row once, located, without an island",
  async () => {
    // A bus row that fails validation and that nothing connects to: the row error (buses.csv
    // line 16: header on line 1, 14 fixture rows, then this one) says all there is; an island
    // warning for it alone would repeat it without a location of its own.
    const files = { ...TWO_FEEDERS, "buses.csv": TWO_FEEDERS["buses.csv"] + "Z9,abc,,0\n" };
    const { diagnostics } = await validateFleet(memorySource(files));
    const row = diagnostics.find((d) => d.code === "value.invalid");
    assert(row !== undefined, JSON.stringify(diagnostics));
    equal(row.at?.file, "buses.csv");
    equal(row.at?.line, 16);
    equal(diagnostics.some((d) => d.code === "topology.island" && /"Z9"/.test(d.message)), false);
    assert(diagnostics.every((d) => d.at !== undefined));
  },
);
