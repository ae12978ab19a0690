/** Feeder key figures and the plausibility screen (REFERENCES.md F, common practice). */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

Deno.test("summarizeFeeder() adds up line length, demand and generation of each feeder", async () => {
  const r = await validateFleet(memorySource(TWO_FEEDERS));
  const [f1, f2] = r.value.feeders;
  assert(f1 && f2);
  // F1: LA1 1.2 + LA2 0.8 km cable, LA3 2.5 km overhead; D1 400 kW + D2 30 kW; PV1 750 kW.
  assertEquals([f1.lineKm, f1.cableKm, f1.overheadKm], [4.5, 2, 2.5]);
  assertEquals([f1.peakLoadKw, f1.minLoadKw, f1.generationKw], [430, 128, 750]);
  assertEquals(f1.generationByKindKw, { converter: 750, synchronous: 0, induction: 0 });
  assertEquals([f1.reachKm, f1.vnKv, f1.buses, f1.customers], [4.5, 20, 5, 25]);
  assertEquals([f1.structure, f2.structure, f2.loops], ["radial", "meshed", 1]);
  assertEquals(f1.protectiveDevices, 2);
});

const PLAUSIBILITY: { name: string; edit: [string, string, string]; code: string }[] = [
  {
    // 45 km of line on a 20 kV feeder is more than 2 km per kV.
    name: "a feeder that reaches far beyond its nominal kV in km",
    edit: ["lines.csv", "LA3,A2,A3,OH50,2.5,A", "LA3,A2,A3,OH50,45,A"],
    code: "plausibility.length",
  },
  {
    name: "a feeder whose load in MVA is far above its nominal kV",
    edit: ["loads.csv", "D3,B2,600,", "D3,B2,60000,"],
    code: "plausibility.load",
  },
];

for (const c of PLAUSIBILITY) {
  Deno.test(`summarizeFeeder() warns of ${c.name}`, async () => {
    const [file, from, to] = c.edit;
    const files = { ...TWO_FEEDERS, [file]: TWO_FEEDERS[file]!.replace(from, to) };
    const r = await validateFleet(memorySource(files));
    const d = r.diagnostics.filter((d) => d.code.startsWith("plausibility."));
    assertEquals(d.map((x) => [x.code, x.severity]), [[c.code, "warning"]]);
    // Located at the feeder's head device, and the feeder stays valid.
    assertEquals(d[0]!.at?.file, "switches.csv");
    assert(r.value.feeders.every((f) => f.status === "valid"));
  });
}
