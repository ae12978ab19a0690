/**
 * Contents of the files of a study run, as text. The CLI writes them; nothing here touches
 * the file system. Every file but run.json is deterministic: same input, same bytes.
 */
import Papa from "papaparse";
import type { Diagnostic } from "../model/diagnostic.ts";
import type { Finding } from "../checks/finding.ts";
import type { FeederSummary } from "../model/summarize_feeder.ts";
import type { FeederStudy } from "../pipeline/study_feeder.ts";
import type { PipelineConfig } from "../pipeline/pipeline_config.ts";

export const CAUTION =
  "Screening study: verify results with a licensed engineer and against local codes before acting.";

/**
 * CSV text with a header row. A first cell that starts with "#" is quoted, so that readers
 * skipping the `#` provenance lines never take a row for one.
 */
export function csv(
  columns: readonly string[],
  rows: readonly (readonly (string | number | null)[])[],
): string {
  return Papa.unparse({ fields: [...columns], data: rows.map((r) => [...r]) }, {
    newline: "\n",
    quotes: (value: unknown, column: number) =>
      column === 0 && typeof value === "string" && value.startsWith("#"),
  }) + "\n";
}

/** The rows of a CSV without its header line: what a file written a feeder at a time appends. */
export function csvRows(
  columns: readonly string[],
  rows: readonly (readonly (string | number | null)[])[],
): string {
  const text = csv(columns, rows);
  return text.slice(text.indexOf("\n") + 1);
}

/** What a CSV file of a run says about where it comes from, as `#` lines above its header. */
export interface CsvProvenance {
  readonly version: string;
  readonly network: string;
  readonly inputHash: string;
  readonly pipeline: string;
  readonly pipelineName: string | null;
  readonly configHash: string;
}

/** `#` lines: title, network and its hash, pipeline and its hash, extra lines, the caution. */
export function provenanceLines(
  title: string,
  p: CsvProvenance,
  extra: readonly string[] = [],
): string {
  return [
    `# gridtriage ${p.version} ${title}`,
    `# network ${p.network} (input sha256 ${p.inputHash})`,
    `# pipeline ${p.pipeline}${
      p.pipelineName ? ` "${p.pipelineName}"` : ""
    } (config sha256 ${p.configHash})`,
    ...extra.map((l) => `# ${l}`),
    `# ${CAUTION}`,
  ].map((l) => l.replace(/[\r\n]+/g, " ")).join("\n") + "\n";
}

export function findingsCsv(findings: readonly Finding[], p: CsvProvenance): string {
  return provenanceLines("findings", p) + csv(
    [
      "feeder",
      "case",
      "severity",
      "code",
      "place_kind",
      "place",
      "value",
      "limit",
      "unit",
      "message",
    ],
    findings.map((f) => [
      f.feederId,
      f.caseId,
      f.severity,
      f.code,
      f.where.kind,
      f.where.id,
      roundForCsv(f.value),
      roundForCsv(f.limit),
      f.unit,
      f.message,
    ]),
  );
}

export function diagnosticsCsv(diagnostics: readonly Diagnostic[], p: CsvProvenance): string {
  return provenanceLines("diagnostics", p) + csv(
    [
      "severity",
      "code",
      "file",
      "line",
      "column",
      "field",
      "feeder",
      "message",
      "found",
      "expected",
    ],
    diagnostics.map((d) => [
      d.severity,
      d.code,
      d.at?.file ?? "",
      d.at?.line ?? "",
      d.at?.column ?? "",
      d.at?.field ?? "",
      d.feederId ?? "",
      d.message,
      d.found ?? "",
      d.expected ?? "",
    ]),
  );
}

function roundForCsv(v: number): number {
  return Math.round(v * 1e6) / 1e6;
}

/**
 * Where a feeder file comes from: tool and version, the config hash and the hash of the
 * feeder's own solver form (null for a feeder set aside before it had one) — the run
 * store's cache key, so a file taken from an earlier run says truly what made it.
 */
export interface FeederProvenance {
  readonly tool: string;
  readonly version: string;
  readonly configHash: string;
  readonly formHash: string | null;
}

/** The per-feeder result file: key figures, every case's buses and branches, findings. */
export function feederJson(
  summary: FeederSummary,
  study: FeederStudy | undefined,
  provenance: FeederProvenance,
  failure?: string,
): string {
  return JSON.stringify(
    {
      feederId: summary.feederId,
      provenance,
      status: study?.status ?? (failure !== undefined ? "failed" : summary.status),
      ...(failure === undefined ? {} : { failure }),
      summary,
      cases: study?.cases ?? [],
      findings: study?.findings ?? [],
      faults: study?.faults ?? null,
      coordination: study?.coordination ?? null,
      needs: study?.needs ?? [],
      headroom: study?.headroom ?? null,
      devices: study?.devices ?? [],
      hosting: study?.hosting ?? null,
      recovery: study?.recovery ?? null,
      diagnostics: study?.diagnostics ?? [],
      caution: CAUTION,
    },
    null,
    2,
  ) + "\n";
}

/** A file name for a feeder id: characters outside [A-Za-z0-9._-] become "_". */
export function feederFileName(feederId: string): string {
  return `${feederId.replace(/[^A-Za-z0-9._-]/g, "_")}.json`;
}

export interface RunRecord {
  /** Present on a shard run: which share of the fleet it holds. */
  readonly shard?: { readonly index: number; readonly count: number };
  readonly tool: string;
  readonly version: string;
  readonly command: string;
  readonly network: string;
  readonly pipeline: string;
  readonly pipelineName: string | null;
  readonly inputHash: string;
  readonly configHash: string;
  readonly startedAt: string;
  readonly finishedAt: string;
  /** How to run the same study again. */
  readonly reproduce?: {
    readonly command: string;
    readonly runtime: string;
    readonly check: string;
  };
  /** The pipeline config as parsed, every default filled in (what configHash is the hash of). */
  readonly config?: PipelineConfig;
  /** The files the run wrote into its folder. */
  readonly outputs?: readonly string[];
  /** Times of this run (like startedAt, they differ between identical runs). */
  readonly timing?: {
    readonly wallMs: number;
    readonly validateMs: number;
    /** Sum over feeders of the time spent studying them. */
    readonly solveMs: number;
    readonly workers: number;
    readonly cacheHits: number;
    /** Peak resident memory of the process, sampled every 100 ms, MB. */
    readonly peakRssMb: number;
  };
  readonly counts: {
    readonly feeders: number;
    readonly studied: number;
    readonly failed: number;
    readonly setAside: number;
    readonly findings: Readonly<Record<string, number>>;
    readonly diagnostics: Readonly<Record<string, number>>;
    /** Needs by class (absent in runs made before the ranking stage). */
    readonly needs?: Readonly<Record<string, number>>;
  };
}

/** What a run is, without when it ran: the provenance every deterministic output carries. */
export type RunProvenance = Omit<RunRecord, "startedAt" | "finishedAt" | "timing" | "outputs">;

export function runJson(record: RunRecord): string {
  return JSON.stringify({ ...record, caution: CAUTION }, null, 2) + "\n";
}

/** Counts of items by a key, keys in sorted order (for stable run.json). */
export function tallyBy<T>(xs: readonly T[], key: (x: T) => string): Record<string, number> {
  const out: Record<string, number> = {};
  for (const k of xs.map(key).sort()) out[k] = (out[k] ?? 0) + 1;
  return out;
}
