/**
 * The reference Newton–Raphson load flow against closed forms, and the random-feeder
 * fixture it is later run on. Expected values come from the formulas named beside each
 * table, evaluated from the CSV inputs (never from the solver form), with the tolerance
 * stated. The networks here are invented test data.
 */
import { deepStrictEqual, equal, notDeepStrictEqual, ok as assert } from "node:assert/strict";
import fc from "fast-check";
import { memorySource } from "../../src/ingest/read_network.ts";
import { validateFleet } from "../../src/pipeline/validate_fleet.ts";
import { BRANCH_TRANSFORMER, type FeederForm } from "../../src/model/feeder_form.ts";
import type { LoadFlowCase } from "../../src/solve/load_flow_types.ts";
import { mergeSwitchedBuses, solveReferenceNewton } from "./newton_raphson.ts";
import {
  buildFeederArbitrary,
  generateRandomFeeder,
  type RandomFeeder,
} from "../fixtures/random_feeders.ts";

const PEAK: LoadFlowCase = { id: "peak", demand: "peak", demandScale: 1, generationScale: 0 };
const MIN: LoadFlowCase = { id: "min", demand: "min", demandScale: 1, generationScale: 1 };
const DEG = Math.PI / 180;
/** Base impedance of a 20 kV bus on the 1 MVA base, ohm (load_flow_types.ts). */
const Z_BASE_20 = 20 * 20;

/** Validates CSV tables and returns the single feeder form, failing on any error. */
async function compileOnly(files: Readonly<Record<string, string>>): Promise<FeederForm> {
  const r = await validateFleet(memorySource(files));
  const errors = r.diagnostics.filter((d) => d.severity === "error");
  deepStrictEqual(errors, [], "the test network must validate");
  equal(r.value.forms.length, 1, "exactly one feeder");
  return r.value.forms[0]!;
}

function busIndex(form: FeederForm, id: string): number {
  const k = form.busIds.findIndex((b) => b.toLowerCase() === id.toLowerCase());
  assert(k >= 0, `bus ${id} in the form`);
  return k;
}

/** |V_solved − V_expected| at one bus, pu. */
function voltageError(
  r: { vRePu: Float64Array; vImPu: Float64Array },
  k: number,
  mag: number,
  angleRad: number,
): number {
  return Math.hypot(r.vRePu[k]! - mag * Math.cos(angleRad), r.vImPu[k]! - mag * Math.sin(angleRad));
}

interface TwoBus {
  v0: number;
  angleDeg: number;
  rOhm: number;
  xOhm: number;
  /** nF/km over the 1 km line; 0 for none. */
  c1: number;
  pKw: number;
  qKvar: number;
  model: "power" | "impedance";
}

/**
 * A 20 kV source busbar, the head breaker to F1-A, one 1 km line F1-A → F1-B and a closed
 * disconnector F1-B → F1-C with the load at F1-C (two switches to merge).
 */
function twoBusFiles(c: TwoBus): Record<string, string> {
  return {
    "buses.csv": "id,nominal_voltage [kV],feeder\nBB,20,\nF1-A,20,F1\nF1-B,20,F1\nF1-C,20,F1\n",
    "grid_sources.csv":
      `id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],voltage_setpoint [pu],voltage_angle [deg]\nG,BB,20,300,200,${c.v0},${c.angleDeg}\n`,
    "line_types.csv":
      `id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],c1 [nF/km],ampacity [A]\nT,cable,${c.rOhm},${c.xOhm},1,1,${
        c.c1 || ""
      },400\n`,
    "lines.csv": "id,from,to,type,length [km]\nL1,F1-A,F1-B,T,1\n",
    "switches.csv":
      "id,from,to,kind,normal_state,heads_feeder\nCB,BB,F1-A,breaker,closed,F1\nS1,F1-B,F1-C,disconnector,closed,\n",
    "loads.csv":
      `id,bus,peak_p [kW],peak_q [kvar],min_p [kW],min_q [kvar],voltage_model\nD,F1-C,${c.pKw},${c.qKvar},${c.pKw},${c.qKvar},${c.model}\n`,
  };
}

