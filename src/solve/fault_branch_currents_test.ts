/**
 * Branch currents for one fault: the path from the source carries the whole fault current
 * on a feeder without generation (Kirchhoff), and on random feeders with machines and
 * converters every line's current equals (ΔV_from − ΔV_to)/z with ΔV from the full
 * impedance matrix (Gauss–Jordan inversion), within 1e-9 relative.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { formOfTables, twoBusFeeder } from "../../tests/fixtures/small_feeders.ts";
import { generateRandomFeeder } from "../../tests/fixtures/random_feeders.ts";
import { BRANCH_LINE } from "../model/feeder_form.ts";
import { DEFAULT_FAULT_SETTINGS } from "./fault_settings.ts";
import { branchCurrentsForFault, prepareFaultModel } from "./fault_branch_currents.ts";
import { denseImpedance, studyFaults } from "./study_faults.ts";

const S = DEFAULT_FAULT_SETTINGS;

Deno.test("branchCurrentsForFault() carries the whole fault current along the path when nothing else feeds it", async () => {
  const form = await formOfTables(twoBusFeeder({ rOhm: 2, xOhm: 3 }));
  const model = prepareFaultModel(form, S, 1, "max")!;
  const k = form.busIds.indexOf("B2");
  const r = branchCurrentsForFault(model, k, "three_phase");
  const study = studyFaults(form, S, 1);
  assert(Math.abs(r.faultKa - study.buses[k]!.max.ik3Ka) < 1e-12);
  for (let b = 0; b < form.nBranch; b++) {
    assert(Math.abs(r.iKa[b]! - r.faultKa) < 1e-12 * r.faultKa, `branch ${form.branchIds[b]}`);
    assertEquals(r.direction[b], 1);
  }
});

Deno.test("branchCurrentsForFault() shows generation feeding back through the branches beyond the fault", async () => {
  const files = twoBusFeeder({
    rOhm: 2,
    xOhm: 3,
    generatorRow: "5000,4000,0.15",
    generatorHeader: "id,bus,kind,rated_power [kVA],active_power [kW],xd_subtransient [pu]",
  });
  files["generators.csv"] = files["generators.csv"]!.replace("converter", "synchronous");
  const form = await formOfTables(files);
  const model = prepareFaultModel(form, S, 1, "max")!;
  // A fault at B1: the line B1–B2 carries the generator's current towards the source.
  const b1 = form.busIds.indexOf("B1"), line = form.branchIds.indexOf("L");
  const r = branchCurrentsForFault(model, b1, "three_phase");
  assertEquals(r.direction[line], -1);
  assert(r.iKa[line]! > 0);
});

Deno.test("branchCurrentsForFault() equals the full impedance matrix on random feeders", async () => {
  let compared = 0;
  for (let seed = 300; compared < 15 && seed < 500; seed++) {
    const form = await formOfTables({
      ...generateRandomFeeder(seed, { topology: "radial" }).files,
    });
    const model = prepareFaultModel(form, S, 1, "max")!;
    const n = form.nBus, nets = model.nets;
    const d1 = denseImpedance(form, nets.z1Re, nets.z1Im, nets.y1Re, nets.y1Im);
    for (let k = 1; k < n; k += 3) {
      const r = branchCurrentsForFault(model, k, "three_phase");
      // ΔV = Z·J − Z(:,k)·I with J in the phase that adds at k, I = (c + Σ|Zkj|·Ij)/Zkk.
      let e = nets.c[k]!;
      const jRe = new Float64Array(n), jIm = new Float64Array(n);
      nets.converterBus.forEach((j, i) => {
        const zr = d1.re[k * n + j]!, zi = d1.im[k * n + j]!, z = Math.hypot(zr, zi);
        jRe[j] = jRe[j]! + nets.converterIPu[i]! * zr / z;
        jIm[j] = jIm[j]! - nets.converterIPu[i]! * zi / z;
        e += z * nets.converterIPu[i]!;
      });
      const zkr = d1.re[k * n + k]!, zki = d1.im[k * n + k]!, zk2 = zkr * zkr + zki * zki;
      const ir = e * zkr / zk2, ii = -e * zki / zk2;
      const dv = (u: number) => {
        let vr = -(d1.re[u * n + k]! * ir - d1.im[u * n + k]! * ii);
        let vi = -(d1.re[u * n + k]! * ii + d1.im[u * n + k]! * ir);
        for (let j = 0; j < n; j++) {
          vr += d1.re[u * n + j]! * jRe[j]! - d1.im[u * n + j]! * jIm[j]!;
          vi += d1.re[u * n + j]! * jIm[j]! + d1.im[u * n + j]! * jRe[j]!;
        }
        return [vr, vi] as const;
      };
      for (let b = 0; b < n - 1; b++) {
        if (form.branchKind[b] !== BRANCH_LINE) continue;
        const [ar, ai] = dv(form.branchFrom[b]!), [br, bi] = dv(form.branchTo[b]!);
        const zr = nets.z1Re[b]!, zi = nets.z1Im[b]!, z2 = zr * zr + zi * zi;
        const cr = ((ar - br) * zr + (ai - bi) * zi) / z2,
          ci = ((ai - bi) * zr - (ar - br) * zi) / z2;
        const want = Math.hypot(cr, ci) / (Math.sqrt(3) * form.vnKv[b + 1]!);
        const scale = Math.max(want, 1e-3 * r.faultKa);
        assert(
          Math.abs(r.iKa[b]! - want) <= 1e-9 * scale,
          `seed ${seed} fault ${k} branch ${b}: ${r.iKa[b]} vs ${want}`,
        );
      }
    }
    compared++;
  }
  assertEquals(compared, 15);
});

Deno.test("branchCurrentsForFault() gives the residual current of a line-to-earth fault on the path", async () => {
  // One earthed source and a line: the whole fault current returns through earth, so on the
  // path the residual 3·I0 equals the phase current, which equals I″k1.
  const form = await formOfTables(twoBusFeeder({ rOhm: 2, xOhm: 3 }));
  const model = prepareFaultModel(form, S, 1, "max")!;
  const k = form.busIds.indexOf("B2");
  const r = branchCurrentsForFault(model, k, "line_to_earth");
  const study = studyFaults(form, S, 1);
  assert(Math.abs(r.faultKa - study.buses[k]!.max.ik1Ka!) < 1e-12);
  for (let b = 0; b < form.nBranch; b++) {
    assert(Math.abs(r.residualKa[b]! - r.faultKa) < 1e-9 * r.faultKa);
    assert(Math.abs(r.iKa[b]! - r.faultKa) < 1e-9 * r.faultKa);
  }
});
