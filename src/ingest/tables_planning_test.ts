/** Reading the planning tables: the generation queue and the generation forecast. */
import { deepStrictEqual as assertEquals, equal, ok as assert } from "node:assert/strict";
import type { SourceLocation } from "../model/diagnostic.ts";
import { parseCsvText } from "./csv_rows.ts";
import { readTableRows } from "./read_table.ts";
import type { TableSpec } from "./table_kit.ts";
import { generationForecastTable, generationQueueTable } from "./tables_planning.ts";

// Sources used below:
// [STYLE] ../shared/guide/STYLE.md, "Errors and diagnostics": every problem is a located
//   diagnostic (1-based line; column = CSV field number), all of a file in one pass.
// [SI-prefix] NIST "SI prefixes" table: k = 1e3, M = 1e6.

// deno-lint-ignore no-explicit-any
type AnySpec = TableSpec<any, any>;

async function read(spec: AnySpec, text: string) {
  const { rows } = await parseCsvText(text);
  return readTableRows(spec, rows);
}

const QUEUE_HEADER = "application_id,bus_id,size [kW],unit_kind,reactive_strategy,queue_position";

Deno.test("generationQueueTable reads good rows with their defaults and units", async () => {
  const t = await read(
    generationQueueTable,
    "application_id,bus_id,size [MW],unit_kind,reactive_strategy,queue_position\n" +
      "GA-1,A2,1.5,,,2\n" +
      "GA-2,b3,0.25,Synchronous,volt-var-b,1\n",
  );
  assertEquals(t.diagnostics, []);
  // 1 MW = 1000 kW [SI-prefix]: the internal unit of active power is kW.
  assertEquals(t.rows.map((r) => r.value), [
    {
      application_id: "GA-1",
      bus_id: "A2",
      size: 1500,
      unit_kind: "converter",
      reactive_strategy: undefined,
      queue_position: 2,
    },
    {
      application_id: "GA-2",
      bus_id: "b3",
      size: 250,
      unit_kind: "synchronous",
      reactive_strategy: "volt-var-b",
      queue_position: 1,
    },
  ]);
  assertEquals(t.rows.map((r) => r.line), [2, 3]);
});

Deno.test("generationForecastTable reads a forecast per feeder in kW", async () => {
  const t = await read(generationForecastTable, "feeder_id,forecast [MW]\nF1,2.5\nF2,0\n");
  assertEquals(t.diagnostics, []);
  assertEquals(t.rows.map((r) => r.value), [
    { feeder_id: "F1", forecast: 2500 },
    { feeder_id: "F2", forecast: 0 },
  ]);
});

interface BadCase {
  readonly why: string;
  readonly spec: AnySpec;
  readonly text: string;
  readonly code: string;
  readonly at: SourceLocation;
}

const Q = (rows: string) => `${QUEUE_HEADER}\n${rows}`;

