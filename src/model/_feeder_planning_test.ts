/**
 * The planning inputs in each feeder's solver form: applications in queue order with
 * their bus index in the form, and the forecast matched to the feeder. Structure only
 * (the two-feeder fixture, no electrical reference values).
 */
import { deepStrictEqual as assertEquals, notEqual, ok as assert } from "node:assert/strict";
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { hashFeederForm } from "./hash_feeder_form.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

// Source used below:
// [SI-prefix] NIST "SI prefixes" table: k = 1e3, M = 1e6.

const QUEUE_HEADER = "application_id,bus_id,size [kW],unit_kind,reactive_strategy,queue_position";

const QUEUE = `${QUEUE_HEADER}
GA-7,A4,120,,,9
GA-2,B2,800,,,4
GA-5,a2,2500,synchronous,pf-095,3
GA-1,A1,300,,,6
GA-9,BB,50,,,1
`;

async function formsOf(files: Readonly<Record<string, string>>) {
  const r = await validateFleet(memorySource(files));
  return { forms: new Map(r.value.forms.map((f) => [f.feederId, f])), fleet: r };
}

Deno.test("compileFeeder() carries the feeder's applications in queue order with their bus index", async () => {
  const { forms, fleet } = await formsOf({ ...TWO_FEEDERS, "generation_queue.csv": QUEUE });
  const f1 = forms.get("F1")!, f2 = forms.get("F2")!;
  // F1's order is HV, BB, SA1, A1, A2, A3, A4 (compile_feeder_test.ts).
  assertEquals(f1.applications, [
    { id: "GA-5", bus: 4, pKw: 2500, kind: "synchronous", strategy: "pf-095", position: 3 },
    { id: "GA-1", bus: 3, pKw: 300, kind: "converter", strategy: null, position: 6 },
    { id: "GA-7", bus: 6, pKw: 120, kind: "converter", strategy: null, position: 9 },
  ]);
  assertEquals(f1.applications.map((a) => f1.busIds[a.bus]), ["A2", "A1", "A4"]);
  assertEquals(f2.applications.map((a) => [a.id, f2.busIds[a.bus]]), [["GA-2", "B2"]]);
  // GA-9 sits on the substation busbar, shared by both feeders: neither carries it.
  const noFeeder = fleet.diagnostics.filter((d) => d.code === "topology.no_feeder");
  assertEquals(noFeeder.map((d) => [d.severity, d.at]), [
    ["warning", { file: "generation_queue.csv", line: 6, column: 2, field: "bus_id" }],
  ]);
});

Deno.test("compileFeeder() matches the forecast to the feeder id case-insensitively, in MW", async () => {
  const { forms } = await formsOf({
    ...TWO_FEEDERS,
    "generation_forecast.csv": "feeder_id,forecast [kW]\nf1,3500\n",
  });
  // 3500 kW = 3.5 MW [SI-prefix].
  assertEquals(forms.get("F1")!.forecastGenerationMw, 3.5);
  assertEquals(forms.get("F2")!.forecastGenerationMw, null);
});

Deno.test("compileFeeder() gives a meshed feeder of two ids the sum of their forecasts", async () => {
  const files = {
    ...TWO_FEEDERS,
    "switches.csv": TWO_FEEDERS["switches.csv"]!.replace(
      "NO1,A2,B2,load_break_switch,open",
      "NO1,A2,B2,load_break_switch,closed",
    ),
    "generation_forecast.csv": "feeder_id,forecast [MW]\nF1,1.5\nF2,2\n",
  };
  const { forms } = await formsOf(files);
  assertEquals([...forms.keys()], ["F1+F2"]);
  assertEquals(forms.get("F1+F2")!.forecastGenerationMw, 3.5);
});

Deno.test("compileFeeder() gives an empty queue and no forecast without the planning tables", async () => {
  const { forms } = await formsOf(TWO_FEEDERS);
  for (const f of forms.values()) {
    assertEquals(f.applications, []);
    assertEquals(f.forecastGenerationMw, null);
  }
});

Deno.test("validateFleet() keeps every feeder when an application names an unknown bus", async () => {
  const { forms, fleet } = await formsOf({
    ...TWO_FEEDERS,
    "generation_queue.csv": `${QUEUE_HEADER}\nGA-1,A2,250,,,1\nGA-2,NOPE,300,,,2\nGA-3,B2,,,,3\n`,
  });
  assertEquals([...forms.keys()], ["F1", "F2"]);
  assert(fleet.value.feeders.every((f) => f.status !== "set_aside"));
  assertEquals(
    fleet.diagnostics.filter((d) => d.at?.file === "generation_queue.csv")
      .map((d) => [d.code, d.severity, d.at?.line, d.at?.column]),
    [["ref.unknown", "error", 3, 2], ["value.missing", "error", 4, 3]],
  );
  assertEquals(forms.get("F1")!.applications.map((a) => a.id), ["GA-1"]);
  assertEquals(forms.get("F2")!.applications, []);
});

Deno.test("hashFeederForm() changes when the feeder's queue or forecast changes", async () => {
  const hashOf = async (files: Record<string, string>) =>
    await hashFeederForm((await formsOf(files)).forms.get("F1")!);
  const plain = await hashOf({ ...TWO_FEEDERS });
  const queued = await hashOf({
    ...TWO_FEEDERS,
    "generation_queue.csv": `${QUEUE_HEADER}\nGA-1,A2,250,,,1\n`,
  });
  const bigger = await hashOf({
    ...TWO_FEEDERS,
    "generation_queue.csv": `${QUEUE_HEADER}\nGA-1,A2,260,,,1\n`,
  });
  const forecast = await hashOf({
    ...TWO_FEEDERS,
    "generation_forecast.csv": "feeder_id,forecast [MW]\nF1,2\n",
  });
  assertEquals(new Set([plain, queued, bigger, forecast]).size, 4);
  // An application on the other feeder leaves this feeder's hash alone.
  const elsewhere = await hashOf({
    ...TWO_FEEDERS,
    "generation_queue.csv": `${QUEUE_HEADER}\nGA-1,B2,250,,,1\n`,
  });
  assertEquals(elsewhere, plain);
  notEqual(queued, plain);
});
