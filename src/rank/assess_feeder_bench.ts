/**
 * What the rank stage adds to a feeder's study, as ratios in one run: the study of every
 * case (the baseline), the generation headroom search, and the whole assessment (headroom,
 * needs, remedies checked by re-studying). Synthetic 300-bus feeders with PV (seed 7), the
 * default pipeline; inputs built outside the timed functions.
 *
 *   deno bench --allow-read src/rank/assess_feeder_bench.ts
 */
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { synthesizeFleetFiles } from "../synth/synthesize_fleet.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { studyCases } from "../pipeline/study_feeder.ts";
import { computeDgHeadroom } from "./dg_headroom.ts";
import { assessFeeder } from "./assess_feeder.ts";

const files = synthesizeFleetFiles({ feeders: 20, busesPerFeeder: 300, seed: 7 });
const forms = (await validateFleet(memorySource(files))).value.forms;
const studies = forms.map((f) => studyCases(f, DEFAULT_PIPELINE));

Deno.bench("study of every case, 20 feeders × 300 buses", { baseline: true, group: "rank" }, () => {
  for (const f of forms) studyCases(f, DEFAULT_PIPELINE);
});

Deno.bench("generation headroom search", { group: "rank" }, () => {
  for (const f of forms) computeDgHeadroom(f, DEFAULT_PIPELINE, 8);
});

Deno.bench("whole assessment: headroom, needs, checked remedies", { group: "rank" }, () => {
  forms.forEach((f, i) => assessFeeder(f, DEFAULT_PIPELINE, studies[i]!.findings));
});
