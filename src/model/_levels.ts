/** Small shared rules of the model stage: voltage levels and earthing records. */
import type { RejectedRow } from "../ingest/read_table.ts";
import type { Earthing, EarthingKind } from "./network.ts";

/** Relative difference above which two nominal voltages are taken as different levels. */
export const VOLTAGE_LEVEL_TOLERANCE = 0.05;
/** Relative difference between a transformer winding and its bus's nominal voltage. */
export const WINDING_TOLERANCE = 0.15;

export function sameLevel(a: number, b: number, tolerance: number): boolean {
  return Math.abs(a - b) <= tolerance * Math.max(Math.abs(a), Math.abs(b));
}

export function earthing(kind: EarthingKind, rOhm: number, xOhm: number): Earthing {
  return { kind, rOhm, xOhm };
}

/** Non-empty values of a column over rejected rows. */
export function rejectedIds(rows: readonly RejectedRow[], column: string): string[] {
  return rows.map((r) => r.cells[column] ?? "").filter((x) => x !== "");
}
