/**
 * Time per bus of the short-circuit study (four fault types at every bus, for maximum
 * currents with and without generation and for minimum currents, and the device duties),
 * beside the study of the load-flow cases of the same feeders as the baseline. Synthetic
 * 500-bus feeders with PV (seed 7); inputs built outside the timed functions.
 *
 *   deno bench --allow-read src/solve/study_faults_bench.ts
 */
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { synthesizeFleetFiles } from "../synth/synthesize_fleet.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { studyCases } from "../pipeline/study_feeder.ts";
import { studyFaults } from "./study_faults.ts";

const files = synthesizeFleetFiles({ feeders: 10, busesPerFeeder: 500, seed: 7 });
const forms = (await validateFleet(memorySource(files))).value.forms;

Deno.bench("load-flow cases, 10 feeders × 500 buses", { baseline: true, group: "faults" }, () => {
  for (const f of forms) studyCases(f, DEFAULT_PIPELINE);
});

Deno.bench("short-circuit study, 10 feeders × 500 buses", { group: "faults" }, () => {
  for (const f of forms) studyFaults(f, DEFAULT_PIPELINE.faults, DEFAULT_PIPELINE.limits.lvMaxKv);
});

// The O(n) tree method against the full impedance matrix on one 150-bus feeder.
const small = (await validateFleet(
  memorySource(synthesizeFleetFiles({ feeders: 1, busesPerFeeder: 150, seed: 7 })),
)).value.forms[0]!;

Deno.bench("tree method, 1 feeder × 150 buses", { baseline: true, group: "method" }, () => {
  studyFaults(small, DEFAULT_PIPELINE.faults, DEFAULT_PIPELINE.limits.lvMaxKv);
});

Deno.bench("full impedance matrix, 1 feeder × 150 buses", { group: "method" }, () => {
  studyFaults(small, DEFAULT_PIPELINE.faults, DEFAULT_PIPELINE.limits.lvMaxKv, "matrix");
});
