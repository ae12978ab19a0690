/**
 * The `study` command: validate the fleet, study every valid feeder (taking unchanged
 * feeders from the run store's cache), and write the run folder — feeders/<id>.json as each
 * feeder finishes, then findings.csv, diagnostics.csv and run.json last. With `onlyFeeders`
 * it reruns just those feeders of the run already in the folder and reports what changed.
 */
import { join, resolve } from "node:path";
import { compareDiagnostics, type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { type FeederForm, listTransferables } from "../model/feeder_form.ts";
import { hashFeederForm } from "../model/hash_feeder_form.ts";
import { folderSource } from "../ingest/read_network.ts";
import { hashNetworkFolder } from "../ingest/hash_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { inShard, type Shard } from "../pipeline/shard.ts";
import { studyFeeder } from "../pipeline/study_feeder.ts";
import { type PackedStudy, packStudy } from "../pipeline/pack_study.ts";
import type { PipelineConfig } from "../pipeline/pipeline_config.ts";
import { hashPipelineConfig } from "../pipeline/hash_pipeline_config.ts";
import { type PoolOutcome, type PoolTask, runPool } from "../pipeline/worker_pool.ts";
import type { StudyTask, StudyWorkerInit } from "../pipeline/study_worker.ts";
import { compareFindings, type Finding } from "../checks/finding.ts";
import {
  diagnosticsCsv,
  feederFileName,
  feederJson,
  findingsCsv,
  runJson,
  type RunProvenance,
  type RunRecord,
  tallyBy,
} from "../report/run_files.ts";
import { type FeederRecord, openRunStore, type RunStore } from "./run_store.ts";
import { writeFileAtomic } from "./write_atomic.ts";
import { partitionNetwork } from "./partition_network.ts";
import { VERSION } from "./version.ts";
import { buildId } from "./build_id.ts";
import { writeRunReports } from "./write_run_reports.ts";
import type { RankedNeed } from "../rank/need.ts";
import type { Shard as ShardOf } from "../pipeline/shard.ts";

/** How to run the same study again, for run.json (the regulator's reproduction recipe). */
function reproduceNote(
  networkDir: string,
  pipelinePath: string,
  shard: ShardOf | undefined,
): { readonly command: string; readonly runtime: string; readonly check: string } {
  const shardOption = shard === undefined ? "" : ` --shard ${shard.index}/${shard.count}`;
  return {
    command:
      `gridtriage study ${networkDir} --pipeline ${pipelinePath} --out <new folder>${shardOption}`,
    runtime: `gridtriage ${VERSION} on Deno ${Deno.version.deno}`,
    check: "the same inputHash and configHash give the same findings, ranking and feeder files",
  };
}

export interface StudyRunOptions {
  /** Worker count; 0 studies in this thread (no crash isolation). */
  readonly workers: number;
  readonly timeoutMs: number;
  /** Run store (SQLite); undefined keeps no store and no cache. */
  readonly storePath?: string;
  /** Take unchanged feeders from the store (default true when there is a store). */
  readonly useCache?: boolean;
  /** Rerun only these feeders of the run already in the output folder. */
  readonly onlyFeeders?: readonly string[];
  /** Study a very large export in parts of at most this many buses (bounded memory). */
  readonly partBuses?: number;
  /** Study only this deterministic share of the fleet (see shard.ts). */
  readonly shard?: Shard;
  /** Test-only fault hook passed to the workers. */
  readonly faults?: StudyWorkerInit["faults"];
  readonly onProgress?: (done: number, total: number, failed: number) => void;
  /** Told when a phase starts: reading and validating, then studying. */
  readonly onPhase?: (text: string) => void;
}

export const DEFAULT_STUDY_RUN_OPTIONS: StudyRunOptions = {
  workers: Math.max(1, navigator.hardwareConcurrency || 1),
  timeoutMs: 300_000,
};

/** A rerun feeder before and after. */
export interface FeederChange {
  readonly feederId: string;
  readonly before: FeederRecord | undefined;
  readonly after: FeederRecord;
}

export interface StudyRun {
  readonly record: RunRecord;
  readonly findings: readonly Finding[];
  readonly diagnostics: readonly Diagnostic[];
  readonly cacheHits: number;
  readonly changes: readonly FeederChange[];
  /** Every need of the fleet, in rank order. */
  readonly ranking: readonly RankedNeed[];
}

const WORKER_URL = new URL("../pipeline/study_worker.ts", import.meta.url);

/** A problem with what the user asked for (exit code 2), not a bug. */
export class StudyInputError extends Error {}

/** A store record for a feeder with no study: set aside, or failed in its worker. */
function emptyRecord(
  feederId: string,
  formHash: string,
  resultFile: string,
  status: string,
): FeederRecord {
  return {
    feederId,
    formHash,
    status,
    resultFile,
    findings: [],
    diagnostics: [],
    vMinPu: null,
    vMaxPu: null,
    maxLoadingPercent: null,
    maxDgChangePercent: null,
    needs: [],
    headroom: null,
  };
}

export async function runStudy(
  networkDir: string,
  pipelinePath: string,
  config: PipelineConfig,
  outDir: string,
  options: StudyRunOptions = DEFAULT_STUDY_RUN_OPTIONS,
): Promise<StudyRun> {
  const startedAt = new Date().toISOString();
  const [inputHash, configHash, build] = await Promise.all([
    hashNetworkFolder(networkDir),
    hashPipelineConfig(config),
    buildId(),
  ]);
  const store: RunStore | undefined = options.storePath === undefined
    ? undefined
    : await openRunStore(options.storePath);
  try {
    const outAbs = resolve(outDir);
    const previous = store?.latestRun(outAbs);
    if (options.onlyFeeders !== undefined) {
      if (previous === undefined) {
        throw new StudyInputError(
          `No earlier run of "${outDir}" is in the run store; run the whole study into it first`,
        );
      }
      if (previous.configHash !== configHash || previous.version !== build) {
        throw new StudyInputError(
          `The run in "${outDir}" was made with another pipeline or tool version; ` +
            "rerun the whole study instead of single feeders",
        );
      }
    }
    const runId = store?.beginRun({
      network: networkDir,
      pipeline: pipelinePath,
      outDir: outAbs,
      inputHash,
      configHash,
      version: build,
      startedAt,
    });
    const t0 = performance.now();
    const feederProvenance = { tool: "gridtriage", version: VERSION, configHash };
    // Peak resident memory of the process (workers are threads of it), sampled.
    let peakRss = Deno.memoryUsage().rss;
    const sampler = setInterval(() => {
      peakRss = Math.max(peakRss, Deno.memoryUsage().rss);
    }, 100);
    try {
      // Very large exports are studied in parts (see partition_network.ts); a rerun of
      // single feeders reads the export whole.
      const parts = options.onlyFeeders === undefined && options.partBuses !== undefined
        ? await partitionNetwork(networkDir, join(outAbs, ".parts"), options.partBuses)
        : undefined;
      const sources = parts === undefined
        ? [folderSource(networkDir)]
        : Array.from({ length: parts.count }, (_, k) => parts.source(k));
      const records = new Map<string, FeederRecord>();
      const diagnostics: Diagnostic[] = [];
      const seenDiagnostics = new Set<string>();
      const fileOf = (id: string) => join(outAbs, "feeders", feederFileName(id));
      await Deno.mkdir(join(outAbs, "feeders"), { recursive: true });
      const keep = (r: FeederRecord) => {
        records.set(r.feederId, r);
        if (store !== undefined && runId !== undefined) {
          store.recordFeeder(runId, configHash, build, r);
        }
      };
      const only = options.onlyFeeders === undefined
        ? undefined
        : new Set(options.onlyFeeders.map((x) => x.toLowerCase()));
      let validateMs = 0, solveMs = 0, cacheHits = 0, failedToRun = 0, feederCount = 0;
      for (let p = 0; p < sources.length; p++) {
        const tv = performance.now();
        options.onPhase?.(
          parts === undefined
            ? `reading and validating ${networkDir}`
            : `reading and validating part ${p + 1} of ${parts.count} of ${networkDir}`,
        );
        const fleet = shareOf(await validateFleet(sources[p]!), options.shard);
        validateMs += performance.now() - tv;
        options.onPhase?.(
          `validated ${fleet.value.feeders.length} feeders in ${
            ((performance.now() - tv) / 1000).toFixed(1)
          } s`,
        );
        const summaries = new Map(fleet.value.feeders.map((f) => [f.feederId, f]));
        if (options.onlyFeeders !== undefined) {
          const known = new Set(fleet.value.feeders.map((f) => f.feederId.toLowerCase()));
          for (const id of options.onlyFeeders) {
            if (!known.has(id.toLowerCase())) {
              throw new StudyInputError(`Feeder "${id}" is not in this network`);
            }
          }
        }
        for (const d of fleet.diagnostics) {
          const key = JSON.stringify(d);
          if (seenDiagnostics.has(key)) continue; // tables every part holds report alike
          seenDiagnostics.add(key);
          diagnostics.push(d);
        }
        feederCount += fleet.value.feeders.length;
        for (const f of fleet.value.feeders) {
          if (f.status !== "set_aside") continue;
          await writeFileAtomic(
            fileOf(f.feederId),
            feederJson(f, undefined, { ...feederProvenance, formHash: null }),
          );
          keep(emptyRecord(f.feederId, "", fileOf(f.feederId), "set_aside"));
        }

        // What to compute, what to take from the store.
        const useCache = store !== undefined && (options.useCache ?? true);
        const toStudy: { form: FeederForm; hash: string }[] = [];
        for (const form of fleet.value.forms) {
          const hash = await hashFeederForm(form);
          const id = form.feederId;
          const earlier = only !== undefined && !only.has(id.toLowerCase())
            ? previous?.feeders.get(id)
            : only === undefined && useCache
            ? store!.findCached(id, hash, configHash, build)
            : undefined;
          const text = earlier === undefined ? undefined : await readIfPresent(earlier.resultFile);
          if (earlier !== undefined && text !== undefined) {
            if (resolve(earlier.resultFile) !== fileOf(id)) await writeFileAtomic(fileOf(id), text);
            keep({ ...earlier, resultFile: fileOf(id) });
            cacheHits++;
            continue;
          }
          toStudy.push({ form, hash });
        }

        const hashes = new Map(toStudy.map((t) => [t.form.feederId, t.hash]));
        const total = toStudy.length;
        let done = 0;
        const accept = async (outcome: PoolOutcome<PackedStudy>) => {
          done++;
          const id = outcome.id;
          if (outcome.ok) {
            solveMs += outcome.workMs;
            const { fileText, ...figures } = outcome.value;
            await writeFileAtomic(fileOf(id), fileText);
            keep({ feederId: id, formHash: hashes.get(id)!, resultFile: fileOf(id), ...figures });
          } else {
            failedToRun++;
            const failure = makeDiagnostic(
              "study.failed",
              "error",
              `Feeder "${id}" could not be studied after ${outcome.attempts} attempt(s): ${outcome.reason}`,
              { feederId: id },
            );
            await writeFileAtomic(
              fileOf(id),
              feederJson(
                summaries.get(id)!,
                undefined,
                { ...feederProvenance, formHash: hashes.get(id)! },
                outcome.reason,
              ),
            );
            keep({
              ...emptyRecord(id, hashes.get(id)!, fileOf(id), "failed"),
              diagnostics: [failure],
            });
          }
          options.onProgress?.(done, total, failedToRun);
        };
        if (options.workers <= 0 || total === 0) {
          for (const { form } of toStudy) {
            const t = performance.now();
            const value = packStudy(summaries.get(form.feederId)!, studyFeeder(form, config), {
              ...feederProvenance,
              formHash: hashes.get(form.feederId)!,
            });
            await accept({
              id: form.feederId,
              ok: true,
              value,
              attempts: 1,
              workMs: performance.now() - t,
            });
          }
        } else {
          const tasks = function* (): Generator<PoolTask<StudyTask>> {
            for (const { form } of toStudy) {
              yield {
                id: form.feederId,
                payload: {
                  form,
                  summary: summaries.get(form.feederId)!,
                  formHash: hashes.get(form.feederId)!,
                },
                transfer: listTransferables(form),
              };
            }
          };
          const init: StudyWorkerInit = {
            settings: config,
            provenance: feederProvenance,
            ...(options.faults ? { faults: options.faults } : {}),
          };
          await runPool<StudyTask, PackedStudy>(
            tasks(),
            { workerUrl: WORKER_URL, workers: options.workers, timeoutMs: options.timeoutMs, init },
            accept,
          );
        }
      }
      if (parts !== undefined) await Deno.remove(join(outAbs, ".parts"), { recursive: true });
      const all = [...records.values()];
      const findings = all.flatMap((r) => r.findings).sort(compareFindings);
      diagnostics.push(...all.flatMap((r) => r.diagnostics));
      diagnostics.sort(compareDiagnostics);
      const studied = all.filter((r) => r.status === "studied").length;
      const failed = all.filter((r) => r.status === "failed").length;
      const setAside = all.filter((r) => r.status === "set_aside").length;
      const needCounts = tallyBy(all.flatMap((r) => r.needs), (n) => n.needClass);
      const provenance: RunProvenance = {
        ...(options.shard === undefined ? {} : { shard: options.shard }),
        tool: "gridtriage",
        version: VERSION,
        command: "study",
        network: networkDir,
        pipeline: pipelinePath,
        pipelineName: config.name ?? null,
        inputHash,
        configHash,
        reproduce: reproduceNote(networkDir, pipelinePath, options.shard),
        config,
        counts: {
          feeders: feederCount,
          studied,
          failed,
          setAside,
          findings: tallyBy(findings, (f) => f.severity),
          diagnostics: tallyBy(diagnostics, (d) => d.severity),
          needs: needCounts,
        },
      };
      await writeFileAtomic(join(outAbs, "findings.csv"), findingsCsv(findings, provenance));
      await writeFileAtomic(
        join(outAbs, "diagnostics.csv"),
        diagnosticsCsv(diagnostics, provenance),
      );
      const reports = await writeRunReports({
        outDir: outAbs,
        feederFiles: all.map((r) => ({ feederId: r.feederId, path: r.resultFile })),
        record: provenance,
        config,
      });
      const record: RunRecord = {
        ...provenance,
        startedAt,
        finishedAt: new Date().toISOString(),
        timing: {
          wallMs: Math.round(performance.now() - t0),
          validateMs: Math.round(validateMs),
          solveMs: Math.round(solveMs),
          workers: options.workers,
          cacheHits,
          peakRssMb: Math.round(Math.max(peakRss, Deno.memoryUsage().rss) / 2 ** 20),
        },
        outputs: [
          "findings.csv",
          "diagnostics.csv",
          ...reports.files,
          "feeders/",
        ],
      };
      await writeFileAtomic(join(outAbs, "run.json"), runJson(record));
      if (store !== undefined && runId !== undefined) {
        store.finishRun(runId, record.finishedAt, record.counts);
      }
      const changes: FeederChange[] = only === undefined ? [] : [...records.values()]
        .filter((r) => only.has(r.feederId.toLowerCase()))
        .map((after) => ({
          feederId: after.feederId,
          before: previous?.feeders.get(after.feederId),
          after,
        }));
      return { record, findings, diagnostics, cacheHits, changes, ranking: reports.ranking };
    } finally {
      clearInterval(sampler);
    }
  } finally {
    store?.close();
  }
}

async function readIfPresent(path: string): Promise<string | undefined> {
  try {
    return await Deno.readTextFile(path);
  } catch {
    return undefined;
  }
}

/**
 * The share of a validated fleet a shard studies: its feeders, their diagnostics, and — in
 * shard 1 only — the diagnostics that belong to no feeder, so a merge holds each once.
 */
function shareOf(
  fleet: Awaited<ReturnType<typeof validateFleet>>,
  shard: Shard | undefined,
): Awaited<ReturnType<typeof validateFleet>> {
  if (shard === undefined) return fleet;
  const mine = (id: string) => inShard(id, shard);
  return {
    value: {
      ...fleet.value,
      feeders: fleet.value.feeders.filter((f) => mine(f.feederId)),
      forms: fleet.value.forms.filter((f) => mine(f.feederId)),
    },
    diagnostics: fleet.diagnostics.filter((d) =>
      d.feederId === undefined ? shard.index === 1 : mine(d.feederId.split(",")[0]!)
    ),
  };
}