// (a) Receiving-end voltage of a line R + jX feeding a constant-power load P + jQ from V0.
// With V_B real, V0·e^{jδ}·V = V² + (R + jX)(P − jQ); squaring the magnitudes gives
// V⁴ + (2(RP + XQ) − V0²)·V² + (R² + X²)(P² + Q²) = 0 (the two-bus "nose curve"
// relation, Van Cutsem & Vournas, *Voltage Stability of Electric Power Systems*, 1998,
// ch. 2 [memory]; re-derived here), upper root; δ = atan2(XP − RQ, V² + RP + XQ).
const CONSTANT_POWER_CASES: readonly TwoBus[] = [
  { v0: 1.02, angleDeg: 0, rOhm: 3, xOhm: 2, c1: 0, pKw: 2000, qKvar: 800, model: "power" },
  { v0: 1.0, angleDeg: 0, rOhm: 6, xOhm: 8, c1: 0, pKw: 3000, qKvar: 1500, model: "power" },
  { v0: 0.98, angleDeg: -20, rOhm: 2, xOhm: 4, c1: 0, pKw: 1000, qKvar: -1500, model: "power" },
  { v0: 1.05, angleDeg: 35, rOhm: 0.4, xOhm: 0.3, c1: 0, pKw: 12000, qKvar: 5000, model: "power" },
];

Deno.test("solveReferenceNewton() matches the two-bus closed form for a constant-power load", async () => {
  for (const c of CONSTANT_POWER_CASES) {
    const form = await compileOnly(twoBusFiles(c));
    const r = solveReferenceNewton(form, PEAK, { tolerancePu: 1e-13 });
    assert(r.converged, `converged for ${JSON.stringify(c)}`);
    const R = c.rOhm / Z_BASE_20, X = c.xOhm / Z_BASE_20, P = c.pKw / 1000, Q = c.qKvar / 1000;
    const b = 2 * (R * P + X * Q) - c.v0 * c.v0;
    const v2 = (-b + Math.sqrt(b * b - 4 * (R * R + X * X) * (P * P + Q * Q))) / 2;
    const delta = Math.atan2(X * P - R * Q, v2 + R * P + X * Q);
    const err = voltageError(r, busIndex(form, "F1-C"), Math.sqrt(v2), c.angleDeg * DEG - delta);
    // Tolerance 1e-10 pu on the complex voltage (expected |V| ≈ 0.9–1.05 pu).
    assert(err <= 1e-10, `error ${err} pu for ${JSON.stringify(c)}`);
    // The breaker joins the busbar to F1-A: both are the slack node.
    const a = busIndex(form, "F1-A");
    assert(voltageError(r, a, c.v0, c.angleDeg * DEG) <= 1e-14, "F1-A held at the source");
  }
});

// (b) Constant-impedance load: at 1 pu it takes S0, so its admittance is conj(S0) = P − jQ
// pu; with the line's half charging jB/2 at the far end (π model, B = 2πf·C·ℓ·Zbase) the
// far-end voltage is the divider V_B = V0 / (1 + Z·(conj(S0) + jB/2)) (Ohm's and
// Kirchhoff's laws; exact, common practice).
const CONSTANT_IMPEDANCE_CASES: readonly TwoBus[] = [
  { v0: 1.0, angleDeg: 0, rOhm: 3, xOhm: 2, c1: 0, pKw: 2000, qKvar: 800, model: "impedance" },
  { v0: 1.03, angleDeg: 12, rOhm: 5, xOhm: 4, c1: 0, pKw: 4000, qKvar: -500, model: "impedance" },
  {
    v0: 1.01,
    angleDeg: -5,
    rOhm: 1.2,
    xOhm: 1.1,
    c1: 3000,
    pKw: 1500,
    qKvar: 600,
    model: "impedance",
  },
];

Deno.test("solveReferenceNewton() matches the voltage divider for a constant-impedance load", async () => {
  for (const c of CONSTANT_IMPEDANCE_CASES) {
    const form = await compileOnly(twoBusFiles(c));
    const r = solveReferenceNewton(form, PEAK, { tolerancePu: 1e-13 });
    assert(r.converged);
    const zr = c.rOhm / Z_BASE_20, zx = c.xOhm / Z_BASE_20;
    const bHalf = 2 * Math.PI * 50 * c.c1 * 1e-9 * 1 * Z_BASE_20 / 2;
    const yr = c.pKw / 1000, yi = -c.qKvar / 1000 + bHalf;
    // d = 1 + Z·Y
    const dr = 1 + zr * yr - zx * yi, di = zr * yi + zx * yr;
    const v0r = c.v0 * Math.cos(c.angleDeg * DEG), v0i = c.v0 * Math.sin(c.angleDeg * DEG);
    const dd = dr * dr + di * di;
    const er = (v0r * dr + v0i * di) / dd, ei = (v0i * dr - v0r * di) / dd;
    const k = busIndex(form, "F1-C");
    const err = Math.hypot(r.vRePu[k]! - er, r.vImPu[k]! - ei);
    // Tolerance 1e-12 pu: the case is linear, Newton solves it in one step up to round-off.
    assert(err <= 1e-12, `error ${err} pu for ${JSON.stringify(c)}`);
  }
});

