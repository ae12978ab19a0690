import { deepStrictEqual, equal, ok as assert } from "node:assert/strict";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { Diagnostic, SourceLocation } from "../model/diagnostic.ts";
import { PHASES_ABC } from "../model/phases.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";
import { parseCsvText } from "./csv_rows.ts";
import { folderSource, memorySource, readNetworkTables, type TableSource } from "./read_network.ts";
import { parseHeaderCell, readTableRows } from "./read_table.ts";
import type { TableSpec } from "./table_kit.ts";
import * as dev from "./tables_devices.ts";
import * as net from "./tables_network.ts";

// Sources used below:
// [STYLE] ../shared/guide/STYLE.md, "Errors and diagnostics": a diagnostic is
//   { code, severity, message, at: { file, line, column, field? } }, 1-based line and
//   column (column = CSV field number); all problems of a file in one pass; messages
//   quote the value, e.g. `Cannot read line "L17": length "-0.3 km" must be positive`.
// [1959] International yard and pound agreement: 1 ft = 0.3048 m, 1 mi = 1.609344 km
//   exactly. [SI-prefix] NIST "SI prefixes" table: k = 1e3, M = 1e6, m = 1e-3, µ = 1e-6,
//   n = 1e-9.

/** Unit-converted values: 1e-12 relative to the expected value. */
const REL_TOL = 1e-12;

// deno-lint-ignore no-explicit-any
type AnySpec = TableSpec<any, any>;

async function readText(spec: AnySpec, text: string, file?: string) {
  const { rows } = await parseCsvText(text);
  return file === undefined ? readTableRows(spec, rows) : readTableRows(spec, rows, file);
}

function only(diagnostics: readonly Diagnostic[], code: string, label: string): Diagnostic {
  const hits = diagnostics.filter((d) => d.code === code);
  equal(hits.length, 1, `${label}: one ${code} in ${JSON.stringify(diagnostics, null, 1)}`);
  return hits[0]!;
}

interface CodeCase {
  readonly code: string;
  readonly severity: "error" | "warning";
  readonly spec: AnySpec;
  readonly text: string;
  readonly at: SourceLocation;
  readonly why: string;
}

const LINE_HEADER = "id,from,to,type,length [km],phases";

