/**
 * Voltage change caused by generation: the same demand solved with and without the
 * generation, bus by bus, against the planning limit of the voltage level (default 2 %
 * on MV, 3 % on LV; common practice, REFERENCES.md F).
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import type { CheckLimits } from "./check_options.ts";
import type { Finding } from "./finding.ts";
import type { VoltageChangeParts } from "./voltage_change_parts.ts";

/** Exact change |V| with generation − |V| without, per bus, in %. */
export function voltageChangePercent(
  withDg: LoadFlowResult,
  withoutDg: LoadFlowResult,
): Float64Array {
  const n = withDg.vMagPu.length;
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = 100 * (withDg.vMagPu[k]! - withoutDg.vMagPu[k]!);
  return out;
}

export function checkVoltageChange(
  form: FeederForm,
  caseId: string,
  changePercent: Float64Array,
  parts: VoltageChangeParts,
  limits: CheckLimits,
): Finding[] {
  const out: Finding[] = [];
  for (let k = 0; k < form.nBus; k++) {
    const lv = form.vnKv[k]! <= limits.lvMaxKv;
    const limit = lv ? limits.voltageChange.lvLimitPercent : limits.voltageChange.mvLimitPercent;
    const dU = changePercent[k]!;
    if (Math.abs(dU) <= limit) continue;
    const rp = 100 * parts.rpPu[k]!, xq = 100 * parts.xqPu[k]!;
    out.push({
      feederId: form.feederId,
      code: "voltage.dg_change",
      severity: "violation",
      where: { kind: "bus", id: form.busIds[k]! },
      value: dU,
      limit,
      unit: "%",
      caseId,
      message:
        `Generation changes the voltage of bus "${form.busIds[k]}" by ${
          dU.toFixed(2)
        } % (limit ${limit} %); ` +
        `R·P part ${rp.toFixed(2)} %, X·Q part ${xq.toFixed(2)} %`,
    });
  }
  return out;
}
