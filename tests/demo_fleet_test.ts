/**
 * The bundled demo fleet (invented data, data-samples/norvessa) validates clean and holds
 * the feeder kinds it promises: an urban cable ring operated open, a long rural overhead
 * feeder with much PV and a synchronous unit, reclosers and lateral fuses, LV feeders,
 * single-phase laterals and a meshed feeder.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { folderSource } from "../src/ingest/read_network.ts";
import { validateFleet } from "../src/pipeline/validate_fleet.ts";
import { GENERATOR_SYNCHRONOUS } from "../src/model/feeder_form.ts";

const result = await validateFleet(folderSource("data-samples/norvessa"));
const forms = result.value.forms;

Deno.test("validateFleet() finds the demo fleet clean with at least 12 valid feeders", () => {
  assertEquals(result.diagnostics, []);
  assert(result.value.feeders.length >= 12);
  assert(result.value.feeders.every((f) => f.status === "valid"));
  assertEquals(forms.length, result.value.feeders.length);
});

Deno.test("validateFleet() sees the feeder kinds the demo fleet promises", () => {
  const ids = new Set(forms.map((f) => f.feederId));
  const ring = forms.find((f) => f.openPoints.some((p) => ids.has(p.otherSide)));
  assert(ring, "an open ring between two feeders");
  assert(forms.some((f) => f.meshed), "a meshed feeder");
  assert(forms.some((f) => f.vnKv[f.nBus - 1]! < 1), "an LV feeder");
  assert(forms.some((f) => [...f.busPhases].some((p) => p !== 7)), "single-phase laterals");
  assert(
    forms.some((f) =>
      f.devices.some((d) => d.kind === "recloser") && f.devices.some((d) => d.kind === "fuse")
    ),
    "reclosers with fused laterals",
  );
  const rural = forms.find((f) => [...f.generators.kind].includes(GENERATOR_SYNCHRONOUS));
  assert(rural, "a feeder with a synchronous unit");
  const pvKw = [...rural.generators.pKw].reduce((s, p) => s + p, 0);
  assert(pvKw > 2000, "with much generation");
});

Deno.test("validateFleet() keeps every demo feeder within the plausibility screen", () => {
  // REFERENCES.md F (common practice): reach in km and load in MVA near the nominal kV.
  for (const f of result.value.feeders) {
    assert(f.reachKm !== null && f.vnKv !== null);
    assert(f.reachKm <= 2 * f.vnKv, `${f.feederId} reach`);
  }
});
