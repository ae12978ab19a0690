/** The fault-level section of a feeder page, from small feeders to very large ones. */
import { ok as assert } from "node:assert/strict";
import type { FeederFile } from "./feeder_file.ts";
import type { BusFaultCurrents } from "../solve/study_faults.ts";
import { renderFaultLevels } from "./_fault_levels.ts";

function file(n: number): FeederFile {
  const cur = (ka: number): BusFaultCurrents => ({
    ik3Ka: ka,
    ik2Ka: 0.866 * ka,
    ik1Ka: 0.5 * ka,
    ikE2EKa: 0.4 * ka,
    ipKa: 2.5 * ka,
    rToX: 0.2,
  });
  const ids = Array.from({ length: n }, (_, k) => `B${k}`);
  return {
    feederId: "F",
    status: "studied",
    summary: {} as FeederFile["summary"],
    cases: [{
      caseId: "peak",
      converged: true,
      buses: ids.map((id, k) => ({ id, distanceKm: k * 0.01 })),
    }] as unknown as FeederFile["cases"],
    findings: [],
    faults: {
      buses: ids.map((id, k) => ({
        id,
        vnKv: 20,
        max: cur(10 / (1 + k * 0.001)),
        maxWithoutGeneration: cur(9 / (1 + k * 0.001)),
        min: cur(8 / (1 + k * 0.001)),
        generationIncreasePercent: 11,
        capacitiveEarthFaultA: null,
      })),
      devices: [],
      diagnostics: [],
    },
    needs: [],
    headroom: null,
    devices: [],
    diagnostics: [],
    caution: "",
  };
}

Deno.test("renderFaultLevels() draws every bus of a small feeder", async () => {
  const out = (await renderFaultLevels(file(40), "t")).__html;
  assert(out.includes("<svg") && !out.includes("distance bins"));
});

Deno.test("renderFaultLevels() bins a 150,000-bus feeder without running out of stack", async () => {
  const out = (await renderFaultLevels(file(150_000), "t")).__html;
  assert(out.includes("<svg") && out.includes("distance bins"));
});
