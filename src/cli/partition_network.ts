/**
 * Splits a network export into parts that can be validated and studied one after the
 * other, so that memory follows the largest part, not the fleet. A first pass reads only
 * the connecting columns (buses, both ends of lines, transformers and switches, the device
 * of each relay stage, the feeder of each head device) and groups the buses that any edge
 * joins — open switches and lines out of service included, so that nothing a feeder's
 * study needs ends up in another part; whole groups are packed into parts of at most
 * `maxBuses` buses (a larger group is a part of its own). A second pass copies every row
 * to its part's folder on disk with its original line number beside it, so every
 * diagnostic still points at the export.
 * Forecast rows go to the part of their feeder's head device (to the first part when no
 * device heads that feeder). Tables that belong to no bus (settings, line types,
 * conductors, geometry, curves) go to every part; their diagnostics repeat and are told
 * once by the caller.
 */
import Papa from "papaparse";
import { join } from "node:path";
import { type CsvProblem, type CsvRow, parseCsvText, streamCsvFile } from "../ingest/csv_rows.ts";
import { parseHeaderCell } from "../ingest/read_table.ts";
import { TABLES, type TableSource } from "../ingest/read_network.ts";

/** Columns naming buses, per table; the part of a row is that of its first known bus. */
const BUS_COLUMNS: Readonly<Record<string, readonly string[]>> = {
  "buses.csv": ["id"],
  "grid_sources.csv": ["bus"],
  "lines.csv": ["from", "to"],
  "transformers.csv": ["hv_bus", "lv_bus"],
  "switches.csv": ["from", "to"],
  "loads.csv": ["bus"],
  "shunts.csv": ["bus"],
  "generators.csv": ["bus"],
  "generation_queue.csv": ["bus_id"],
};
const EDGE_TABLES = ["lines.csv", "transformers.csv", "switches.csv"];

export interface NetworkParts {
  readonly count: number;
  /** Table source of part k (0-based). */
  source(k: number): TableSource;
}

/**
 * Streams a table row by row (header first); false when the file does not exist.
 * Quote problems are returned in `problems`.
 */
async function streamTable(
  path: string,
  onRow: (row: CsvRow, isHeader: boolean) => void,
  problems: CsvProblem[] = [],
): Promise<boolean> {
  let first = true;
  try {
    problems.push(
      ...await streamCsvFile(path, (r) => {
        onRow(r, first);
        first = false;
      }),
    );
    return true;
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) return false;
    throw e;
  }
}

function columnIndex(header: CsvRow | undefined, names: readonly string[]): number[] {
  const cols = header?.cells.map((c) => parseHeaderCell(c)?.name ?? "") ?? [];
  return names.map((n) => cols.indexOf(n));
}

/**
 * Partitions `dir` into parts under `workDir`. Returns undefined when one part would hold
 * everything anyway (the caller then reads the export directly).
 */
