/**
 * The short-circuit study against hand calculations with the IEC 60909-0:2016 formulas
 * (REFERENCES.md D, [memory]: ZQ = c·UnQ²/S″kQ with XQ = ZQ/√(1 + (R/X)²), ZT = uk·UrT²/SrT,
 * RT = PkrT·UrT²/SrT², KT = 0.95·cmax/(1 + 0.6·xT), I″k3 = c·Un/(√3·|Zk|),
 * κ = 1.02 + 0.98·e^(−3R/X), ip = κ·√2·I″k3), identities of the sequence networks, the
 * converter rule of the 2016 edition, a Dyn transformer's zero-sequence blocking, and the
 * O(n) tree method against the full impedance matrix on random feeders.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { generateRandomFeeder } from "../../tests/fixtures/random_feeders.ts";
import { DEFAULT_FAULT_SETTINGS } from "./fault_settings.ts";
import { studyFaults } from "./study_faults.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { memorySource } from "../ingest/read_network.ts";

const S = DEFAULT_FAULT_SETTINGS;
const close = (a: number, b: number, rel: number, what: string) =>
  assert(Math.abs(a - b) <= rel * Math.abs(b), `${what}: ${a} against ${b}`);

/** 110 kV network feeder, a 110/20 kV transformer, 5 km of line to bus B2. */
function network(o: {
  vectorGroup?: string;
  uk0?: number;
  x0ToX1?: number;
  r0ToX0?: number;
  sourceEarthing?: string;
  lineR0?: number;
  lineX0?: number;
  generator?: string;
} = {}): Record<string, string> {
  const files: Record<string, string> = {
    "buses.csv": "id,nominal_voltage [kV],feeder\nHV,110,\nMV,20,\nB1,20,F\nB2,20,F\n",
    "grid_sources.csv":
      "id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],r_to_x,x0_to_x1,r0_to_x0,earthing\n" +
      `Q,HV,110,2000,1500,0.1,${o.x0ToX1 ?? 1.5},${o.r0ToX0 ?? 0.1},${
        o.sourceEarthing ?? "solid"
      }\n`,
    "transformers.csv":
      "id,hv_bus,lv_bus,rated_power [MVA],hv_voltage [kV],lv_voltage [kV],sc_voltage [%],load_losses [kW],zero_seq_sc_voltage [%],vector_group,hv_earthing,lv_earthing\n" +
      `T,HV,MV,40,110,20,12,170,${o.uk0 ?? 10.8},${o.vectorGroup ?? "YNyn0"},solid,solid\n`,
    "line_types.csv":
      "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],ampacity [A]\n" +
      `OH,overhead,0.2,0.35,${o.lineR0 ?? 0.5},${o.lineX0 ?? 1.2},400\n`,
    "lines.csv": "id,from,to,type,length [km]\nL,B1,B2,OH,5\n",
    "switches.csv":
      "id,from,to,kind,heads_feeder,rated_current [A],breaking_current [kA],making_current [kA]\n" +
      "CB,MV,B1,breaker,F,630,16,40\n",
  };
  if (o.generator !== undefined) files["generators.csv"] = o.generator;
  return files;
}

