/**
 * Findings of the short-circuit study: breaking and making duty of every switching device
 * with a rating against the largest current it must interrupt or make (maximum condition,
 * generation in service), and the rise of each bus's maximum three-phase current that the
 * generation causes (a screening criterion; common practice 10 %).
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import type { FaultStudy } from "../solve/study_faults.ts";
import type { Finding } from "./finding.ts";

export function checkFaults(form: FeederForm, study: FaultStudy, s: FaultSettings): Finding[] {
  const out: Finding[] = [];
  const base = { feederId: form.feederId, caseId: "faults-max" };
  for (const d of study.devices) {
    const duty = 1000 * d.dutyKa, peak = 1000 * d.peakKa;
    if (d.breakingCurrentA !== null && d.breakingCurrentA > 0) {
      const percent = 100 * duty / d.breakingCurrentA;
      if (percent > s.dutyWarnPercent) {
        const over = percent > 100;
        out.push({
          ...base,
          code: over ? "fault.breaking_duty" : "fault.breaking_duty_near",
          severity: over ? "violation" : "warning",
          where: { kind: "branch", id: d.id },
          value: percent,
          limit: over ? 100 : s.dutyWarnPercent,
          unit: "%",
          message: `Device "${d.id}" may have to interrupt ${d.dutyKa.toFixed(2)} kA (${
            d.forwardKa >= d.reverseKa ? "fed from the source side" : "fed back by generation"
          }), ${percent.toFixed(0)} % of its ${
            (d.breakingCurrentA / 1000).toFixed(1)
          } kA breaking current`,
        });
      }
    }
    if (d.makingCurrentA !== null && d.makingCurrentA > 0 && peak > d.makingCurrentA) {
      out.push({
        ...base,
        code: "fault.making_duty",
        severity: "violation",
        where: { kind: "branch", id: d.id },
        value: 100 * peak / d.makingCurrentA,
        limit: 100,
        unit: "%",
        message: `Device "${d.id}" may have to make a peak of ${
          d.peakKa.toFixed(2)
        } kA, above its ${(d.makingCurrentA / 1000).toFixed(1)} kA making current`,
      });
    }
  }
  for (const b of study.buses) {
    if (b.generationIncreasePercent > s.generationIncreaseLimitPercent) {
      out.push({
        ...base,
        code: "fault.generation_increase",
        severity: "warning",
        where: { kind: "bus", id: b.id },
        value: b.generationIncreasePercent,
        limit: s.generationIncreaseLimitPercent,
        unit: "%",
        message: `Generation raises the maximum three-phase fault current at bus "${b.id}" by ${
          b.generationIncreasePercent.toFixed(1)
        } % to ${b.max.ik3Ka.toFixed(2)} kA`,
      });
    }
  }
  return out;
}
