/**
 * The protection's response to a fault on a two-relay radial feeder: operating times equal
 * the IEC 60255-151 standard-inverse formula (REFERENCES.md C: k 0.14, α 0.02) at the
 * fault current worked by hand with IEC 60909 (REFERENCES.md D [memory]); the downstream
 * relay clears a far fault with the upstream one graded behind it; synchronous generation
 * at the far end makes the non-directional downstream relay trip first for a fault between
 * the relays (the wrong device, feeding the fault from the other side), which a forward
 * directional element prevents.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { twoRelayFeeder } from "../../tests/fixtures/protection_feeders.ts";
import { DEFAULT_FAULT_SETTINGS } from "./fault_settings.ts";
import { prepareFaultModel } from "./fault_branch_currents.ts";
import { protectiveDevices, simulateFaultProtection } from "./simulate_fault_protection.ts";

/** IEC standard inverse (REFERENCES.md C). */
const si = (tms: number, pickupA: number, iA: number) => tms * 0.14 / ((iA / pickupA) ** 0.02 - 1);

const feeder = (o: { r2Direction?: string; generator?: boolean }) =>
  twoRelayFeeder({
    ...(o.r2Direction === undefined ? {} : { r2Direction: o.r2Direction }),
    ...(o.generator ? { generatorAt: "B4" } : {}),
  });

Deno.test("simulateFaultProtection() grades two relays for a far fault as the formulas say", async () => {
  const form = await formOfTables(feeder({}));
  const model = prepareFaultModel(form, DEFAULT_FAULT_SETTINGS, 1, "max")!;
  const r = simulateFaultProtection(
    model,
    protectiveDevices(form),
    form.busIds.indexOf("B4"),
    "three_phase",
  );
  // Hand calculation: ZQ = 1.1·20²/200 = 2.2 Ω (XQ = ZQ/√1.01, RQ = 0.1·XQ), two lines of
  // 5 km at 0.2 + j0.35 Ω/km; I″k3 = 1.1·20 kV/(√3·|Z|).
  const xq = 2.2 / Math.sqrt(1.01), rq = 0.1 * xq;
  const iA = 1000 * 1.1 * 20 / (Math.sqrt(3) * Math.hypot(rq + 2, xq + 3.5));
  assert(Math.abs(r.faultKa * 1000 - iA) < 1e-6 * iA);
  const cb1 = r.devices.find((d) => d.device === "CB1")!,
    cb2 = r.devices.find((d) => d.device === "CB2")!;
  assert(Math.abs(cb2.iA - iA) < 1e-6 * iA && Math.abs(cb1.iA - iA) < 1e-6 * iA);
  assert(Math.abs(cb2.tripS - si(0.1, 300, iA)) < 1e-9);
  assert(Math.abs(cb1.tripS - si(0.3, 400, iA)) < 1e-9);
  assertEquals([r.primary?.device, r.backup?.device, r.first?.device], ["CB2", "CB1", "CB2"]);
  // Graded: the backup waits more than the 0.3 s coordination interval (common practice).
  assert(cb1.tripS - cb2.tripS > 0.3, `${cb1.tripS} − ${cb2.tripS}`);
  assertEquals([cb1.direction, cb2.direction], [1, 1]);
});

Deno.test("simulateFaultProtection() shows generation at the far end tripping the wrong relay first", async () => {
  const bus = "B2"; // between the relays: only CB1 lies between the fault and the source
  const nonDirectional = await formOfTables(feeder({ generator: true }));
  const m1 = prepareFaultModel(nonDirectional, DEFAULT_FAULT_SETTINGS, 1, "max")!;
  const r1 = simulateFaultProtection(
    m1,
    protectiveDevices(nonDirectional),
    nonDirectional.busIds.indexOf(bus),
    "three_phase",
  );
  const cb2 = r1.devices.find((d) => d.device === "CB2")!;
  assertEquals(cb2.direction, -1); // fed from the generator's side
  assert(cb2.iA > 300, `${cb2.iA} A`);
  assertEquals(r1.primary?.device, "CB1");
  assertEquals(r1.first?.device, "CB2"); // the wrong trip sequence
  // A forward directional element on R2 leaves the fault to CB1.
  const directional = await formOfTables(feeder({ generator: true, r2Direction: "forward" }));
  const m2 = prepareFaultModel(directional, DEFAULT_FAULT_SETTINGS, 1, "max")!;
  const r2 = simulateFaultProtection(
    m2,
    protectiveDevices(directional),
    directional.busIds.indexOf(bus),
    "three_phase",
  );
  assertEquals(r2.devices.find((d) => d.device === "CB2")!.tripS, Infinity);
  assertEquals(r2.first?.device, "CB1");
  // For a fault beyond CB2 the directional relay still clears first.
  const far = simulateFaultProtection(
    m2,
    protectiveDevices(directional),
    directional.busIds.indexOf("B4"),
    "three_phase",
  );
  assertEquals(far.first?.device, "CB2");
});
