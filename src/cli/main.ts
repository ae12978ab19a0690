/**
 * gridtriage command line. The only layer that touches the terminal, the file system
 * (beyond reading input tables) and the exit code.
 *
 * Exit codes: 0 finished clean (warnings allowed), 1 finished but feeders were set aside
 * or errors were found, 2 usage or configuration error, 3 internal error (a bug).
 */
import { Command, CommanderError, InvalidArgumentError } from "@commander-js/extra-typings";
import { folderSource } from "../ingest/read_network.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { choosePaint } from "./paint.ts";
import { formatDiagnostic, formatValidation } from "./format_validation.ts";
import { loadPipelineConfig } from "../pipeline/load_pipeline_config.ts";
import { DEFAULT_STUDY_RUN_OPTIONS, runStudy, StudyInputError } from "./run_study.ts";
import { createProgress } from "./progress.ts";
import { MergeError, mergeRuns } from "./merge_runs.ts";
import { writeSynthFleet } from "./write_fleet.ts";
import { parseShard } from "../pipeline/shard.ts";
import { diffRuns, type FeederResultFile, formatDiff } from "../report/diff_runs.ts";
import { join } from "node:path";
import { formatStudySummary } from "./format_study.ts";
import { VERSION } from "./version.ts";

export const EXIT_CLEAN = 0;
export const EXIT_SET_ASIDE = 1;
export const EXIT_USAGE = 2;
export const EXIT_INTERNAL = 3;

class UsageError extends Error {}

async function checkDirectory(path: string): Promise<void> {
  let info: Deno.FileInfo;
  try {
    info = await Deno.stat(path);
  } catch {
    throw new UsageError(
      `Cannot open network folder "${path}": it does not exist or cannot be read`,
    );
  }
  if (!info.isDirectory) {
    throw new UsageError(`Network folder "${path}" is a file; expected a folder of CSV tables`);
  }
}

/** runStudy with the user's mistakes turned into usage errors. */
async function runStudyOrExplain(...args: Parameters<typeof runStudy>) {
  try {
    return await runStudy(...args);
  } catch (e) {
    if (e instanceof StudyInputError) throw new UsageError(e.message);
    throw e;
  }
}

/** Parses a whole number ≥ 0 for an option. */
function parseCount(text: string): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 0) {
    throw new InvalidArgumentError(`"${text}" is not a whole number ≥ 0`);
  }
  return n;
}

function parsePositive(text: string): number {
  const n = parseCount(text);
  if (n < 1) throw new InvalidArgumentError(`"${text}" must be at least 1`);
  return n;
}

function parseFloatOption(text: string): number {
  const n = Number(text);
  if (!Number.isFinite(n) || n < 0) throw new InvalidArgumentError(`"${text}" is not a number ≥ 0`);
  return n;
}

