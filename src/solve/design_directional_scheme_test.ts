/**
 * The directional scheme on the far-end-generation feeder of the protection checks (an
 * invented scenario): without direction the downstream relay trips first for a fault
 * between the relays; with the proposed scheme the right device clears first for faults on
 * either side of it, every backup stays the coordination interval behind, and the checks
 * find nothing left.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { twoRelayFeeder } from "../../tests/fixtures/protection_feeders.ts";
import { DEFAULT_FAULT_SETTINGS } from "./fault_settings.ts";
import { DEFAULT_PROTECTION_SETTINGS } from "./protection_settings.ts";
import { prepareFaultModel } from "./fault_branch_currents.ts";
import { protectiveDevices, simulateFaultProtection } from "./simulate_fault_protection.ts";
import { checkProtection } from "../checks/check_protection.ts";
import { designDirectionalScheme } from "./design_directional_scheme.ts";

Deno.test("designDirectionalScheme() makes far-end generation coordinate on both sides of the relay", async () => {
  const form = await formOfTables(twoRelayFeeder({ generatorAt: "B4" }));
  const before = checkProtection(form, DEFAULT_FAULT_SETTINGS, DEFAULT_PROTECTION_SETTINGS, 1);
  const directional = new Set(
    before.filter((f) => f.code === "protection.reverse_pickup").map((f) => f.where.id),
  );
  assertEquals([...directional], ["CB2"]);
  const load = new Map([["CB1", 150], ["CB2", 80]]); // invented peak load currents, A
  const scheme = designDirectionalScheme(
    form,
    directional,
    load,
    DEFAULT_FAULT_SETTINGS,
    1,
    DEFAULT_PROTECTION_SETTINGS,
  );
  assert(scheme.status === "proposed");
  const r2 = scheme.settings.find((s) => s.device === "CB2")!;
  assertEquals(r2.direction, "forward");
  assert(r2.pickupA >= 1.25 * 80);
  // Faults on either side of CB2, every condition: the nearest device on the source side
  // clears first, and the backup waits at least the interval.
  for (const cond of ["max", "maxWithoutGeneration", "min"] as const) {
    const m = prepareFaultModel(scheme.form, DEFAULT_FAULT_SETTINGS, 1, cond)!;
    const devices = protectiveDevices(scheme.form);
    for (const [bus, expected] of [["B2", "CB1"], ["B4", "CB2"]] as const) {
      const r = simulateFaultProtection(m, devices, scheme.form.busIds.indexOf(bus), "three_phase");
      assertEquals(r.first?.device, expected, `${cond} ${bus}`);
      if (r.backup !== null && Number.isFinite(r.backup.tripS)) {
        assert(
          r.backup.tripS - r.primary!.tripS >= 0.3 - 1e-6,
          `${cond} ${bus}: ${r.backup.tripS} − ${r.primary!.tripS}`,
        );
      }
    }
  }
  const after = checkProtection(
    scheme.form,
    DEFAULT_FAULT_SETTINGS,
    DEFAULT_PROTECTION_SETTINGS,
    1,
  );
  assertEquals(after, []);
});

Deno.test("designDirectionalScheme() reports a relay that cannot tell load from fault", async () => {
  const form = await formOfTables(twoRelayFeeder({ generatorAt: "B4" }));
  const scheme = designDirectionalScheme(
    form,
    new Set(["CB2"]),
    new Map([["CB2", 5000]]),
    DEFAULT_FAULT_SETTINGS,
    1,
    DEFAULT_PROTECTION_SETTINGS,
  );
  assertEquals(scheme.status, "infeasible");
});
