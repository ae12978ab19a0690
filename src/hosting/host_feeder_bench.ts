/**
 * Hosting capacity at every bus: the screen-and-confirm method against brute force (plain
 * bisection with a cold full load flow per trial, brute_force_hosting.ts) on the same
 * feeders and buses, one strategy (unity power factor), load-flow criteria (the fault
 * criteria are the same code in both). Synthetic feeders with PV (seed 11); inputs built
 * outside the timed functions. Ratios in one run; the answers agree within 1 % or 10 kW
 * (brute_force_hosting_test.ts). The whole study of a feeder (base solves, screen, confirm,
 * spread capacity) is timed too, for the time per bus.
 *
 *   deno bench --allow-read src/hosting/host_feeder_bench.ts
 */
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { synthesizeFleetFiles } from "../synth/synthesize_fleet.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { DEFAULT_HOSTING_SETTINGS } from "./hosting_settings.ts";
import { confirmBuses, hostFeeder } from "./host_feeder.ts";
import { bruteForceHosting } from "./brute_force_hosting.ts";
import { prepareHostingBase } from "./hosting_base.ts";

const unity = DEFAULT_HOSTING_SETTINGS.strategies[0]!;
const hosting = { ...DEFAULT_HOSTING_SETTINGS, strategies: [unity] };
const opts = {
  toleranceKw: hosting.toleranceKw,
  tolerancePercent: hosting.tolerancePercent,
  maxKw: hosting.maxMw * 1000,
};

for (const [feeders, buses] of [[4, 60], [2, 200]] as const) {
  const files = synthesizeFleetFiles({ feeders, busesPerFeeder: buses, seed: 11 });
  const forms = (await validateFleet(memorySource(files))).value.forms;
  const group = `hosting ${feeders} × ${buses} buses`;
  Deno.bench(`brute force: bisection, cold load flow per trial (${group})`, {
    baseline: true,
    group,
  }, () => {
    for (const f of forms) {
      bruteForceHosting(f, DEFAULT_PIPELINE, hosting, unity, 2 * opts.toleranceKw);
    }
  });
  Deno.bench(`screen and confirm, the same buses (${group})`, { group }, () => {
    for (const f of forms) {
      const base = prepareHostingBase(f, DEFAULT_PIPELINE, hosting)!;
      const list: number[] = [];
      for (let k = Math.max(f.substationBusCount, 1); k < f.nBus; k++) list.push(k);
      confirmBuses(base, unity, list, opts);
    }
  });
  Deno.bench(`whole hosting study with the spread capacity (${group})`, { group }, () => {
    for (const f of forms) hostFeeder(f, DEFAULT_PIPELINE, hosting, null);
  });
}
