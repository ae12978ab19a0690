/**
 * The fleet-level files of a run, built from its feeder files once every feeder is done:
 * `ranking.csv` and `fleet.json` (the ranked needs), `buses.parquet` and `branches.parquet`
 * (bus and branch results for analysts) and `report.html`. Feeder files are read one at a
 * time, in feeder-id order, so memory holds the ranking and one row per feeder, not the
 * fleet's results. Used by `study` and by `merge`, which therefore write the same bytes.
 */
import { join } from "node:path";
import type { PipelineConfig } from "../pipeline/pipeline_config.ts";
import type { FeederFile } from "../report/feeder_file.ts";
import type { FleetFeederRow, ReportContext } from "../report/report_context.ts";
import { renderFeederPage, renderReportHead, renderReportTail } from "../report/report_html.ts";
import type { RunProvenance } from "../report/run_files.ts";
import type { NeedClass, RankedNeed } from "../rank/need.ts";
import { rankNeeds } from "../rank/rank_needs.ts";
import { fleetJson, rankingCsv, type RankingProvenance } from "../report/ranking_files.ts";
import { createBusParquetWriter } from "../report/bus_parquet.ts";
import { createBranchParquetWriter } from "../report/branch_parquet.ts";
import { writeFileAtomic } from "./write_atomic.ts";
import { faultsCsvHead, faultsCsvRows } from "../report/faults_csv.ts";
import { protectionCsvHead, protectionCsvRows } from "../report/protection_csv.ts";
import {
  hostingCsvHead,
  hostingCsvRows,
  queueCsvHead,
  queueCsvRows,
} from "../report/hosting_csv.ts";
import { recoveryCsvHead, recoveryCsvRows } from "../report/recovery_csv.ts";
import { openAtomicFile } from "./open_atomic_file.ts";

export interface RunReportInput {
  readonly outDir: string;
  /** The run's feeder files, in any order. */
  readonly feederFiles: readonly { readonly feederId: string; readonly path: string }[];
  /** The run without its times, so the files stay byte-identical between identical runs. */
  readonly record: RunProvenance;
  readonly config: PipelineConfig;
}

export interface RunReports {
  readonly ranking: readonly RankedNeed[];
  readonly files: readonly string[];
}

export async function writeRunReports(input: RunReportInput): Promise<RunReports> {
  const { outDir, record, config } = input;
  const files = [...input.feederFiles].sort((a, b) => cmp(a.feederId, b.feederId));
  const provenance: RankingProvenance = {
    tool: record.tool,
    version: record.version,
    network: record.network,
    pipeline: record.pipeline,
    pipelineName: record.pipelineName,
    inputHash: record.inputHash,
    configHash: record.configHash,
    currency: config.costs.currency,
    costSource: config.costs.source,
  };
  const meta = {
    tool: record.tool,
    version: record.version,
    inputHash: record.inputHash,
    configHash: record.configHash,
  };
  const faults = await openAtomicFile(join(outDir, "faults.csv"));
  const encoder = new TextEncoder();
  await faults.write(encoder.encode(faultsCsvHead(provenance)));
  const protection = await openAtomicFile(join(outDir, "protection.csv"));
  await protection.write(encoder.encode(protectionCsvHead(provenance)));
  const hosting = await openAtomicFile(join(outDir, "hosting.csv"));
  await hosting.write(encoder.encode(hostingCsvHead(provenance)));
  const queue = await openAtomicFile(join(outDir, "queue.csv"));
  await queue.write(encoder.encode(queueCsvHead(provenance)));
  const recovery = await openAtomicFile(join(outDir, "recovery.csv"));
  await recovery.write(encoder.encode(recoveryCsvHead(provenance)));
  const buses = await openAtomicFile(join(outDir, "buses.parquet"));
  const branches = await openAtomicFile(join(outDir, "branches.parquet"));
  const rows: FleetFeederRow[] = [];
  const needs = [];
  try {
    const busWriter = createBusParquetWriter(meta, buses.write);
    const branchWriter = createBranchParquetWriter(meta, branches.write);
    for (const f of files) {
      const file = JSON.parse(await Deno.readTextFile(f.path)) as FeederFile;
      rows.push(fleetRow(file, config.ranking.classOrder));
      needs.push(...(file.needs ?? []));
      await busWriter.addFeeder(file);
      const faultRows = faultsCsvRows(file);
      if (faultRows !== "") await faults.write(encoder.encode(faultRows));
      const protectionRows = protectionCsvRows(file);
      if (protectionRows !== "") await protection.write(encoder.encode(protectionRows));
      const hostingRows = hostingCsvRows(file);
      if (hostingRows !== "") await hosting.write(encoder.encode(hostingRows));
      const queueRows = queueCsvRows(file);
      if (queueRows !== "") await queue.write(encoder.encode(queueRows));
      const recoveryRows = recoveryCsvRows(file);
      if (recoveryRows !== "") await recovery.write(encoder.encode(recoveryRows));
      await branchWriter.addFeeder(file);
    }
    await busWriter.finish();
    await branchWriter.finish();
    await buses.commit();
    await branches.commit();
    await faults.commit();
    await protection.commit();
    await hosting.commit();
    await queue.commit();
    await recovery.commit();
  } finally {
    await buses.abandon();
    await branches.abandon();
    await faults.abandon();
    await protection.abandon();
    await hosting.abandon();
    await queue.abandon();
    await recovery.abandon();
  }
  const ranking = rankNeeds(needs, config.ranking);
  await writeFileAtomic(join(outDir, "ranking.csv"), rankingCsv(ranking, provenance));
  await writeFileAtomic(
    join(outDir, "fleet.json"),
    fleetJson(rows, ranking, config.ranking, provenance),
  );
  await writeReportHtml(outDir, files, rows, ranking, record, config);
  return {
    ranking,
    files: [
      "ranking.csv",
      "fleet.json",
      "faults.csv",
      "protection.csv",
      "hosting.csv",
      "queue.csv",
      "recovery.csv",
      "buses.parquet",
      "branches.parquet",
      "report.html",
    ],
  };
}

