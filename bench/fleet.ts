/**
 * Fleet-scale benchmark (a script, not a timed test): synthesises fleets, runs the whole
 * study from the command line as a separate process, and writes feeders per second,
 * nanoseconds per bus, peak memory (the study's own sample, in run.json) and the
 * single-feeder rerun time to BENCHMARKS.md.
 *
 *   deno task bench:fleet            # the full series (tens of minutes)
 *   deno task bench:fleet --quick    # small sizes, to check the script itself
 */
import { join } from "node:path";

const quick = Deno.args.includes("--quick");
const ROOT = "reports/bench";
const PERMS = [
  "--allow-read",
  "--allow-write=reports",
  "--allow-env=NO_COLOR,FORCE_COLOR,CLICOLOR_FORCE,TERM",
];
const WORKERS = Math.max(1, navigator.hardwareConcurrency || 1);

/** Runs the CLI as a separate process; returns its wall time. */
async function cli(args: string[]): Promise<number> {
  const t0 = performance.now();
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", ...PERMS, "src/cli/main.ts", ...args],
    stdout: "null",
    stderr: "piped",
  }).output();
  if (out.code > 1) {
    throw new Error(`gridtriage ${args.join(" ")}: ${new TextDecoder().decode(out.stderr)}`);
  }
  return (performance.now() - t0) / 1000;
}

interface Row {
  label: string;
  feeders: number;
  buses: number;
  wallS: number;
  validateS: number;
  solveS: number;
  peakRssMb: number;
}

async function studyFleet(
  label: string,
  feeders: number,
  buses: number,
  extra: string[] = [],
): Promise<Row> {
  const net = join(ROOT, `${feeders}x${buses}`, "network");
  const out = join(ROOT, `${feeders}x${buses}`, extra.length > 0 ? "run-parts" : "run");
  await Deno.remove(out, { recursive: true }).catch(() => {});
  if (!(await Deno.stat(net).then(() => true).catch(() => false))) {
    await cli([
      "synth",
      "--feeders",
      String(feeders),
      "--buses",
      String(buses),
      "--seed",
      "7",
      "--out",
      net,
    ]);
  }
  const wallS = await cli([
    "study",
    net,
    "--out",
    out,
    "--no-cache",
    "--quiet",
    "--store",
    join(ROOT, "store.sqlite"),
    ...extra,
  ]);
  const run = JSON.parse(await Deno.readTextFile(join(out, "run.json")));
  const row: Row = {
    label,
    feeders,
    buses,
    wallS,
    validateS: run.timing.validateMs / 1000,
    solveS: run.timing.solveMs / 1000,
    peakRssMb: run.timing.peakRssMb,
  };
  console.log(JSON.stringify(row));
  return row;
}

const main = quick ? [100, 50] : [1000, 500];
const series = quick
  ? [[200, 100], [20, 1000]]
  : [[2000, 100], [200, 1000], [20, 10_000], [2, 100_000]];
await Deno.remove(ROOT, { recursive: true }).catch(() => {});
const rows: Row[] = [await studyFleet("main", main[0]!, main[1]!)];
const partBuses = String(main[0]! * main[1]! / 10);
rows.push(await studyFleet("main, in parts", main[0]!, main[1]!, ["--part-buses", partBuses]));
for (const [f, b] of series) rows.push(await studyFleet("scaling", f!, b!));

// Single-feeder rerun on the main fleet, start-up included.
const mainDir = join(ROOT, `${main[0]}x${main[1]}`);
let firstFeeder = "";
for await (const e of Deno.readDir(join(mainDir, "run", "feeders"))) {
  const id = JSON.parse(await Deno.readTextFile(join(mainDir, "run", "feeders", e.name))).feederId;
  if (firstFeeder === "" || id < firstFeeder) firstFeeder = id;
}
const rerunWallS = await cli([
  "study",
  join(mainDir, "network"),
  "--out",
  join(mainDir, "run"),
  "--feeder",
  firstFeeder,
  "--quiet",
  "--store",
  join(ROOT, "store.sqlite"),
]);

const f = (v: number, d = 1) => v.toFixed(d);
const table = [
  "| fleet | feeders × buses | wall s | feeders/s | ns per bus (wall) | ns per bus (solve, summed) | ingest s | overhead vs solve | peak RSS MB |",
  "| ----- | --------------- | ------ | --------- | ----------------- | -------------------------- | -------- | ----------------- | ----------- |",
  ...rows.map((r) => {
    const total = r.feeders * r.buses;
    const solveWall = r.solveS / WORKERS;
    const overhead = solveWall > 0 ? (r.wallS - solveWall) / solveWall : NaN;
    return `| ${r.label} | ${r.feeders} × ${r.buses} | ${f(r.wallS)} | ${
      f(r.feeders / r.wallS, 2)
    } | ${f(1e9 * r.wallS / total, 0)} | ${f(1e9 * r.solveS / total, 0)} | ${f(r.validateS)} | ${
      f(100 * overhead, 0)
    } % | ${f(r.peakRssMb, 0)} |`;
  }),
];
const section = [
  "<!-- fleet:begin -->",
  `Measured ${new Date().toISOString().slice(0, 10)} with \`deno task bench:fleet${
    quick ? " --quick" : ""
  }\`, ` +
  `${WORKERS} workers, synthetic fleets (\`gridtriage synth\`, seed 7), the nightly pipeline (three cases, every check).`,
  "",
  ...table,
  "",
  `Single-feeder rerun (\`study … --feeder ${firstFeeder}\`) on the ${main[0]} × ${
    main[1]
  } fleet, ` +
  `start-up included: ${f(rerunWallS, 2)} s wall, peak RSS ${
    f(JSON.parse(await Deno.readTextFile(join(mainDir, "run", "run.json"))).timing.peakRssMb, 0)
  } MB.`,
  "",
  "Overhead vs solve = (wall − summed solve time / workers) / (summed solve time / workers): what ingest, " +
  'the pool and writing add to the solving itself. "main, in parts" is the same study with ' +
  "`--part-buses` at a tenth of the fleet's buses.",
  "<!-- fleet:end -->",
].join("\n");
const doc = await Deno.readTextFile("BENCHMARKS.md");
const next = doc.includes("<!-- fleet:begin -->")
  ? doc.replace(/<!-- fleet:begin -->[\s\S]*<!-- fleet:end -->/, section)
  : `${doc.trimEnd()}\n\n## Fleet study\n\n\`\`\`sh\ndeno task bench:fleet\n\`\`\`\n\n${section}\n`;
await Deno.writeTextFile("BENCHMARKS.md", next);
console.log(section);
