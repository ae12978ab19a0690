/** Reading the CSV files of a run back into findings and diagnostics (for merging shards). */
import Papa from "papaparse";
import {
  type Diagnostic,
  makeDiagnostic,
  type Severity,
  type SourceLocation,
} from "../model/diagnostic.ts";
import type { Finding, FindingSeverity } from "../checks/finding.ts";

function rows(text: string): Record<string, string>[] {
  return Papa.parse<Record<string, string>>(text, {
    header: true,
    skipEmptyLines: true,
    comments: "#",
  }).data;
}

export function parseFindingsCsv(text: string): Finding[] {
  return rows(text).map((r) => ({
    feederId: r.feeder ?? "",
    code: r.code ?? "",
    severity: (r.severity ?? "info") as FindingSeverity,
    where: { kind: (r.place_kind ?? "feeder") as Finding["where"]["kind"], id: r.place ?? "" },
    value: Number(r.value),
    limit: Number(r.limit),
    unit: r.unit ?? "",
    caseId: r.case ?? "",
    message: r.message ?? "",
  }));
}

export function parseDiagnosticsCsv(text: string): Diagnostic[] {
  return rows(text).map((r) => {
    const at: { -readonly [K in keyof SourceLocation]: SourceLocation[K] } = { file: r.file ?? "" };
    if (r.line) at.line = Number(r.line);
    if (r.column) at.column = Number(r.column);
    if (r.field) at.field = r.field;
    return makeDiagnostic(r.code ?? "", (r.severity ?? "info") as Severity, r.message ?? "", {
      at: r.file ? at : undefined,
      feederId: r.feeder || undefined,
      found: r.found || undefined,
      expected: r.expected || undefined,
    });
  });
}