// (c) Transformers without load: no current flows, so V_to = V_from / a with
// a = ratio·e^{j·shift}. Expected ratio from the CSV inputs: the tapped winding's voltage is
// its rated voltage × (1 + position·step/100) (docs/network-format.md, transformers.csv),
// and the pu ratio is (hv_eff/hv_bus_kV)/(lv_eff/lv_bus_kV); the shift is the clock number
// × 30°, the LV side lagging the HV side (IEC 60076-1 clock notation [memory]).
interface TransformerCase {
  name: string;
  group: string;
  hvKv: number;
  lvKv: number;
  hvBusKv: number;
  lvBusKv: number;
  tapSide: "hv" | "lv";
  tapPosition: number;
  tapStepPercent: number;
  v0: number;
  angleDeg: number;
}

const TRANSFORMER_CASES: readonly TransformerCase[] = [
  {
    name: "110/20 kV YNd11, HV tap +2",
    group: "YNd11",
    hvKv: 110,
    lvKv: 20.5,
    hvBusKv: 110,
    lvBusKv: 20,
    tapSide: "hv",
    tapPosition: 2,
    tapStepPercent: 1.25,
    v0: 1.01,
    angleDeg: 0,
  },
  {
    name: "110/20 kV Dyn11, LV tap −3",
    group: "Dyn11",
    hvKv: 115,
    lvKv: 21,
    hvBusKv: 110,
    lvBusKv: 20,
    tapSide: "lv",
    tapPosition: -3,
    tapStepPercent: 1.5,
    v0: 0.99,
    angleDeg: 7,
  },
  {
    name: "20/0.4 kV Dyn5 inside the feeder, HV tap +1",
    group: "Dyn5",
    hvKv: 20,
    lvKv: 0.41,
    hvBusKv: 20,
    lvBusKv: 0.4,
    tapSide: "hv",
    tapPosition: 1,
    tapStepPercent: 2.5,
    v0: 1.02,
    angleDeg: 10,
  },
];

function transformerFiles(c: TransformerCase): Record<string, string> {
  const inFeeder = c.hvBusKv === 20;
  const tRow = `T1,${inFeeder ? "F1-B" : "HV"},${
    inFeeder ? "F1-LV" : "BB"
  },0.63,${c.hvKv},${c.lvKv},6,5,${c.group},${c.tapSide},-5,5,${c.tapPosition},${c.tapStepPercent}\n`;
  return {
    "buses.csv": "id,nominal_voltage [kV],feeder\n" +
      (inFeeder ? "" : `HV,${c.hvBusKv},\n`) +
      `BB,20,\nF1-A,20,F1\nF1-B,20,F1\n` + (inFeeder ? `F1-LV,${c.lvBusKv},F1\n` : ""),
    "grid_sources.csv":
      `id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],voltage_setpoint [pu],voltage_angle [deg]\nG,${
        inFeeder ? "BB" : "HV"
      },${inFeeder ? 20 : c.hvBusKv},3000,2000,${c.v0},${c.angleDeg}\n`,
    "line_types.csv":
      "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],ampacity [A]\nOH,overhead,0.3,0.35,0.45,1.2,300\n",
    "lines.csv": "id,from,to,type,length [km]\nL1,F1-A,F1-B,OH,2\n",
    "switches.csv": "id,from,to,kind,normal_state,heads_feeder\nCB,BB,F1-A,breaker,closed,F1\n",
    "transformers.csv":
      "id,hv_bus,lv_bus,rated_power [MVA],hv_voltage [kV],lv_voltage [kV],sc_voltage [%],load_losses [kW],vector_group,tap_side,tap_min,tap_max,tap_position,tap_step [%]\n" +
      tRow,
  };
}

