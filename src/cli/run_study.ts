/**
 * The `study` command: validate the fleet, study every valid feeder, and write the run
 * folder (feeders/<id>.json as each feeder finishes, then findings.csv, diagnostics.csv
 * and run.json last). Returns what the summary and the exit code need.
 */
import { join } from "node:path";
import { compareDiagnostics, type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { type FeederForm, listTransferables } from "../model/feeder_form.ts";
import { type PoolOutcome, type PoolTask, runPool } from "../pipeline/worker_pool.ts";
import type { StudyWorkerInit } from "../pipeline/study_worker.ts";
import { folderSource } from "../ingest/read_network.ts";
import { hashNetworkFolder } from "../ingest/hash_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { type FeederStudy, studyFeeder } from "../pipeline/study_feeder.ts";
import type { PipelineConfig } from "../pipeline/pipeline_config.ts";
import { hashPipelineConfig } from "../pipeline/hash_pipeline_config.ts";
import { compareFindings, type Finding } from "../checks/finding.ts";
import {
  diagnosticsCsv,
  feederFileName,
  feederJson,
  findingsCsv,
  runJson,
  type RunRecord,
} from "../report/run_files.ts";
import { writeFileAtomic } from "./write_atomic.ts";
import { VERSION } from "./version.ts";

export interface StudyRun {
  readonly record: RunRecord;
  readonly findings: readonly Finding[];
  readonly diagnostics: readonly Diagnostic[];
  readonly studies: readonly FeederStudy[];
}

export interface StudyRunOptions {
  /** Worker count; 0 studies in this thread (no crash isolation). */
  readonly workers: number;
  readonly timeoutMs: number;
  /** Test-only fault hook passed to the workers. */
  readonly faults?: StudyWorkerInit["faults"];
  readonly onProgress?: (done: number, total: number, failed: number) => void;
}

export const DEFAULT_STUDY_RUN_OPTIONS: StudyRunOptions = {
  workers: Math.max(1, navigator.hardwareConcurrency || 1),
  timeoutMs: 300_000,
};

const WORKER_URL = new URL("../pipeline/study_worker.ts", import.meta.url);

export async function runStudy(
  networkDir: string,
  pipelinePath: string,
  config: PipelineConfig,
  outDir: string,
  options: StudyRunOptions = DEFAULT_STUDY_RUN_OPTIONS,
): Promise<StudyRun> {
  const startedAt = new Date().toISOString();
  const [inputHash, configHash] = await Promise.all([
    hashNetworkFolder(networkDir),
    hashPipelineConfig(config),
  ]);
  const fleet = await validateFleet(folderSource(networkDir));
  const summaries = new Map(fleet.value.feeders.map((f) => [f.feederId, f]));
  const findings: Finding[] = [];
  const diagnostics: Diagnostic[] = [...fleet.diagnostics];
  const studies: FeederStudy[] = [];
  let failedToRun = 0;
  const writeFeeder = (id: string, study: FeederStudy | undefined, failure?: string) =>
    writeFileAtomic(
      join(outDir, "feeders", feederFileName(id)),
      feederJson(summaries.get(id)!, study, failure),
    );
  for (const f of fleet.value.feeders) {
    if (f.status === "set_aside") await writeFeeder(f.feederId, undefined);
  }
  const total = fleet.value.forms.length;
  let done = 0;
  const accept = async (outcome: PoolOutcome<FeederStudy>) => {
    done++;
    if (outcome.ok) {
      studies.push(outcome.value);
      findings.push(...outcome.value.findings);
      diagnostics.push(...outcome.value.diagnostics);
      await writeFeeder(outcome.id, outcome.value);
    } else {
      failedToRun++;
      diagnostics.push(makeDiagnostic(
        "study.failed",
        "error",
        `Feeder "${outcome.id}" could not be studied after ${outcome.attempts} attempt(s): ${outcome.reason}`,
        { feederId: outcome.id },
      ));
      await writeFeeder(outcome.id, undefined, outcome.reason);
    }
    options.onProgress?.(done, total, failedToRun);
  };
  if (options.workers <= 0) {
    for (const form of fleet.value.forms) {
      await accept({ id: form.feederId, ok: true, value: studyFeeder(form, config), attempts: 1 });
    }
  } else {
    const tasks = function* (): Generator<PoolTask<FeederForm>> {
      for (const form of fleet.value.forms) {
        yield { id: form.feederId, payload: form, transfer: listTransferables(form) };
      }
    };
    const init: StudyWorkerInit = {
      settings: config,
      ...(options.faults ? { faults: options.faults } : {}),
    };
    await runPool<FeederForm, FeederStudy>(
      tasks(),
      { workerUrl: WORKER_URL, workers: options.workers, timeoutMs: options.timeoutMs, init },
      accept,
    );
  }
  findings.sort(compareFindings);
  diagnostics.sort(compareDiagnostics);
  await writeFileAtomic(join(outDir, "findings.csv"), findingsCsv(findings));
  await writeFileAtomic(join(outDir, "diagnostics.csv"), diagnosticsCsv(diagnostics));
  const count = <T>(xs: readonly T[], key: (x: T) => string) => {
    const out: Record<string, number> = {};
    for (const x of xs) out[key(x)] = (out[key(x)] ?? 0) + 1;
    return out;
  };
  const record: RunRecord = {
    tool: "gridtriage",
    version: VERSION,
    command: "study",
    network: networkDir,
    pipeline: pipelinePath,
    pipelineName: config.name ?? null,
    inputHash,
    configHash,
    startedAt,
    finishedAt: new Date().toISOString(),
    counts: {
      feeders: fleet.value.feeders.length,
      studied: studies.filter((s) => s.status === "studied").length,
      failed: studies.filter((s) => s.status === "failed").length + failedToRun,
      setAside: fleet.value.feeders.filter((f) => f.status === "set_aside").length,
      findings: count(findings, (f) => f.severity),
      diagnostics: count(diagnostics, (d) => d.severity),
    },
  };
  await writeFileAtomic(join(outDir, "run.json"), runJson(record));
  return { record, findings, diagnostics, studies };
}
