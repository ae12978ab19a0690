/**
 * Reads one table of the network format: checks the header (known columns, declared
 * units), converts units, validates every row with the table's zod schema and turns
 * every problem into a located diagnostic. All problems of a file come out in one pass.
 */
import type { z } from "zod";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import type { CsvRow } from "./csv_rows.ts";
import { type Cell, quantityColumns, type TableSpec } from "./table_kit.ts";
import { resolveUnit } from "./units.ts";
import type { InternalUnit } from "./units.ts";

/** A row that passed validation, with where it came from. */
export interface TableRow<T> {
  readonly value: T;
  readonly line: number;
}

/** A row that failed: kept as the identifiers it names, so its feeder can be set aside. */
export interface RejectedRow {
  readonly line: number;
  /** Raw cells by column name (only what could be read). */
  readonly cells: Readonly<Record<string, string>>;
  readonly reason: string;
}

export interface TableResult<T> {
  readonly file: string;
  readonly present: boolean;
  readonly rows: readonly TableRow<T>[];
  readonly rejected: readonly RejectedRow[];
  /** Column names of the header in file order ("" for a column not in the format). */
  readonly columns: readonly string[];
  /** True when a header problem makes every row of the table untrustworthy. */
  readonly headerBroken: boolean;
  readonly diagnostics: readonly Diagnostic[];
}

interface HeaderColumn {
  readonly name: string;
  readonly unit: string | undefined;
}

const HEADER_CELL = /^\s*([A-Za-z][A-Za-z0-9_]*)\s*(?:\[([^\]]*)\])?\s*$/;

/** Splits `length [km]` into name and unit; undefined when the cell is not of that form. */
export function parseHeaderCell(cell: string): HeaderColumn | undefined {
  const m = HEADER_CELL.exec(cell);
  if (!m || m[1] === undefined) return undefined;
  const unit = m[2]?.trim();
  return { name: m[1].toLowerCase(), unit: unit === undefined || unit === "" ? undefined : unit };
}

/** Columns a schema knows, and which of them are required. */
function schemaColumns(schema: z.ZodType): { known: Set<string>; required: Set<string> } {
  // Every table schema is a z.object, possibly refined; walk to its shape.
  const shape = findShape(schema);
  const known = new Set(Object.keys(shape));
  const required = new Set<string>();
  for (const [name, col] of Object.entries(shape)) {
    if (!col.safeParse(undefined).success) required.add(name);
  }
  return { known, required };
}

function findShape(schema: z.ZodType): Record<string, z.ZodType> {
  // deno-lint-ignore no-explicit-any
  let s: any = schema;
  for (let i = 0; i < 10 && s; i++) {
    if (s.shape) return s.shape as Record<string, z.ZodType>;
    s = s._zod?.def?.in ?? s._zod?.def?.schema ?? s._zod?.def?.innerType;
  }
  throw new Error("table schema has no object shape");
}

/**
 * Validates the rows of one table. `rows` are the CSV rows, header first. The file name
 * in diagnostics is `file` (relative to the network folder).
 */
