/**
 * Protection checks on small feeders built to make each one fire (invented settings, not
 * reference data; the operating times themselves are tested against REFERENCES.md C in
 * src/solve/overcurrent_time_test.ts): a well-graded pair gives nothing; a backup set too
 * fast is miscoordinated; far-end generation makes the downstream non-directional relay trip
 * first and carry reverse current above pickup, so the feeder needs directional protection;
 * a fast feeder-head relay trips sympathetically for a busbar fault; generation between a
 * relay and a far fault blinds it.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { twoRelayFeeder, type TwoRelayOptions } from "../../tests/fixtures/protection_feeders.ts";
import { DEFAULT_FAULT_SETTINGS } from "../solve/fault_settings.ts";
import { DEFAULT_PROTECTION_SETTINGS } from "../solve/protection_settings.ts";
import { checkProtection } from "./check_protection.ts";

type Opts = TwoRelayOptions;
const feeder = twoRelayFeeder;

async function findings(o: Opts) {
  const form = await formOfTables(feeder(o));
  return checkProtection(form, DEFAULT_FAULT_SETTINGS, DEFAULT_PROTECTION_SETTINGS, 1);
}
const codes = (fs: { code: string; where: { id: string } }[]) =>
  fs.map((f) => `${f.code} ${f.where.id}`).sort();

Deno.test("checkProtection() finds nothing on a well-graded pair without generation", async () => {
  assertEquals(await findings({}), []);
});

Deno.test("checkProtection() finds a backup graded too close to its primary", async () => {
  const fs = await findings({ r1Tms: 0.12 });
  assertEquals(codes(fs), ["protection.miscoordination CB1"]);
  assert(fs[0]!.value < 0.3);
});

Deno.test("checkProtection() asks for directional protection when far-end generation trips the wrong relay", async () => {
  const fs = await findings({ generatorAt: "B4" });
  assertEquals(codes(fs), [
    "protection.needs_directional F",
    "protection.reverse_pickup CB2",
    "protection.wrong_device CB2",
  ]);
  // A forward directional element on R2 cures it.
  assertEquals(await findings({ generatorAt: "B4", r2Direction: "forward" }), []);
});

Deno.test("checkProtection() finds a sympathetic trip of a fast feeder head on back-feed", async () => {
  const fs = await findings({
    generatorAt: "B4",
    generatorKva: 8000,
    r1Tms: 0.05,
    r2Direction: "forward",
  });
  assert(codes(fs).includes("protection.sympathetic_trip CB1"), codes(fs).join("; "));
  assert(codes(fs).includes("protection.needs_directional F"));
});

Deno.test("checkProtection() finds a relay blinded by generation between it and the fault", async () => {
  const fs = await findings({ r2: false, generatorAt: "B2", generatorKva: 12000, skMva: 60 });
  assert(codes(fs).includes("protection.blinding CB1"), codes(fs).join("; "));
});
