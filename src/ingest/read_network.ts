/**
 * Reads a network folder: every table of the format, streamed from disk, validated.
 * Returns the validated rows of each table; nothing is dropped silently.
 */
import { join } from "node:path";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { type CsvResult, type CsvRow, parseCsvText, streamCsvFile } from "./csv_rows.ts";
import { readTableRows, type TableResult } from "./read_table.ts";
import type { TableSpec } from "./table_kit.ts";
import * as net from "./tables_network.ts";
import * as dev from "./tables_devices.ts";
import * as plan from "./tables_planning.ts";

export const TABLES = {
  settings: net.settingsTable,
  buses: net.busTable,
  gridSources: net.gridSourceTable,
  lineTypes: net.lineTypeTable,
  lineTypeMatrix: net.lineTypeMatrixTable,
  conductors: net.conductorTable,
  lineGeometry: net.lineGeometryTable,
  lines: net.lineTable,
  transformers: net.transformerTable,
  switches: net.switchTable,
  loads: dev.loadTable,
  shunts: dev.shuntTable,
  generators: dev.generatorTable,
  reactiveCurves: dev.reactiveCurveTable,
  relayStages: dev.relayStageTable,
  fuseCurves: dev.fuseCurveTable,
  generationQueue: plan.generationQueueTable,
  generationForecast: plan.generationForecastTable,
} as const;

type Tables = typeof TABLES;
type RowOf<S> = S extends TableSpec<infer _U, infer T> ? T : never;

/** Validated rows of every table of a network folder. */
export type NetworkTables = { readonly [K in keyof Tables]: TableResult<RowOf<Tables[K]>> };

export interface ReadNetworkResult {
  readonly value: NetworkTables;
  readonly diagnostics: readonly Diagnostic[];
}

/** Source of table text: the file system, or an in-memory map in tests. */
export type TableSource = (file: string) => Promise<CsvResult | undefined>;

/** Reads tables from a folder on disk; an absent file gives undefined. */
export function folderSource(dir: string): TableSource {
  return async (file) => {
    const rows: CsvRow[] = [];
    try {
      const problems = await streamCsvFile(join(dir, file), (r) => rows.push(r));
      return { rows, problems };
    } catch (e) {
      if (e instanceof Deno.errors.NotFound) return undefined;
      throw e;
    }
  };
}

/** Reads and validates every table. Missing required tables are errors. */
export async function readNetworkTables(source: TableSource): Promise<ReadNetworkResult> {
  const diagnostics: Diagnostic[] = [];
  const value: Record<string, TableResult<unknown>> = {};
  for (
    const [key, spec] of Object.entries(TABLES) as [keyof Tables, TableSpec<string, unknown>][]
  ) {
    let csv: CsvResult | undefined;
    let unreadable = false;
    try {
      csv = await source(spec.file);
    } catch (e) {
      diagnostics.push(makeDiagnostic(
        "table.unreadable",
        "error",
        e instanceof TypeError
          ? `Cannot read ${spec.file}: it is not valid UTF-8 text (save the export as UTF-8)`
          : `Cannot read ${spec.file}: ${e instanceof Error ? e.message : String(e)}`,
        { at: { file: spec.file } },
      ));
      csv = undefined;
      unreadable = true;
    }
    if (csv === undefined) {
      if (spec.required && !unreadable) {
        diagnostics.push(makeDiagnostic(
          "table.missing",
          "error",
          `The network folder lacks the required table ${spec.file}`,
          { at: { file: spec.file }, expected: `a file ${spec.file}` },
        ));
      }
      value[key] = emptyTable(spec.file, spec.required);
      continue;
    }
    for (const p of csv.problems) {
      diagnostics.push(
        makeDiagnostic("csv.quote", "error", `Cannot read ${spec.file}: ${p.message}`, {
          at: { file: spec.file, line: p.line },
        }),
      );
    }
    const result = readTableRows(spec, csv.rows);
    diagnostics.push(...result.diagnostics);
    value[key] = result;
  }
  return { value: value as unknown as NetworkTables, diagnostics };
}

function emptyTable(file: string, broken: boolean): TableResult<never> {
  return {
    file,
    present: false,
    rows: [],
    rejected: [],
    columns: [],
    headerBroken: broken,
    diagnostics: [],
  };
}

/** Tables held in memory as CSV text, by file name (tests, generated fleets). */
export function memorySource(files: Readonly<Record<string, string>>): TableSource {
  return async (file) => {
    const text = files[file];
    return text === undefined ? undefined : await parseCsvText(text);
  };
}
