/**
 * The nightly pipeline on the demo fleet (invented data): the long rural PV feeder shows
 * the voltage change caused by its generation in the minimum-demand case, and a lightly
 * loaded urban feeder shows no voltage finding at all.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { folderSource } from "../src/ingest/read_network.ts";
import { validateFleet } from "../src/pipeline/validate_fleet.ts";
import { loadPipelineConfig } from "../src/pipeline/load_pipeline_config.ts";
import { studyFeeder } from "../src/pipeline/study_feeder.ts";

const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
const fleet = await validateFleet(folderSource("data-samples/norvessa"));
const studies = new Map(fleet.value.forms.map((f) => [f.feederId, studyFeeder(f, config)]));

Deno.test("studyFeeder() solves every case of every demo feeder", () => {
  for (const [id, s] of studies) {
    assertEquals(s.status, "studied", id);
    assertEquals(s.cases.map((c) => c.caseId), config.cases.map((c) => c.id));
  }
});

Deno.test("studyFeeder() finds generation-caused voltage change on the rural PV feeder at minimum demand", () => {
  const rural = studies.get("MOR-L1")!;
  const rise = rural.findings.filter((f) =>
    f.code === "voltage.dg_change" || f.code === "voltage.above_band"
  );
  assert(rise.length > 0);
  assert(rise.every((f) => f.caseId === "min-full-dg"));
  // The voltage-change parts are reported beside the exact value for every bus.
  const min = rural.cases.find((c) => c.caseId === "min-full-dg")!;
  assert(
    min.buses!.every((b) =>
      b.dgChangePercent !== null && b.rpPercent !== null && b.xqPercent !== null
    ),
  );
  assert(min.sourceQShiftKvar !== null);
});

Deno.test("studyFeeder() finds no voltage problem on a lightly loaded urban feeder", () => {
  const urban = studies.get("CTY-K3")!;
  assertEquals(urban.findings.filter((f) => f.code.startsWith("voltage.")), []);
});

Deno.test("studyFeeder() leaves the protection of a feeder above protection.maxBuses unchecked, with a warning", () => {
  const form = fleet.value.forms.find((f) => f.feederId === "MOR-L1")!;
  const s = studyFeeder(form, { ...config, protection: { ...config.protection, maxBuses: 10 } });
  assertEquals(s.coordination, null);
  assert(s.diagnostics.some((d) => d.code === "protection.too_large" && d.severity === "warning"));
  assert(!s.findings.some((f) => f.code.startsWith("protection.")));
});

Deno.test("studyFeeder() gives every bus of the rural overhead feeder a hosting capacity per strategy, with what binds it; volt-var takes more than unity power factor there", () => {
  const h = studies.get("MOR-L1")!.hosting!;
  const strategies = config.hosting.strategies.map((s) => s.id);
  const feederBuses = new Set(h.buses.map((b) => b.bus));
  assertEquals(h.buses.length, feederBuses.size * strategies.length);
  assert(h.buses.every((b) => b.capacityKw >= 0 && b.criterion !== "no_solution"));
  const spread = (id: string) => h.strategies.find((s) => s.strategy === id)!;
  // Invented demo data: the absorbing volt-var curve lowers the rise that binds with unity.
  assert(spread("volt-var-b").minKw > spread("unity").minKw);
  assert(spread("volt-var-b").spreadKw > spread("unity").spreadKw);
  assertEquals(spread("unity").spreadCriterion, "voltage_change");
});

Deno.test("studyFeeder() screens recovery after faults: the rural feeder loses generation beyond its recloser's slow clearing, an urban cable feeder loses nothing", () => {
  const rural = studies.get("MOR-L1")!;
  const lost = rural.findings.find((f) => f.code === "recovery.generation_lost")!;
  assert(lost.value > 0 && lost.message.includes("ride-through"), lost.message);
  assert(rural.recovery!.faultsSimulated > 0 && rural.recovery!.worst !== null);
  const urban = studies.get("CTY-K1")!;
  assert(urban.recovery!.faultsSimulated > 0);
  assertEquals(urban.findings.filter((f) => f.code.startsWith("recovery.")), []);
});
