/**
 * The `merge` command: combines the run folders of the shards of one study into one run
 * folder, identical to what a single machine would have written (but for the times in
 * run.json). Refuses shards of different inputs, configs or tool versions, and incomplete
 * or repeated shard sets.
 */
import { join } from "node:path";
import { compareDiagnostics, type Diagnostic } from "../model/diagnostic.ts";
import { compareFindings, type Finding } from "../checks/finding.ts";
import {
  diagnosticsCsv,
  findingsCsv,
  runJson,
  type RunRecord,
  tallyBy,
} from "../report/run_files.ts";
import { parseDiagnosticsCsv, parseFindingsCsv } from "../report/read_run_files.ts";
import { writeFileAtomic } from "./write_atomic.ts";
import { writeRunReports } from "./write_run_reports.ts";
import { hashPipelineConfig } from "../pipeline/hash_pipeline_config.ts";

/** Counts by key added over several tallies, keys in sorted order. */
function sumTallies(tallies: readonly Readonly<Record<string, number>>[]): Record<string, number> {
  const total: Record<string, number> = {};
  for (const t of tallies) for (const [k, n] of Object.entries(t)) total[k] = (total[k] ?? 0) + n;
  return Object.fromEntries(Object.entries(total).sort(([a], [b]) => (a < b ? -1 : 1)));
}

export class MergeError extends Error {}

export async function mergeRuns(shardDirs: readonly string[], outDir: string): Promise<RunRecord> {
  const records: RunRecord[] = [];
  for (const dir of shardDirs) {
    let text: string;
    try {
      text = await Deno.readTextFile(join(dir, "run.json"));
    } catch {
      throw new MergeError(`"${dir}" is not a run folder: it has no run.json`);
    }
    records.push(JSON.parse(text) as RunRecord);
  }
  const first = records[0];
  if (first === undefined) throw new MergeError("no shard folders given");
  const count = first.shard?.count;
  if (count === undefined) throw new MergeError(`"${shardDirs[0]}" is not a shard run`);
  const seen = new Set<number>();
  records.forEach((r, i) => {
    const same = r.inputHash === first.inputHash && r.configHash === first.configHash &&
      r.version === first.version && r.shard?.count === count;
    if (!same) {
      throw new MergeError(
        `"${
          shardDirs[i]
        }" is a shard of another study (input, pipeline, version or shard count differ)`,
      );
    }
    if (seen.has(r.shard!.index)) {
      throw new MergeError(`shard ${r.shard!.index}/${count} is given twice`);
    }
    seen.add(r.shard!.index);
  });
  const missing = Array.from({ length: count }, (_, i) => i + 1).filter((i) => !seen.has(i));
  if (missing.length > 0) {
    throw new MergeError(`shards ${missing.map((i) => `${i}/${count}`).join(", ")} are missing`);
  }

  // The config the shards ran with, as run.json holds it; its hash must be the one recorded.
  const config = first.config;
  if (config === undefined || await hashPipelineConfig(config) !== first.configHash) {
    throw new MergeError(
      `"${shardDirs[0]}" does not hold the pipeline config it was run with; rerun the shards`,
    );
  }

  const findings: Finding[] = [];
  const feederFiles: { feederId: string; path: string }[] = [];
  const diagnostics: Diagnostic[] = [];
  for (const dir of shardDirs) {
    findings.push(...parseFindingsCsv(await Deno.readTextFile(join(dir, "findings.csv"))));
    diagnostics.push(...parseDiagnosticsCsv(await Deno.readTextFile(join(dir, "diagnostics.csv"))));
    await Deno.mkdir(join(outDir, "feeders"), { recursive: true });
    for await (const e of Deno.readDir(join(dir, "feeders"))) {
      if (!e.isFile || !e.name.endsWith(".json")) continue;
      const text = await Deno.readTextFile(join(dir, "feeders", e.name));
      await writeFileAtomic(join(outDir, "feeders", e.name), text);
      const { feederId } = JSON.parse(text) as { feederId: string };
      feederFiles.push({ feederId, path: join(outDir, "feeders", e.name) });
    }
  }
  findings.sort(compareFindings);
  diagnostics.sort(compareDiagnostics);
  const sum = (k: "feeders" | "studied" | "failed" | "setAside") =>
    records.reduce((s, r) => s + r.counts[k], 0);
  const { shard: _shard, timing: _timing, startedAt: _s, finishedAt: _f, outputs, ...base } = first;
  const counts = {
    feeders: sum("feeders"),
    studied: sum("studied"),
    failed: sum("failed"),
    setAside: sum("setAside"),
    findings: tallyBy(findings, (f) => f.severity),
    diagnostics: tallyBy(diagnostics, (d) => d.severity),
    needs: sumTallies(records.map((r) => r.counts.needs ?? {})),
  };
  const reproduce = base.reproduce === undefined ? {} : {
    reproduce: { ...base.reproduce, command: base.reproduce.command.replace(/ --shard \S+$/, "") },
  };
  const provenance = { ...base, ...reproduce, counts };
  await writeFileAtomic(join(outDir, "findings.csv"), findingsCsv(findings, provenance));
  await writeFileAtomic(join(outDir, "diagnostics.csv"), diagnosticsCsv(diagnostics, provenance));
  await writeRunReports({ outDir, feederFiles, record: provenance, config });
  const merged: RunRecord = {
    ...provenance,
    startedAt: records.map((r) => r.startedAt).sort()[0]!,
    finishedAt: records.map((r) => r.finishedAt).sort().at(-1)!,
    ...(outputs === undefined ? {} : { outputs }),
  };
  await writeFileAtomic(join(outDir, "run.json"), runJson(merged));
  return merged;
}
