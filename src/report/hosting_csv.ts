/**
 * `hosting.csv`: the hosting capacity of every bus of the run for every reactive-power
 * strategy, what binds it and where, and what the capacity costs elsewhere (reactive power
 * the substation supplies more, change in losses). One row per feeder, bus and strategy,
 * written a feeder at a time like faults.csv.
 */
import type { FeederFile } from "./feeder_file.ts";
import { type CsvProvenance, csvRows, provenanceLines } from "./run_files.ts";

export const HOSTING_COLUMNS = [
  "feeder",
  "bus",
  "strategy",
  "capacity_kw",
  "binding_criterion",
  "binding_code",
  "binding_where",
  "source_q_shift_kvar",
  "losses_change_kw",
  "screened_kw",
] as const;

export function hostingCsvHead(p: CsvProvenance): string {
  return provenanceLines("hosting capacity per bus and reactive-power strategy", p) +
    HOSTING_COLUMNS.join(",") + "\n";
}

/** The rows of one feeder (none when its file holds no hosting study). */
export function hostingCsvRows(file: FeederFile): string {
  const h = file.hosting;
  if (h === undefined || h === null || h.buses.length === 0) return "";
  return csvRows(
    HOSTING_COLUMNS,
    h.buses.map((b) => [
      file.feederId,
      b.bus,
      b.strategy,
      b.capacityKw,
      b.criterion,
      b.code,
      b.where.id,
      b.sourceQShiftKvar,
      b.lossesChangeKw,
      b.screenedKw,
    ]),
  );
}

export const QUEUE_COLUMNS = [
  "feeder",
  "position",
  "application",
  "bus",
  "size_kw",
  "unit_kind",
  "strategy",
  "verdict",
  "upgrade",
  "alternative_strategy",
  "binding_criterion",
  "binding_code",
  "binding_where",
] as const;

/** `queue.csv`: every generation application, in queue order per feeder, with its verdict. */
export function queueCsvHead(p: CsvProvenance): string {
  return provenanceLines("generation applications checked in queue order", p) +
    QUEUE_COLUMNS.join(",") + "\n";
}

export function queueCsvRows(file: FeederFile): string {
  const q = file.hosting?.queue;
  if (q === undefined || q.length === 0) return "";
  return csvRows(
    QUEUE_COLUMNS,
    q.map((r) => [
      file.feederId,
      r.position,
      r.application,
      r.bus,
      r.sizeKw,
      r.kind,
      r.strategy,
      r.verdict,
      r.upgrade,
      r.alternative,
      r.criterion,
      r.code,
      r.where?.id ?? null,
    ]),
  );
}