Deno.test("studyFaults() follows the IEC 60909 hand calculation step by step", async () => {
  const form = await formOfTables(network());
  const f = studyFaults(form, S, 1);
  const b2 = f.buses.find((b) => b.id === "B2")!;
  // Network feeder, referred to 20 kV by the rated ratio 110/20.
  const zQ = 1.1 * 110 ** 2 / 2000; // 6.655 Ω at 110 kV
  const zQt = zQ * (20 / 110) ** 2; // 0.22 Ω
  const xQt = zQt / Math.sqrt(1 + 0.1 ** 2), rQt = 0.1 * xQt; // XQ = 0.995·ZQ
  close(xQt / zQt, 0.995, 1e-3, "XQ/ZQ");
  // Transformer, at 20 kV.
  const zT = 0.12 * 20 ** 2 / 40; // 1.2 Ω
  const rT = 0.17 * 20 ** 2 / 40 ** 2; // 0.0425 Ω
  const xT = Math.sqrt(zT ** 2 - rT ** 2);
  const kT = 0.95 * 1.1 / (1 + 0.6 * (xT / (20 ** 2 / 40)));
  close(kT, 0.975, 1e-3, "KT"); // 0.95·1.1/(1 + 0.6·0.1199)
  // Line: 5 km of 0.2 + j0.35 Ω/km.
  const rK = rQt + kT * rT + 1.0, xK = xQt + kT * xT + 1.75;
  const ik3 = 1.1 * 20 / (Math.sqrt(3) * Math.hypot(rK, xK));
  const kappa = 1.02 + 0.98 * Math.exp(-3 * rK / xK);
  const ip = kappa * Math.SQRT2 * ik3;
  close(b2.max.rToX, rK / xK, 1e-9, "R/X");
  close(b2.max.ik3Ka, ik3, 1e-6, "I″k3");
  close(b2.max.ipKa, ip, 1e-6, "ip");
  // Line-to-line with Z2 = Z1: √3/2 of the three-phase current.
  close(b2.max.ik2Ka, Math.sqrt(3) / 2 * b2.max.ik3Ka, 1e-6, "I″k2");
  // Minimum: c = 1.0, S″kQ min, line resistance at 80 °C (factor 1.24).
  const zQmin = 1.0 * 110 ** 2 / 1500 * (20 / 110) ** 2;
  const xQmin = zQmin / Math.sqrt(1.01), rQmin = 0.1 * xQmin;
  const ik3min = 1.0 * 20 /
    (Math.sqrt(3) * Math.hypot(rQmin + kT * rT + 1.24, xQmin + kT * xT + 1.75));
  close(b2.min.ik3Ka, ik3min, 1e-6, "I″k3 min");
});

Deno.test("studyFaults() gives the three-phase current for a line-to-earth fault when Z0 = Z1", async () => {
  // Zero sequence made equal to the positive: source X0/X1 = 1 and R0/X0 = R/X; transformer
  // uk0 = uk (its resistance is the same in both); line Z0 = Z1; solid earthing throughout.
  const form = await formOfTables(
    network({ uk0: 12, x0ToX1: 1, r0ToX0: 0.1, lineR0: 0.2, lineX0: 0.35 }),
  );
  const f = studyFaults(form, S, 1);
  for (const b of f.buses.filter((x) => x.vnKv === 20)) {
    close(b.max.ik1Ka!, b.max.ik3Ka, 1e-9, `I″k1 at ${b.id}`);
    // And the earth current of a double line-to-earth fault, 3E|Z2|/|3Z1²| = E/|Z1| too.
    close(b.max.ikE2EKa!, b.max.ik3Ka, 1e-9, `I″kE2E at ${b.id}`);
  }
});

Deno.test("studyFaults() sees no earth path through a Dyn transformer from its delta side", async () => {
  // 20/0.4 kV Dyn11 with a solidly earthed LV star; the 20 kV network feeder is isolated.
  const files = {
    "buses.csv": "id,nominal_voltage [kV],feeder\nMV,20,\nLVB,0.4,\nA,0.4,N\nB,0.4,N\n",
    "grid_sources.csv":
      "id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],earthing\nQ,MV,20,250,200,isolated\n",
    "transformers.csv":
      "id,hv_bus,lv_bus,rated_power [MVA],hv_voltage [kV],lv_voltage [kV],sc_voltage [%],load_losses [kW],zero_seq_sc_voltage [%],vector_group,lv_earthing\n" +
      "T,MV,LVB,0.63,20,0.4,6,6.5,5.7,Dyn11,solid\n",
    "line_types.csv":
      "id,construction,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],c0 [uF/km],ampacity [A]\nC,cable,0.206,0.08,0.824,0.32,0.3,275\n",
    "lines.csv": "id,from,to,type,length [km]\nL,A,B,C,0.2\n",
    "switches.csv": "id,from,to,kind,heads_feeder\nCB,LVB,A,breaker,N\n",
  };
  const form = await formOfTables(files);
  const f = studyFaults(form, S, 1);
  const mv = f.buses.find((b) => b.id === "MV")!, lvb = f.buses.find((b) => b.id === "LVB")!;
  // The MV side has no zero-sequence path: no earth-fault current, the capacitive one instead
  // (no MV lines in this feeder, so zero).
  assertEquals(mv.max.ik1Ka, null);
  assertEquals(mv.capacitiveEarthFaultA, 0);
  // The LV side is earthed through the transformer: ZT0 alone closes the zero sequence.
  assert(lvb.max.ik1Ka !== null && lvb.max.ik1Ka > 0);
  // LV capacitive current of the cable: √3·0.4 kV·ω·C0·l = √3·400·2π·50·0.3e-6·0.2 A, for an
  // earthed LV it is not reported.
  assertEquals(lvb.capacitiveEarthFaultA, null);
});

