/**
 * Shared state of the model stage: diagnostics, the taint map, connectivity of rows that
 * could not be used, and located bus references. Private to buildNetwork and its helpers.
 */
import type { NetworkTables } from "../ingest/read_network.ts";
import { TABLES } from "../ingest/read_network.ts";
import type { TableResult } from "../ingest/read_table.ts";
import type { TableSpec } from "../ingest/table_kit.ts";
import { type Diagnostic, makeDiagnostic, type SourceLocation } from "./diagnostic.ts";
import { locateField } from "./locate.ts";
import type { Bus, PlaceholderEdge, Taint } from "./network.ts";

export interface BuildContext {
  readonly tables: NetworkTables;
  readonly diagnostics: Diagnostic[];
  readonly busById: ReadonlyMap<string, Bus>;
  readonly placeholderBuses: ReadonlySet<string>;
  readonly placeholderEdges: PlaceholderEdge[];
  /** Marks a bus untrustworthy because of the row at file:line. */
  taintBus(busId: string | undefined, code: string, file: string, line: number): void;
  /** Records an error and taints the buses it concerns. */
  error(code: string, message: string, at: SourceLocation, buses: string[]): void;
  /** Keeps the connection of a row that could not be used. */
  placeholder(id: string | undefined, a: string | undefined, b: string | undefined): void;
  /** Resolves a bus reference; an unknown one is an error located at the referencing cell. */
  refBus(
    what: string,
    file: string,
    line: number,
    field: string,
    id: string,
  ): Bus | undefined;
  /** The taint map as plain data (lower-case bus ids). */
  taintedBuses(): Record<string, Taint[]>;
  /** Header column names per file (kept in the Network for later stages). */
  readonly headers: Readonly<Record<string, readonly string[]>>;
  /** The location of a field on a row, with its CSV column. */
  cellAt(file: string, line: number, field: string): SourceLocation;
}

export function createBuildContext(tables: NetworkTables): BuildContext {
  const headers: Record<string, readonly string[]> = Object.fromEntries(
    (Object.keys(TABLES) as (keyof NetworkTables)[]).map((
      k,
    ) => [tables[k].file, tables[k].columns]),
  );
  const cellAt = (file: string, line: number, field: string) =>
    locateField(headers, { file, line }, field);
  const diagnostics: Diagnostic[] = [];
  const taint = new Map<string, Map<string, Taint>>();
  const taintBus = (busId: string | undefined, code: string, file: string, line: number) => {
    if (busId === undefined || busId === "") return;
    const key = busId.toLowerCase();
    if (!taint.has(key)) taint.set(key, new Map());
    taint.get(key)!.set(`${code}@${file}:${line}`, { code, file, line });
  };
  const error = (code: string, message: string, at: SourceLocation, buses: string[]) => {
    diagnostics.push(makeDiagnostic(code, "error", message, { at }));
    for (const b of buses) taintBus(b, code, at.file, at.line ?? 0);
  };
  /** Connectivity of rows that could not be used, so their feeder is found and set aside. */
  const placeholderEdges: PlaceholderEdge[] = [];
  const placeholder = (id: string | undefined, a: string | undefined, b: string | undefined) => {
    if (a && b) placeholderEdges.push({ id: id ?? "", aBusId: a, bBusId: b });
  };

  // Buses: ids are matched case-insensitively throughout.
  const busById = new Map<string, Bus>();
  for (const { value: r, line } of tables.buses.rows) {
    const bus: Bus = {
      id: r.id,
      vnKv: r.nominal_voltage,
      ...(r.x === undefined ? {} : { xM: r.x }),
      ...(r.y === undefined ? {} : { yM: r.y }),
      customers: r.customers,
      ...(r.feeder === undefined ? {} : { feederHint: r.feeder }),
      ...(r.name === undefined ? {} : { name: r.name }),
      at: { file: tables.buses.file, line },
    };
    busById.set(r.id.toLowerCase(), bus);
  }
  const placeholderBuses = new Set(tables.buses.rejected.map((r) => r.cells.id ?? ""));
  const rejectedBusIds = new Set(
    tables.buses.rejected.map((r) => (r.cells.id ?? "").toLowerCase()),
  );
  /** Checks a bus reference; unknown ones are errors located at the referencing cell. */
  const refBus = (
    what: string,
    file: string,
    line: number,
    field: string,
    id: string,
  ): Bus | undefined => {
    const bus = busById.get(id.toLowerCase());
    if (bus !== undefined) return bus;
    if (rejectedBusIds.has(id.toLowerCase()) || !tables.buses.present) {
      taintBus(id, "ref.rejected", file, line);
      return undefined;
    }
    error(
      "ref.unknown",
      `${what} on line ${line}: ${field} "${id}" is not a bus of ${tables.buses.file}`,
      cellAt(file, line, field),
      [],
    );
    return undefined;
  };

  const ctx: BuildContext = {
    tables,
    diagnostics,
    busById,
    placeholderBuses,
    placeholderEdges,
    taintBus,
    error,
    placeholder,
    refBus,
    headers,
    cellAt,
    taintedBuses() {
      const out: Record<string, Taint[]> = {};
      for (const [k, reasons] of taint) out[k] = [...reasons.values()];
      return out;
    },
  };
  // Rejected rows and broken tables: taint what they name.
  for (
    const [key, spec] of Object.entries(TABLES) as [
      keyof NetworkTables,
      TableSpec<string, unknown>,
    ][]
  ) {
    const t = tables[key] as TableResult<Record<string, unknown>>;
    const rows: readonly { line: number; cells: Readonly<Record<string, unknown>> }[] =
      t.headerBroken
        ? [...t.rejected, ...t.rows.map((r) => ({ line: r.line, cells: r.value }))]
        : t.rejected;
    for (const r of rows) {
      const ends = spec.busColumns.map((c) => String(r.cells[c] ?? ""));
      for (const b of ends) taintBus(b, "row.rejected", t.file, r.line);
      if (ends.length === 2) placeholder(String(r.cells.id ?? ""), ends[0], ends[1]);
    }
  }

  return ctx;
}
