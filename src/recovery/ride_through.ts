/**
 * What a generator does through a voltage dip of a given depth and length: rides through,
 * ceases to inject while the voltage is low (momentary cessation, then resumes), or trips.
 */
import type { RideThroughCategory } from "./recovery_settings.ts";

export type RideThroughOutcome = "rides_through" | "ceases" | "trips";

/** The unit's voltage stays at vPu for seconds (the fault's clearing time). */
export function rideThrough(
  category: RideThroughCategory,
  vPu: number,
  seconds: number,
): RideThroughOutcome {
  for (const p of category.trip) if (vPu < p.vPu && seconds >= p.seconds) return "trips";
  return category.cessationPu !== null && vPu < category.cessationPu ? "ceases" : "rides_through";
}

/**
 * Whether a unit left at vPu after the fault is cleared trips later: the trip points it
 * crosses, whatever their time (the post-fault voltage does not recover by itself within the
 * screen: stalled motors keep it down).
 */
export function tripsLater(category: RideThroughCategory, vPu: number): boolean {
  return category.trip.some((p) => vPu < p.vPu);
}