function buildProgram(setExit: (code: number) => void) {
  const program = new Command()
    .name("gridtriage")
    .description(
      "Screening studies of distribution feeders with distributed generation.\n" +
        "Results are screening studies: verify with a licensed engineer and local codes before acting.",
    )
    .version(VERSION)
    .showHelpAfterError()
    .exitOverride();

  program.command("validate")
    .description(
      "Read a network folder, check every table and the topology, and list the feeders\n" +
        "(valid or set aside) with every problem found, located by file, line and column.",
    )
    .argument("<network-dir>", "folder of network tables (see docs/network-format.md)")
    .option("--json", "print machine-readable JSON instead of text")
    .action(async (dir, options) => {
      await checkDirectory(dir);
      const result = await validateFleet(folderSource(dir));
      const { forms: _forms, ...fleet } = result.value;
      if (options.json) {
        console.log(JSON.stringify({ fleet, diagnostics: result.diagnostics }, null, 2));
      } else {
        const paint = choosePaint(Deno.stdout.isTerminal(), Deno.env.get("NO_COLOR"));
        console.log(formatValidation(result.value, result.diagnostics, paint));
      }
      const failed = result.diagnostics.some((d) => d.severity === "error") ||
        fleet.feeders.some((f) => f.status === "set_aside");
      setExit(failed ? EXIT_SET_ASIDE : EXIT_CLEAN);
    });
  program.command("study")
    .description(
      "Study every valid feeder of a network folder: load flow for each case of the pipeline, " +
        "voltage, voltage-change, thermal, reverse-power and loss checks. Writes run.json, " +
        "findings.csv, diagnostics.csv and feeders/<id>.json into the output folder.",
    )
    .argument("<network-dir>", "folder of network tables (see docs/network-format.md)")
    .option(
      "--pipeline <file>",
      "pipeline configuration (see docs/pipeline.md)",
      "pipelines/nightly.json",
    )
    .option("--out <dir>", "run folder to write", "reports/latest")
    .option(
      "--workers <n>",
      "worker threads (default: one per core; 0 studies in the main thread)",
      parseCount,
      DEFAULT_STUDY_RUN_OPTIONS.workers,
    )
    .option(
      "--timeout <seconds>",
      "longest one feeder may take before its worker is replaced",
      parseCount,
      300,
    )
    .option("--quiet", "no progress on stderr")
    .option(
      "--feeder <id>",
      "rerun only this feeder of the run already in --out (repeatable) and print what changed",
      (v: string, prev: string[]) => [...prev, v],
      [] as string[],
    )
    .option(
      "--store <file>",
      "run store (SQLite) for provenance and the cache",
      "reports/gridtriage.sqlite",
    )
    .option("--no-cache", "study every feeder even if the store holds an identical earlier result")
    .option(
      "--part-buses <n>",
      "study a very large export in parts of at most n buses each, so memory follows the part, not the fleet",
      parsePositive,
    )
    .option(
      "--shard <i/N>",
      "study only share i of N of the fleet (by a hash of the feeder id)",
      (v: string) => {
        const shard = parseShard(v);
        if (shard === undefined) {
          throw new InvalidArgumentError(
            `"${v}" is not of the form i/N with 1 ≤ i ≤ N`,
          );
        }
        return shard;
      },
    )
    .action(async (dir, options) => {
      await checkDirectory(dir);
      const config = await loadPipelineConfig(options.pipeline);
      const paint = choosePaint(Deno.stdout.isTerminal(), Deno.env.get("NO_COLOR"));
      const errPaint = choosePaint(Deno.stderr.isTerminal(), Deno.env.get("NO_COLOR"));
      for (const d of config.diagnostics) console.error(formatDiagnostic(d, errPaint));
      if (config.value === undefined) {
        throw new UsageError(
          `Pipeline config "${options.pipeline}" has errors; nothing was studied`,
        );
      }
      const progress = createProgress(
        options.quiet ? "quiet" : Deno.stderr.isTerminal() ? "tty" : "log",
      );
      const run = await runStudyOrExplain(dir, options.pipeline, config.value, options.out, {
        workers: options.workers,
        timeoutMs: options.timeout * 1000,
        storePath: options.store,
        useCache: options.cache,
        ...(options.feeder.length > 0 ? { onlyFeeders: options.feeder } : {}),
        ...(options.shard === undefined ? {} : { shard: options.shard }),
        ...(options.partBuses === undefined ? {} : { partBuses: options.partBuses }),
        onProgress: (done, total, failed) => progress.update(done, total, failed),
        onPhase: (text) => progress.note(text),
      });
      progress.finish();
      console.log(formatStudySummary(run, options.out, paint));
      const failed = run.record.counts.failed > 0 || run.record.counts.setAside > 0 ||
        run.diagnostics.some((d) => d.severity === "error");
      setExit(failed ? EXIT_SET_ASIDE : EXIT_CLEAN);
    });
  program.command("synth")
    .description(
      "Write a deterministic synthetic fleet in the network format (invented names and data, " +
        "realistic radial MV feeders) for benchmarks and large tests.",
    )
    .requiredOption("--feeders <n>", "number of feeders", parsePositive)
    .requiredOption("--buses <n>", "buses per feeder", parsePositive)
    .option("--seed <n>", "seed of the generator", parseCount, 1)
    .option(
      "--dg-penetration <share>",
      "generation as a share of peak demand",
      parseFloatOption,
      0.6,
    )
    .requiredOption("--out <dir>", "network folder to write")
    .action(async (options) => {
      const bytes = await writeSynthFleet({
        feeders: options.feeders,
        busesPerFeeder: options.buses,
        seed: options.seed,
        dgPenetration: options.dgPenetration,
      }, options.out);
      console.log(
        `Wrote ${options.feeders} synthetic feeders of ${options.buses} buses (${
          (bytes / 1e6).toFixed(1)
        } MB) to ${options.out}`,
      );
      setExit(EXIT_CLEAN);
    });

  program.command("merge")
    .description(
      "Combine the run folders of every shard of one study (study --shard i/N) into one run " +
        "folder, identical to a single-machine run but for the times in run.json.",
    )
    .argument("<shard-dirs...>", "the shard run folders, all N of them")
    .requiredOption("--out <dir>", "run folder to write")
    .action(async (dirs, options) => {
      try {
        const merged = await mergeRuns(dirs, options.out);
        console.log(
          `Merged ${dirs.length} shards: ${merged.counts.feeders} feeders into ${options.out}`,
        );
      } catch (e) {
        if (e instanceof MergeError) throw new UsageError(e.message);
        throw e;
      }
      setExit(EXIT_CLEAN);
    });

  program.command("diff")
    .description(
      "List the feeders whose status, key figures or findings differ between two run folders, " +
        "with before and after.",
    )
    .argument("<run-a>", "earlier run folder")
    .argument("<run-b>", "later run folder")
    .option("--json", "print machine-readable JSON instead of text")
    .action(async (a, b, options) => {
      const diffs = diffRuns(await readRunFeeders(a), await readRunFeeders(b));
      console.log(options.json ? JSON.stringify(diffs, null, 2) : formatDiff(diffs));
      setExit(EXIT_CLEAN);
    });
  return program;
}

