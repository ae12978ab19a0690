/**
 * The error sample (data-samples/with-errors, planted problems listed in its EXPECTED.md):
 * every planted problem is reported with its file, line and column, nothing else is, and
 * the valid feeders of the sample still come out valid.
 */
import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { folderSource } from "../src/ingest/read_network.ts";
import { validateFleet } from "../src/pipeline/validate_fleet.ts";

/** [file, line, column, field, severity, code, feeder] — EXPECTED.md, "Every planted problem". */
const PLANTED: [
  string,
  number,
  number | undefined,
  string | undefined,
  string,
  string,
  string | undefined,
][] = [
  ["buses.csv", 28, 1, "id", "error", "id.duplicate", "SOU-F3"],
  ["buses.csv", 36, 6, "feeder", "warning", "feeder.mismatch", "SOU-F4"],
  ["buses.csv", 49, undefined, undefined, "warning", "topology.island", undefined],
  ["lines.csv", 21, 5, "length", "error", "value.invalid", "SOU-F3"],
  ["lines.csv", 23, 3, "to", "error", "ref.unknown", "SOU-F3"],
  ["lines.csv", 31, 3, "to", "error", "voltage.mismatch", "SOU-F4"],
  ["lines.csv", 36, 4, "type", "error", "ref.unknown", "SOU-F5"],
  ["loads.csv", 1, 10, "tariff_group", "warning", "column.unknown", undefined],
  ["loads.csv", 16, 3, "peak_p", "error", "value.invalid", "SOU-F3"],
  ["loads.csv", 25, 8, "phases", "error", "phase.upstream", "SOU-F5"],
  ["transformers.csv", 3, 5, "hv_voltage", "error", "winding.mismatch", "SOU-F4"],
  ["transformers.csv", 5, 10, "vector_group", "error", "value.invalid", "SOU-F5"],
];

const result = await validateFleet(folderSource("data-samples/with-errors"));

Deno.test("validateFleet() reports every planted problem of the error sample at its location", () => {
  const found = result.diagnostics.map((d) => [
    d.at?.file,
    d.at?.line,
    d.at?.column,
    d.at?.field,
    d.severity,
    d.code,
    d.feederId,
  ]);
  assertEquals(found, PLANTED);
});

Deno.test("validateFleet() keeps the valid feeders of the error sample valid", () => {
  assertEquals(
    result.value.feeders.map((f) => [f.feederId, f.status]),
    [
      ["SOU-F1", "valid"],
      ["SOU-F2", "valid"],
      ["SOU-F3", "set_aside"],
      ["SOU-F4", "set_aside"],
      ["SOU-F5", "set_aside"],
    ],
  );
  assertEquals(result.value.forms.map((f) => f.feederId), ["SOU-F1", "SOU-F2"]);
});

Deno.test("validateFleet() gives each set-aside feeder of the error sample its reasons", () => {
  const reasons = Object.fromEntries(
    result.value.feeders.map((
      f,
    ) => [f.feederId, f.reasons.map((r) => `${r.code} ${r.file} ${r.line}`)]),
  );
  // EXPECTED.md, "Feeder outcome".
  assertEquals(reasons, {
    "SOU-F1": [],
    "SOU-F2": [],
    "SOU-F3": [
      "row.rejected buses.csv 28",
      "ref.unknown lines.csv 23",
      "row.rejected lines.csv 21",
      "row.rejected loads.csv 16",
    ].sort(byFileLine),
    "SOU-F4": ["voltage.mismatch lines.csv 31", "winding.mismatch transformers.csv 3"],
    "SOU-F5": [
      "ref.unknown lines.csv 36",
      "phase.upstream loads.csv 25",
      "row.rejected transformers.csv 5",
    ],
  });
});

function byFileLine(a: string, b: string): number {
  const [, fa, la] = a.split(" "), [, fb, lb] = b.split(" ");
  return fa! < fb! ? -1 : fa! > fb! ? 1 : Number(la) - Number(lb);
}
