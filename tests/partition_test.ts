/**
 * Studying an export in parts (bounded memory) gives the same run folder, byte for byte,
 * as studying it whole — on the demo fleet, the error sample (its diagnostics included)
 * and a synthetic fleet.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { loadPipelineConfig } from "../src/pipeline/load_pipeline_config.ts";
import { runStudy } from "../src/cli/run_study.ts";
import { partitionNetwork } from "../src/cli/partition_network.ts";
import { writeSynthFleet } from "../src/cli/write_fleet.ts";
import { validateFleet } from "../src/pipeline/validate_fleet.ts";
import { readTree } from "./fixtures/read_tree.ts";

const TMP = "reports/.test-tmp/parts";
const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;

async function bothWays(network: string, partBuses: number, expectParts: number): Promise<void> {
  const parts = await partitionNetwork(network, `${TMP}/probe`, partBuses);
  assertEquals(parts?.count ?? 1, expectParts);
  const opts = { workers: 0, timeoutMs: 60_000 };
  await runStudy(network, "p", config, `${TMP}/whole`, opts);
  await runStudy(network, "p", config, `${TMP}/parts`, { ...opts, partBuses });
  const whole = await readTree(`${TMP}/whole`), inParts = await readTree(`${TMP}/parts`);
  delete whole["run.json"];
  delete inParts["run.json"];
  assertEquals(Object.keys(inParts).sort(), Object.keys(whole).sort(), "no part folders are left");
  for (const k of Object.keys(whole)) assertEquals(inParts[k], whole[k], k);
}

Deno.test("runStudy() in parts equals the whole study on the demo fleet and the error sample", async () => {
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    // Four substations, each with its feeders one group: four parts of at most 40 buses.
    await bothWays("data-samples/norvessa", 40, 4);
    await Deno.remove(TMP, { recursive: true });
    // One substation and a de-energised island: two parts; every planted diagnostic once.
    await bothWays("data-samples/with-errors", 10, 2);
    const diagnostics = await Deno.readTextFile(`${TMP}/parts/diagnostics.csv`);
    // Header and the 12 planted problems, below the `#` provenance lines.
    assertEquals(diagnostics.trim().split("\n").filter((l) => !l.startsWith("#")).length, 1 + 12);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("runStudy() in parts equals the whole study on a synthetic fleet", async () => {
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    await writeSynthFleet({ feeders: 30, busesPerFeeder: 40, seed: 4 }, `${TMP}/net`);
    await bothWays(`${TMP}/net`, 500, 4);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("partitionNetwork() keeps an export that fits in one part whole", async () => {
  assertEquals(await partitionNetwork("data-samples/norvessa", `${TMP}/none`, 10_000), undefined);
  assert(!(await Deno.stat(`${TMP}/none`).then(() => true).catch(() => false)));
});

Deno.test("partitionNetwork() reads an export whole when an edge table lacks its bus columns", async () => {
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    await Deno.mkdir(`${TMP}/net`, { recursive: true });
    for await (const e of Deno.readDir("data-samples/norvessa")) {
      if (e.name.endsWith(".csv")) {
        await Deno.copyFile(`data-samples/norvessa/${e.name}`, `${TMP}/net/${e.name}`);
      }
    }
    const lines = await Deno.readTextFile(`${TMP}/net/lines.csv`);
    await Deno.writeTextFile(`${TMP}/net/lines.csv`, lines.replace(/^id,from,/, "id,start,"));
    assertEquals(await partitionNetwork(`${TMP}/net`, `${TMP}/p`, 40), undefined);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("partitionNetwork() sends queue and forecast rows to their feeder's part, an unknown feeder's to the first", async () => {
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    await Deno.mkdir(`${TMP}/net`, { recursive: true });
    for await (const e of Deno.readDir("data-samples/norvessa")) {
      if (e.name.endsWith(".csv")) {
        await Deno.copyFile(`data-samples/norvessa/${e.name}`, `${TMP}/net/${e.name}`);
      }
    }
    const forecast = await Deno.readTextFile(`${TMP}/net/generation_forecast.csv`);
    await Deno.writeTextFile(`${TMP}/net/generation_forecast.csv`, forecast + "MOR-L9,1\n");
    const parts = await partitionNetwork(`${TMP}/net`, `${TMP}/p`, 40);
    assertEquals(parts?.count, 4);
    let unknown = 0, withForecast = 0, applications = 0;
    for (let k = 0; k < parts!.count; k++) {
      const r = await validateFleet(parts!.source(k));
      unknown += r.diagnostics.filter((d) => d.code === "feeder.unknown").length;
      withForecast += r.value.forms.filter((f) => f.forecastGenerationMw !== null).length;
      applications += r.value.forms.reduce((n, f) => n + f.applications.length, 0);
    }
    assertEquals([unknown, withForecast, applications], [1, 13, 7]);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});
