/**
 * A flat Parquet table written a row group at a time: rows are buffered column by column,
 * and every `rowGroupRows` rows are encoded as one row group and handed to a byte sink, so
 * memory holds one row group whatever the size of the table. Nothing here touches the
 * file system: the caller's sink receives the file's bytes, in order, as consecutive chunks.
 *
 * Same rows, columns, metadata and group size give the same bytes: no timestamps, no
 * random ids. Encoding is hyparquet-writer's (Snappy pages, dictionary where it pays,
 * min/max statistics per column chunk).
 */
import { ByteWriter, type KeyValue, ParquetWriter, type SchemaElement } from "hyparquet-writer";

/** One column: a UTF-8 string or a 64-bit float, each either required or nullable. */
export interface ParquetColumnSpec {
  readonly name: string;
  readonly type: "STRING" | "DOUBLE";
  readonly nullable: boolean;
}

export type ParquetCell = string | number | null;

/**
 * Receives the file's bytes in order. Each chunk is a fresh copy the sink may keep. A
 * returned promise is awaited before the next chunk is handed over.
 */
export type ByteSink = (chunk: Uint8Array) => void | Promise<void>;

export interface ParquetTableOptions {
  /** Rows per row group (every group but the last holds exactly this many). */
  readonly rowGroupRows: number;
  /** Key–value metadata of the file footer, in this order. */
  readonly keyValue: readonly { readonly key: string; readonly value: string }[];
  /** The footer's created_by text. */
  readonly createdBy: string;
}

export interface ParquetTableTotals {
  readonly rows: number;
  readonly rowGroups: number;
  readonly bytes: number;
}

export interface ParquetTableWriter {
  /** Buffers one row (cells in column order); encodes a row group when the buffer is full. */
  appendRow(cells: readonly ParquetCell[]): void;
  /** Resolves once every chunk encoded so far has been taken by the sink. */
  settled(): Promise<void>;
  /** Encodes the last row group and the footer, hands them over, and reports the totals. */
  finish(): Promise<ParquetTableTotals>;
}

type Buffer = Float64Array | (number | null)[] | string[];

export function createParquetTableWriter(
  columns: readonly ParquetColumnSpec[],
  options: ParquetTableOptions,
  sink: ByteSink,
): ParquetTableWriter {
  const size = options.rowGroupRows;
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`rowGroupRows must be a positive integer, got ${size}`);
  }
  const names = new Set(columns.map((c) => c.name));
  if (columns.length === 0 || names.size !== columns.length) {
    throw new Error("A Parquet table needs at least one column and unique column names");
  }
  const schema: SchemaElement[] = [
    { name: "root", num_children: columns.length },
    ...columns.map((c): SchemaElement => {
      const repetition_type = c.nullable ? "OPTIONAL" : "REQUIRED";
      return c.type === "STRING"
        ? {
          name: c.name,
          type: "BYTE_ARRAY",
          converted_type: "UTF8",
          logical_type: { type: "STRING" },
          repetition_type,
        }
        : { name: c.name, type: "DOUBLE", repetition_type };
    }),
  ];
  const bytes = new ByteWriter();
  const kvMetadata: KeyValue[] = options.keyValue.map((kv) => ({ key: kv.key, value: kv.value }));
  const parquet = new ParquetWriter({
    writer: bytes,
    schema,
    kvMetadata,
    createdBy: options.createdBy,
  });
  const buffers: Buffer[] = columns.map((c) =>
    c.type === "STRING"
      ? new Array<string>(size)
      : c.nullable
      ? new Array<number | null>(size)
      : new Float64Array(size)
  );
  let filled = 0, rows = 0, rowGroups = 0, finished = false;
  let tail: Promise<void> = Promise.resolve();

  // Hands what the byte writer holds to the sink, after every earlier chunk.
  const emit = () => {
    const chunk = bytes.getBytes().slice();
    bytes.index = 0;
    tail = tail.then(() => sink(chunk));
  };
  const writeGroup = () => {
    if (filled === 0) return;
    parquet.write({
      columnData: columns.map((c, j) => {
        const b = buffers[j]!;
        return { name: c.name, data: filled === size ? b : b.slice(0, filled) };
      }),
      rowGroupSize: filled,
    });
    rows += filled;
    rowGroups++;
    filled = 0;
    emit();
  };

  return {
    appendRow(cells) {
      if (finished) throw new Error("appendRow() called after finish()");
      if (cells.length !== columns.length) {
        throw new Error(`A row needs ${columns.length} cells, got ${cells.length}`);
      }
      for (let j = 0; j < columns.length; j++) {
        const c = columns[j]!;
        const v = cells[j];
        const ok = v === null
          ? c.nullable
          : c.type === "STRING"
          ? typeof v === "string"
          : typeof v === "number";
        if (!ok) {
          throw new TypeError(
            `Column "${c.name}" of row ${rows + filled + 1} needs ${
              c.type === "STRING" ? "a string" : "a number"
            }${c.nullable ? " or null" : ""}, got ${v === null ? "null" : typeof v}`,
          );
        }
        buffers[j]![filled] = v as never;
      }
      filled++;
      if (filled === size) writeGroup();
    },
    settled() {
      return tail;
    },
    async finish() {
      if (finished) throw new Error("finish() called twice");
      finished = true;
      writeGroup();
      parquet.finish();
      emit();
      await tail;
      return { rows, rowGroups, bytes: bytes.offset };
    },
  };
}