/** One case per kind of bad row, with its exact location [STYLE]. */
const BAD_CASES: readonly BadCase[] = [
  {
    why: "a size of zero",
    spec: generationQueueTable,
    text: Q("GA-1,A1,0,,,1\n"),
    code: "value.invalid",
    at: { file: "generation_queue.csv", line: 2, column: 3, field: "size" },
  },
  {
    why: "a negative size",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,1\nGA-2,A1,-5,,,2\n"),
    code: "value.invalid",
    at: { file: "generation_queue.csv", line: 3, column: 3, field: "size" },
  },
  {
    why: "an empty bus_id",
    spec: generationQueueTable,
    text: Q("GA-1,,100,,,1\n"),
    code: "value.missing",
    at: { file: "generation_queue.csv", line: 2, column: 2, field: "bus_id" },
  },
  {
    why: "a unit kind the queue does not take",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,induction,,1\n"),
    code: "value.invalid",
    at: { file: "generation_queue.csv", line: 2, column: 4, field: "unit_kind" },
  },
  {
    why: "a fractional queue position",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,1.5\n"),
    code: "value.invalid",
    at: { file: "generation_queue.csv", line: 2, column: 6, field: "queue_position" },
  },
  {
    why: "a queue position of zero",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,0\n"),
    code: "value.invalid",
    at: { file: "generation_queue.csv", line: 2, column: 6, field: "queue_position" },
  },
  {
    why: "an empty queue position",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,\n"),
    code: "value.missing",
    at: { file: "generation_queue.csv", line: 2, column: 6, field: "queue_position" },
  },
  {
    why: "an application id used twice (case-insensitive), reported on the later row",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,1\nga-1,A2,200,,,2\n"),
    code: "id.duplicate",
    at: { file: "generation_queue.csv", line: 3, column: 1, field: "application_id" },
  },
  {
    why: "a queue position used twice, reported on the later row",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,1\nGA-2,A2,200,,,3\nGA-3,A3,300,,,3\n"),
    code: "value.duplicate",
    at: { file: "generation_queue.csv", line: 4, column: 6, field: "queue_position" },
  },
  {
    why: "the same queue position written differently",
    spec: generationQueueTable,
    text: Q("GA-1,A1,100,,,2\nGA-2,A2,200,,,2.0\n"),
    code: "value.duplicate",
    at: { file: "generation_queue.csv", line: 3, column: 6, field: "queue_position" },
  },
  {
    why: "a size column without its unit",
    spec: generationQueueTable,
    text: "application_id,bus_id,size,queue_position\nGA-1,A1,100,1\n",
    code: "unit.missing",
    at: { file: "generation_queue.csv", line: 1, column: 3, field: "size" },
  },
  {
    why: "a size in a reactive-power unit",
    spec: generationQueueTable,
    text: "application_id,bus_id,size [kvar],queue_position\nGA-1,A1,100,1\n",
    code: "unit.dimension",
    at: { file: "generation_queue.csv", line: 1, column: 3, field: "size" },
  },
  {
    why: "a negative forecast",
    spec: generationForecastTable,
    text: "feeder_id,forecast [MW]\nF1,-1\n",
    code: "value.invalid",
    at: { file: "generation_forecast.csv", line: 2, column: 2, field: "forecast" },
  },
  {
    why: "a forecast that is not a number",
    spec: generationForecastTable,
    text: 'feeder_id,forecast [MW]\nF1,"1,5"\n',
    code: "value.invalid",
    at: { file: "generation_forecast.csv", line: 2, column: 2, field: "forecast" },
  },
  {
    why: "a feeder given twice (case-insensitive), reported on the later row",
    spec: generationForecastTable,
    text: "feeder_id,forecast [MW]\nF1,1\nf1,2\n",
    code: "id.duplicate",
    at: { file: "generation_forecast.csv", line: 3, column: 1, field: "feeder_id" },
  },
];

for (const c of BAD_CASES) {
  Deno.test(`readTableRows() on ${c.spec.file}: ${c.why} gives ${c.code} at its cell`, async () => {
    const t = await read(c.spec, c.text);
    const hits = t.diagnostics.filter((d) => d.code === c.code);
    equal(hits.length, 1, JSON.stringify(t.diagnostics, null, 1));
    equal(hits[0]!.severity, "error");
    assertEquals(hits[0]!.at, c.at);
    if (c.at.line !== 1) {
      // A bad row is dropped; a header problem marks the table instead.
      assert(t.rejected.some((r) => r.line === c.at.line));
      assert(!t.rows.some((r) => r.line === c.at.line));
    } else assert(t.headerBroken);
  });
}

Deno.test("readTableRows() reports every bad row of the queue in one pass and keeps the good ones", async () => {
  const t = await read(
    generationQueueTable,
    Q("GA-1,A1,100,,,1\nGA-2,A1,0,,,2\nGA-3,A2,50,wind,,3\nGA-4,A2,70,,,1\nGA-5,A3,90,,,5\n"),
  );
  assertEquals(t.diagnostics.map((d) => [d.code, d.at?.line, d.at?.column]), [
    ["value.invalid", 3, 3],
    ["value.invalid", 4, 4],
    ["value.duplicate", 5, 6],
  ]);
  assertEquals(t.rows.map((r) => r.value.application_id), ["GA-1", "GA-5"]);
});