Deno.test("solveReferenceNewton() gives V0 divided by the complex ratio behind an unloaded transformer", async () => {
  for (const c of TRANSFORMER_CASES) {
    const form = await compileOnly(transformerFiles(c));
    const r = solveReferenceNewton(form, PEAK, { tolerancePu: 1e-13 });
    assert(r.converged, c.name);
    const step = 1 + c.tapPosition * c.tapStepPercent / 100;
    const hvEff = c.hvKv * (c.tapSide === "hv" ? step : 1);
    const lvEff = c.lvKv * (c.tapSide === "lv" ? step : 1);
    const ratio = (hvEff / c.hvBusKv) / (lvEff / c.lvBusKv);
    const clock = Number(/\d+$/.exec(c.group)![0]);
    const lvBus = c.hvBusKv === 20 ? "F1-LV" : "F1-B";
    const err = voltageError(
      r,
      busIndex(form, lvBus),
      c.v0 / ratio,
      (c.angleDeg - clock * 30) * DEG,
    );
    // Tolerance 1e-12 pu: nothing flows, the answer is exact up to round-off.
    assert(err <= 1e-12, `${c.name}: error ${err} pu`);
  }
});

const BALANCE_SEEDS = 30;

Deno.test("solveReferenceNewton() balances slack power against loads, I²R losses and generation", async () => {
  // Conservation of energy (common practice): P_slack = Σ P_load + Σ |I|²·R − Σ P_gen, the
  // loads evaluated at the solved voltages and the losses from the branch currents.
  for (let seed = 1; seed <= BALANCE_SEEDS; seed++) {
    const feeder = generateRandomFeeder(1000 + seed, {
      topology: seed % 2 === 0 ? "meshed" : "radial",
    });
    const form = await compileOnly(feeder.files);
    for (const c of [PEAK, MIN]) {
      const r = solveReferenceNewton(form, c, { tolerancePu: 1e-12 });
      assert(r.converged, `${feeder.summary}, case ${c.id}`);
      const loads = r.loadPPu.reduce((s, p) => s + p, 0);
      const gens = r.genPPu.reduce((s, p) => s + p, 0);
      const residual = Math.abs(r.sourcePPu - (loads + r.lossesPPu - gens));
      // Tolerance 1e-9 pu (1 W on the 1 MVA base).
      assert(residual <= 1e-9, `${feeder.summary}, case ${c.id}: residual ${residual} pu`);
      assert(r.lossesPPu > 0, "a loaded network has losses");
    }
  }
});

Deno.test("solveReferenceNewton() holds voltage-controlled generators at their set-points", async () => {
  // Definition of a PV bus (Grainger & Stevenson ch. 9): |V| is specified there.
  let seen = 0;
  for (let seed = 1; seen < 5 && seed < 400; seed++) {
    const feeder = generateRandomFeeder(seed, { maxBuses: 20 });
    if (!feeder.files["generators.csv"]!.includes("voltage_control")) continue;
    const form = await compileOnly(feeder.files);
    const g = form.generators.reactive.findIndex((m) => m.mode === "voltage_control");
    const mode = form.generators.reactive[g]!;
    assert(mode.mode === "voltage_control");
    const k = form.generators.bus[g]!;
    for (const c of [PEAK, MIN]) {
      const r = solveReferenceNewton(form, c, { tolerancePu: 1e-12 });
      const v = Math.hypot(r.vRePu[k]!, r.vImPu[k]!);
      assert(Math.abs(v - mode.vSetPu) <= 1e-12, `${feeder.summary}: |V| ${v}`);
    }
    seen++;
  }
  equal(seen, 5, "five feeders with a voltage-controlled generator");
});

// ---- The random-feeder fixture ----

const FIXTURE_SEEDS = 40;

Deno.test("generateRandomFeeder() gives one valid feeder, radial or meshed as asked", async () => {
  for (let seed = 1; seed <= FIXTURE_SEEDS; seed++) {
    const topology = seed % 2 === 0 ? "meshed" : "radial";
    const feeder = generateRandomFeeder(seed, { topology });
    const r = await validateFleet(memorySource(feeder.files));
    deepStrictEqual(r.diagnostics.filter((d) => d.severity === "error"), [], feeder.summary);
    equal(r.value.forms.length, 1, feeder.summary);
    equal(r.value.forms[0]!.meshed, topology === "meshed", feeder.summary);
    equal(feeder.meshed, topology === "meshed", feeder.summary);
  }
});

Deno.test("generateRandomFeeder() is repeatable for a seed and differs between seeds", () => {
  deepStrictEqual(generateRandomFeeder(77).files, generateRandomFeeder(77).files);
  notDeepStrictEqual(generateRandomFeeder(77).files, generateRandomFeeder(78).files);
});

