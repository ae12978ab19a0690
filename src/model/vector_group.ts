/** Transformer vector groups: winding connections and clock number (IEC 60076-1 notation). */
import type { VectorGroup, WindingConnection } from "./network.ts";

const PATTERN = /^(D|Y|YN|Z|ZN)(d|y|yn|z|zn)(\d{1,2})$/;

/** Parses "Dyn11" into its parts; undefined when the text is not a vector group. */
export function parseVectorGroup(text: string): VectorGroup | undefined {
  const m = PATTERN.exec(text.trim());
  if (!m) return undefined;
  const clock = Number(m[3]);
  if (clock > 11) return undefined;
  return {
    hv: m[1] as WindingConnection,
    lv: m[2]!.toUpperCase() as WindingConnection,
    clock,
    text: text.trim(),
  };
}

/** Phase shift of the LV side behind the HV side, degrees (clock × 30°). */
export function phaseShiftDeg(group: VectorGroup): number {
  return group.clock * 30;
}

/** True when a winding lets zero-sequence current flow to earth (earthed star or zigzag). */
export function passesZeroSequence(connection: WindingConnection): boolean {
  return connection === "YN" || connection === "ZN";
}