export function readTableRows<U extends string, T>(
  spec: TableSpec<U, T>,
  rows: readonly CsvRow[],
  file: string = spec.file,
): TableResult<T> {
  const diagnostics: Diagnostic[] = [];
  const out: TableRow<T>[] = [];
  const rejected: RejectedRow[] = [];
  const header = rows[0];
  if (header === undefined) {
    diagnostics.push(
      makeDiagnostic("table.empty", "error", `Table ${file} has no header row`, {
        at: { file, line: 1, column: 1 },
        expected: "a header row naming the columns",
      }),
    );
    return {
      file,
      present: true,
      rows: out,
      rejected,
      columns: [],
      headerBroken: true,
      diagnostics,
    };
  }

  // Header: names, units, factors.
  const probe = spec.row(quantityColumns(spec.units, {}));
  const { known, required } = schemaColumns(probe);
  const units = spec.units as Readonly<Record<string, InternalUnit>>;
  const columns: (string | undefined)[] = [];
  const factors: Record<string, number> = {};
  let headerBroken = false;
  const seen = new Set<string>();
  header.cells.forEach((cell, i) => {
    const at = { file, line: header.line, column: i + 1 };
    const col = parseHeaderCell(cell);
    if (col === undefined) {
      diagnostics.push(makeDiagnostic(
        "column.malformed",
        "error",
        `Cannot read header of ${file}: column "${cell}" is not of the form name or name [unit]`,
        { at, found: cell, expected: "name or name [unit]" },
      ));
      columns.push(undefined);
      headerBroken = true;
      return;
    }
    const atField = { ...at, field: col.name };
    if (seen.has(col.name)) {
      diagnostics.push(makeDiagnostic(
        "column.duplicate",
        "error",
        `Cannot read header of ${file}: column "${col.name}" appears twice`,
        { at: atField, found: cell },
      ));
      columns.push(undefined);
      headerBroken = true;
      return;
    }
    seen.add(col.name);
    if (!known.has(col.name)) {
      diagnostics.push(makeDiagnostic(
        "column.unknown",
        "warning",
        `Column "${col.name}" of ${file} is not part of the format and is ignored`,
        { at: atField, found: cell, expected: `one of ${[...known].join(", ")}` },
      ));
      columns.push(undefined);
      return;
    }
    columns.push(col.name);
    const internal = units[col.name];
    if (internal === undefined) {
      if (col.unit !== undefined) {
        diagnostics.push(makeDiagnostic(
          "unit.unexpected",
          "warning",
          `Column "${col.name}" of ${file} takes no unit; "[${col.unit}]" is ignored`,
          { at: atField, found: col.unit },
        ));
      }
      return;
    }
    if (col.unit === undefined) {
      diagnostics.push(makeDiagnostic(
        "unit.missing",
        "error",
        `Column "${col.name}" of ${file} must declare its unit, e.g. "${col.name} [${internal}]"`,
        { at: atField, found: cell, expected: `a unit convertible to ${internal}` },
      ));
      headerBroken = true;
      return;
    }
    const res = resolveUnit(col.unit, internal);
    if (!res.ok) {
      diagnostics.push(makeDiagnostic(
        res.code,
        "error",
        `Column "${col.name}" of ${file}: ${res.message}`,
        { at: atField, found: col.unit, expected: `a unit convertible to ${internal}` },
      ));
      headerBroken = true;
      return;
    }
    factors[col.name] = res.factor;
  });
  for (const name of required) {
    if (!seen.has(name)) {
      diagnostics.push(makeDiagnostic(
        "column.missing",
        "error",
        `Table ${file} lacks the required column "${name}"`,
        { at: { file, line: header.line, field: name }, expected: `a column "${name}"` },
      ));
      headerBroken = true;
    }
  }

  // Rows.
  const schema = spec.row(quantityColumns(spec.units, factors));
  const colIndex = new Map<string, number>();
  columns.forEach((c, i) => c !== undefined && colIndex.set(c, i));
  const keys = new Map<string, number>();
  const uniqueSeen = new Map<string, Map<string, number>>();
  for (let r = 1; r < rows.length; r++) {
    const row = rows[r]!;
    const record: Record<string, Cell> = {};
    const raw: Record<string, string> = {};
    for (let i = 0; i < columns.length; i++) {
      const name = columns[i];
      if (name === undefined) continue;
      const text = (row.cells[i] ?? "").trim();
      raw[name] = text;
      record[name] = text === "" ? undefined : text;
    }
    const label = rowLabel(spec, raw, row.line);
    let ok = true;
    if (row.cells.length !== header.cells.length) {
      ok = false;
      diagnostics.push(makeDiagnostic(
        "csv.columns",
        "error",
        `Cannot read ${label} of ${file}: it has ${row.cells.length} fields, the header has ${header.cells.length}`,
        {
          at: { file, line: row.line, column: Math.min(row.cells.length, header.cells.length) + 1 },
          found: `${row.cells.length} fields`,
          expected: `${header.cells.length} fields`,
        },
      ));
    }
    const parsed = schema.safeParse(record);
    if (!parsed.success) {
      ok = false;
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0] ?? "");
        const idx = colIndex.get(field);
        const found = raw[field];
        const unit = columnUnit(header.cells[idx ?? -1]);
        const shown = found === undefined || found === ""
          ? ""
          : ` "${found}${unit === undefined ? "" : " " + unit}"`;
        const missing = found === undefined || found === "";
        diagnostics.push(makeDiagnostic(
          missing && issue.message === "is required" ? "value.missing" : "value.invalid",
          "error",
          `Cannot read ${label} of ${file}: ${field}${shown} ${issue.message}`,
          {
            at: idx === undefined
              ? { file, line: row.line, field }
              : { file, line: row.line, column: idx + 1, field },
            found: found ?? "",
            expected: issue.message,
          },
        ));
      }
    }
    if (spec.key.length > 0) {
      const keyText = spec.key.map((k) => (raw[k] ?? "").toLowerCase()).join("\u0000");
      const complete = spec.key.every((k) => (raw[k] ?? "") !== "");
      const first = keys.get(keyText);
      if (complete && first !== undefined) {
        ok = false;
        const k0 = spec.key[0]!;
        diagnostics.push(makeDiagnostic(
          "id.duplicate",
          "error",
          `Cannot read ${label} of ${file}: ${spec.key.join(" + ")} "${
            spec.key.map((k) => raw[k]).join(" + ")
          }" is already used on line ${first}`,
          {
            at: { file, line: row.line, column: (colIndex.get(k0) ?? 0) + 1, field: k0 },
            found: spec.key.map((k) => raw[k]).join(" + "),
            expected: "a value not used on another row",
          },
        ));
      } else if (complete) keys.set(keyText, row.line);
    }
    for (const col of spec.unique ?? []) {
      const v = parsed.success ? (parsed.data as Record<string, unknown>)[col] : raw[col];
      if (v === undefined || v === "") continue;
      const text = String(v).toLowerCase();
      const seenOn = uniqueSeen.get(col) ?? new Map<string, number>();
      uniqueSeen.set(col, seenOn);
      const first = seenOn.get(text);
      if (first === undefined) {
        seenOn.set(text, row.line);
        continue;
      }
      ok = false;
      const idx = colIndex.get(col);
      diagnostics.push(makeDiagnostic(
        "value.duplicate",
        "error",
        `Cannot read ${label} of ${file}: ${col} "${raw[col]}" is already used on line ${first}`,
        {
          at: idx === undefined
            ? { file, line: row.line, field: col }
            : { file, line: row.line, column: idx + 1, field: col },
          found: raw[col] ?? "",
          expected: "a value not used on another row",
        },
      ));
    }
    if (ok && parsed.success) out.push({ value: parsed.data, line: row.line });
    else rejected.push({ line: row.line, cells: raw, reason: label });
  }
  return {
    file,
    present: true,
    rows: out,
    rejected,
    columns: columns.map((c) => c ?? ""),
    headerBroken,
    diagnostics,
  };
}

function columnUnit(cell: string | undefined): string | undefined {
  return cell === undefined ? undefined : parseHeaderCell(cell)?.unit;
}

function rowLabel<U extends string, T>(
  spec: TableSpec<U, T>,
  raw: Record<string, string>,
  line: number,
): string {
  const id = spec.key.length === 1 ? raw[spec.key[0]!] : undefined;
  return id ? `row "${id}"` : `the row on line ${line}`;
}
