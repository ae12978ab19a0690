/**
 * The planning inputs in the model: applications checked against the buses, the queue in
 * position order, and bad rows that never set a feeder aside. Structure only (the
 * two-feeder fixture, no electrical reference values).
 */
import { deepStrictEqual as assertEquals, equal, ok as assert } from "node:assert/strict";
import fc from "fast-check";
import { memorySource, readNetworkTables } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { buildNetwork } from "./build_network.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

const QUEUE_HEADER = "application_id,bus_id,size [kW],unit_kind,reactive_strategy,queue_position";

async function build(files: Readonly<Record<string, string>>) {
  const tables = await readNetworkTables(memorySource(files));
  const network = buildNetwork(tables.value);
  return { network: network.value, diagnostics: [...tables.diagnostics, ...network.diagnostics] };
}

const withQueue = (rows: string, forecast?: string): Record<string, string> => ({
  ...TWO_FEEDERS,
  "generation_queue.csv": `${QUEUE_HEADER}\n${rows}`,
  ...(forecast === undefined ? {} : { "generation_forecast.csv": forecast }),
});

Deno.test("buildPlanningInputs() keeps the queue in position order with the buses' spelling", async () => {
  const { network, diagnostics } = await build(withQueue(
    "GA-3,b2,400,,,7\nGA-1,a2,250,synchronous,pf-090,2\nGA-2,A4,100,,,5\n",
    "feeder_id,forecast [MW]\nf1,1.25\n",
  ));
  assertEquals(diagnostics, []);
  assertEquals(network.applications, [
    {
      id: "GA-1",
      busId: "A2",
      pKw: 250,
      kind: "synchronous",
      strategy: "pf-090",
      position: 2,
      at: { file: "generation_queue.csv", line: 3 },
    },
    {
      id: "GA-2",
      busId: "A4",
      pKw: 100,
      kind: "converter",
      strategy: null,
      position: 5,
      at: { file: "generation_queue.csv", line: 4 },
    },
    {
      id: "GA-3",
      busId: "B2",
      pKw: 400,
      kind: "converter",
      strategy: null,
      position: 7,
      at: { file: "generation_queue.csv", line: 2 },
    },
  ]);
  assertEquals(network.generationForecasts, [
    { feederId: "f1", pKw: 1250, at: { file: "generation_forecast.csv", line: 2 } },
  ]);
});

Deno.test("buildPlanningInputs() drops an application on an unknown bus with a located error and taints nothing", async () => {
  const { network, diagnostics } = await build(withQueue("GA-1,A2,250,,,1\nGA-2,ZZ9,300,,,2\n"));
  assertEquals(diagnostics.map((d) => [d.code, d.severity, d.at]), [
    [
      "ref.unknown",
      "error",
      { file: "generation_queue.csv", line: 3, column: 2, field: "bus_id" },
    ],
  ]);
  assert(diagnostics[0]!.message.includes('"ZZ9"'));
  assertEquals(network.applications.map((a) => a.id), ["GA-1"]);
  assertEquals(network.taintedBuses, {});
});

Deno.test("buildPlanningInputs() leaves out an application on a rejected bus without a second error", async () => {
  const files = withQueue("GA-1,A3,250,,,1\n");
  files["buses.csv"] = files["buses.csv"]!.replace("A3,20,F1,0", "A3,-20,F1,0");
  const { network, diagnostics } = await build(files);
  assertEquals(diagnostics.map((d) => d.at?.file), ["buses.csv"]);
  assertEquals(network.applications, []);
});

Deno.test("buildPlanningInputs() uses no row of a table whose header is broken", async () => {
  const { network, diagnostics } = await build({
    ...TWO_FEEDERS,
    "generation_queue.csv": "application_id,bus_id,size,queue_position\nGA-1,A2,250,1\n",
    "generation_forecast.csv": "feeder_id,forecast [km]\nF1,2\n",
  });
  assertEquals(diagnostics.map((d) => [d.code, d.at?.file]), [
    ["unit.missing", "generation_queue.csv"],
    ["unit.dimension", "generation_forecast.csv"],
  ]);
  assertEquals(network.applications, []);
  assertEquals(network.generationForecasts, []);
  assertEquals(network.taintedBuses, {});
});

/** Cells that break parsers, and ids that name real, unknown and substation buses. */
const cell = fc.oneof(
  fc.constantFrom("", "0", "1", "2", "3", "-1", "1.5", "1,5", "NaN", "1e999"),
  fc.constantFrom("A1", "a2", "B4", "BB", "HV", "X1", "ZZ"),
  fc.constantFrom("F1", "f2", "F9", "converter", "synchronous", "wind", "x y", '"q"'),
  fc.string({ maxLength: 6 }),
);
const rowsOf = (n: number) =>
  fc.array(fc.array(cell, { minLength: n, maxLength: n }), { maxLength: 8 });
const csvLine = (cells: readonly string[]) =>
  cells.map((c) => (/[",\n\r]/.test(c) ? `"${c.replaceAll('"', '""')}"` : c)).join(",");

Deno.test("validateFleet() studies the same feeders whatever the queue and forecast hold (property)", async () => {
  const base = await validateFleet(memorySource(TWO_FEEDERS));
  const valid = (r: typeof base) => r.value.forms.map((f) => f.feederId);
  await fc.assert(
    fc.asyncProperty(rowsOf(6), rowsOf(2), async (queue, forecast) => {
      const files = {
        ...TWO_FEEDERS,
        "generation_queue.csv": [QUEUE_HEADER, ...queue.map(csvLine)].join("\n"),
        "generation_forecast.csv": ["feeder_id,forecast [MW]", ...forecast.map(csvLine)].join(
          "\n",
        ),
      };
      const r = await validateFleet(memorySource(files));
      assertEquals(valid(r), valid(base));
      for (const d of r.diagnostics) {
        if (d.at?.file !== "generation_queue.csv" && d.at?.file !== "generation_forecast.csv") {
          continue;
        }
        assert(d.at.line !== undefined && d.at.line >= 1, JSON.stringify(d));
        equal(d.feederId, undefined, "a planning row is never a feeder's reason");
      }
      // Every application a form carries sits on one of that form's own buses.
      for (const f of r.value.forms) {
        for (const a of f.applications) assert(a.bus >= f.substationBusCount && a.bus < f.nBus);
      }
    }),
    { numRuns: 100, seed: 20_250_301 },
  );
});
