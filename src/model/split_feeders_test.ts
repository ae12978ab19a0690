/**
 * Topology tests on small hand-made networks (structure only: expected orders, islands
 * and loops follow from the drawings in the fixture, no electrical reference values).
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { memorySource, readNetworkTables } from "../ingest/read_network.ts";
import { buildNetwork } from "./build_network.ts";
import { splitFeeders } from "./split_feeders.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

async function split(files: Readonly<Record<string, string>>) {
  const tables = await readNetworkTables(memorySource(files));
  const network = buildNetwork(tables.value);
  const topo = splitFeeders(network.value);
  return {
    feeders: topo.value.feeders,
    islands: topo.value.islands,
    diagnostics: [...tables.diagnostics, ...network.diagnostics, ...topo.diagnostics],
  };
}

function edit(file: string, fn: (text: string) => string): Record<string, string> {
  return { ...TWO_FEEDERS, [file]: fn(TWO_FEEDERS[file]!) };
}

Deno.test("splitFeeders() splits the fleet at the feeder-head breakers", async () => {
  const { feeders, diagnostics } = await split(TWO_FEEDERS);
  assertEquals(feeders.map((f) => f.feederId), ["F1", "F2"]);
  assertEquals(feeders.map((f) => f.headDeviceIds), [["CB1"], ["CB2"]]);
  assertEquals(feeders.map((f) => f.sourceId), ["G1", "G1"]);
  // The substation part (source bus HV, busbar BB) leads every feeder's order.
  for (const f of feeders) {
    assertEquals(f.busIds.slice(0, 2), ["HV", "BB"]);
    assertEquals(f.substationBusCount, 2);
  }
  assertEquals(diagnostics.filter((d) => d.severity === "error"), []);
});

Deno.test("splitFeeders() orders buses breadth-first with parents before children", async () => {
  const { feeders } = await split(TWO_FEEDERS);
  const f1 = feeders[0]!;
  assertEquals(f1.busIds, ["HV", "BB", "SA1", "A1", "A2", "A3", "A4"]);
  assertEquals([...f1.parent], [-1, 0, 1, 2, 3, 4, 4]);
  assertEquals(f1.parentEdge.map((e) => e?.id), [
    undefined,
    "T1",
    "CB1",
    "LA1",
    "LA2",
    "LA3",
    "FU1",
  ]);
  for (const f of feeders) {
    for (let k = 1; k < f.busIds.length; k++) {
      assert(f.parent[k]! < k, `parent of ${k} comes first`);
    }
  }
});

Deno.test("splitFeeders() marks a closed loop as meshed and keeps the loop edge", async () => {
  const { feeders } = await split(TWO_FEEDERS);
  const f2 = feeders[1]!;
  assertEquals(f2.meshed, true);
  assertEquals(f2.loopEdges.map((e) => e.id), ["LB3"]);
  assertEquals(feeders[0]!.meshed, false);
  assertEquals(feeders[0]!.loopEdges, []);
});

Deno.test("splitFeeders() reports a de-energised island with its location and open neighbour", async () => {
  const { islands, diagnostics } = await split(TWO_FEEDERS);
  assertEquals(islands, [{ busIds: ["X1", "X2"], nextTo: [{ switchId: "NO2", feederId: "F2" }] }]);
  const d = diagnostics.find((d) => d.code === "topology.island")!;
  assertEquals(d.severity, "warning");
  assertEquals(d.at, { file: "buses.csv", line: 14 });
});

Deno.test("splitFeeders() lists open points with what lies beyond them", async () => {
  const { feeders } = await split(TWO_FEEDERS);
  assertEquals(feeders[0]!.openPoints, [{ switchId: "NO1", busId: "A2", otherSide: "F2" }]);
  assertEquals(feeders[1]!.openPoints, [
    { switchId: "NO1", busId: "B2", otherSide: "F1" },
    { switchId: "NO2", busId: "B4", otherSide: "island" },
  ]);
});

Deno.test("splitFeeders() joins feeders tied by a closed switch into one meshed feeder", async () => {
  const files = edit(
    "switches.csv",
    (t) => t.replace("NO1,A2,B2,load_break_switch,open", "NO1,A2,B2,load_break_switch,closed"),
  );
  const { feeders, diagnostics } = await split(files);
  assertEquals(feeders.map((f) => f.feederId), ["F1+F2"]);
  assertEquals(feeders[0]!.feederIds, ["F1", "F2"]);
  assertEquals(feeders[0]!.meshed, true);
  // Two loops: the tie through the busbar and the loop inside F2.
  assertEquals(feeders[0]!.loopEdges.length, 2);
  assert(diagnostics.some((d) => d.code === "topology.merged" && d.severity === "warning"));
});

Deno.test("splitFeeders() checks phases against what is present upstream", async () => {
  // A three-phase line beyond the single-phase lateral A2–A3.
  const files = {
    ...edit("buses.csv", (t) => t + "A5,20,F1,0\n"),
    "lines.csv": TWO_FEEDERS["lines.csv"]! + "LA5,A3,A5,OH50,0.5,ABC\n",
  };
  const { feeders, diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "phase.upstream")!;
  assertEquals(d.at, { file: "lines.csv", line: 11, column: 6, field: "phases" });
  assertEquals(d.feederId, "F1");
  assertEquals(feeders[0]!.setAside, true);
  assertEquals(feeders[1]!.setAside, false);
});

Deno.test("splitFeeders() checks load phases against the bus", async () => {
  const files = edit(
    "loads.csv",
    (t) => t.replace("D2,A3,30,0.95,8,0.95,A", "D2,A3,30,0.95,8,0.95,B"),
  );
  const { feeders, diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "phase.upstream")!;
  assertEquals(d.at, { file: "loads.csv", line: 3, column: 7, field: "phases" });
  assertEquals(feeders.map((f) => f.setAside), [true, false]);
});

Deno.test("splitFeeders() warns where the feeder column disagrees with connectivity", async () => {
  const files = edit("buses.csv", (t) => t.replace("B3,20,F2,9", "B3,20,F1,9"));
  const { feeders, diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "feeder.mismatch")!;
  assertEquals(d.severity, "warning");
  assertEquals(d.at, { file: "buses.csv", line: 12, column: 3, field: "feeder" });
  assertEquals(d.found, "F1");
  assertEquals(feeders.map((f) => f.setAside), [false, false]);
});

Deno.test("splitFeeders() sets aside only the feeder holding a rejected row", async () => {
  const files = edit(
    "lines.csv",
    (t) => t.replace("LB5,B3,B4,CAB240,0.5", "LB5,B3,B4,CAB240,-0.5"),
  );
  const { feeders, islands, diagnostics } = await split(files);
  assertEquals(feeders.map((f) => [f.feederId, f.setAside]), [["F1", false], ["F2", true]]);
  assertEquals(feeders[1]!.reasons, [{ code: "row.rejected", file: "lines.csv", line: 9 }]);
  // B4 stays attached to F2 through the rejected line: no false island.
  assertEquals(islands.map((i) => i.busIds), [["X1", "X2"]]);
  assert(diagnostics.some((d) => d.code === "value.invalid" && d.at?.line === 9));
});

Deno.test("splitFeeders() rejects a feeder fed from two grid sources", async () => {
  // A second source G2 whose transformer T2 feeds X1; closing NO2 ties it into F2.
  const files = {
    ...edit("buses.csv", (t) => t + "HV2,110,,0\n"),
    "grid_sources.csv": TWO_FEEDERS["grid_sources.csv"]! + "G2,HV2,110,2500,1500\n",
    "switches.csv": TWO_FEEDERS["switches.csv"]!.replace(
      "NO2,B4,X1,disconnector,open",
      "NO2,B4,X1,disconnector,closed",
    ),
    "transformers.csv": TWO_FEEDERS["transformers.csv"]! +
      "T2,HV2,X1,40,110,20.5,12,180,YNd11,no,,0,0,0\n",
  };
  const { feeders, diagnostics } = await split(files);
  assertEquals(feeders.map((f) => [f.feederId, f.setAside]), [["F1", false], ["F2", true]]);
  const d = diagnostics.find((d) => d.code === "topology.multisource")!;
  assertEquals(d.feederId, "F2");
  assertEquals(d.at, { file: "switches.csv", line: 3 });
});

Deno.test("splitFeeders() warns of loads that no feeder reaches", async () => {
  const files = edit("loads.csv", (t) => t + "D9,BB,100,0.95,50,0.95,ABC\n");
  const { diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "topology.no_feeder")!;
  assertEquals(d.at, { file: "loads.csv", line: 5, column: 2, field: "bus" });
});

Deno.test("splitFeeders() reports a head device that no source feeds", async () => {
  const files = edit("switches.csv", (t) => t + "CB9,X1,X2,breaker,closed,F9,630,20,\n");
  const { feeders, diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "topology.head")!;
  assertEquals(d.at, { file: "switches.csv", line: 7, column: 6, field: "heads_feeder" });
  assertEquals(feeders.find((f) => f.feederId === "F9")?.setAside, true);
});

Deno.test("splitFeeders() reports one feeder id heading two separate networks", async () => {
  const files = edit(
    "switches.csv",
    (t) => t.replace("CB2,BB,SB1,breaker,closed,F2", "CB2,BB,SB1,breaker,closed,F1"),
  );
  const { feeders, diagnostics } = await split(files);
  const d = diagnostics.find((d) => d.code === "feeder.duplicate")!;
  assertEquals(d.severity, "error");
  assertEquals(d.at, { file: "switches.csv", line: 3 });
  assert(feeders.some((f) => f.setAside));
});

Deno.test("splitFeeders() warns of a forecast row for a feeder id that no feeder has", async () => {
  const { feeders, diagnostics } = await split({
    ...TWO_FEEDERS,
    // f2 matches F2 (ids compare case-insensitively); F7 heads nothing.
    "generation_forecast.csv": "feeder_id,forecast [MW]\nf2,1\nF7,2\n",
  });
  const hits = diagnostics.filter((d) => d.code === "feeder.unknown");
  assertEquals(hits.map((d) => [d.severity, d.found, d.at]), [
    ["warning", "F7", { file: "generation_forecast.csv", line: 3, column: 1, field: "feeder_id" }],
  ]);
  assert(feeders.every((f) => !f.setAside));
});

Deno.test("splitFeeders() counts every feeder id, set-aside and unfed ones too, as known to the forecast", async () => {
  const files = edit("switches.csv", (t) => t + "CB9,X1,X2,breaker,closed,F9,630,20,\n");
  files["generation_forecast.csv"] = "feeder_id,forecast [MW]\nF9,1\n";
  const { diagnostics } = await split(files);
  assertEquals(diagnostics.filter((d) => d.code === "feeder.unknown"), []);
});
