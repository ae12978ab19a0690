/** The solver form: layout conventions, transformer data and transfer to a worker. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { memorySource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { transformerImpedanceOhm } from "./compile_feeder.ts";
import {
  BRANCH_LINE,
  BRANCH_SWITCH,
  BRANCH_TRANSFORMER,
  listTransferables,
} from "./feeder_form.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

const close = (a: number, b: number, rel = 1e-9) =>
  assert(Math.abs(a - b) <= rel * Math.max(Math.abs(b), 1e-12), `${a} ≠ ${b}`);

async function forms() {
  const r = await validateFleet(memorySource(TWO_FEEDERS));
  return r.value.forms;
}

Deno.test("transformerImpedanceOhm() follows IEC 60909-0 ZT = ukr·UrT²/SrT, RT = PkrT·UrT²/SrT²", () => {
  // 40 MVA, uk 12 %, Pk 180 kW referred to 20 kV (formulas of IEC 60909-0:2016 §6.3.1 [memory],
  // REFERENCES.md D): ZT = 0.12·20²/40 = 1.2 Ω, RT = 0.18·20²/40² = 0.045 Ω, XT = √(ZT² − RT²).
  const z = transformerImpedanceOhm({ ukPercent: 12, loadLossKw: 180, sRatedMva: 40 }, 20);
  close(z.rOhm, 0.045);
  close(z.xOhm, Math.sqrt(1.2 * 1.2 - 0.045 * 0.045));
  close(Math.hypot(z.rOhm, z.xOhm), 1.2);
});

Deno.test("compileFeeder() lays branches so that branch k − 1 joins bus k to its parent", async () => {
  const [f1] = await forms();
  assert(f1);
  assertEquals(f1.busIds, ["HV", "BB", "SA1", "A1", "A2", "A3", "A4"]);
  assertEquals(f1.nBranch, 6);
  for (let k = 1; k < f1.nBus; k++) {
    assertEquals(f1.branchTo[k - 1], k);
    assertEquals(f1.branchFrom[k - 1], f1.parent[k]);
  }
  assertEquals([...f1.branchKind], [
    BRANCH_TRANSFORMER,
    BRANCH_SWITCH,
    BRANCH_LINE,
    BRANCH_LINE,
    BRANCH_LINE,
    BRANCH_SWITCH,
  ]);
  // Children in CSR form: A2 (bus 4) feeds A3 (5) and A4 (6).
  const kids = (k: number) => [...f1.children.subarray(f1.childStart[k]!, f1.childStart[k + 1]!)];
  assertEquals(kids(4), [5, 6]);
  assertEquals(kids(5), []);
  // Distance along the path: 1.2 + 0.8 + 2.5 km to A3.
  close(f1.distanceKm[5]!, 4.5);
  close(f1.distanceKm[6]!, 2.0);
});

Deno.test("compileFeeder() scales line data by length and restricts phase matrices to the line's phases", async () => {
  const [f1] = await forms();
  assert(f1);
  // LA1: 1.2 km of 0.125 + j0.11 Ω/km.
  close(f1.r1Ohm[2]!, 0.15);
  close(f1.x1Ohm[2]!, 0.132);
  close(f1.b1S[2]!, 2 * Math.PI * 50 * 300e-9 * 1.2);
  // LA3 is single-phase A on a sequence type: only the aa entry, Zs = (Z0 + 2·Z1)/3 per km.
  const k = 4;
  close(f1.zPhaseReOhm[9 * k]!, 2.5 * (0.75 + 2 * 0.6) / 3);
  for (let e = 1; e < 9; e++) assertEquals(f1.zPhaseReOhm[9 * k + e], 0);
  assertEquals(f1.branchPhases[k], 1);
  assertEquals(f1.busPhases[5], 1);
  assertEquals(f1.ratingA[k], 180);
  assertEquals(f1.cable[k], 0);
});

Deno.test("compileFeeder() gives transformers their turns ratio and phase shift", async () => {
  const [f1] = await forms();
  assert(f1);
  // T1 110/20.5 kV between 110 kV and 20 kV buses: off-nominal ratio 20/20.5; YNd11 → 330°.
  close(f1.ratio[0]!, 20 / 20.5);
  assertEquals(f1.shiftDeg[0], 330);
  assertEquals(f1.transformers[0]!.branch, 0);
  close(f1.ratingA[0]!, 40e3 / (Math.sqrt(3) * 20.5));
  const z = transformerImpedanceOhm({ ukPercent: 12, loadLossKw: 180, sRatedMva: 40 }, 20.5);
  close(f1.r1Ohm[0]!, z.rOhm);
});

Deno.test("compileFeeder() places loads, generators and protective devices", async () => {
  const [f1, f2] = await forms();
  assert(f1 && f2);
  assertEquals(f1.loads.ids, ["D1", "D2"]);
  assertEquals([...f1.loads.bus], [3, 5]);
  close(f1.loads.peakQKvar[0]!, 400 * Math.tan(Math.acos(0.95)));
  assertEquals(f1.generators.ids, ["PV1"]);
  assertEquals([...f1.generators.bus], [4]);
  assertEquals(f1.devices.map((d) => [d.id, d.kind, d.branch, d.isHead]), [
    ["CB1", "breaker", 1, true],
    ["FU1", "fuse", 5, false],
  ]);
  assertEquals(f1.devices[1]!.fuseCurve?.melt.length, 3);
  assertEquals(f2.meshed, true);
  assertEquals(f2.nBranch, f2.nBus); // one loop branch beyond the tree
});

Deno.test("listTransferables() moves every typed array of a form without loss", async () => {
  const [f1] = await forms();
  assert(f1);
  const copy = structuredClone(f1);
  const buffers = listTransferables(f1);
  assert(buffers.length >= 30);
  const moved = structuredClone(f1, { transfer: buffers });
  assertEquals(moved, copy);
  assertEquals(f1.vnKv.byteLength, 0); // detached: it was transferred, not copied
});

Deno.test("compileFeeder() places in-service shunts on their buses", async () => {
  const files = {
    ...TWO_FEEDERS,
    "shunts.csv":
      "id,bus,rated_reactive_power [Mvar],in_service\nC1,A1,0.3,yes\nC2,A2,0.2,no\nR1,B3,-0.1,yes\n",
  };
  const r = await validateFleet(memorySource(files));
  assertEquals(r.diagnostics.filter((d) => d.severity === "error"), []);
  const [f1, f2] = r.value.forms;
  assert(f1 && f2);
  assertEquals(f1.shunts.ids, ["C1"]);
  assertEquals([...f1.shunts.bus], [3]);
  assertEquals([...f1.shunts.qRatedKvar], [300]);
  assertEquals([...f2.shunts.qRatedKvar], [-100]);
});
