/**
 * Needs: what a feeder needs, derived from its findings, with the evidence, the remedy
 * that removes it (checked by re-solving the feeder with the remedy applied), its
 * indicative cost and the generation capacity it unlocks. Plain data; the ranking stage
 * orders them across the fleet.
 */
import type { FindingPlace } from "../checks/finding.ts";
import type { ProposedSetting } from "../solve/design_directional_scheme.ts";

/**
 * Severity classes, most urgent first: safety and protection; statutory voltage and
 * thermal limits; planning limits (generation-caused voltage change); hosting-capacity
 * shortfall. NEED_CLASSES gives the default order.
 */
export type NeedClass = "safety" | "statutory" | "planning" | "hosting";
export const NEED_CLASSES: readonly NeedClass[] = ["safety", "statutory", "planning", "hosting"];

export type NeedKind =
  | "overvoltage"
  | "undervoltage"
  | "voltage_change"
  | "line_overload"
  | "transformer_overload"
  | "device_overload"
  | "device_duty"
  | "protection_direction"
  | "protection_grading"
  | "hosting_shortfall"
  | "post_fault_recovery";

/** One finding behind a need, reduced to what the evidence needs. */
export interface NeedEvidence {
  readonly code: string;
  readonly caseId: string;
  readonly where: FindingPlace;
  readonly value: number;
  readonly limit: number;
  readonly unit: string;
}

export type RemedyKind =
  | "reactive_mode"
  | "tap_setpoint"
  | "voltage_regulator"
  | "reconductor"
  | "transformer"
  | "switchgear"
  | "protection_scheme"
  | "ride_through"
  | "connection_strategy";

/** A line of a remedy's bill of quantities. */
export interface RemedyItem {
  readonly what: string;
  readonly quantity: number;
  readonly unit: string;
  readonly unitCost: number;
  readonly cost: number;
}

export interface Remedy {
  readonly kind: RemedyKind;
  readonly description: string;
  readonly items: readonly RemedyItem[];
  /** Sum of the items, in the cost table's currency. */
  readonly cost: number;
  /** Growth of the feeder's generation headroom the remedy brings, MW (null: not applicable). */
  readonly capacityUnlockedMw: number | null;
  /** A protection scheme's proposed relay settings, with what they were before. */
  readonly protectionSettings?: readonly ProposedSetting[];
}

/** A remedy that was tried and did not remove the need, and why. */
export interface RemedyTried {
  readonly kind: RemedyKind;
  readonly outcome: string;
}

export interface Need {
  readonly feederId: string;
  /** `<feeder>/<kind>`: one need per kind per feeder. */
  readonly id: string;
  readonly kind: NeedKind;
  readonly needClass: NeedClass;
  /** One sentence: what is wrong, where, how far past the limit. */
  readonly summary: string;
  /** The worst finding: largest excess over its limit. */
  readonly worst: NeedEvidence;
  /** Excess of the worst finding over its limit, % of the limit. */
  readonly excessPercent: number;
  readonly evidence: readonly NeedEvidence[];
  /** Customers at the buses, or beyond the branches, the need touches. */
  readonly customers: number;
  /** The cheapest remedy that removes the need, or null when none in the catalogue does. */
  readonly remedy: Remedy | null;
  readonly tried: readonly RemedyTried[];
}

/**
 * How much the feeder's connected generation could grow, in the same places and
 * proportions, before the first limit is crossed, in the case with the most generation.
 */
export interface DgHeadroom {
  readonly caseId: string;
  /** Generation fed in by that case as studied, MW. */
  readonly connectedMw: number;
  /** Largest multiple of that generation within every limit (capped at the search range). */
  readonly factor: number;
  /** (factor − 1) · connectedMw: negative when the connected generation already crosses a limit. */
  readonly headroomMw: number;
  /** The limit crossed just beyond the factor (null when the search range was reached). */
  readonly binding: { readonly code: string; readonly where: FindingPlace } | null;
}

/** A need in the fleet ranking. */
export interface RankedNeed extends Need {
  readonly rank: number;
  /** Benefit points: weighted customers, capacity unlocked and excess (docs/ranking.md). */
  readonly benefit: number;
  /** Benefit per 1,000 of cost (null without a remedy). */
  readonly benefitPerCost: number | null;
  /** The value the order is built on (weighted method), or benefitPerCost (class-first). */
  readonly score: number;
}
