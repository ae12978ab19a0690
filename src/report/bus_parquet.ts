/**
 * buses.parquet: one row per (feeder, case, bus) of a study run, for analysts who load a
 * whole fleet's bus results into a data-frame or SQL engine. Feeders are added one at a
 * time and row groups are written as they fill, so memory holds one row group, not the
 * fleet. Columns and units: docs/parquet.md.
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

/** The columns of buses.parquet, in file order. */
export const BUS_PARQUET_COLUMNS: readonly ParquetColumnSpec[] = [
  { name: "feeder", type: "STRING", nullable: false },
  { name: "case", type: "STRING", nullable: false },
  { name: "bus", type: "STRING", nullable: false },
  { name: "nominal_kv", type: "DOUBLE", nullable: false },
  { name: "distance_km", type: "DOUBLE", nullable: false },
  { name: "v_pu", type: "DOUBLE", nullable: false },
  { name: "angle_deg", type: "DOUBLE", nullable: false },
  { name: "dg_change_percent", type: "DOUBLE", nullable: true },
  { name: "rp_part_percent", type: "DOUBLE", nullable: true },
  { name: "xq_part_percent", type: "DOUBLE", nullable: true },
];

/**
 * Starts buses.parquet; its bytes go to `sink` in order. In the CLI, a file's writable
 * stream makes a sink that writes every byte (FsFile.write alone may write part of a chunk):
 *
 *     const out = file.writable.getWriter();
 *     const buses = createBusParquetWriter(meta, (chunk) => out.write(chunk));
 *     for (const f of feederFilesInIdOrder) await buses.addFeeder(f);
 *     await buses.finish();
 *     await out.close();
 */
export function createBusParquetWriter(
  meta: ParquetProvenance,
  sink: ByteSink,
  options: FeederParquetOptions = {},
): FeederParquetWriter {
  return createFeederParquetWriter(
    "buses",
    BUS_PARQUET_COLUMNS,
    (c) => c.buses,
    (feeder, caseId, b) => [
      feeder,
      caseId,
      b.id,
      b.vnKv,
      b.distanceKm,
      b.vPu,
      b.angleDeg,
      b.dgChangePercent,
      b.rpPercent,
      b.xqPercent,
    ],
    meta,
    sink,
    options,
  );
}
