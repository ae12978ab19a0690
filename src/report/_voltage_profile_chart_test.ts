/** The voltage profile chart: every bus on a small feeder, distance bins on a very large one. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import type { CaseOutcome } from "../pipeline/study_feeder.ts";
import {
  PROFILE_BINS,
  PROFILE_DETAIL_BUSES,
  voltageProfileChart,
} from "./_voltage_profile_chart.ts";

const LIMITS = {
  voltageBand: { mv: { vMinPu: 0.9, vMaxPu: 1.1 }, lv: { vMinPu: 0.9, vMaxPu: 1.1 } },
  lvMaxKv: 1,
};

/** A chain of n buses 0.01 km apart, voltage falling along it, one bus sticking out. */
function chain(n: number, odd: { at: number; vPu: number }): CaseOutcome {
  const buses = Array.from({ length: n }, (_, k) => ({
    id: `B${k}`,
    vnKv: 20,
    distanceKm: 0.01 * k,
    vPu: k === odd.at ? odd.vPu : 1.02 - 1e-5 * k,
    angleDeg: 0,
    dgChangePercent: null,
    rpPercent: null,
    xqPercent: null,
  }));
  return {
    caseId: "peak",
    label: null,
    converged: true,
    iterations: 3,
    residualPu: 0,
    demandKw: 0,
    generationKw: 0,
    generationKvar: 0,
    sourcePKw: 0,
    sourceQKvar: 0,
    lossesKw: 0,
    lossesKvar: 0,
    vMinPu: 0.9,
    vMaxPu: 1.02,
    maxLoadingPercent: 0,
    maxDgChangePercent: null,
    sourceQShiftKvar: null,
    taps: [],
    buses,
    branches: buses.slice(1).map((b, k) => ({
      id: `L${k}`,
      kind: "line" as const,
      from: `B${k}`,
      to: b.id,
      pFromKw: 0,
      qFromKvar: 0,
      pToKw: 0,
      qToKvar: 0,
      iA: 0,
      loadingPercent: 0,
    })),
  };
}

const busMarks = (svg: string) =>
  (svg.match(/role="graphics-symbol"[^>]*aria-roledescription="circle"/g) ?? []).length;

Deno.test("voltageProfileChart() draws every bus of a small feeder", async () => {
  const { svg, notes } = await voltageProfileChart([chain(50, { at: 30, vPu: 0.95 })], LIMITS, "t");
  assertEquals(notes, []);
  assertEquals(busMarks(svg!), 50);
});

Deno.test("voltageProfileChart() bins a very large feeder and keeps each bin's extremes", async () => {
  const n = PROFILE_DETAIL_BUSES + 2000;
  const { svg, notes } = await voltageProfileChart(
    [chain(n, { at: Math.floor(n / 2), vPu: 0.91 })],
    LIMITS,
    "t",
  );
  assert(notes[0]!.includes(`${PROFILE_BINS} equal distance bins`));
  // Two marks per bin at most (its lowest and highest bus), far fewer than the buses.
  assert(busMarks(svg!) <= 2 * PROFILE_BINS);
  // The one low bus is its bin's lowest and is drawn.
  assert(svg!.includes("Voltage (pu): 0.91"));
});
