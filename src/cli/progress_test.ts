import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { createProgress, progressLine } from "./progress.ts";

Deno.test("progressLine() shows done/total, rate, time left and failures", () => {
  assertEquals(progressLine(50, 200, 0, 10), "studied 50/200 feeders · 5.0/s · 30 s left");
  assertEquals(
    progressLine(50, 200, 2, 10),
    "studied 50/200 feeders · 5.0/s · 30 s left · 2 failed",
  );
  assertEquals(progressLine(0, 10, 0, 0), "studied 0/10 feeders · 0.0/s · – left");
  assert(progressLine(1, 10_000, 0, 1).includes("2 h 47 min left"));
});

Deno.test("createProgress() logs every few seconds off a terminal and stays silent when quiet", () => {
  let clock = 0;
  const out: string[] = [];
  const log = createProgress("log", (t) => out.push(t), () => clock, 5000);
  for (let i = 1; i <= 10; i++) {
    clock = i * 1000;
    log.update(i, 10, 0);
  }
  // One line at 5 s and one at the end (10 of 10).
  assertEquals(out.length, 2);
  assert(out.every((l) => l.endsWith("\n")));
  const quiet: string[] = [];
  const q = createProgress("quiet", (t) => quiet.push(t), () => 0);
  q.update(1, 2, 0);
  q.finish();
  assertEquals(quiet, []);
});

Deno.test("createProgress() rewrites one line on a terminal and clears it at the end", () => {
  const out: string[] = [];
  const tty = createProgress("tty", (t) => out.push(t), () => 1000);
  tty.update(1, 2, 0);
  tty.finish();
  assert(out[0]!.startsWith("\r") && out[0]!.endsWith("\x1b[K"));
  assertEquals(out.at(-1), "\r\x1b[K");
});

Deno.test("createProgress() notes phases on their own line, and nothing when quiet", () => {
  const out: string[] = [];
  const log = createProgress("log", (t) => out.push(t), () => 0);
  log.note("validated 3 feeders in 0.1 s");
  assertEquals(out, ["validated 3 feeders in 0.1 s\n"]);
  const quiet: string[] = [];
  createProgress("quiet", (t) => quiet.push(t), () => 0).note("x");
  assertEquals(quiet, []);
});
