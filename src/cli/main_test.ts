/** The CLI's contract: exit codes, JSON output, colour rules. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { EXIT_CLEAN, EXIT_SET_ASIDE, EXIT_USAGE, runCli } from "./main.ts";
import { choosePaint, NO_PAINT } from "./paint.ts";

/** Runs the CLI capturing what it prints. */
async function capture(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [], err: string[] = [];
  const log = console.log, error = console.error;
  console.log = (...a: unknown[]) => out.push(a.join(" "));
  console.error = (...a: unknown[]) => err.push(a.join(" "));
  // commander writes help and errors to process streams.
  const proc = (await import("node:process")).default;
  const w1 = proc.stdout.write, w2 = proc.stderr.write;
  proc.stdout.write = ((s: string) => (out.push(String(s)), true)) as typeof proc.stdout.write;
  proc.stderr.write = ((s: string) => (err.push(String(s)), true)) as typeof proc.stderr.write;
  try {
    const code = await runCli(args);
    return { code, out: out.join("\n"), err: err.join("\n") };
  } finally {
    console.log = log;
    console.error = error;
    proc.stdout.write = w1;
    proc.stderr.write = w2;
  }
}

Deno.test("runCli() validate exits 0 on the clean sample fleet and lists its feeders", async () => {
  const { code, out } = await capture(["validate", "data-samples/norvessa"]);
  assertEquals(code, EXIT_CLEAN);
  assert(out.includes("13 feeders, 13 valid, 0 set aside"), out);
  assert(out.includes("Screening study"), "the caution is printed");
});

Deno.test("runCli() validate --json prints the fleet and diagnostics as JSON", async () => {
  const { code, out } = await capture(["validate", "data-samples/norvessa", "--json"]);
  assertEquals(code, EXIT_CLEAN);
  const parsed = JSON.parse(out);
  assertEquals(parsed.fleet.feeders.length, 13);
  assert(Array.isArray(parsed.diagnostics));
  assertEquals(parsed.fleet.forms, undefined);
});

Deno.test("runCli() validate exits 1 when feeders are set aside", async () => {
  const { code, out } = await capture(["validate", "data-samples/with-errors"]);
  assertEquals(code, EXIT_SET_ASIDE);
  assert(out.includes("set aside"));
});

Deno.test("runCli() exits 2 on usage errors without a stack trace", async () => {
  for (
    const args of [["frobnicate"], ["validate"], ["validate", "no/such/folder"], [
      "validate",
      "README.md",
    ], ["--bogus"]]
  ) {
    const { code, err } = await capture(args);
    assertEquals(code, EXIT_USAGE, args.join(" "));
    assert(!/\bat .*\.ts:\d+/.test(err), `no stack trace for ${args.join(" ")}`);
  }
});

Deno.test("runCli() --help exits 0 on every command", async () => {
  for (const args of [["--help"], ["validate", "--help"], ["--version"]]) {
    const { code, out } = await capture(args);
    assertEquals(code, EXIT_CLEAN);
    assert(out.length > 0);
  }
});

Deno.test("choosePaint() colours only a terminal without NO_COLOR (no-color.org convention)", () => {
  const cases: [boolean, string | undefined, boolean][] = [
    [true, undefined, true],
    [true, "", true],
    [true, "1", false],
    [false, undefined, false],
    [false, "1", false],
  ];
  for (const [tty, noColor, coloured] of cases) {
    const paint = choosePaint(tty, noColor);
    assertEquals(paint !== NO_PAINT, coloured, `tty=${tty} NO_COLOR=${noColor}`);
    assertEquals(paint.red("x") !== "x", coloured);
  }
});