Deno.test("studyFaults() adds exactly a converter's current limit at its own bus", async () => {
  const files = network({
    generator:
      "id,bus,kind,rated_power [kVA],active_power [kW],fault_current_limit [pu]\nPV,B2,converter,2000,1800,1.2\n",
  });
  const form = await formOfTables(files);
  const f = studyFaults(form, S, 1);
  const b2 = f.buses.find((b) => b.id === "B2")!;
  // 1.2 × rated current: 1.2 · 2 MVA / (√3 · 20 kV).
  const limitKa = 1.2 * 2 / (Math.sqrt(3) * 20);
  close(b2.max.ik3Ka - b2.maxWithoutGeneration.ik3Ka, limitKa, 1e-9, "added current");
  close(b2.generationIncreasePercent, 100 * limitKa / b2.maxWithoutGeneration.ik3Ka, 1e-5, "rise");
  // Minimum currents leave generation out by default.
  assert(b2.min.ik3Ka < b2.maxWithoutGeneration.ik3Ka);
});

Deno.test("studyFaults() O(n) tree method equals the full impedance matrix on random feeders", async () => {
  let compared = 0;
  for (let seed = 1; compared < 25 && seed < 200; seed++) {
    const r = generateRandomFeeder(seed, { topology: "radial" });
    const form = await formOfTables({ ...r.files });
    const a = studyFaults(form, S, 1), b = studyFaults(form, S, 1, "matrix");
    for (let k = 0; k < form.nBus; k++) {
      for (const cond of ["max", "maxWithoutGeneration", "min"] as const) {
        const x = a.buses[k]![cond], y = b.buses[k]![cond];
        close(x.ik3Ka, y.ik3Ka, 1e-9, `seed ${seed} bus ${k} ${cond} I″k3`);
        close(x.ik2Ka, y.ik2Ka, 1e-9, `seed ${seed} bus ${k} ${cond} I″k2`);
        assertEquals(x.ik1Ka === null, y.ik1Ka === null);
        if (x.ik1Ka !== null) close(x.ik1Ka, y.ik1Ka!, 1e-9, `seed ${seed} bus ${k} ${cond} I″k1`);
      }
    }
    compared++;
  }
  assertEquals(compared, 25);
});

Deno.test("studyFaults() leaves out a meshed feeder above the matrix size limit, with a warning", async () => {
  const forms = (await validateFleet(memorySource(TWO_FEEDERS))).value.forms;
  const meshed = forms.find((f) => f.meshed)!;
  const solved = studyFaults(meshed, S, 1);
  assert(solved.buses.length === meshed.nBus && solved.diagnostics.length === 0);
  const limited = studyFaults(meshed, { ...S, meshedMaxBuses: 2 }, 1);
  assertEquals(limited.buses, []);
  assertEquals(limited.diagnostics.map((d) => [d.code, d.severity]), [[
    "fault.too_large",
    "warning",
  ]]);
});
