/**
 * Validation throughput on the sample fleet. Ratios within one run are what count
 * (machines are noisy): reading the tables is the baseline, the whole validation
 * (model, topology, compile, summary) is compared against it.
 */
import { join } from "node:path";
import { memorySource, readNetworkTables, TABLES } from "../ingest/read_network.ts";
import { validateFleet } from "./validate_fleet.ts";

const dir = "data-samples/norvessa";
const files: Record<string, string> = {};
for (const spec of Object.values(TABLES)) {
  try {
    files[spec.file] = Deno.readTextFileSync(join(dir, spec.file));
  } catch {
    // optional table absent
  }
}

Deno.bench("read tables of the sample fleet", { group: "validate", baseline: true }, async () => {
  await readNetworkTables(memorySource(files));
});

Deno.bench("validate the sample fleet end to end", { group: "validate" }, async () => {
  await validateFleet(memorySource(files));
});
