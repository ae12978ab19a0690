/**
 * Hosting capacity on a single 20 kV line (source at 1 pu, line R + jX, no demand): the
 * trade's closed form P ≈ U·ΔU/(R − X·tan φ) (Bollen & Hassan, Integration of Distributed
 * Generation in the Power System, Wiley-IEEE 2011) against the nonlinear answer, itself
 * checked against the exact DistFlow branch equation (Baran & Wu, IEEE Trans. Power Delivery
 * 4(2), 1989): with P + jQ injected at the far bus and V its voltage,
 * 1 = V² − 2(RP + XQ) + (R² + X²)(P² + Q²)/V², solved for P at V = 1 + ΔU.
 */
import { ok as assert } from "node:assert/strict";
import { formOfTables, twoBusFeeder } from "../../tests/fixtures/small_feeders.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import { DEFAULT_HOSTING_SETTINGS, type HostingSettings } from "./hosting_settings.ts";
import { hostFeeder } from "./host_feeder.ts";

const Z_BASE = 400; // 20 kV, 1 MVA: ohm per pu
export const LINE_SETTINGS: CaseSettings = {
  ...DEFAULT_PIPELINE,
  cases: [{ id: "min-dg", demand: "min", demandScale: 1, generationScale: 1 }],
  limits: {
    ...DEFAULT_PIPELINE.limits,
    voltageBand: {
      mv: { vMinPu: 0.9, vMaxPu: 1.1 },
      lv: { vMinPu: 0.9, vMaxPu: 1.1 },
    },
    voltageChange: { mvLimitPercent: 2, lvLimitPercent: 3 },
  },
  solver: { ...DEFAULT_PIPELINE.solver, tolerancePu: 1e-12 },
};

const HOSTING: HostingSettings = {
  ...DEFAULT_HOSTING_SETTINGS,
  toleranceKw: 1,
  tolerancePercent: 0.05,
};

/** Exact P (MW) at which the far-bus voltage reaches v, for Q = −t·P. */
function distFlowP(rPu: number, xPu: number, t: number, v: number): number {
  const a = (rPu * rPu + xPu * xPu) * (1 + t * t) / (v * v);
  const b = -2 * (rPu - xPu * t);
  const c = v * v - 1;
  return (-b - Math.sqrt(b * b - 4 * a * c)) / (2 * a);
}

/**
 * The closed form keeps only the linear term of the branch equation: with ΔU = 2 %,
 * P_exact = P_closed·(1 + ΔU/2) + (R² + X²)(1 + t²)P²/(2(R − Xt)V²). The tool's answer must
 * sit above the closed form by exactly these neglected terms (to 0.2 % of the closed form).
 */
function assertClosedFormGap(pKw: number, closedKw: number, r: number, x: number, t: number) {
  const p = pKw / 1000, v = 1.02;
  const expected = closedKw / 1000 * (1 + 0.01) + (r * r + x * x) * (1 + t * t) * p * p /
      (2 * (r - x * t) * v * v);
  const gap = (pKw - closedKw) / closedKw;
  assert(gap > 0, `closed ${closedKw} not below nonlinear ${pKw}`);
  assert(Math.abs(p - expected) / (closedKw / 1000) < 2e-3, `gap ${gap}: ${p} vs ${expected}`);
}

Deno.test("single line, unity power factor: nonlinear capacity = DistFlow exact (0.1 %), closed form U·ΔU/R within its neglected loss term (Bollen & Hassan 2011; Baran & Wu 1989)", async () => {
  const form = await formOfTables(twoBusFeeder({ rOhm: 4, xOhm: 8, loadPKw: 0 }));
  const out = hostFeeder(
    form,
    LINE_SETTINGS,
    { ...HOSTING, strategies: [HOSTING.strategies[0]!] },
    null,
  );
  const row = out.hosting!.buses.find((b) => b.bus === "B2")!;
  const exact = 1000 * distFlowP(4 / Z_BASE, 8 / Z_BASE, 0, 1.02);
  const closed = 1000 * 20 * 20 * 0.02 / 4; // U²·δ/R in kW: 2000 kW
  assert(Math.abs(row.capacityKw - exact) / exact < 1e-3, `${row.capacityKw} vs ${exact}`);
  assert(row.criterion === "voltage_change", row.criterion);
  assertClosedFormGap(row.capacityKw, closed, 4 / Z_BASE, 8 / Z_BASE, 0);
});

Deno.test("single line, fixed power factor 0.95 absorbing: capacity = DistFlow exact with Q = −P·tan φ; closed form U·ΔU/(R − X·tan φ) within its neglected term (Bollen & Hassan 2011)", async () => {
  // X/R = 1: with X/R = 2 a 0.95 absorbing unit never lifts the voltage by 2 % at all.
  const form = await formOfTables(twoBusFeeder({ rOhm: 8, xOhm: 8, loadPKw: 0 }));
  const pf = HOSTING.strategies.find((s) => s.id === "pf-0.95")!;
  const out = hostFeeder(form, LINE_SETTINGS, { ...HOSTING, strategies: [pf] }, null);
  const row = out.hosting!.buses.find((b) => b.bus === "B2")!;
  const t = Math.sqrt(1 - 0.95 ** 2) / 0.95;
  const exact = 1000 * distFlowP(8 / Z_BASE, 8 / Z_BASE, t, 1.02);
  const closed = 1000 * 20 * 20 * 0.02 / (8 - 8 * t);
  assert(Math.abs(row.capacityKw - exact) / exact < 1e-3, `${row.capacityKw} vs ${exact}`);
  assertClosedFormGap(row.capacityKw, closed, 8 / Z_BASE, 8 / Z_BASE, t);
  // Absorbing moves reactive demand to the substation: it supplies more, Q = P·tan φ plus
  // the line's I²X.
  assert(row.sourceQShiftKvar! > row.capacityKw * t, String(row.sourceQShiftKvar));
});
