/** The run folder: every file written, and byte-identical between runs except run.json. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { join } from "node:path";
import { loadPipelineConfig } from "../pipeline/load_pipeline_config.ts";
import { runStudy, type StudyRunOptions } from "./run_study.ts";

const TMP = "reports/.test-tmp/run-study";

async function readTree(dir: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for await (const e of Deno.readDir(dir)) {
    const p = join(dir, e.name);
    if (e.isDirectory) {
      for (const [k, v] of Object.entries(await readTree(p))) out[`${e.name}/${k}`] = v;
    } else out[e.name] = await Deno.readTextFile(p);
  }
  return out;
}

Deno.test("runStudy() writes the run folder, identical between runs but for run.json", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const a = await runStudy(
      "data-samples/with-errors",
      "pipelines/nightly.json",
      config,
      `${TMP}/a`,
    );
    await runStudy("data-samples/with-errors", "pipelines/nightly.json", config, `${TMP}/b`);
    const ta = await readTree(`${TMP}/a`), tb = await readTree(`${TMP}/b`);
    assertEquals(Object.keys(ta).sort(), [
      "diagnostics.csv",
      "feeders/SOU-F1.json",
      "feeders/SOU-F2.json",
      "feeders/SOU-F3.json",
      "feeders/SOU-F4.json",
      "feeders/SOU-F5.json",
      "findings.csv",
      "run.json",
    ]);
    for (const k of Object.keys(ta)) if (k !== "run.json") assertEquals(ta[k], tb[k], k);
    // No temporary files are left behind.
    assert(Object.keys(ta).every((k) => !k.endsWith(".tmp")));
    const run = JSON.parse(ta["run.json"]!);
    assertEquals(run.counts.setAside, 3);
    assertEquals(run.counts.studied, 2);
    assertEquals(run.inputHash.length, 64);
    assertEquals(a.record.configHash, run.configHash);
    // Set-aside feeders still get a file that says why.
    const f3 = JSON.parse(ta["feeders/SOU-F3.json"]!);
    assertEquals(f3.status, "set_aside");
    assert(f3.summary.reasons.length > 0);
    // The validation errors are in diagnostics.csv with their locations.
    assert(ta["diagnostics.csv"]!.includes("lines.csv,21,5,length"));
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("runStudy() writes the same bytes with 1, 2 and 4 workers as in one thread", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const trees: Record<string, string>[] = [];
    for (const workers of [0, 1, 2, 4]) {
      const out = `${TMP}/w${workers}`;
      await runStudy("data-samples/norvessa", "pipelines/nightly.json", config, out, {
        workers,
        timeoutMs: 60_000,
      });
      const t = await readTree(out);
      delete t["run.json"];
      trees.push(t);
    }
    assertEquals(Object.keys(trees[0]!).length, 15); // 13 feeders + findings + diagnostics
    for (const t of trees.slice(1)) assertEquals(t, trees[0]);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("runStudy() reports a feeder whose worker crashes or hangs and keeps every other result", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const clean = `${TMP}/clean`, faulty = `${TMP}/faulty`;
    await runStudy("data-samples/norvessa", "pipelines/nightly.json", config, clean, {
      workers: 0,
      timeoutMs: 60_000,
    });
    const run = await runStudy("data-samples/norvessa", "pipelines/nightly.json", config, faulty, {
      workers: 2,
      timeoutMs: 2_000,
      faults: { crash: ["MOR-L2"], hang: ["EST-M3"] },
    });
    const a = await readTree(clean), b = await readTree(faulty);
    for (const k of Object.keys(a)) {
      if (k.startsWith("feeders/") && k !== "feeders/MOR-L2.json" && k !== "feeders/EST-M3.json") {
        assertEquals(b[k], a[k], k);
      }
    }
    for (const id of ["MOR-L2", "EST-M3"]) {
      const f = JSON.parse(b[`feeders/${id}.json`]!);
      assertEquals(f.status, "failed");
      const d = run.diagnostics.find((d) => d.code === "study.failed" && d.feederId === id)!;
      assert(/2 attempt/.test(d.message), d.message);
    }
    assert(/crash/.test(JSON.parse(b["feeders/MOR-L2.json"]!).failure));
    assert(/timed out/.test(JSON.parse(b["feeders/EST-M3.json"]!).failure));
    assertEquals(run.record.counts.failed, 2);
    assertEquals(run.record.counts.studied, 11);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});
