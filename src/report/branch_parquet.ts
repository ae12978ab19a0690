/**
 * branches.parquet: one row per (feeder, case, branch) of a study run: flows, current and
 * loading of every line, transformer and closed switch. Written like buses.parquet, feeder
 * by feeder, a row group at a time. Columns and units: docs/parquet.md.
 */
import type { ByteSink, ParquetColumnSpec } from "./parquet_table_writer.ts";
import {
  createFeederParquetWriter,
  type FeederParquetOptions,
  type FeederParquetWriter,
  type ParquetProvenance,
} from "./_feeder_parquet.ts";

export type { ByteSink, ParquetTableTotals } from "./parquet_table_writer.ts";
export type {
  FeederParquetOptions,
  FeederParquetWriter,
  ParquetProvenance,
} from "./_feeder_parquet.ts";

/** The columns of branches.parquet, in file order. */
export const BRANCH_PARQUET_COLUMNS: readonly ParquetColumnSpec[] = [
  { name: "feeder", type: "STRING", nullable: false },
  { name: "case", type: "STRING", nullable: false },
  { name: "branch", type: "STRING", nullable: false },
  { name: "kind", type: "STRING", nullable: false },
  { name: "from_bus", type: "STRING", nullable: false },
  { name: "to_bus", type: "STRING", nullable: false },
  { name: "p_from_kw", type: "DOUBLE", nullable: false },
  { name: "q_from_kvar", type: "DOUBLE", nullable: false },
  { name: "p_to_kw", type: "DOUBLE", nullable: false },
  { name: "q_to_kvar", type: "DOUBLE", nullable: false },
  { name: "i_a", type: "DOUBLE", nullable: false },
  { name: "loading_percent", type: "DOUBLE", nullable: false },
];

export function createBranchParquetWriter(
  meta: ParquetProvenance,
  sink: ByteSink,
  options: FeederParquetOptions = {},
): FeederParquetWriter {
  return createFeederParquetWriter(
    "branches",
    BRANCH_PARQUET_COLUMNS,
    (c) => c.branches,
    (feeder, caseId, b) => [
      feeder,
      caseId,
      b.id,
      b.kind,
      b.from,
      b.to,
      b.pFromKw,
      b.qFromKvar,
      b.pToKw,
      b.qToKvar,
      b.iA,
      b.loadingPercent,
    ],
    meta,
    sink,
    options,
  );
}