/** One case per diagnostic code of readTableRows, with its exact location [STYLE]. */
const CODE_CASES: readonly CodeCase[] = [
  {
    code: "column.malformed",
    severity: "error",
    spec: net.busTable,
    text: "id,nominal_voltage [kV],bad cell\nB1,20,x\n",
    at: { file: "buses.csv", line: 1, column: 3 },
    why: "a header cell that is not `name` or `name [unit]` has no field name",
  },
  {
    code: "column.duplicate",
    severity: "error",
    spec: net.busTable,
    text: "id,nominal_voltage [kV],name,Name\nB1,20,a,b\n",
    at: { file: "buses.csv", line: 1, column: 4, field: "name" },
    why: "names are case-insensitive, the second one is the duplicate",
  },
  {
    code: "column.unknown",
    severity: "warning",
    spec: net.busTable,
    text: "id,nominal_voltage [kV],colour\nB1,20,red\n",
    at: { file: "buses.csv", line: 1, column: 3, field: "colour" },
    why: "an extra column is ignored with a warning",
  },
  {
    code: "unit.unexpected",
    severity: "warning",
    spec: net.busTable,
    text: "id,nominal_voltage [kV],customers [kW]\nB1,20,3\n",
    at: { file: "buses.csv", line: 1, column: 3, field: "customers" },
    why: "customers is a count and takes no unit",
  },
  {
    code: "unit.missing",
    severity: "error",
    spec: net.busTable,
    text: "id,nominal_voltage\nB1,20\n",
    at: { file: "buses.csv", line: 1, column: 2, field: "nominal_voltage" },
    why: "a quantity column must declare its unit",
  },
  {
    code: "unit.missing",
    severity: "error",
    spec: net.lineTable,
    text: "id,from,to,type,length [ ],phases\nL1,A,B,T,1,ABC\n",
    at: { file: "lines.csv", line: 1, column: 5, field: "length" },
    why: "empty brackets declare no unit",
  },
  {
    code: "unit.unknown",
    severity: "error",
    spec: net.busTable,
    text: "id,nominal_voltage [furlongz]\nB1,20\n",
    at: { file: "buses.csv", line: 1, column: 2, field: "nominal_voltage" },
    why: "furlongz is no unit",
  },
  {
    code: "unit.dimension",
    severity: "error",
    spec: net.lineTable,
    text: "id,from,to,type,length [kV],phases\nL1,A,B,T,1,ABC\n",
    at: { file: "lines.csv", line: 1, column: 5, field: "length" },
    why: "kV is not a length",
  },
  {
    code: "unit.dimension",
    severity: "error",
    spec: dev.loadTable,
    text: "id,bus,peak_p [kvar],peak_power_factor,min_p [kW],min_power_factor\nD1,A,1,0.9,1,0.9\n",
    at: { file: "loads.csv", line: 1, column: 3, field: "peak_p" },
    why: "active power in var (IEC 80000-6 keeps W and var apart [memory])",
  },
  {
    code: "column.missing",
    severity: "error",
    spec: net.lineTable,
    text: "\nid,from,to,length [km]\nL1,A,B,1\n",
    at: { file: "lines.csv", line: 2, field: "type" },
    why: "type is required; the header is on line 2 after a blank line",
  },
  {
    code: "csv.columns",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,A,B,T,1,ABC\nL2,A,B\n`,
    at: { file: "lines.csv", line: 3, column: 4 },
    why: "too few fields: the first missing field is 4",
  },
  {
    code: "csv.columns",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,A,B,T,1,ABC,extra,more\n`,
    at: { file: "lines.csv", line: 2, column: 7 },
    why: "too many fields: the first extra field is 7",
  },
  {
    code: "value.invalid",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,A,B,T,-0.3,ABC\n`,
    at: { file: "lines.csv", line: 2, column: 5, field: "length" },
    why: "length must be positive",
  },
  {
    code: "value.invalid",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,A,B,T,"1,5",ABC\n`,
    at: { file: "lines.csv", line: 2, column: 5, field: "length" },
    why: "decimal comma",
  },
  {
    code: "value.invalid",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,A,A,T,1,ABC\n`,
    at: { file: "lines.csv", line: 2, column: 3, field: "to" },
    why: "a cross-column rule located at the field it names",
  },
  {
    code: "value.missing",
    severity: "error",
    spec: net.lineTable,
    text: `${LINE_HEADER}\nL1,,B,T,1,ABC\n`,
    at: { file: "lines.csv", line: 2, column: 2, field: "from" },
    why: "from is required",
  },
  {
    code: "id.duplicate",
    severity: "error",
    spec: net.busTable,
    text: "id,nominal_voltage [kV]\nB1,20\nb1,20\n",
    at: { file: "buses.csv", line: 3, column: 1, field: "id" },
    why: "ids are case-insensitive",
  },
  {
    code: "id.duplicate",
    severity: "error",
    spec: dev.fuseCurveTable,
    text: "time [s],curve,kind,current [A]\n1,K,melt,50\n2,K,melt,50\n",
    at: { file: "fuse_curves.csv", line: 3, column: 2, field: "curve" },
    why: "a composite key, located at its first column wherever that is",
  },
  {
    code: "table.empty",
    severity: "error",
    spec: net.busTable,
    text: "",
    at: { file: "buses.csv", line: 1, column: 1 },
    why: "no header row",
  },
  {
    code: "table.empty",
    severity: "error",
    spec: net.busTable,
    text: "\n\n  \n",
    at: { file: "buses.csv", line: 1, column: 1 },
    why: "only blank lines",
  },
];

Deno.test("readTableRows() reports each diagnostic code with its location", async () => {
  for (const c of CODE_CASES) {
    const label = `${c.code}: ${c.why}`;
    const result = await readText(c.spec, c.text);
    const d = only(result.diagnostics, c.code, label);
    equal(d.severity, c.severity, label);
    deepStrictEqual(d.at, c.at, label);
    assert(d.message.trim().length > 0, label);
    // Sentence case [STYLE].
    assert(/^[A-Z]/.test(d.message), `${label}: ${d.message}`);
  }
});

Deno.test("readTableRows() names the file it is given in every location", async () => {
  const result = await readText(
    net.lineTable,
    `${LINE_HEADER},colour\nL1,A,B,T,-1,ABC,red\n`,
    "north/lines.csv",
  );
  deepStrictEqual(
    result.diagnostics.map((d) => [d.code, d.at]),
    [
      ["column.unknown", { file: "north/lines.csv", line: 1, column: 7, field: "colour" }],
      ["value.invalid", { file: "north/lines.csv", line: 2, column: 5, field: "length" }],
    ],
  );
  equal(result.file, "north/lines.csv");
});

Deno.test("readTableRows() quotes the offending value with its unit", async () => {
  // [STYLE]: `length "-0.3 km" must be positive`, the value as written with the unit of
  // its column as written.
  const cases = [
    {
      text: `${LINE_HEADER}\nL17,A,B,T,-0.3,ABC\n`,
      message: 'Cannot read row "L17" of lines.csv: length "-0.3 km" must be positive',
    },
    {
      text: "id,from,to,type,length [mi],phases\nL17,A,B,T,-0.3,ABC\n",
      message: 'Cannot read row "L17" of lines.csv: length "-0.3 mi" must be positive',
    },
    {
      text: `${LINE_HEADER}\nL17,A,B,T,"1,5",ABC\n`,
      message:
        'Cannot read row "L17" of lines.csv: length "1,5 km" must use a decimal point, not a comma',
    },
    {
      text: `${LINE_HEADER}\nL17,A,B,T,1,ABX\n`,
      message:
        'Cannot read row "L17" of lines.csv: phases "ABX" must be phase letters from A, B, C, each at most once',
    },
    {
      text: `${LINE_HEADER}\nL17,A,B,T,,ABC\n`,
      message: 'Cannot read row "L17" of lines.csv: length is required',
    },
    {
      text: `${LINE_HEADER}\n,A,B,T,1,ABC\n`,
      message: "Cannot read the row on line 2 of lines.csv: id is required",
    },
  ];
  for (const c of cases) {
    const result = await readText(net.lineTable, c.text);
    deepStrictEqual(result.diagnostics.map((d) => d.message), [c.message]);
  }
});

Deno.test("readTableRows() reports every bad row of a file in one pass", async () => {
  // [STYLE]: collect them all in one pass; do not stop at the first bad row.
  const text = [
    LINE_HEADER,
    "L1,A,B,T,1.0,ABC",
    "L2,A,B,T,-2,ABC", // line 3: negative length
    "L3,A,B,T,0.5,AB",
    "L4,A,B,T,0.5,ABQ", // line 5: bad phases
    "", // line 6: blank, skipped but counted
    "L5,,B,T,0.5,ABC", // line 7: from missing
    "L6,B,C,T,2.5,C",
  ].join("\n") + "\n";
  const result = await readText(net.lineTable, text);
  deepStrictEqual(
    result.diagnostics.map((d) => [d.code, d.severity, d.at]),
    [
      ["value.invalid", "error", { file: "lines.csv", line: 3, column: 5, field: "length" }],
      ["value.invalid", "error", { file: "lines.csv", line: 5, column: 6, field: "phases" }],
      ["value.missing", "error", { file: "lines.csv", line: 7, column: 2, field: "from" }],
    ],
  );
  deepStrictEqual(result.rows.map((r) => [r.value.id, r.line]), [
    ["L1", 2],
    ["L3", 4],
    ["L6", 8],
  ]);
  deepStrictEqual(result.rejected.map((r) => [r.cells.id, r.line]), [
    ["L2", 3],
    ["L4", 5],
    ["L5", 7],
  ]);
  equal(result.headerBroken, false);
});

Deno.test("readTableRows() reports header and row problems of one file together", async () => {
  const text = "id,nominal_voltage [kV],colour,name,name\nB1,-20,red,a,b\nB2,20,blue,c\n";
  const result = await readText(net.busTable, text);
  deepStrictEqual(
    result.diagnostics.map((d) => [d.code, d.at]),
    [
      ["column.unknown", { file: "buses.csv", line: 1, column: 3, field: "colour" }],
      ["column.duplicate", { file: "buses.csv", line: 1, column: 5, field: "name" }],
      ["value.invalid", { file: "buses.csv", line: 2, column: 2, field: "nominal_voltage" }],
      ["csv.columns", { file: "buses.csv", line: 3, column: 5 }],
    ],
  );
  equal(result.headerBroken, true);
});

Deno.test("readTableRows() converts row values to the internal unit of the column", async () => {
  const cases: readonly {
    spec: AnySpec;
    text: string;
    field: string;
    expected: number;
    source: string;
  }[] = [
    {
      spec: net.lineTable,
      text: "id,from,to,type,length [mi]\nL1,A,B,T,2\n",
      field: "length",
      expected: 2 * 1.609344,
      source: "1959: 1 mi = 1.609344 km",
    },
    {
      spec: net.lineTable,
      text: "id,from,to,type,length [ft]\nL1,A,B,T,5280\n",
      field: "length",
      expected: 1.609344,
      source: "1959: 5280 ft = 1 mi",
    },
    {
      spec: net.lineTable,
      text: "id,from,to,type,length [m]\nL1,A,B,T,250\n",
      field: "length",
      expected: 0.25,
      source: "SI-prefix k",
    },
    {
      spec: net.busTable,
      text: "id,nominal_voltage [V]\nB1,20000\n",
      field: "nominal_voltage",
      expected: 20,
      source: "SI-prefix k",
    },
    {
      spec: net.lineTypeTable,
      text:
        "id,construction,r1 [ohm/mi],x1 [Ω/km],r0 [mΩ/m],x0 [ohm/km],c1 [uF/km],ampacity [kA]\n" +
        "T,cable,0.306,0.1,0.5,0.4,0.3,0.42\n",
      field: "r1",
      expected: 0.306 / 1.609344,
      source: "1959 mile",
    },
    {
      spec: net.lineTypeTable,
      text:
        "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],c1 [uF/km],ampacity [A]\n" +
        "T,cable,0.1,0.1,0.5,0.4,0.3,420\n",
      field: "c1",
      expected: 300,
      source: "SI-prefix µ, n",
    },
    {
      spec: net.lineTypeTable,
      text: "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],ampacity [kA]\n" +
        "T,cable,0.1,0.1,0.5,0.4,0.42\n",
      field: "ampacity",
      expected: 420,
      source: "SI-prefix k",
    },
    {
      spec: dev.loadTable,
      text: "id,bus,peak_p [MW],peak_q [Mvar],min_p [W],min_q [var]\nD1,A,1.5,0.5,2000,-300\n",
      field: "peak_p",
      expected: 1500,
      source: "SI-prefix M, k",
    },
    {
      spec: dev.loadTable,
      text: "id,bus,peak_p [MW],peak_q [Mvar],min_p [W],min_q [var]\nD1,A,1.5,0.5,2000,-300\n",
      field: "min_q",
      expected: -0.3,
      source: "SI-prefix k",
    },
    {
      spec: dev.loadTable,
      text: "id,bus,peak_p [kW],peak_power_factor,min_p [kW],min_power_factor,stall_time [ms]\n" +
        "D1,A,10,0.9,5,0.9,250\n",
      field: "stall_time",
      expected: 0.25,
      source: "SI-prefix m",
    },
    {
      spec: net.transformerTable,
      text: "id,hv_bus,lv_bus,rated_power [kVA],hv_voltage [kV],lv_voltage [V],sc_voltage [pu]," +
        "vector_group\nT1,HV,LV,630,20,400,0.06,Dyn11\n",
      field: "sc_voltage",
      expected: 6,
      source: "% = 0.01 (SI Brochure [memory])",
    },
    {
      spec: net.transformerTable,
      text: "id,hv_bus,lv_bus,rated_power [kVA],hv_voltage [kV],lv_voltage [V],sc_voltage [pu]," +
        "vector_group\nT1,HV,LV,630,20,400,0.06,Dyn11\n",
      field: "rated_power",
      expected: 0.63,
      source: "SI-prefix M, k",
    },
  ];
  for (const c of cases) {
    const label = `${c.field} (${c.source})`;
    const result = await readText(c.spec, c.text);
    deepStrictEqual(result.diagnostics, [], label);
    const value = (result.rows[0]?.value as Record<string, number>)[c.field]!;
    assert(
      Math.abs(value - c.expected) <= REL_TOL * Math.abs(c.expected),
      `${label}: ${value}, expected ${c.expected}`,
    );
  }
});

Deno.test("readTableRows() applies the defaults of optional columns", async () => {
  // Expected defaults: phases ABC and in service (common practice: a line drawn without
  // qualifiers is three-phase and in service); 50 Hz (common practice outside North
  // America); ρ = 100 Ω·m, the earth resistivity customary for Carson's equations
  // (REFERENCES.md A, Kersting); grid source at 1 pu (common practice).
  const cases: readonly { spec: AnySpec; text: string; expected: Record<string, unknown> }[] = [
    {
      spec: net.lineTable,
      text: "id,from,to,type,length [km]\nL1,A,B,T,1\n",
      expected: { phases: PHASES_ABC, in_service: true },
    },
    {
      spec: net.lineTable,
      text: "id,from,to,type,length [km],phases,in_service\nL1,A,B,T,1,,\n",
      expected: { phases: PHASES_ABC, in_service: true },
    },
    {
      spec: net.settingsTable,
      text: "company\nNorth Grid\n",
      expected: { company: "North Grid", frequency: 50, earth_resistivity: 100 },
    },
    {
      spec: net.busTable,
      text: "id,nominal_voltage [kV],customers\nB1,20,\n",
      expected: { customers: 0 },
    },
    {
      spec: net.gridSourceTable,
      text:
        "id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA]\nG,HV,110,3000,2000\n",
      expected: { voltage_setpoint: 1, voltage_angle: 0, earthing: "solid" },
    },
  ];
  for (const c of cases) {
    const result = await readText(c.spec, c.text);
    deepStrictEqual(result.diagnostics, [], c.text);
    const value = result.rows[0]?.value as Record<string, unknown>;
    for (const [k, v] of Object.entries(c.expected)) equal(value[k], v, `${c.text}: ${k}`);
  }
});

Deno.test("readTableRows() rejects non-finite numbers in every quantity column", {}, async () => {
  // Regression: "1e999" matches the number pattern but is Infinity; columns without a range
  // check (x1, x0 of line_types; x, y of buses; voltage_angle, …) must still refuse it with a
  // sentence of our own, or a "valid" feeder gets Infinity/NaN impedances.
  const cases = [
    {
      spec: net.lineTypeTable,
      text: "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],ampacity [A]\n" +
        "T,cable,0.1,1e999,0.2,0.3,100\n",
      at: { file: "line_types.csv", line: 2, column: 4, field: "x1" },
    },
    {
      spec: net.busTable,
      text: "id,nominal_voltage [kV],x [m]\nB1,20,-1e999\n",
      at: { file: "buses.csv", line: 2, column: 3, field: "x" },
    },
    {
      spec: net.lineTable,
      text: `${LINE_HEADER}\nL1,A,B,T,1e999,ABC\n`,
      at: { file: "lines.csv", line: 2, column: 5, field: "length" },
    },
  ];
  for (const c of cases) {
    const result = await readText(c.spec, c.text);
    const d = only(result.diagnostics, "value.invalid", c.text);
    deepStrictEqual(d.at, c.at);
    assert(!d.message.includes("Invalid input"), d.message);
    equal(result.rows.length, 0);
  }
});

Deno.test("readTableRows() reads reactive columns declared in kVAR and MVAr", async () => {
  // Common practice spellings of kvar and Mvar; SI-prefix M = 1e6, k = 1e3.
  const text = "id,bus,peak_p [kW],peak_q [kVAR],min_p [kW],min_q [MVAr]\nD1,A,400,100,120,0.03\n";
  const result = await readText(dev.loadTable, text);
  deepStrictEqual(result.diagnostics, []);
  const value = result.rows[0]?.value as Record<string, number>;
  equal(value.peak_q, 100);
  assert(Math.abs(value.min_q! - 30) <= REL_TOL * 30, String(value.min_q));
});

Deno.test("readTableRows() reports a header unit named like an object property", {}, async () => {
  // Regression: a unit text that names an Object.prototype property ("constructor") must be a
  // header error, not a function used as a factor that makes every row NaN.
  const text = "id,bus,kind,rated_power [kVA],active_power [kW],voltage_setpoint [constructor]\n" +
    "G1,A,converter,100,50,1.02\n";
  const result = await readText(dev.generatorTable, text);
  const d = only(result.diagnostics, "unit.dimension", text);
  deepStrictEqual(d.at, { file: "generators.csv", line: 1, column: 6, field: "voltage_setpoint" });
  equal(result.diagnostics.filter((x) => x.code === "value.invalid").length, 0);
});

Deno.test("parseHeaderCell() splits a header cell into name and unit", () => {
  const cases: readonly [string, { name: string; unit: string | undefined } | undefined][] = [
    ["length [km]", { name: "length", unit: "km" }],
    ["  Length   [ mi ]  ", { name: "length", unit: "mi" }],
    ["r1 [Ω/km]", { name: "r1", unit: "Ω/km" }],
    ["id", { name: "id", unit: undefined }],
    ["x []", { name: "x", unit: undefined }],
    ["peak_q[kvar]", { name: "peak_q", unit: "kvar" }],
    ["", undefined],
    ["bad cell", undefined],
    ["1st", undefined],
    ["length [km", undefined],
    ["length [km] extra", undefined],
  ];
  for (const [cell, expected] of cases) deepStrictEqual(parseHeaderCell(cell), expected, cell);
});

Deno.test("readNetworkTables() reads the two-feeder fixture without diagnostics", async () => {
  const result = await readNetworkTables(memorySource(TWO_FEEDERS));
  deepStrictEqual(result.diagnostics, []);
  // switches.csv declares breaking_current [kA]: 20 kA = 20 000 A (SI-prefix k).
  const cb1 = result.value.switches.rows.find((r) => r.value.id === "CB1");
  equal(cb1?.value.breaking_current, 20_000);
  equal(result.value.settings.present, false);
});

Deno.test("readNetworkTables() reports missing, unquotable and unreadable tables", async () => {
  const withoutLines: Record<string, string> = { ...TWO_FEEDERS };
  delete withoutLines["lines.csv"];
  const withoutLoads: Record<string, string> = { ...TWO_FEEDERS };
  delete withoutLoads["loads.csv"];
  const unclosed = {
    ...TWO_FEEDERS,
    "lines.csv": 'id,from,to,type,length [km]\nLA1,SA1,A1,CAB240,1.2\n\nLA2,A1,"A2,CAB240,0.8\n',
  };
  const failing = (file: string, message: string): TableSource => async (f) => {
    if (f === file) throw new Error(message);
    return await memorySource(TWO_FEEDERS)(f);
  };
  const cases: readonly {
    name: string;
    source: TableSource;
    code: string;
    at: SourceLocation;
    message: string;
  }[] = [
    {
      name: "required table absent",
      source: memorySource(withoutLines),
      code: "table.missing",
      at: { file: "lines.csv" },
      message: "The network folder lacks the required table lines.csv",
    },
    {
      name: "quote opened on line 4 never closes",
      source: memorySource(unclosed),
      code: "csv.quote",
      at: { file: "lines.csv", line: 4 },
      message: "Cannot read lines.csv: a quoted field is not closed",
    },
    {
      name: "source throws",
      source: failing("loads.csv", "permission denied"),
      code: "table.unreadable",
      at: { file: "loads.csv" },
      message: "Cannot read loads.csv: permission denied",
    },
  ];
  for (const c of cases) {
    const result = await readNetworkTables(c.source);
    const d = only(result.diagnostics, c.code, c.name);
    equal(d.severity, "error", c.name);
    deepStrictEqual(d.at, c.at, c.name);
    equal(d.message, c.message, c.name);
  }
  // An optional table may be absent: no diagnostic at all.
  const optional = await readNetworkTables(memorySource(withoutLoads));
  deepStrictEqual(optional.diagnostics, []);
  equal(optional.value.loads.present, false);
});

const TMP_ROOT = fileURLToPath(new URL("../../reports/.test-tmp/", import.meta.url));

/** Writes `files` into a fresh folder under reports/.test-tmp, runs `body`, removes it. */
async function withFolder(
  files: Readonly<Record<string, string | Uint8Array>>,
  body: (dir: string) => Promise<void>,
): Promise<void> {
  await Deno.mkdir(TMP_ROOT, { recursive: true });
  const dir = await Deno.makeTempDir({ dir: TMP_ROOT, prefix: "read_table_" });
  try {
    for (const [name, content] of Object.entries(files)) {
      if (typeof content === "string") await Deno.writeTextFile(join(dir, name), content);
      else await Deno.writeFile(join(dir, name), content);
    }
    await body(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("readNetworkTables() reads a folder on disk like the same tables in memory", async () => {
  // The same bytes through streamCsvFile and through parseCsvText give the same rows,
  // lines and diagnostics; one row is made bad so the comparison covers diagnostics.
  const files = {
    ...TWO_FEEDERS,
    "lines.csv": TWO_FEEDERS["lines.csv"]!.replace("LA2,A1,A2,CAB240,0.8", "LA2,A1,A2,CAB240,-0.8"),
  };
  await withFolder(files, async (dir) => {
    const disk = await readNetworkTables(folderSource(dir));
    const memory = await readNetworkTables(memorySource(files));
    deepStrictEqual(disk.diagnostics, memory.diagnostics);
    deepStrictEqual(disk.diagnostics.map((d) => [d.code, d.at]), [
      ["value.invalid", { file: "lines.csv", line: 3, column: 5, field: "length" }],
    ]);
    deepStrictEqual(disk.value, memory.value);
  });
});

Deno.test("readNetworkTables() reports a file that is not UTF-8 once, as unreadable", async () => {
  // Unicode ch. 3: byte FC is never well-formed UTF-8; it is what a Latin-1 export
  // writes for "ü" ("Grün" = 47 72 FC 6E).
  const header = new TextEncoder().encode("id,from,to,type,length [km]\nL1,A,B,T,1\nL2,Gr");
  const latin1 = new Uint8Array([...header, 0xfc, 0x6e, 0x2c, 0x31, 0x0a]);
  await withFolder({ ...TWO_FEEDERS, "lines.csv": latin1 }, async (dir) => {
    const result = await readNetworkTables(folderSource(dir));
    const forLines = result.diagnostics.filter((d) => d.at?.file === "lines.csv");
    deepStrictEqual(forLines.map((d) => [d.code, d.severity, d.at]), [
      ["table.unreadable", "error", { file: "lines.csv" }],
    ]);
    equal(
      forLines[0]!.message,
      "Cannot read lines.csv: it is not valid UTF-8 text (save the export as UTF-8)",
    );
  });
});
