/**
 * `protection.csv`: the relay settings of every directional protection scheme proposed in
 * the run, one row per graded relay stage, before and after. A screening proposal: the
 * caution in the `#` lines says that a licensed protection engineer must verify it.
 */
import type { FeederFile } from "./feeder_file.ts";
import { type CsvProvenance, csvRows, provenanceLines } from "./run_files.ts";

export const PROTECTION_COLUMNS = [
  "feeder",
  "need",
  "device",
  "relay",
  "stage",
  "characteristic",
  "direction_before",
  "direction",
  "pickup_before_a",
  "pickup_a",
  "time_multiplier_before",
  "time_multiplier",
] as const;

export function protectionCsvHead(p: CsvProvenance): string {
  return provenanceLines("proposed protection settings", p, [
    "Protection settings here are a screening proposal, to be verified by a licensed protection engineer before any relay is set",
  ]) + PROTECTION_COLUMNS.join(",") + "\n";
}

export function protectionCsvRows(file: FeederFile): string {
  const rows = (file.needs ?? []).flatMap((n) =>
    (n.remedy?.protectionSettings ?? []).map((s) => [
      file.feederId,
      n.kind,
      s.device,
      s.relay,
      s.stage,
      s.characteristic,
      s.before.direction,
      s.direction,
      s.before.pickupA,
      Math.round(s.pickupA * 1000) / 1000,
      s.before.timeMultiplier,
      s.timeMultiplier,
    ])
  );
  if (rows.length === 0) return "";
  return csvRows(PROTECTION_COLUMNS, rows);
}
