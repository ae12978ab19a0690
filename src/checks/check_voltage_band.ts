/** Bus voltages of a case against the band of their voltage level. */
import type { FeederForm } from "../model/feeder_form.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import type { CheckLimits } from "./check_options.ts";
import type { Finding } from "./finding.ts";

export function checkVoltageBand(
  form: FeederForm,
  result: LoadFlowResult,
  limits: CheckLimits,
): Finding[] {
  const out: Finding[] = [];
  for (let k = 0; k < form.nBus; k++) {
    const lv = form.vnKv[k]! <= limits.lvMaxKv;
    const band = lv ? limits.voltageBand.lv : limits.voltageBand.mv;
    const v = result.vMagPu[k]!;
    const high = v > band.vMaxPu, low = v < band.vMinPu;
    if (!high && !low) continue;
    const limit = high ? band.vMaxPu : band.vMinPu;
    out.push({
      feederId: form.feederId,
      code: high ? "voltage.above_band" : "voltage.below_band",
      severity: "violation",
      where: { kind: "bus", id: form.busIds[k]! },
      value: v,
      limit,
      unit: "pu",
      caseId: result.caseId,
      message: `Bus "${form.busIds[k]}" at ${v.toFixed(4)} pu is ${high ? "above" : "below"} the ${
        lv ? "LV" : "MV"
      } band limit ${limit} pu`,
    });
  }
  return out;
}
