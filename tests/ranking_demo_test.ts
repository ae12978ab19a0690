/**
 * The ranked upgrade list of the demo fleet (invented data): the three feeders the demo
 * sets up to need work are ranked with their evidence and checked remedies, and every
 * fleet file carries the run's provenance and the caution.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import Papa from "papaparse";
import { loadPipelineConfig } from "../src/pipeline/load_pipeline_config.ts";
import { runStudy } from "../src/cli/run_study.ts";
import { CAUTION } from "../src/report/run_files.ts";

const TMP = "reports/.test-tmp/ranking-demo";

Deno.test("runStudy() ranks the demo fleet's needs with checked, priced remedies", async () => {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const run = await runStudy("data-samples/norvessa", "pipelines/nightly.json", config, TMP, {
      workers: 0,
      timeoutMs: 60_000,
    });
    // Safety (a breaker below the fault level) first, then the statutory (thermal) needs,
    // then the planning one; within a class by benefit per cost.
    assertEquals(run.ranking.map((n) => [n.rank, n.feederId, n.kind]), [
      [1, "CTY-K4", "device_duty"],
      [2, "HTH-N2", "line_overload"],
      [3, "HTH-N2", "device_overload"],
      [4, "CTY-K4", "line_overload"],
      [5, "MOR-L1", "voltage_change"],
    ]);
    const perCost = run.ranking.slice(1, 4).map((n) => n.benefitPerCost!);
    assert(perCost[0]! >= perCost[1]! && perCost[1]! >= perCost[2]!);
    // The old 16 kA breaker gives way to the next standard rating that interrupts the
    // busbar's fault current.
    assertEquals(
      run.ranking[0]!.remedy?.description,
      'Replace switching device "CTY-K4-H" by one rated 20 kA breaking',
    );
    // The cable feeder is rebuilt with cable; the rural PV feeder gets a setting change that
    // also frees generation headroom.
    assertEquals(run.ranking[3]!.remedy?.items.map((i) => i.what), [
      "rebuild line with MV cable 400 mm² Al",
    ]);
    const rural = run.ranking[4]!;
    assertEquals(rural.remedy?.kind, "reactive_mode");
    assert(rural.remedy!.capacityUnlockedMw! > 0);
    assert(rural.customers > 0);

    const csv = await Deno.readTextFile(`${TMP}/ranking.csv`);
    const comments = csv.split("\n").filter((l) => l.startsWith("#"));
    assert(comments.some((l) => l.includes(run.record.inputHash)));
    assert(comments.some((l) => l.includes(run.record.configHash)));
    assert(comments.some((l) => l.includes(CAUTION)));
    const rows = Papa.parse<Record<string, string>>(csv, {
      header: true,
      comments: "#",
      skipEmptyLines: true,
    }).data;
    assertEquals(rows.map((r) => r.feeder), ["CTY-K4", "HTH-N2", "HTH-N2", "CTY-K4", "MOR-L1"]);
    // Cost arithmetic: the bill of quantities adds up to the cost in every row.
    for (const n of run.ranking) {
      const sum = n.remedy!.items.reduce((s, i) => s + i.cost, 0);
      assert(Math.abs(sum - n.remedy!.cost) < 0.005, n.id);
      for (const i of n.remedy!.items) assert(Math.abs(i.quantity * i.unitCost - i.cost) < 0.005);
    }

    const fleet = JSON.parse(await Deno.readTextFile(`${TMP}/fleet.json`));
    assertEquals(fleet.totals.needs, 5);
    assertEquals(fleet.totals.feedersWithNeeds, 3);
    assertEquals(fleet.feeders.length, 13);
    assertEquals(fleet.caution, CAUTION);

    const html = await Deno.readTextFile(`${TMP}/report.html`);
    assert(html.includes(CAUTION));
    assert(html.includes(run.record.configHash));
    // Offline: nothing is fetched from elsewhere when the page opens.
    assert(!/(src|href)\s*=\s*["']?(https?:)?\/\//i.test(html));
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});