export async function partitionNetwork(
  dir: string,
  workDir: string,
  maxBuses: number,
): Promise<NetworkParts | undefined> {
  // Pass 1: bus ids and the groups that edges make.
  const index = new Map<string, number>();
  let idCol = -1;
  const found = await streamTable(join(dir, "buses.csv"), (row, isHeader) => {
    if (isHeader) {
      idCol = columnIndex(row, ["id"])[0]!;
      return;
    }
    const id = (row.cells[idCol] ?? "").trim().toLowerCase();
    if (id !== "" && !index.has(id)) index.set(id, index.size);
  });
  if (!found || index.size <= maxBuses) return undefined;
  const up = Int32Array.from({ length: index.size }, (_, i) => i);
  const find = (a: number): number => {
    while (up[a] !== a) a = up[a] = up[up[a]!]!;
    return a;
  };
  const busOf = (cell: string | undefined) => index.get((cell ?? "").trim().toLowerCase());
  const switchBus = new Map<string, number>();
  const headBus = new Map<string, number>();
  let headersUsable = true;
  for (const file of EDGE_TABLES) {
    let cols: number[] = [], sid = -1, headCol = -1;
    await streamTable(join(dir, file), (row, isHeader) => {
      if (isHeader) {
        cols = columnIndex(row, BUS_COLUMNS[file]!);
        sid = columnIndex(row, ["id"])[0]!;
        headCol = columnIndex(row, ["heads_feeder"])[0]!;
        if (cols.includes(-1)) headersUsable = false;
        return;
      }
      const a = busOf(row.cells[cols[0]!]), b = busOf(row.cells[cols[1]!]);
      if (a !== undefined && b !== undefined) up[find(a)] = find(b);
      if (file === "switches.csv" && (a ?? b) !== undefined) {
        switchBus.set((row.cells[sid] ?? "").trim().toLowerCase(), (a ?? b)!);
        const head = (row.cells[headCol] ?? "").trim().toLowerCase();
        if (head !== "" && !headBus.has(head)) headBus.set(head, (a ?? b)!);
      }
    });
  }
  // An edge table without its bus columns cannot be split safely: read the export whole,
  // and let validation report the missing columns.
  if (!headersUsable) return undefined;
  // Groups in order of their first bus; parts filled in that order.
  const size = new Int32Array(index.size);
  for (let i = 0; i < index.size; i++) size[find(i)]!++;
  const partOfRoot = new Int32Array(index.size).fill(-1);
  let parts = 0, filled = 0;
  for (let i = 0; i < index.size; i++) {
    const root = find(i);
    if (partOfRoot[root] !== -1) continue;
    if (parts === 0 || filled + size[root]! > maxBuses) {
      parts++;
      filled = 0;
    }
    partOfRoot[root] = parts - 1;
    filled += size[root]!;
  }
  if (parts <= 1) return undefined;
  const partOfBus = (cell: string | undefined) => {
    const b = busOf(cell);
    return b === undefined ? undefined : partOfRoot[find(b)]!;
  };

  // Pass 2: each row to its part, with its original line number.
  const partDirs = Array.from({ length: parts }, (_, k) => join(workDir, `part-${k}`));
  for (const d of partDirs) await Deno.mkdir(d, { recursive: true });
  const problemsOf = new Map<string, CsvProblem[]>();
  const enc = new TextEncoder();
  for (const spec of Object.values(TABLES)) {
    try {
      await Deno.stat(join(dir, spec.file));
    } catch {
      continue; // absent tables stay absent in every part
    }
    const files = await Promise.all(
      partDirs.map((d) =>
        Deno.open(join(d, spec.file), { write: true, create: true, truncate: true })
      ),
    );
    const buffers: string[][] = partDirs.map(() => []);
    const sizes = new Array<number>(parts).fill(0);
    const flush = (k: number) => {
      const data = enc.encode(buffers[k]!.join(""));
      for (let off = 0; off < data.length;) off += files[k]!.writeSync(data.subarray(off));
      buffers[k] = [];
      sizes[k] = 0;
    };
    const write = (k: number, row: CsvRow) => {
      const line = Papa.unparse([[String(row.line), ...row.cells]], { newline: "\n" }) + "\n";
      buffers[k]!.push(line);
      sizes[k]! += line.length;
      if (sizes[k]! > 1 << 16) flush(k);
    };
    const busCols = BUS_COLUMNS[spec.file];
    let cols: number[] = [], deviceCol = -1, feederCol = -1;
    const problems: CsvProblem[] = [];
    try {
      await streamTable(join(dir, spec.file), (row, isHeader) => {
        if (isHeader) {
          cols = busCols === undefined ? [] : columnIndex(row, busCols);
          deviceCol = columnIndex(row, ["device"])[0]!;
          feederCol = columnIndex(row, ["feeder_id"])[0]!;
          for (let k = 0; k < parts; k++) write(k, row);
          return;
        }
        if (
          busCols === undefined && spec.file !== "relay_stages.csv" &&
          spec.file !== "generation_forecast.csv"
        ) {
          for (let k = 0; k < parts; k++) write(k, row);
          return;
        }
        let k: number | undefined;
        if (spec.file === "relay_stages.csv") {
          const b = switchBus.get((row.cells[deviceCol] ?? "").trim().toLowerCase());
          k = b === undefined ? undefined : partOfRoot[find(b)]!;
        } else if (spec.file === "generation_forecast.csv") {
          const b = headBus.get((row.cells[feederCol] ?? "").trim().toLowerCase());
          k = b === undefined ? undefined : partOfRoot[find(b)]!;
        } else {
          for (const c of cols) k ??= partOfBus(row.cells[c]);
        }
        write(k ?? 0, row);
      }, problems);
      for (let k = 0; k < parts; k++) flush(k);
    } finally {
      for (const f of files) f.close();
    }
    problemsOf.set(spec.file, problems);
  }
  return {
    count: parts,
    source: (k) => async (file) => {
      let text: string;
      try {
        text = await Deno.readTextFile(join(partDirs[k]!, file));
      } catch (e) {
        if (e instanceof Deno.errors.NotFound) return undefined;
        throw e;
      }
      const parsed = await parseCsvText(text);
      return {
        rows: parsed.rows.map((r) => ({ line: Number(r.cells[0]), cells: r.cells.slice(1) })),
        // Quote problems of the export belong to its first part only, so they are told once.
        problems: k === 0 ? problemsOf.get(file) ?? [] : [],
      };
    },
  };
}
