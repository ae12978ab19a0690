import { strictEqual } from "node:assert/strict";
import { NO_RESULT_COLOUR, voltageClassColour, worstVoltageColouring } from "./_bus_colouring.ts";
import { bandShare } from "./_voltage_band.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";

const BAND = { vMinPu: 0.9, vMaxPu: 1.1 };

Deno.test("bandShare() measures the deviation from 1 pu against the allowed one on its side", () => {
  const cases: [number, number][] = [[0.9, -1], [0.95, -0.5], [1, 0], [1.05, 0.5], [1.1, 1]];
  for (const [v, share] of cases) {
    strictEqual(Math.abs(bandShare(v, BAND) - share) < 1e-12, true, `${v} pu`);
  }
  strictEqual(bandShare(1.06, { vMinPu: 0.94, vMaxPu: 1.03 }) > 1, true);
});

Deno.test("voltageClassColour() puts the band limits inside the band and splits each side in half", () => {
  const colourOf = (v: number) => voltageClassColour(bandShare(v, BAND));
  strictEqual(colourOf(0.9), colourOf(0.92));
  strictEqual(colourOf(0.9) === colourOf(0.899), false);
  strictEqual(colourOf(1.1), colourOf(1.08));
  strictEqual(colourOf(1.1) === colourOf(1.101), false);
  strictEqual(colourOf(0.96), colourOf(1.04));
  strictEqual(colourOf(0.94) === colourOf(0.96), false);
});

Deno.test("worstVoltageColouring() takes each bus's largest deviation over the cases", () => {
  const { ctx, files } = reportFixture();
  const c = worstVoltageColouring(files[0]!.cases, ctx.limits);
  // SKR-F1-07: 0.966 pu at peak, 1.112 pu at minimum demand with generation: above the band.
  strictEqual(c.colourOf("SKR-F1-07"), voltageClassColour(1.2));
  strictEqual(
    c.describe("SKR-F1-07"),
    "SKR-F1-07: 1.112 pu in case min-full-dg (band 0.90–1.10 pu)",
  );
  strictEqual(c.colourOf("nowhere"), NO_RESULT_COLOUR);
});
