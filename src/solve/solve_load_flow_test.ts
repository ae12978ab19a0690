/** Balanced load flow against closed forms and control behaviour. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { solveLoadFlow } from "./solve_load_flow.ts";
import { DEFAULT_LOAD_FLOW_OPTIONS, type LoadFlowCase } from "./load_flow_types.ts";
import { formOfTables, twoBusFeeder } from "../../tests/fixtures/small_feeders.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

const PEAK: LoadFlowCase = { id: "peak", demand: "peak", demandScale: 1, generationScale: 0 };
const FULL_DG: LoadFlowCase = { id: "dg", demand: "peak", demandScale: 1, generationScale: 1 };
const TIGHT = { ...DEFAULT_LOAD_FLOW_OPTIONS, tolerancePu: 1e-12 };

const formOf = formOfTables;

/**
 * Exact receiving-end voltage of a constant-power load P + jQ behind R + jX from a source
 * V0 (per unit): V0 = V + (R + jX)·conj(S/V) gives V⁴ + (2(RP + XQ) − V0²)·V² +
 * (R² + X²)(P² + Q²) = 0, a quadratic in V²; the upper root is the operating point
 * (Van Cutsem & Vournas, Voltage Stability of Electric Power Systems, 1998, ch. 2 [memory]).
 */
function twoBusExact(v0: number, r: number, x: number, p: number, q: number): number {
  const b = 2 * (r * p + x * q) - v0 * v0;
  const c = (r * r + x * x) * (p * p + q * q);
  return Math.sqrt((-b + Math.sqrt(b * b - 4 * c)) / 2);
}

const TWO_BUS_CASES = [
  { rOhm: 2, xOhm: 3, loadPKw: 2000, loadQKvar: 800, vSetPu: 1 },
  { rOhm: 6, xOhm: 4, loadPKw: 4000, loadQKvar: 1500, vSetPu: 1.03 },
  { rOhm: 0.5, xOhm: 0.4, loadPKw: 500, loadQKvar: -200, vSetPu: 0.98 },
  { rOhm: 10, xOhm: 12, loadPKw: 5000, loadQKvar: 3000, vSetPu: 1.05 },
];

Deno.test("solveLoadFlow() matches the two-bus closed form (quadratic in V²) within 1e-10 pu", async () => {
  for (const c of TWO_BUS_CASES) {
    const form = await formOf(twoBusFeeder(c));
    const res = solveLoadFlow(form, PEAK, TIGHT).value;
    assert(res.converged);
    const zBase = 20 * 20; // kV² / 1 MVA
    const exact = twoBusExact(
      c.vSetPu,
      c.rOhm / zBase,
      c.xOhm / zBase,
      c.loadPKw / 1000,
      c.loadQKvar / 1000,
    );
    const b2 = form.busIds.indexOf("B2");
    assert(Math.abs(res.vMagPu[b2]! - exact) < 1e-10, `${res.vMagPu[b2]} vs ${exact}`);
  }
});

Deno.test("solveLoadFlow() of a constant-impedance load is the exact voltage divider", async () => {
  // Z_load = V²/S* at 1 pu: |V2| = |V0·Zl/(Zl + Zline)| (Ohm's law; exact, no iteration).
  const form = await formOf(
    twoBusFeeder({ rOhm: 4, xOhm: 3, loadPKw: 3000, loadQKvar: 1000, voltageModel: "impedance" }),
  );
  const res = solveLoadFlow(form, PEAK, TIGHT).value;
  // Load admittance y = conj(S) = 3 − j1 pu; line z = (4 + j3)/400 pu.
  const [yr, yi] = [3, -1];
  const den = yr * yr + yi * yi;
  const [zlr, zli] = [yr / den, -yi / den];
  const [zr, zi] = [4 / 400, 3 / 400];
  const [tr, ti] = [zlr + zr, zli + zi];
  const exact = Math.hypot(zlr, zli) / Math.hypot(tr, ti);
  assert(Math.abs(res.vMagPu[form.busIds.indexOf("B2")]! - exact) < 1e-12);
});

