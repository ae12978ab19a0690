/**
 * Oracle for every check here: the independent reader hyparquet (npm hyparquet@1.33.0)
 * reading back what createBusParquetWriter wrote; expected rows are the feeder files' own
 * values, flattened by hand below. Invented data only.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { parquetMetadata, parquetReadObjects } from "hyparquet";
import { createBusParquetWriter, type ParquetProvenance } from "./bus_parquet.ts";
import type { FeederFile } from "./feeder_file.ts";
import { CAUTION } from "./run_files.ts";
import {
  collectBytes,
  HAND_MADE_FEEDERS,
  studyDemoFeederFiles,
} from "../../tests/fixtures/feeder_file_fixtures.ts";

const META: ParquetProvenance = {
  tool: "gridtriage",
  version: "0.1.0",
  inputHash: "3f1c".repeat(16),
  configHash: "9ab0".repeat(16),
};

const DEMO = await studyDemoFeederFiles();

async function writeBuses(
  files: readonly FeederFile[],
  rowGroupRows?: number,
): Promise<Uint8Array> {
  const out = collectBytes();
  const w = createBusParquetWriter(
    META,
    out.sink,
    rowGroupRows === undefined ? {} : { rowGroupRows },
  );
  for (const f of files) await w.addFeeder(f);
  await w.finish();
  return out.bytes();
}

/** What each row must hold: feeders, then cases, then buses, in the order given. */
function expectedRows(files: readonly FeederFile[]): Record<string, unknown>[] {
  const rows: Record<string, unknown>[] = [];
  for (const f of files) {
    for (const c of f.cases) {
      for (const b of c.buses ?? []) {
        rows.push({
          feeder: f.feederId,
          case: c.caseId,
          bus: b.id,
          nominal_kv: b.vnKv,
          distance_km: b.distanceKm,
          v_pu: b.vPu,
          angle_deg: b.angleDeg,
          dg_change_percent: b.dgChangePercent,
          rp_part_percent: b.rpPercent,
          xq_part_percent: b.xqPercent,
        });
      }
    }
  }
  return rows;
}

const read = (bytes: Uint8Array) => parquetReadObjects({ file: bytes.buffer as ArrayBuffer });

Deno.test("createBusParquetWriter() writes one row per feeder, case and bus, every value exact", async () => {
  const rows = await read(await writeBuses(HAND_MADE_FEEDERS));
  const expected = expectedRows(HAND_MADE_FEEDERS);
  // 3 + 3 buses of NRV-ÅSEN-F2 (its third case did not converge), 2 of NRV-KELD-F1, none
  // of the failed NRV-VARR-F9.
  assertEquals(expected.length, 8);
  assertEquals(rows, expected);
  assert(rows.some((r) => r.dg_change_percent === null));
  assert(rows.some((r) => r.dg_change_percent !== null));
});

Deno.test("createBusParquetWriter() names and types its columns and records the run in the footer", async () => {
  const meta = parquetMetadata((await writeBuses(HAND_MADE_FEEDERS)).buffer as ArrayBuffer);
  assertEquals(meta.schema.slice(1).map((e) => [e.name, e.type, e.repetition_type]), [
    ["feeder", "BYTE_ARRAY", "REQUIRED"],
    ["case", "BYTE_ARRAY", "REQUIRED"],
    ["bus", "BYTE_ARRAY", "REQUIRED"],
    ["nominal_kv", "DOUBLE", "REQUIRED"],
    ["distance_km", "DOUBLE", "REQUIRED"],
    ["v_pu", "DOUBLE", "REQUIRED"],
    ["angle_deg", "DOUBLE", "REQUIRED"],
    ["dg_change_percent", "DOUBLE", "OPTIONAL"],
    ["rp_part_percent", "DOUBLE", "OPTIONAL"],
    ["xq_part_percent", "DOUBLE", "OPTIONAL"],
  ]);
  // Strings are UTF-8 strings, not raw bytes.
  for (const e of meta.schema.slice(1, 4)) {
    assertEquals([e.converted_type, e.logical_type], ["UTF8", { type: "STRING" }]);
  }
  assertEquals(meta.key_value_metadata, [
    { key: "table", value: "buses" },
    { key: "tool", value: "gridtriage" },
    { key: "tool_version", value: "0.1.0" },
    { key: "input_hash", value: META.inputHash },
    { key: "config_hash", value: META.configHash },
    { key: "caution", value: CAUTION },
  ]);
  assertEquals(meta.created_by, "gridtriage version 0.1.0");
  assertEquals(meta.num_rows, 8n);
});

Deno.test("createBusParquetWriter() writes the demo fleet's bus results exactly", async () => {
  const expected = expectedRows(DEMO);
  // Every demo feeder is studied with bus results in all three cases.
  assertEquals(DEMO.length, 13);
  assert(expected.length > 100);
  assertEquals(await read(await writeBuses(DEMO)), expected);
});

Deno.test("createBusParquetWriter() splits a large table into row groups of the set size", async () => {
  const n = expectedRows(DEMO).length;
  const size = 97;
  const bytes = await writeBuses(DEMO, size);
  const groups = parquetMetadata(bytes.buffer as ArrayBuffer).row_groups.map((g) =>
    Number(g.num_rows)
  );
  assertEquals(groups.length, Math.ceil(n / size));
  assert(groups.length > 3);
  assert(groups.slice(0, -1).every((g) => g === size));
  assertEquals(groups.reduce((a, b) => a + b, 0), n);
  // Row groups span feeder boundaries without changing a value or the order.
  assertEquals(await read(bytes), expectedRows(DEMO));
});

Deno.test("createBusParquetWriter() gives identical bytes for identical input", async () => {
  assertEquals(await writeBuses(DEMO), await writeBuses(DEMO));
  assertEquals(await writeBuses(DEMO, 50), await writeBuses(DEMO, 50));
});
