import { deepStrictEqual, equal } from "node:assert/strict";
import { fileURLToPath } from "node:url";
import { loadPipelineConfig } from "./load_pipeline_config.ts";

const NIGHTLY = fileURLToPath(new URL("../../pipelines/nightly.json", import.meta.url));
const STRICT = fileURLToPath(new URL("../../pipelines/strict-band.json", import.meta.url));

Deno.test("loadPipelineConfig() reads pipelines/nightly.json with no diagnostics", async () => {
  const { value, diagnostics } = await loadPipelineConfig(NIGHTLY);
  deepStrictEqual(diagnostics, []);
  deepStrictEqual(value!.cases, [
    { id: "peak-no-dg", demand: "peak", demandScale: 1, generationScale: 0 },
    { id: "min-full-dg", demand: "min", demandScale: 1, generationScale: 1 },
    {
      id: "winter-peak-half-dg",
      label: "Winter peak, half generation",
      demand: "peak",
      demandScale: 1.1,
      generationScale: 0.5,
    },
  ]);
  equal(value!.limits.voltageBand.preset, "en50160-style");
});

Deno.test("loadPipelineConfig() reads pipelines/strict-band.json: nightly with the ANSI Range A band", async () => {
  const strict = await loadPipelineConfig(STRICT);
  const nightly = await loadPipelineConfig(NIGHTLY);
  deepStrictEqual(strict.diagnostics, []);
  // ANSI C84.1 Range A, 114–126 V on 120 V [memory] (REFERENCES.md E).
  const band = { vMinPu: 0.95, vMaxPu: 1.05 };
  deepStrictEqual(strict.value!.limits.voltageBand, {
    preset: "ansi-range-a-style",
    mv: band,
    lv: band,
  });
  const { name: _n1, description: _d1, ...strictRest } = strict.value!;
  const { name: _n2, description: _d2, ...nightlyRest } = nightly.value!;
  deepStrictEqual(
    { ...strictRest, limits: { ...strictRest.limits, voltageBand: null } },
    { ...nightlyRest, limits: { ...nightlyRest.limits, voltageBand: null } },
  );
});

Deno.test("loadPipelineConfig() reports a file it cannot read as config.unreadable", async () => {
  const dir = await Deno.makeTempDir({ dir: "reports", prefix: "pipeline-config-" });
  try {
    const notUtf8 = `${dir}/latin1.json`;
    await Deno.writeFile(notUtf8, new Uint8Array([0x7b, 0x22, 0x6e, 0xe9, 0x22, 0x7d])); // {"né"} in Latin-1
    const cases: readonly [string, string][] = [
      [`${dir}/missing.json`, "no such file"],
      [dir, "Cannot read pipeline config"], // the reason is the system's own words
      [notUtf8, "not valid UTF-8"],
    ];
    for (const [path, why] of cases) {
      const { value, diagnostics } = await loadPipelineConfig(path);
      equal(value, undefined, path);
      deepStrictEqual(
        diagnostics.map((d) => [d.code, d.severity, d.at]),
        [["config.unreadable", "error", { file: path }]],
        path,
      );
      equal(diagnostics[0]!.message.includes(why), true, diagnostics[0]!.message);
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("loadPipelineConfig() locates problems in the file it read", async () => {
  const dir = await Deno.makeTempDir({ dir: "reports", prefix: "pipeline-config-" });
  try {
    const path = `${dir}/bad.json`;
    await Deno.writeTextFile(path, `{\n  "solver": { "maxIterations": 0 }\n}\n`);
    const { value, diagnostics } = await loadPipelineConfig(path);
    equal(value, undefined);
    deepStrictEqual(diagnostics.map((d) => [d.code, d.at]), [[
      "config.invalid",
      { file: path, line: 2, column: 32, field: "solver.maxIterations" },
    ]]);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
