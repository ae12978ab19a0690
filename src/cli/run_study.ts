/**
 * The `study` command: validate the fleet, study every valid feeder, and write the run
 * folder (feeders/<id>.json as each feeder finishes, then findings.csv, diagnostics.csv
 * and run.json last). Returns what the summary and the exit code need.
 */
import { join } from "node:path";
import { compareDiagnostics, type Diagnostic } from "../model/diagnostic.ts";
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

export async function runStudy(
  networkDir: string,
  pipelinePath: string,
  config: PipelineConfig,
  outDir: string,
): Promise<StudyRun> {
  const startedAt = new Date().toISOString();
  const [inputHash, configHash] = await Promise.all([
    hashNetworkFolder(networkDir),
    hashPipelineConfig(config),
  ]);
  const fleet = await validateFleet(folderSource(networkDir));
  const forms = new Map(fleet.value.forms.map((f) => [f.feederId, f]));
  const findings: Finding[] = [];
  const diagnostics: Diagnostic[] = [...fleet.diagnostics];
  const studies: FeederStudy[] = [];
  for (const summary of fleet.value.feeders) {
    const form = forms.get(summary.feederId);
    const study = form === undefined ? undefined : studyFeeder(form, config);
    if (study) {
      studies.push(study);
      findings.push(...study.findings);
      diagnostics.push(...study.diagnostics);
    }
    await writeFileAtomic(
      join(outDir, "feeders", feederFileName(summary.feederId)),
      feederJson(summary, study),
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
      failed: studies.filter((s) => s.status === "failed").length,
      setAside: fleet.value.feeders.filter((f) => f.status === "set_aside").length,
      findings: count(findings, (f) => f.severity),
      diagnostics: count(diagnostics, (d) => d.severity),
    },
  };
  await writeFileAtomic(join(outDir, "run.json"), runJson(record));
  return { record, findings, diagnostics, studies };
}
