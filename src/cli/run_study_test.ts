/** The run folder: every file written, and byte-identical between runs except run.json. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { join } from "node:path";
import { loadPipelineConfig } from "../pipeline/load_pipeline_config.ts";
import { runStudy } from "./run_study.ts";

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
