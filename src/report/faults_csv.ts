/**
 * `faults.csv`: the headline short-circuit figures of every bus of the run, one row per
 * feeder and bus, kA unless the column says otherwise. Written a feeder at a time: the
 * provenance lines and header first (faultsCsvHead), then each feeder's rows.
 */
import type { FeederFile } from "./feeder_file.ts";
import { type CsvProvenance, csvRows, provenanceLines } from "./run_files.ts";

export const FAULT_COLUMNS = [
  "feeder",
  "bus",
  "nominal_kv",
  "ik3_max_ka",
  "ik3_max_without_generation_ka",
  "generation_increase_percent",
  "ik2_max_ka",
  "ik1_max_ka",
  "ike2e_max_ka",
  "ip_max_ka",
  "r_to_x_max",
  "ik3_min_ka",
  "ik2_min_ka",
  "ik1_min_ka",
  "capacitive_earth_fault_a",
] as const;

export function faultsCsvHead(p: CsvProvenance): string {
  return provenanceLines("short-circuit currents (IEC 60909-0)", p) + FAULT_COLUMNS.join(",") +
    "\n";
}

/** The rows of one feeder (none when its file holds no fault study). */
export function faultsCsvRows(file: FeederFile): string {
  const f = file.faults;
  if (f === undefined || f === null || f.buses.length === 0) return "";
  const rows = f.buses.map((b) => [
    file.feederId,
    b.id,
    b.vnKv,
    b.max.ik3Ka,
    b.maxWithoutGeneration.ik3Ka,
    b.generationIncreasePercent,
    b.max.ik2Ka,
    b.max.ik1Ka,
    b.max.ikE2EKa,
    b.max.ipKa,
    b.max.rToX,
    b.min.ik3Ka,
    b.min.ik2Ka,
    b.min.ik1Ka,
    b.capacitiveEarthFaultA,
  ]);
  return csvRows(FAULT_COLUMNS, rows);
}