/** The feeder result files of a run folder, by feeder id. */
async function readRunFeeders(runDir: string): Promise<Map<string, FeederResultFile>> {
  const dir = join(runDir, "feeders");
  const out = new Map<string, FeederResultFile>();
  try {
    for await (const e of Deno.readDir(dir)) {
      if (!e.isFile || !e.name.endsWith(".json")) continue;
      const f = JSON.parse(await Deno.readTextFile(join(dir, e.name))) as FeederResultFile;
      out.set(f.feederId, f);
    }
  } catch (e) {
    if (e instanceof SyntaxError) {
      throw new UsageError(`Run folder "${runDir}" holds a damaged feeder file`);
    }
    throw new UsageError(`Cannot read run folder "${runDir}": it has no feeders/ folder`);
  }
  return out;
}

/** Runs the CLI with arguments; returns the exit code instead of exiting. */
export async function runCli(args: readonly string[]): Promise<number> {
  let code = EXIT_CLEAN;
  const program = buildProgram((c) => (code = c));
  try {
    await program.parseAsync([...args], { from: "user" });
    return code;
  } catch (e) {
    if (e instanceof CommanderError) {
      return e.exitCode === 0 ? EXIT_CLEAN : EXIT_USAGE;
    }
    if (e instanceof UsageError) {
      console.error(`gridtriage: ${e.message}`);
      return EXIT_USAGE;
    }
    if (e instanceof Deno.errors.PermissionDenied) {
      console.error(`gridtriage: ${e.message.split("\n")[0]}`);
      return EXIT_USAGE;
    }
    console.error(
      `gridtriage: internal error: ${e instanceof Error ? e.message : String(e)}\n` +
        "This is a bug in gridtriage; please report it with the input that caused it.",
    );
    return EXIT_INTERNAL;
  }
}

if (import.meta.main) {
  Deno.exit(await runCli(Deno.args));
}