Deno.test("generateRandomFeeder() keeps both cases within 0.9–1.1 pu and inside machine capability", async () => {
  // The fixture's promises (moderate loading; a voltage-controlled unit needs less than its
  // capability √(S² − P²) with full generation), checked with the reference solution.
  let units = 0;
  for (let seed = 1; seed <= FIXTURE_SEEDS; seed++) {
    const feeder = generateRandomFeeder(500 + seed);
    const form = await compileOnly(feeder.files);
    for (const c of [PEAK, MIN]) {
      const r = solveReferenceNewton(form, c, { tolerancePu: 1e-12 });
      assert(r.converged, feeder.summary);
      for (let k = 0; k < form.nBus; k++) {
        const v = Math.hypot(r.vRePu[k]!, r.vImPu[k]!);
        assert(v >= 0.9 && v <= 1.1, `${feeder.summary}, case ${c.id}: bus ${k} at ${v} pu`);
      }
    }
    const r = solveReferenceNewton(form, MIN, { tolerancePu: 1e-12 });
    for (let g = 0; g < form.generators.n; g++) {
      if (form.generators.reactive[g]!.mode !== "voltage_control") continue;
      const s = form.generators.sRatedKva[g]! / 1000, p = r.genPPu[g]!;
      const qMax = Math.sqrt(s * s - p * p);
      assert(Math.abs(r.genQPu[g]!) <= 0.5 * qMax, `${feeder.summary}: Q ${r.genQPu[g]} pu`);
      units++;
    }
  }
  assert(units >= 5, `${units} voltage-controlled units drawn`);
});

Deno.test("generateRandomFeeder() covers every element it promises", async () => {
  const seen = new Set<string>();
  for (let seed = 1; seed <= FIXTURE_SEEDS; seed++) {
    const form = await compileOnly(generateRandomFeeder(seed).files);
    const { nGroup } = mergeSwitchedBuses(form);
    equal(nGroup, form.nBus - form.devices.length, "each tree switch merges two buses");
    if (form.vnKv[0]! > 100) seen.add("110 kV source");
    else seen.add("20 kV source");
    if (form.meshed) seen.add("meshed");
    else seen.add("radial");
    if ([...form.vnKv].some((v) => v < 1)) seen.add("LV branch");
    if (form.devices.some((d) => !d.isHead)) seen.add("inner switch");
    for (let b = 0; b < form.nBranch; b++) {
      if (form.branchKind[b] !== BRANCH_TRANSFORMER) continue;
      if (Math.abs(form.ratio[b]! - 1) > 1e-6) seen.add("off-nominal ratio");
      if (Math.abs(form.shiftDeg[b]! % 360) > 1) seen.add("phase shift");
      if (Math.abs(form.shiftDeg[b]! - 150) < 1e-9) seen.add("Dyn5");
    }
    if ([...form.b1S].some((b) => b > 0)) seen.add("line charging");
    if (new Set([...form.cable].filter((c) => c !== 255)).size === 2) {
      seen.add("cable and overhead");
    }
    for (let l = 0; l < form.loads.n; l++) {
      const z = form.loads.zipZ[l]!, i = form.loads.zipI[l]!, p = form.loads.zipP[l]!;
      seen.add(z === 1 ? "impedance" : i === 1 ? "current" : p === 1 ? "power" : "zip");
      if (form.loads.peakQKvar[l]! < 0) seen.add("capacitive load");
    }
    for (const m of form.generators.reactive) {
      seen.add(m.mode === "fixed_power_factor" ? `pf ${m.sense}` : m.mode);
    }
    if (form.shunts.n > 0) seen.add("shunt");
  }
  const promised = [
    "110 kV source",
    "20 kV source",
    "meshed",
    "radial",
    "LV branch",
    "inner switch",
    "off-nominal ratio",
    "phase shift",
    "Dyn5",
    "line charging",
    "cable and overhead",
    "impedance",
    "current",
    "power",
    "zip",
    "capacitive load",
    "unity",
    "pf absorbing",
    "pf injecting",
    "fixed_q",
    "voltage_control",
    "shunt",
  ];
  deepStrictEqual(promised.filter((p) => !seen.has(p)), [], "elements never drawn");
});

Deno.test("buildFeederArbitrary() draws valid meshed feeders of the asked size", async () => {
  await fc.assert(
    fc.asyncProperty(
      buildFeederArbitrary({ topology: "meshed", minBuses: 10, maxBuses: 15 }),
      async (feeder: RandomFeeder) => {
        const form = await compileOnly(feeder.files);
        assert(form.meshed, feeder.summary);
        const feederBuses = form.nBus - form.substationBusCount;
        assert(feederBuses >= 10 && feederBuses <= 15, `${feeder.summary}: ${feederBuses} buses`);
      },
    ),
    { seed: 4242, numRuns: 10 },
  );
});