Deno.test("runCli() study writes a run folder and exits 0 on the clean sample fleet", async () => {
  const out = "reports/.test-tmp/cli-study";
  try {
    const { code, out: text } = await capture(["study", "data-samples/norvessa", "--out", out]);
    assertEquals(code, EXIT_CLEAN);
    assert(text.includes("Studied 13 of 13 feeders"), text);
    assert(text.includes("voltage.dg_change"), "the rural feeder's finding is summarised");
    const findings = await Deno.readTextFile(`${out}/findings.csv`);
    // Provenance and the caution in `#` lines, then the header.
    assert(findings.startsWith("# gridtriage "));
    assert(
      findings.split("\n").find((l) => !l.startsWith("#"))!.startsWith(
        "feeder,case,severity,code,",
      ),
    );
  } finally {
    await Deno.remove(out, { recursive: true }).catch(() => {});
  }
});

Deno.test("runCli() study exits 2 with located errors for a bad pipeline file", async () => {
  const bad = "reports/.test-tmp/bad-pipeline.json";
  await Deno.mkdir("reports/.test-tmp", { recursive: true });
  await Deno.writeTextFile(bad, '{ "cases": [ { "id": "x", "demand": "often" } ] }\n');
  try {
    const { code, err } = await capture([
      "study",
      "data-samples/norvessa",
      "--pipeline",
      bad,
      "--out",
      "reports/.test-tmp/never",
    ]);
    assertEquals(code, EXIT_USAGE);
    assert(/bad-pipeline\.json:1:\d+: error config\.invalid/.test(err), err);
    assert(!/\bat .*\.ts:\d+/.test(err));
  } finally {
    await Deno.remove(bad).catch(() => {});
  }
});

Deno.test("runCli() synth writes a fleet that validates clean, and diff of a run with itself is empty", async () => {
  const dir = "reports/.test-tmp/cli-synth";
  try {
    const s = await capture([
      "synth",
      "--feeders",
      "6",
      "--buses",
      "30",
      "--seed",
      "5",
      "--out",
      `${dir}/net`,
    ]);
    assertEquals(s.code, EXIT_CLEAN);
    const v = await capture(["validate", `${dir}/net`]);
    assertEquals(v.code, EXIT_CLEAN);
    assert(v.out.includes("6 feeders, 6 valid, 0 set aside"), v.out);
    await capture([
      "study",
      `${dir}/net`,
      "--out",
      `${dir}/run`,
      "--workers",
      "0",
      "--store",
      `${dir}/s.sqlite`,
    ]);
    const d = await capture(["diff", `${dir}/run`, `${dir}/run`]);
    assertEquals(d.code, EXIT_CLEAN);
    assertEquals(d.out.trim(), "No feeder changed.");
    assertEquals((await capture(["diff", `${dir}/run`, `${dir}/none`])).code, EXIT_USAGE);
  } finally {
    await Deno.remove(dir, { recursive: true }).catch(() => {});
  }
});

Deno.test("runCli() study --feeder exits 2 when the run folder has no earlier run or the feeder is unknown", async () => {
  const dir = "reports/.test-tmp/cli-rerun";
  try {
    const store = ["--store", `${dir}/s.sqlite`, "--workers", "0", "--quiet"];
    const none = await capture([
      "study",
      "data-samples/norvessa",
      "--out",
      `${dir}/run`,
      "--feeder",
      "MOR-L1",
      ...store,
    ]);
    assertEquals(none.code, EXIT_USAGE);
    assert(/No earlier run/.test(none.err), none.err);
    await capture(["study", "data-samples/norvessa", "--out", `${dir}/run`, ...store]);
    const unknown = await capture([
      "study",
      "data-samples/norvessa",
      "--out",
      `${dir}/run`,
      "--feeder",
      "NOPE",
      ...store,
    ]);
    assertEquals(unknown.code, EXIT_USAGE);
    assert(/Feeder "NOPE" is not in this network/.test(unknown.err), unknown.err);
    const ok = await capture([
      "study",
      "data-samples/norvessa",
      "--out",
      `${dir}/run`,
      "--feeder",
      "MOR-L1",
      ...store,
    ]);
    assertEquals(ok.code, EXIT_CLEAN);
    assert(ok.out.includes("Feeder MOR-L1:"), ok.out);
  } finally {
    await Deno.remove(dir, { recursive: true }).catch(() => {});
  }
});
