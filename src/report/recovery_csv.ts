/**
 * `recovery.csv`: the faults after which something happens — generation trips or stops
 * injecting, motors stall, a bus stays low, a branch overloads, the feeder collapses — one
 * row per feeder and fault (worst first, up to recovery.maxFaultsListed per feeder), written a
 * feeder at a time like faults.csv.
 */
import type { FeederFile } from "./feeder_file.ts";
import { type CsvProvenance, csvRows, provenanceLines } from "./run_files.ts";

export const RECOVERY_COLUMNS = [
  "feeder",
  "fault_bus",
  "fault_type",
  "condition",
  "clearing_s",
  "cleared_by",
  "isolated_buses",
  "generation_tripped_kw",
  "generation_ceased_kw",
  "generation_tripped_after_kw",
  "units_tripped",
  "motor_loads_stalled",
  "post_fault_v_min_pu",
  "post_fault_v_min_bus",
  "buses_below_threshold",
  "collapsed",
  "overloaded_branches",
] as const;

export function recoveryCsvHead(p: CsvProvenance): string {
  return provenanceLines("recovery after faults (ride-through, motor stall, post-fault state)", p) +
    RECOVERY_COLUMNS.join(",") + "\n";
}

export function recoveryCsvRows(file: FeederFile): string {
  const r = file.recovery;
  if (r === undefined || r === null || r.faults.length === 0) return "";
  return csvRows(
    RECOVERY_COLUMNS,
    r.faults.map((o) => [
      file.feederId,
      o.bus,
      o.type,
      o.condition,
      o.clearingS,
      o.clearedBy,
      o.isolatedBuses,
      o.trippedKw,
      o.ceasedKw,
      o.trippedLaterKw,
      [...o.tripped, ...o.trippedLater].join(" "),
      o.stalled.join(" "),
      o.vMinPu,
      o.vMinBus,
      o.belowThreshold,
      o.collapsed ? "yes" : "no",
      o.overloads.map((x) => `${x.branch}:${x.percent}%`).join(" "),
    ]),
  );
}
