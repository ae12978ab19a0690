/**
 * What buses.parquet and branches.parquet share: the provenance written into the footer,
 * and a writer that walks a feeder file's cases and rows in file order and appends them to
 * a Parquet table a row group at a time.
 */
import type { CaseOutcome } from "../pipeline/study_feeder.ts";
import type { FeederFile } from "./feeder_file.ts";
import { CAUTION } from "./run_files.ts";
import {
  type ByteSink,
  createParquetTableWriter,
  type ParquetCell,
  type ParquetColumnSpec,
  type ParquetTableTotals,
} from "./parquet_table_writer.ts";

/** Where a results table came from: written into the file's key–value metadata. */
export interface ParquetProvenance {
  readonly tool: string;
  readonly version: string;
  /** Hash of the run's network input. */
  readonly inputHash: string;
  /** Hash of the run's pipeline configuration. */
  readonly configHash: string;
}

export interface FeederParquetOptions {
  /** Rows per row group; default 100,000 (see DEFAULT_ROW_GROUP_ROWS). */
  readonly rowGroupRows?: number;
}

/** Writes one results table of a run, feeder by feeder. */
export interface FeederParquetWriter {
  /**
   * Appends the rows of one feeder file: its cases in file order, each case's rows in file
   * order (a case without rows, such as one that did not converge, adds none). Call it in
   * sorted feeder order, and await it before the next call to keep memory bounded.
   */
  addFeeder(file: FeederFile): Promise<void>;
  /** Writes the last row group and the footer; resolves once the sink has every byte. */
  finish(): Promise<ParquetTableTotals>;
}

/** About 10 MB of buffered cells for the bus table; 150 groups for 15 million rows. */
export const DEFAULT_ROW_GROUP_ROWS = 100_000;

/** The key–value metadata of a results table, in footer order. */
export function provenanceKeyValue(
  table: string,
  meta: ParquetProvenance,
): { key: string; value: string }[] {
  return [
    { key: "table", value: table },
    { key: "tool", value: meta.tool },
    { key: "tool_version", value: meta.version },
    { key: "input_hash", value: meta.inputHash },
    { key: "config_hash", value: meta.configHash },
    { key: "caution", value: CAUTION },
  ];
}

export function createFeederParquetWriter<Row>(
  table: string,
  columns: readonly ParquetColumnSpec[],
  rowsOf: (c: CaseOutcome) => readonly Row[] | undefined,
  cellsOf: (feederId: string, caseId: string, row: Row) => readonly ParquetCell[],
  meta: ParquetProvenance,
  sink: ByteSink,
  options: FeederParquetOptions,
): FeederParquetWriter {
  const writer = createParquetTableWriter(columns, {
    rowGroupRows: options.rowGroupRows ?? DEFAULT_ROW_GROUP_ROWS,
    keyValue: provenanceKeyValue(table, meta),
    createdBy: `${meta.tool} version ${meta.version}`,
  }, sink);
  return {
    addFeeder(file) {
      for (const c of file.cases) {
        for (const row of rowsOf(c) ?? []) writer.appendRow(cellsOf(file.feederId, c.caseId, row));
      }
      return writer.settled();
    },
    finish: () => writer.finish(),
  };
}
