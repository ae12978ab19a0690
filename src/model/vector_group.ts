/** Transformer vector groups: winding connections and clock number (IEC 60076-1 notation). */
import type { VectorGroup, WindingConnection } from "./network.ts";

const PATTERN = /^(D|Y|YN|Z|ZN)(d|y|yn|z|zn)(\d{1,2})$/;

/** Parses "Dyn11" into its parts; undefined when the text is not a vector group. */
export function parseVectorGroup(text: string): VectorGroup | undefined {
  const m = PATTERN.exec(text.trim());
  if (!m) return undefined;
  const clock = Number(m[3]);
  if (clock > 11) return undefined;
  // Star and delta windings: like connections shift by even clock numbers, unlike ones by
  // odd numbers (IEC 60076-1 vector groups; common practice). Zigzag windings allow both.
  const hvStar = m[1]!.startsWith("Y"), lvStar = m[2]!.startsWith("y");
  const hvDelta = m[1] === "D", lvDelta = m[2] === "d";
  const like = (hvStar && lvStar) || (hvDelta && lvDelta);
  const unlike = (hvStar && lvDelta) || (hvDelta && lvStar);
  if ((like && clock % 2 === 1) || (unlike && clock % 2 === 0)) return undefined;
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
