/**
 * The screen-and-confirm hosting capacity against plain bisection with a full load flow at
 * every trial (brute_force_hosting.ts) at every bus of random radial feeders: within 1 % or
 * 10 kW (the tolerance the method promises), for unity power factor and volt-var. The random
 * feeders are invented test data (tests/fixtures/random_feeders.ts); the reference is the
 * load flow itself, checked elsewhere against published benchmarks.
 */
import { ok as assert } from "node:assert/strict";
import { generateRandomFeeder } from "../../tests/fixtures/random_feeders.ts";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { DEFAULT_HOSTING_SETTINGS } from "./hosting_settings.ts";
import { type FeederHosting, hostFeeder, type HostingBusRow } from "./host_feeder.ts";
import { bruteForceHosting } from "./brute_force_hosting.ts";

const SEEDS = [11, 23, 37, 41, 59, 73, 97, 101, 131, 151, 173, 199];

Deno.test("per-bus hosting capacity within 1 % or 10 kW of brute-force bisection with full load flows (random radial feeders, unity and volt-var)", async () => {
  const hosting = {
    ...DEFAULT_HOSTING_SETTINGS,
    maxMw: 20,
    strategies: DEFAULT_HOSTING_SETTINGS.strategies.filter((s) =>
      s.id === "unity" || s.id === "volt-var-b"
    ),
  };
  let compared = 0, fast = 0, brute = 0;
  for (const seed of SEEDS) {
    const feeder = generateRandomFeeder(seed, { topology: "radial", maxBuses: 30 });
    const form = await formOfTables(feeder.files);
    const out = hostFeeder(form, DEFAULT_PIPELINE, hosting, null);
    const h: FeederHosting | null = out.hosting;
    assert(h !== null, feeder.summary);
    fast += h.loadFlows;
    for (const strategy of hosting.strategies) {
      const ref = bruteForceHosting(form, DEFAULT_PIPELINE, hosting, strategy, 1);
      brute += ref.loadFlows;
      for (const b of ref.buses) {
        const row: HostingBusRow = h.buses.find((r) =>
          r.bus === b.bus && r.strategy === strategy.id
        )!;
        const diff = Math.abs(row.capacityKw - b.capacityKw);
        assert(
          diff <= Math.max(10, 0.01 * b.capacityKw),
          `seed ${seed} (${feeder.summary}), ${strategy.id} at ${b.bus}: ${row.capacityKw} kW (${row.criterion}) vs brute force ${b.capacityKw} kW (${b.criterion})`,
        );
        compared++;
      }
    }
  }
  assert(compared > 50, `only ${compared} buses compared`);
  console.log(
    `${compared} bus capacities; load flows: screen-and-confirm ${fast}, brute force ${brute}`,
  );
});