/**
 * report.html: the overview, then a section per feeder — feeders with needs first, in the
 * order of their best-ranked need, then the others by id — up to output.reportFeederPages.
 */
async function writeReportHtml(
  outDir: string,
  files: readonly { readonly feederId: string; readonly path: string }[],
  rows: readonly FleetFeederRow[],
  ranking: readonly RankedNeed[],
  record: RunProvenance,
  config: PipelineConfig,
): Promise<void> {
  const ctx: ReportContext = {
    run: record,
    ranking,
    feeders: rows,
    limits: { voltageBand: config.limits.voltageBand, lvMaxKv: config.limits.lvMaxKv },
    costs: { currency: config.costs.currency, source: config.costs.source },
  };
  const firstRank = new Map<string, number>();
  for (const n of ranking) if (!firstRank.has(n.feederId)) firstRank.set(n.feederId, n.rank);
  const pages = [...files]
    .sort((a, b) =>
      (firstRank.get(a.feederId) ?? Infinity) - (firstRank.get(b.feederId) ?? Infinity) ||
      cmp(a.feederId, b.feederId)
    )
    .slice(0, config.output.reportFeederPages);
  const out = await openAtomicFile(join(outDir, "report.html"));
  const encoder = new TextEncoder();
  try {
    await out.write(encoder.encode(await renderReportHead(ctx)));
    for (const f of pages) {
      const file = JSON.parse(await Deno.readTextFile(f.path)) as FeederFile;
      await out.write(encoder.encode(await renderFeederPage(file, ctx)));
    }
    await out.write(encoder.encode(renderReportTail(ctx)));
    await out.commit();
  } finally {
    await out.abandon();
  }
}

/** The fleet table's row of a feeder, from its file. */
export function fleetRow(file: FeederFile, classOrder: readonly NeedClass[]): FleetFeederRow {
  const converged = file.cases.filter((c) => c.converged);
  const pick = (xs: number[], f: (...v: number[]) => number) => xs.length === 0 ? null : f(...xs);
  const needs = file.needs ?? [];
  let worstClass: NeedClass | null = null;
  for (const c of classOrder) {
    if (needs.some((n) => n.needClass === c)) {
      worstClass = c;
      break;
    }
  }
  return {
    feederId: file.feederId,
    status: file.status,
    vnKv: file.summary.vnKv,
    buses: file.summary.buses,
    customers: file.summary.customers,
    generationKw: file.summary.generationKw,
    vMinPu: pick(converged.map((c) => c.vMinPu), Math.min),
    vMaxPu: pick(converged.map((c) => c.vMaxPu), Math.max),
    maxLoadingPercent: pick(converged.map((c) => c.maxLoadingPercent), Math.max),
    headroomMw: file.headroom?.headroomMw ?? null,
    needs: needs.length,
    worstClass,
  };
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
