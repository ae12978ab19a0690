/**
 * Oracle for every check here: the independent reader hyparquet (npm hyparquet@1.33.0, not
 * the writer's own copy) reading back the bytes the sink received.
 */
import { deepStrictEqual as assertEquals, throws } from "node:assert/strict";
import { parquetMetadata, parquetReadObjects } from "hyparquet";
import {
  type ByteSink,
  createParquetTableWriter,
  type ParquetCell,
  type ParquetColumnSpec,
} from "./parquet_table_writer.ts";

const COLUMNS: readonly ParquetColumnSpec[] = [
  { name: "id", type: "STRING", nullable: false },
  { name: "x", type: "DOUBLE", nullable: false },
  { name: "y", type: "DOUBLE", nullable: true },
];

const OPTIONS = {
  rowGroupRows: 4,
  keyValue: [{ key: "k", value: "v" }],
  createdBy: "tester version 0",
};

/** Invented rows: ids with multi-byte characters, signed zero, extremes and nulls. */
const ROWS: readonly (readonly ParquetCell[])[] = Array.from({ length: 10 }, (_, i) => [
  i % 3 === 0 ? `NRV-Ås-${i}` : `row ${i}`,
  i === 1 ? -0 : i === 2 ? Number.MAX_VALUE : i === 3 ? 5e-324 : i / 7,
  i % 2 === 0 ? null : -i * 1.1,
]);

/** A sink that keeps every chunk, and the file they make. */
function collectBytes(): { sink: ByteSink; chunks: Uint8Array[]; bytes(): Uint8Array } {
  const chunks: Uint8Array[] = [];
  return {
    chunks,
    sink: (c) => {
      chunks.push(c);
    },
    bytes() {
      const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
      let at = 0;
      for (const c of chunks) {
        out.set(c, at);
        at += c.length;
      }
      return out;
    },
  };
}

async function write(
  rows: readonly (readonly ParquetCell[])[],
  sink?: ByteSink,
): Promise<Uint8Array> {
  const c = collectBytes();
  const w = createParquetTableWriter(COLUMNS, OPTIONS, sink ?? c.sink);
  for (const r of rows) w.appendRow(r);
  await w.finish();
  return c.bytes();
}

Deno.test("createParquetTableWriter() writes every value back exactly, nulls as null", async () => {
  const bytes = await write(ROWS);
  const read = await parquetReadObjects({ file: bytes.buffer as ArrayBuffer });
  // hyparquet reads each row as an object keyed by column name.
  assertEquals(read, ROWS.map(([id, x, y]) => ({ id, x, y })));
});

Deno.test("createParquetTableWriter() declares strings as UTF-8 and doubles, required or optional", async () => {
  const meta = parquetMetadata((await write(ROWS)).buffer as ArrayBuffer);
  assertEquals(
    meta.schema.slice(1).map((e) => [
      e.name,
      e.type,
      e.repetition_type,
      e.converted_type,
      e.logical_type,
    ]),
    [
      ["id", "BYTE_ARRAY", "REQUIRED", "UTF8", { type: "STRING" }],
      ["x", "DOUBLE", "REQUIRED", undefined, undefined],
      ["y", "DOUBLE", "OPTIONAL", undefined, undefined],
    ],
  );
  assertEquals(meta.key_value_metadata, [{ key: "k", value: "v" }]);
  assertEquals(meta.created_by, "tester version 0");
});

Deno.test("createParquetTableWriter() fills row groups of rowGroupRows rows, the rest in the last", async () => {
  const c = collectBytes();
  const w = createParquetTableWriter(COLUMNS, OPTIONS, c.sink);
  for (const r of ROWS) w.appendRow(r);
  // Two full groups of 4 have reached the sink before finish().
  await w.settled();
  assertEquals(c.chunks.length, 2);
  const totals = await w.finish();
  const meta = parquetMetadata(c.bytes().buffer as ArrayBuffer);
  assertEquals(meta.row_groups.map((g) => g.num_rows), [4n, 4n, 2n]);
  assertEquals(meta.num_rows, 10n);
  assertEquals(totals, { rows: 10, rowGroups: 3, bytes: c.bytes().length });
});

Deno.test("createParquetTableWriter() gives the same bytes for the same rows, sync or async sink", async () => {
  const a = await write(ROWS);
  const b = await write(ROWS);
  assertEquals(a, b);
  const slow = collectBytes();
  const late: ByteSink = async (chunk) => {
    await new Promise((r) => setTimeout(r, chunk.length % 3));
    slow.chunks.push(chunk);
  };
  await write(ROWS, late);
  assertEquals(slow.bytes(), a);
});

Deno.test("createParquetTableWriter() writes a readable file without rows", async () => {
  const bytes = await write([]);
  const meta = parquetMetadata(bytes.buffer as ArrayBuffer);
  assertEquals([meta.num_rows, meta.row_groups.length], [0n, 0]);
  assertEquals(await parquetReadObjects({ file: bytes.buffer as ArrayBuffer }), []);
});

Deno.test("createParquetTableWriter() throws on a cell of the wrong type, naming column and row", () => {
  const w = createParquetTableWriter(COLUMNS, OPTIONS, () => {});
  w.appendRow(["a", 1, null]);
  throws(() => w.appendRow(["b", null, 2]), /Column "x" of row 2 needs a number, got null/);
  throws(() => w.appendRow([3, 1, 2]), /Column "id" of row 2 needs a string, got number/);
  throws(() => w.appendRow(["b", 1]), /A row needs 3 cells, got 2/);
});

Deno.test("createParquetTableWriter() refuses rows after finish() and a bad group size", async () => {
  const w = createParquetTableWriter(COLUMNS, OPTIONS, () => {});
  await w.finish();
  throws(() => w.appendRow(["a", 1, null]), /after finish/);
  throws(
    () => createParquetTableWriter(COLUMNS, { ...OPTIONS, rowGroupRows: 0 }, () => {}),
    /positive integer/,
  );
});