Deno.test("solveLoadFlow() voltage rise from generation follows dU ≈ (R·P + X·Q)/U to second order", async () => {
  // Bollen & Hassan, Integration of Distributed Generation in the Power System (2011): the
  // rise at an infeed is about (R·P + X·Q)/U. Expanding U2 = U1 + Z·conj(S/U2) at U1 = 1 pu
  // with a = R·P + X·Q and b = X·P − R·Q gives |U2| − 1 = a − a² − b²/2 + O(|S·Z|³): the
  // formula's error is second order, so halving the power quarters it.
  const errors: number[] = [];
  for (const pKw of [2000, 1000, 500]) {
    const qKvar = -0.3 * pKw; // absorbing
    const form = await formOf(
      twoBusFeeder({
        rOhm: 4,
        xOhm: 3,
        generatorHeader:
          "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_power [kvar]",
        generatorRow: `${pKw * 1.2},${pKw},fixed_q,${qKvar}`,
      }),
    );
    const res = solveLoadFlow(form, FULL_DG, TIGHT).value;
    const [r, x, p, q] = [4 / 400, 3 / 400, pKw / 1000, qKvar / 1000];
    const approx = r * p + x * q;
    const exact = res.vMagPu[form.busIds.indexOf("B2")]! - 1;
    const b = x * p - r * q;
    const secondOrder = approx - approx * approx - b * b / 2;
    const third = (Math.abs(approx) + Math.abs(b)) ** 3;
    errors.push(exact - approx);
    assert(
      Math.abs(exact - secondOrder) < third,
      `${exact} vs ${secondOrder} (third order ${third})`,
    );
  }
  // Halving the power quarters the error (second order), within 10 %.
  assert(
    Math.abs(errors[0]! / errors[1]! - 4) < 0.4 && Math.abs(errors[1]! / errors[2]! - 4) < 0.4,
    String(errors),
  );
});

Deno.test("solveLoadFlow() keeps a voltage-controlled generator at its set-point", async () => {
  const form = await formOf(
    twoBusFeeder({
      rOhm: 4,
      xOhm: 6,
      loadPKw: 2500,
      loadQKvar: 1000,
      generatorHeader:
        "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,voltage_setpoint [pu]",
      generatorRow: "3000,1000,voltage_control,1.01",
    }),
  );
  const res = solveLoadFlow(form, FULL_DG, TIGHT).value;
  assert(res.converged);
  assert(Math.abs(res.vMagPu[form.busIds.indexOf("B2")]! - 1.01) < 1e-10);
  assert(res.genQKvar[0]! > 0, "it must inject reactive power to lift the voltage");
});

Deno.test("solveLoadFlow() ends a volt-var generator on its curve (IEEE 1547-2018 Category B default [memory])", async () => {
  // Category B: +44 % at 0.92 pu, 0 from 0.98 to 1.02 pu, −44 % at 1.08 pu (REFERENCES.md E).
  const curve =
    "curve,kind,point,x,y\nB,volt_var,1,0.92,0.44\nB,volt_var,2,0.98,0\nB,volt_var,3,1.02,0\nB,volt_var,4,1.08,-0.44\n";
  const form = await formOf(
    twoBusFeeder({
      rOhm: 8,
      xOhm: 8,
      vSetPu: 1.02,
      generatorHeader:
        "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_curve",
      generatorRow: "2500,2000,volt_var,B",
      reactiveCurves: curve,
    }),
  );
  const res = solveLoadFlow(form, FULL_DG, TIGHT).value;
  assert(res.converged);
  const v = res.vMagPu[form.busIds.indexOf("B2")]!;
  assert(v > 1.02 && v < 1.08, `voltage ${v} in the sloped part`);
  const onCurve = -0.44 * (v - 1.02) / 0.06 * 2500;
  assert(Math.abs(res.genQKvar[0]! - onCurve) < 1e-6, `${res.genQKvar[0]} vs ${onCurve}`);
});

Deno.test("solveLoadFlow() steps the on-load tap changer until the voltage is inside its band", async () => {
  // The fixture's T1 holds 20 kV busbar BB at 1.02 pu ± 0.0075 (band 0.015, step 1.5 %).
  const files = {
    ...TWO_FEEDERS,
    "loads.csv": TWO_FEEDERS["loads.csv"]!.replace("D1,A1,400", "D1,A1,30000"),
  };
  const form = await formOf(files);
  const res = solveLoadFlow(form, PEAK, TIGHT).value;
  assert(res.converged);
  const bb = form.busIds.indexOf("BB");
  assert(Math.abs(res.vMagPu[bb]! - 1.02) <= 0.0075 + 1e-9, `BB at ${res.vMagPu[bb]}`);
  assert(res.tapPositions[0] !== 0, "the tap moved");
  const fixed = solveLoadFlow(form, PEAK, { ...TIGHT, tapControl: false }).value;
  assert(Math.abs(fixed.vMagPu[bb]! - 1.02) > 0.0075, "without control it would be outside");
});

Deno.test("solveLoadFlow() reports voltage collapse as a diagnostic, not a number", async () => {
  const form = await formOf(twoBusFeeder({ rOhm: 20, xOhm: 20, loadPKw: 50000, loadQKvar: 20000 }));
  const { value, diagnostics } = solveLoadFlow(form, PEAK);
  assertEquals(value.converged, false);
  assert(value.failure === "collapse" || value.failure === "not_converged");
  const d = diagnostics.find((d) => d.code.startsWith("loadflow."))!;
  assertEquals(d.severity, "error");
  assertEquals(d.feederId, "F");
  assert(/iterations/.test(d.message) && /mismatch/.test(d.message), d.message);
});
