/**
 * Hosting capacity at every bus: the screen-and-confirm method against brute force (plain
 * bisection with a cold full load flow per trial, brute_force_hosting.ts) on the same
 * feeders, one strategy (unity power factor), load-flow criteria (the fault criteria are the
 * same code in both). Synthetic 60-bus feeders with PV (seed 11); inputs built outside the
 * timed functions. Ratios in one run; the answers agree within 1 % or 10 kW
 * (brute_force_hosting_test.ts).
 *
 *   deno bench --allow-read src/hosting/host_feeder_bench.ts
 */
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { synthesizeFleetFiles } from "../synth/synthesize_fleet.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { DEFAULT_HOSTING_SETTINGS } from "./hosting_settings.ts";
import { hostFeeder } from "./host_feeder.ts";
import { bruteForceHosting } from "./brute_force_hosting.ts";

const files = synthesizeFleetFiles({ feeders: 4, busesPerFeeder: 60, seed: 11 });
const forms = (await validateFleet(memorySource(files))).value.forms;
const unity = DEFAULT_HOSTING_SETTINGS.strategies[0]!;
const hosting = { ...DEFAULT_HOSTING_SETTINGS, strategies: [unity] };

Deno.bench("brute force: bisection, cold load flow per trial, 4 feeders × 60 buses", {
  baseline: true,
  group: "hosting",
}, () => {
  for (const f of forms) {
    bruteForceHosting(f, DEFAULT_PIPELINE, hosting, unity, 2 * hosting.toleranceKw);
  }
});

Deno.bench("screen and confirm, same feeders", { group: "hosting" }, () => {
  for (const f of forms) hostFeeder(f, DEFAULT_PIPELINE, hosting, null);
});
