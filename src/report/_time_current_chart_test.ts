import { deepStrictEqual as assertEquals, ok as assert, strictEqual } from "node:assert/strict";
import { stageOperatingTimeS } from "../solve/overcurrent_time.ts";
import { TCC_MIN_S, timeCurrentChart, timeCurrentSeries } from "./_time_current_chart.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";
import type { DeviceCurves } from "./feeder_file.ts";

const devices = () => reportFixture().files[0]!.devices;

Deno.test("timeCurrentSeries() draws one curve per relay element and curve set and two per fuse", () => {
  const d = timeCurrentSeries(devices())!;
  assertEquals(d.series.map((s) => s.name), [
    "SKR-F1-H · R-F1 · phase",
    "SKR-F1-H · R-F1 · earth",
    "SKR-F1-R4 · R-F1-R4 · phase · fast",
    "SKR-F1-R4 · R-F1-R4 · phase · delayed",
    "SKR-F1-FU5 · EXP-40 · melt",
    "SKR-F1-FU5 · EXP-40 · clear",
  ]);
  // Decades around every pickup (60 A) and the largest breaking current (16 kA).
  strictEqual(d.iMinA, 10);
  strictEqual(d.iMaxA, 100_000);
});

Deno.test("timeCurrentSeries() takes the fastest stage of a relay at each current", () => {
  const head = devices()[0]!;
  const [s1, s2] = head.relays[0]!.stages;
  const phase = timeCurrentSeries([head])!.series[0]!;
  for (const p of phase.points.slice(1)) {
    const t = Math.min(stageOperatingTimeS(s1!, p.iA), stageOperatingTimeS(s2!, p.iA));
    strictEqual(p.tS, Math.max(t, TCC_MIN_S), `${p.iA} A`);
  }
  // The curve rises at the pickup, and above the instantaneous pickup sits on the floor.
  assertEquals(phase.points[0], { iA: 300, tS: 10_000 });
  assert(phase.points.filter((p) => p.iA > 3000).every((p) => p.tS === TCC_MIN_S));
});

Deno.test("timeCurrentSeries() names stages it cannot draw and returns null without devices", () => {
  strictEqual(timeCurrentSeries([]), null);
  const bad: DeviceCurves = {
    ...devices()[0]!,
    relays: [{
      id: "R-X",
      stages: [{
        stage: 1,
        element: "phase",
        characteristic: "iec_very_inverse",
        pickupA: 100,
        direction: "forward",
        curveSet: "both",
      }],
    }],
  };
  const d = timeCurrentSeries([bad])!;
  assertEquals(d.series, []);
  assertEquals(d.notes, ['Stage 1 of relay "R-X" lacks a setting and is not drawn.']);
});

Deno.test("timeCurrentChart() renders log–log axes with decade labels", async () => {
  const { svg } = await timeCurrentChart(devices(), "t");
  assert(svg !== null);
  for (const label of ["0.01", "1000", "100k", "Current (A)", "Time (s)"]) {
    assert(svg.includes(`>${label}</text>`), label);
  }
});
