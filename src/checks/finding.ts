/**
 * Findings: what a study concludes about a feeder, one record per crossed or approached
 * limit. Plain data, stable codes of our own (docs/findings.md), sortable for stable output.
 */

export type FindingSeverity = "violation" | "warning" | "info";

export interface FindingPlace {
  readonly kind: "bus" | "branch" | "feeder";
  readonly id: string;
}

export interface Finding {
  readonly feederId: string;
  readonly code: string;
  readonly severity: FindingSeverity;
  readonly where: FindingPlace;
  /** The value found and the limit it is compared with, in `unit`. */
  readonly value: number;
  readonly limit: number;
  readonly unit: string;
  /** Study case the finding belongs to. */
  readonly caseId: string;
  readonly message: string;
}

const SEVERITY_ORDER: Record<FindingSeverity, number> = { violation: 0, warning: 1, info: 2 };

/** Stable order: feeder, case, severity, code, place. */
export function compareFindings(a: Finding, b: Finding): number {
  return cmp(a.feederId, b.feederId) || cmp(a.caseId, b.caseId) ||
    SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity] || cmp(a.code, b.code) ||
    cmp(a.where.id, b.where.id);
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
