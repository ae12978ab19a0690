/** A finding behind a need in words: value and limit in their unit, place and case. */
import type { NeedEvidence } from "../rank/need.ts";
import { formatNumber } from "./_number_text.ts";

/** A value in its unit: pu to 3 decimals, small numbers to 2, large ones whole. */
export function formatValue(v: number, unit: string): string {
  const digits = unit === "pu" ? 3 : Math.abs(v) >= 100 ? 0 : 2;
  return `${formatNumber(v, digits)} ${unit}`;
}

export function evidenceText(e: NeedEvidence): string {
  return `${formatValue(e.value, e.unit)} against ${
    formatValue(e.limit, e.unit)
  } at ${e.where.kind} ` +
    `${e.where.id}, case ${e.caseId}`;
}
