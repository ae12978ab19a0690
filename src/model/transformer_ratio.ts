/** Off-nominal turns ratio of a transformer branch at a tap position. */
import type { FormTransformer } from "./feeder_form.ts";

/**
 * Ratio t in pu such that the ideal transformer gives V_to = V_from / t (per unit on each
 * bus's nominal voltage): the winding voltages with the tap applied, each over its bus's
 * nominal voltage. A tap step on the HV side changes the HV winding voltage by
 * (position − neutral)·step; on the LV side, the LV winding voltage.
 */
export function transformerRatio(
  t: Pick<FormTransformer, "hvKv" | "lvKv" | "hvIsFrom" | "tap">,
  position: number,
  vnFromKv: number,
  vnToKv: number,
): number {
  const step = (position - t.tap.neutral) * t.tap.stepPercent / 100;
  const hv = t.tap.side === "hv" ? t.hvKv * (1 + step) : t.hvKv;
  const lv = t.tap.side === "lv" ? t.lvKv * (1 + step) : t.lvKv;
  return t.hvIsFrom ? (hv / vnFromKv) / (lv / vnToKv) : (lv / vnFromKv) / (hv / vnToKv);
}
