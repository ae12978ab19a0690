/** A finding behind a need in words: value and limit in their unit, place and case. */
import type { NeedEvidence } from "../rank/need.ts";
import { formatNumber } from "./_number_text.ts";

/** A value in its unit: pu to 3 decimals, % to 2 (1 from 100 up), others to 2 (0 from 100 up). */
export function formatValue(v: number, unit: string): string {
  const large = Math.abs(v) >= 100;
  const digits = unit === "pu" ? 3 : unit === "%" ? (large ? 1 : 2) : large ? 0 : 2;
  return `${formatNumber(v, digits)} ${unit}`;
}

export function evidenceText(e: NeedEvidence): string {
  return `${formatValue(e.value, e.unit)} against ${
    formatValue(e.limit, e.unit)
  } at ${e.where.kind} ` +
    `${e.where.id}, case ${e.caseId}`;
}
