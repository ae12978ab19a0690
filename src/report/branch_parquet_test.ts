/**
 * Oracle for every check here: the independent reader hyparquet (npm hyparquet@1.33.0)
 * reading back what createBranchParquetWriter wrote; expected rows are the feeder files'
 * own values, flattened by hand below. Invented data only.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { parquetMetadata, parquetReadObjects } from "hyparquet";
import { createBranchParquetWriter, type ParquetProvenance } from "./branch_parquet.ts";
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
  inputHash: "07d2".repeat(16),
  configHash: "c4e5".repeat(16),
};

async function writeBranches(
  files: readonly FeederFile[],
  rowGroupRows?: number,
): Promise<Uint8Array> {
  const out = collectBytes();
  const w = createBranchParquetWriter(
    META,
    out.sink,
    rowGroupRows === undefined ? {} : { rowGroupRows },
  );
  for (const f of files) await w.addFeeder(f);
  await w.finish();
  return out.bytes();
}

/** What each row must hold: feeders, then cases, then branches, in the order given. */
function expectedRows(files: readonly FeederFile[]): Record<string, unknown>[] {
  const rows: Record<string, unknown>[] = [];
  for (const f of files) {
    for (const c of f.cases) {
      for (const b of c.branches ?? []) {
        rows.push({
          feeder: f.feederId,
          case: c.caseId,
          branch: b.id,
          kind: b.kind,
          from_bus: b.from,
          to_bus: b.to,
          p_from_kw: b.pFromKw,
          q_from_kvar: b.qFromKvar,
          p_to_kw: b.pToKw,
          q_to_kvar: b.qToKvar,
          i_a: b.iA,
          loading_percent: b.loadingPercent,
        });
      }
    }
  }
  return rows;
}

const read = (bytes: Uint8Array) => parquetReadObjects({ file: bytes.buffer as ArrayBuffer });

Deno.test("createBranchParquetWriter() writes one row per feeder, case and branch, every value exact", async () => {
  const expected = expectedRows(HAND_MADE_FEEDERS);
  assertEquals(expected.length, 7);
  assertEquals(await read(await writeBranches(HAND_MADE_FEEDERS)), expected);
});

Deno.test("createBranchParquetWriter() names and types its columns and records the run in the footer", async () => {
  const meta = parquetMetadata((await writeBranches(HAND_MADE_FEEDERS)).buffer as ArrayBuffer);
  assertEquals(meta.schema.slice(1).map((e) => [e.name, e.type, e.repetition_type]), [
    ["feeder", "BYTE_ARRAY", "REQUIRED"],
    ["case", "BYTE_ARRAY", "REQUIRED"],
    ["branch", "BYTE_ARRAY", "REQUIRED"],
    ["kind", "BYTE_ARRAY", "REQUIRED"],
    ["from_bus", "BYTE_ARRAY", "REQUIRED"],
    ["to_bus", "BYTE_ARRAY", "REQUIRED"],
    ["p_from_kw", "DOUBLE", "REQUIRED"],
    ["q_from_kvar", "DOUBLE", "REQUIRED"],
    ["p_to_kw", "DOUBLE", "REQUIRED"],
    ["q_to_kvar", "DOUBLE", "REQUIRED"],
    ["i_a", "DOUBLE", "REQUIRED"],
    ["loading_percent", "DOUBLE", "REQUIRED"],
  ]);
  for (const e of meta.schema.slice(1, 7)) {
    assertEquals([e.converted_type, e.logical_type], ["UTF8", { type: "STRING" }]);
  }
  assertEquals(meta.key_value_metadata, [
    { key: "table", value: "branches" },
    { key: "tool", value: "gridtriage" },
    { key: "tool_version", value: "0.1.0" },
    { key: "input_hash", value: META.inputHash },
    { key: "config_hash", value: META.configHash },
    { key: "caution", value: CAUTION },
  ]);
});

Deno.test("createBranchParquetWriter() writes the demo fleet's branch results exactly, in row groups", async () => {
  const demo = await studyDemoFeederFiles();
  const expected = expectedRows(demo);
  assert(expected.length > 100);
  assertEquals(await read(await writeBranches(demo)), expected);
  const bytes = await writeBranches(demo, 64);
  const groups = parquetMetadata(bytes.buffer as ArrayBuffer).row_groups;
  assertEquals(groups.length, Math.ceil(expected.length / 64));
  assertEquals(await read(bytes), expected);
  assertEquals(bytes, await writeBranches(demo, 64));
});
