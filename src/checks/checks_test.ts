/** Checks on small feeders whose figures follow from hand calculation. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import { prepareLoadFlow } from "../solve/prepare_load_flow.ts";
import { DEFAULT_LOAD_FLOW_OPTIONS, type LoadFlowCase } from "../solve/load_flow_types.ts";
import { computeVoltageChangeParts } from "./voltage_change_parts.ts";
import { checkVoltageBand } from "./check_voltage_band.ts";
import { branchLoadingPercent, checkFlows } from "./check_flows.ts";
import type { CheckLimits } from "./check_options.ts";
import { twoBusFeeder } from "../../tests/fixtures/small_feeders.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

const LIMITS: CheckLimits = {
  voltageBand: { mv: { vMinPu: 0.95, vMaxPu: 1.05 }, lv: { vMinPu: 0.9, vMaxPu: 1.1 } },
  lvMaxKv: 1,
  voltageChange: { mvLimitPercent: 2, lvLimitPercent: 3 },
  thermal: { limitPercent: 100, warnPercent: 90 },
  reversePower: { headLimitKw: 0, transformerLimitKw: 0 },
  losses: { warnPercent: 1 },
};
const ALL = {
  voltageBand: true,
  voltageChange: true,
  thermal: true,
  reversePower: true,
  losses: true,
};
const PEAK: LoadFlowCase = { id: "peak", demand: "peak", demandScale: 1, generationScale: 0 };
const DG: LoadFlowCase = { id: "dg", demand: "min", demandScale: 1, generationScale: 1 };
const TIGHT = { ...DEFAULT_LOAD_FLOW_OPTIONS, tolerancePu: 1e-12 };

async function formOf(files: Record<string, string>): Promise<FeederForm> {
  return (await validateFleet(memorySource(files))).value.forms[0]!;
}

Deno.test("computeVoltageChangeParts() of one infeed behind one line is R·P and X·Q", async () => {
  // The trade formula at its simplest (Bollen & Hassan 2011): one branch, one generator.
  const form = await formOf(twoBusFeeder({
    rOhm: 4,
    xOhm: 3,
    generatorHeader:
      "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_power [kvar]",
    generatorRow: "1200,1000,fixed_q,-300",
  }));
  const pre = prepareLoadFlow(form);
  const parts = computeVoltageChangeParts(
    form,
    pre.zRe,
    pre.zIm,
    Float64Array.of(1000),
    Float64Array.of(-300),
  );
  const b2 = form.busIds.indexOf("B2");
  assert(Math.abs(parts.rpPu[b2]! - (4 / 400) * 1) < 1e-15);
  assert(Math.abs(parts.xqPu[b2]! - (3 / 400) * -0.3) < 1e-15);
});

Deno.test("computeVoltageChangeParts() equals the sum over generators of their common-path R·P", async () => {
  // Invariant: Σ_g R(common path of bus k and g)·P_g, computed here by brute force.
  const form = (await validateFleet(memorySource({
    ...TWO_FEEDERS,
    "generators.csv":
      "id,bus,kind,rated_power [kVA],active_power [kW]\nG1,A2,converter,800,700\nG2,A3,converter,60,50\nG3,A4,converter,300,250\n",
  }))).value.forms[0]!;
  const pre = prepareLoadFlow(form);
  const p = Float64Array.from(form.generators.pKw);
  const parts = computeVoltageChangeParts(form, pre.zRe, pre.zIm, p, new Float64Array(p.length));
  const path = (k: number) => {
    const s = new Set<number>();
    for (let v = k; v > 0; v = form.parent[v]!) s.add(v);
    return s;
  };
  for (let k = 0; k < form.nBus; k++) {
    let expected = 0;
    const pk = path(k);
    for (let g = 0; g < form.generators.n; g++) {
      for (const v of path(form.generators.bus[g]!)) {
        if (pk.has(v)) expected += pre.zRe[v - 1]! * p[g]! / 1000;
      }
    }
    assert(Math.abs(parts.rpPu[k]! - expected) < 1e-15, `bus ${form.busIds[k]}`);
  }
});

Deno.test("branchLoadingPercent() is I / ampacity with I = S / (√3·U) by hand", async () => {
  // Load 12.5 MW + 4 Mvar at B2 behind a short line: |I| = |S|/(√3·|U|·Un) with |U| from the
  // load flow, about 95 % of the 400 A ampacity.
  const form = await formOf(
    twoBusFeeder({ rOhm: 0.2, xOhm: 0.2, loadPKw: 12500, loadQKvar: 4000 }),
  );
  const res = solveLoadFlow(form, PEAK, TIGHT).value;
  const b2 = form.busIds.indexOf("B2");
  const iA = Math.hypot(12500, 4000) / (Math.sqrt(3) * res.vMagPu[b2]! * 20);
  const line = form.branchIds.indexOf("L");
  assert(Math.abs(res.iA[line]! - iA) < 1e-6 * iA);
  assert(Math.abs(branchLoadingPercent(form, res)[line]! - 100 * iA / 400) < 1e-6);
  const f = checkFlows(form, res, LIMITS, ALL).filter((x) => x.code.startsWith("thermal."));
  assertEquals(f.map((x) => [x.code, x.where.id, x.severity]), [[
    "thermal.near_limit",
    "L",
    "warning",
  ]]);
});

Deno.test("checkFlows() reports losses above their share with I²R by hand", async () => {
  const form = await formOf(twoBusFeeder({ rOhm: 4, xOhm: 3, loadPKw: 3000, loadQKvar: 1000 }));
  const res = solveLoadFlow(form, PEAK, TIGHT).value;
  const i = res.iA[form.branchIds.indexOf("L")]!;
  // Three-phase losses 3·I²·R (Ohm's law), in kW.
  assert(Math.abs(res.lossesKw - 3 * i * i * 4 / 1000) < 1e-6);
  const f = checkFlows(form, res, LIMITS, ALL).find((x) => x.code === "losses.high")!;
  assert(Math.abs(f.value - 100 * res.lossesKw / res.sourcePKw) < 1e-9);
});

Deno.test("checkFlows() reports reverse power through the feeder head", async () => {
  const form = await formOf(twoBusFeeder({
    rOhm: 1,
    xOhm: 1,
    loadPKw: 200,
    generatorRow: "1500,1400",
  }));
  const res = solveLoadFlow(form, DG, TIGHT).value;
  const f = checkFlows(form, res, LIMITS, ALL).find((x) => x.code === "flow.reverse_head")!;
  assertEquals(f.where, { kind: "branch", id: "CB" });
  // Export = generation − load − losses.
  assert(Math.abs(f.value - (1400 - 200 - res.lossesKw)) < 1e-6);
});

Deno.test("checkVoltageBand() flags buses outside the band of their level", async () => {
  const form = await formOf(twoBusFeeder({ rOhm: 8, xOhm: 8, loadPKw: 5000, loadQKvar: 2000 }));
  const res = solveLoadFlow(form, PEAK, TIGHT).value;
  const f = checkVoltageBand(form, res, LIMITS);
  assertEquals(f.map((x) => [x.code, x.where.id, x.limit]), [["voltage.below_band", "B2", 0.95]]);
  assert(f[0]!.value < 0.95);
  assertEquals(
    checkVoltageBand(form, res, {
      ...LIMITS,
      voltageBand: { ...LIMITS.voltageBand, mv: { vMinPu: 0.5, vMaxPu: 1.5 } },
    }),
    [],
  );
});
