/**
 * The voltage band that applies to a bus, by its nominal voltage, and where a voltage sits
 * in it: the deviation from 1 pu as a share of the allowed deviation on that side
 * (−1 at the lower limit, +1 at the upper one).
 */
import type { VoltageRange } from "../checks/check_options.ts";
import type { ReportContext } from "./report_context.ts";

export type VoltageLevel = "mv" | "lv";

export function voltageLevelOf(vnKv: number, limits: ReportContext["limits"]): VoltageLevel {
  return vnKv <= limits.lvMaxKv ? "lv" : "mv";
}

export function bandOf(vnKv: number, limits: ReportContext["limits"]): VoltageRange {
  return limits.voltageBand[voltageLevelOf(vnKv, limits)];
}

/** (v − 1)/(1 − vMin) below 1 pu, (v − 1)/(vMax − 1) above. */
export function bandShare(vPu: number, band: VoltageRange): number {
  const d = vPu - 1;
  if (d < 0) return band.vMinPu < 1 ? d / (1 - band.vMinPu) : -Infinity;
  if (d > 0) return band.vMaxPu > 1 ? d / (band.vMaxPu - 1) : Infinity;
  return 0;
}
