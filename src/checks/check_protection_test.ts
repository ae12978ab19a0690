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
import { DEFAULT_FAULT_SETTINGS } from "../solve/fault_settings.ts";
import { DEFAULT_PROTECTION_SETTINGS } from "../solve/protection_settings.ts";
import { checkProtection } from "./check_protection.ts";

interface Opts {
  r1Tms?: number;
  r2?: boolean;
  r2Direction?: string;
  generatorAt?: string;
  generatorKva?: number;
  skMva?: number;
}

function feeder(o: Opts): Record<string, string> {
  const files: Record<string, string> = {
    "buses.csv": "id,nominal_voltage [kV],feeder\nS,20,\nB1,20,F\nB2,20,F\nB3,20,F\nB4,20,F\n",
    "grid_sources.csv":
      "id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],r_to_x,earthing\n" +
      `Q,S,20,${o.skMva ?? 200},${0.75 * (o.skMva ?? 200)},0.1,solid\n`,
    "line_types.csv":
      "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],ampacity [A]\nOH,overhead,0.2,0.35,0.5,1.2,400\n",
    "lines.csv": "id,from,to,type,length [km]\nL1,B1,B2,OH,5\nL2,B3,B4,OH,5\n",
    "switches.csv":
      "id,from,to,kind,heads_feeder,rated_current [A],breaking_current [kA]\nCB1,S,B1,breaker,F,630,16\nCB2,B2,B3,breaker,,630,16\n",
    "relay_stages.csv":
      "relay,device,stage,element,characteristic,pickup [A],time_multiplier,direction\n" +
      `R1,CB1,1,phase,iec_standard_inverse,400,${o.r1Tms ?? 0.3},\n` +
      (o.r2 === false
        ? ""
        : `R2,CB2,1,phase,iec_standard_inverse,300,0.1,${o.r2Direction ?? ""}\n`),
  };
  if (o.generatorAt !== undefined) {
    files["generators.csv"] =
      "id,bus,kind,rated_power [kVA],active_power [kW],xd_subtransient [pu]\n" +
      `SG,${o.generatorAt},synchronous,${o.generatorKva ?? 4000},${
        0.9 * (o.generatorKva ?? 4000)
      },0.15\n`;
  }
  return files;
}

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
