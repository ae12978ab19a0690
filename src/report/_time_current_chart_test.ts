import { deepStrictEqual as assertEquals, ok as assert, strictEqual } from "node:assert/strict";
import { stageOperatingTimeS } from "../solve/overcurrent_time.ts";
import { TCC_MIN_S, timeCurrentChart, timeCurrentSeries } from "./_time_current_chart.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";
import type { DeviceCurves } from "./feeder_file.ts";
import { SERIES_COLOURS } from "./_chart_palette.ts";

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

Deno.test("timeCurrentSeries() draws a fuse curve shared by several devices once, naming them", () => {
  const fuse = devices()[2]!;
  const many = ["A", "B", "C", "D"].map((id) => ({ ...fuse, id }));
  assertEquals(timeCurrentSeries(many.slice(0, 3))!.series.map((s) => s.name), [
    "A, B, C · EXP-40 · melt",
    "A, B, C · EXP-40 · clear",
  ]);
  assertEquals(timeCurrentSeries(many)!.series.map((s) => s.colourKey), [
    "A, B and 2 more · EXP-40",
    "A, B and 2 more · EXP-40",
  ]);
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

Deno.test("timeCurrentChart() renders log–log axes with decade labels and a colour per curve", async () => {
  const { svg } = await timeCurrentChart(devices(), "t");
  assert(svg !== null);
  // Four relay curves and one fuse (melt and clear share its colour), each stroked in its
  // own palette colour and named in the legend.
  SERIES_COLOURS.slice(0, 5).forEach((c) =>
    assert(svg.includes(`stroke="${c}"`), `no curve drawn in ${c}`)
  );
  assert(svg.includes(">SKR-F1-FU5 · EXP-40</text>"));
  for (const label of ["0.01", "1000", "100k", "Current (A)", "Time (s)"]) {
    assert(svg.includes(`>${label}</text>`), label);
  }
});
