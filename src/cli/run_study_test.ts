import { hashPipelineConfig } from "../pipeline/hash_pipeline_config.ts";
/** The run folder: every file written, and byte-identical between runs except run.json. */
import { readTree } from "../../tests/fixtures/read_tree.ts";
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { loadPipelineConfig } from "../pipeline/load_pipeline_config.ts";
import { runStudy, type StudyRunOptions } from "./run_study.ts";

const TMP = "reports/.test-tmp/run-study";

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
      "branches.parquet",
      "buses.parquet",
      "diagnostics.csv",
      "faults.csv",
      "feeders/SOU-F1.json",
      "feeders/SOU-F2.json",
      "feeders/SOU-F3.json",
      "feeders/SOU-F4.json",
      "feeders/SOU-F5.json",
      "findings.csv",
      "fleet.json",
      "hosting.csv",
      "protection.csv",
      "queue.csv",
      "ranking.csv",
      "recovery.csv",
      "report.html",
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
    // What a reproduction needs: the resolved config (whose hash is configHash) and the command.
    assertEquals(await hashPipelineConfig(run.config), run.configHash);
    assert(run.reproduce.command.startsWith("gridtriage study data-samples/with-errors"));
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
    // 13 feeders, findings, diagnostics, ranking, fleet, faults, protection, hosting, queue,
    // recovery, buses, branches, report.
    assertEquals(Object.keys(trees[0]!).length, 25);
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
      timeoutMs: 5_000,
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

/** Copies the demo fleet to a scratch folder, optionally editing one table. */
async function copyFleet(
  to: string,
  edit?: { file: string; from: string; to: string },
): Promise<void> {
  await Deno.mkdir(to, { recursive: true });
  for await (const e of Deno.readDir("data-samples/norvessa")) {
    if (!e.name.endsWith(".csv")) continue;
    let text = await Deno.readTextFile(`data-samples/norvessa/${e.name}`);
    if (edit && edit.file === e.name) {
      assert(text.includes(edit.from), `${e.name} holds ${edit.from}`);
      text = text.replace(edit.from, edit.to);
    }
    await Deno.writeTextFile(`${to}/${e.name}`, text);
  }
}

Deno.test("runStudy() takes unchanged feeders from the store and studies the changed one", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const store = `${TMP}/store.sqlite`;
    const opts: StudyRunOptions = { workers: 0, timeoutMs: 60_000, storePath: store };
    const first = await runStudy("data-samples/norvessa", "p", config, `${TMP}/r1`, opts);
    assertEquals(first.cacheHits, 0);
    const again = await runStudy("data-samples/norvessa", "p", config, `${TMP}/r2`, opts);
    assertEquals(again.cacheHits, 13);
    const t1 = await readTree(`${TMP}/r1`), t2 = await readTree(`${TMP}/r2`);
    delete t1["run.json"];
    delete t2["run.json"];
    assertEquals(t2, t1);
    // One feeder's load edited: a miss for it, hits for the twelve others.
    await copyFleet(`${TMP}/net`);
    const loads = await Deno.readTextFile(`${TMP}/net/loads.csv`);
    const line = loads.split("\n").find((l) => l.includes(",CTY-K3-"))!;
    const cells = line.split(",");
    cells[2] = String(Number(cells[2]) * 2);
    await Deno.writeTextFile(`${TMP}/net/loads.csv`, loads.replace(line, cells.join(",")));
    const edited = await runStudy(`${TMP}/net`, "p", config, `${TMP}/r3`, opts);
    assertEquals(edited.cacheHits, 12);
    const noCache = await runStudy(`${TMP}/net`, "p", config, `${TMP}/r4`, {
      ...opts,
      useCache: false,
    });
    assertEquals(noCache.cacheHits, 0);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});

Deno.test("runStudy() with onlyFeeders reruns one edited feeder and changes only its outputs", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const opts: StudyRunOptions = {
      workers: 0,
      timeoutMs: 60_000,
      storePath: `${TMP}/store.sqlite`,
    };
    await copyFleet(`${TMP}/net`);
    const out = `${TMP}/run`;
    await runStudy(`${TMP}/net`, "p", config, out, opts);
    const before = await readTree(out);
    // Double every generator of MOR-L3 and scale another feeder's loads, then rerun MOR-L3 only.
    const gens = await Deno.readTextFile(`${TMP}/net/generators.csv`);
    await Deno.writeTextFile(
      `${TMP}/net/generators.csv`,
      gens.split("\n").map((l) => {
        if (!l.includes(",MOR-L3-")) return l;
        const c = l.split(",");
        c[3] = String(Number(c[3]) * 2);
        c[4] = String(Number(c[4]) * 2);
        return c.join(",");
      }).join("\n"),
    );
    const run = await runStudy(`${TMP}/net`, "p", config, out, {
      ...opts,
      onlyFeeders: ["MOR-L3"],
    });
    const after = await readTree(out);
    assertEquals(run.changes.map((c) => c.feederId), ["MOR-L3"]);
    const ch = run.changes[0]!;
    assert(ch.before !== undefined && ch.after.maxDgChangePercent! > ch.before.maxDgChangePercent!);
    for (const k of Object.keys(before)) {
      if (k.startsWith("feeders/") && k !== "feeders/MOR-L3.json") {
        assertEquals(after[k], before[k], k);
      }
    }
    assert(after["feeders/MOR-L3.json"] !== before["feeders/MOR-L3.json"]);
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});
