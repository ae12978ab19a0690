/**
 * Scale-out: three shard processes of the CLI and a merge give the same run folder, byte
 * for byte, as one process studying the whole fleet (run.json differs only in its times).
 */
import { readTree } from "./fixtures/read_tree.ts";
import { deepStrictEqual as assertEquals } from "node:assert/strict";

const TMP = "reports/.test-tmp/shards";
const PERMS = [
  "--allow-read",
  "--allow-write=reports",
  "--allow-env=NO_COLOR,FORCE_COLOR,CLICOLOR_FORCE,TERM",
];

async function cli(...args: string[]): Promise<void> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", ...PERMS, "src/cli/main.ts", ...args],
    stdout: "piped",
    stderr: "piped",
  }).output();
  if (out.code !== 0 && out.code !== 1) {
    throw new Error(
      `gridtriage ${args.join(" ")} exited ${out.code}: ${new TextDecoder().decode(out.stderr)}`,
    );
  }
}

/** run.json without what differs between identical runs: its times. */
const withoutTimes = (runJson: string) => {
  const { startedAt: _s, finishedAt: _f, timing: _t, ...rest } = JSON.parse(runJson);
  return rest;
};

Deno.test("study --shard i/3 in three processes and merge equal a single run byte for byte", async () => {
  await Deno.remove(TMP, { recursive: true }).catch(() => {});
  try {
    const common = ["--quiet", "--no-cache", "--store", `${TMP}/store.sqlite`];
    await Promise.all(
      [1, 2, 3].map((i) =>
        cli(
          "study",
          "data-samples/norvessa",
          "--out",
          `${TMP}/s${i}`,
          "--shard",
          `${i}/3`,
          ...common,
        )
      ),
    );
    await cli("merge", `${TMP}/s1`, `${TMP}/s2`, `${TMP}/s3`, "--out", `${TMP}/merged`);
    await cli("study", "data-samples/norvessa", "--out", `${TMP}/single`, ...common);
    const merged = await readTree(`${TMP}/merged`), single = await readTree(`${TMP}/single`);
    assertEquals(Object.keys(merged).sort(), Object.keys(single).sort());
    for (const k of Object.keys(single)) {
      if (k === "run.json") assertEquals(withoutTimes(merged[k]!), withoutTimes(single[k]!));
      else assertEquals(merged[k], single[k], k);
    }
  } finally {
    await Deno.remove(TMP, { recursive: true }).catch(() => {});
  }
});
