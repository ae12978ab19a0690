import { equal, match, notEqual } from "node:assert/strict";
import { hashPipelineConfig } from "./hash_pipeline_config.ts";
import { parsePipelineConfig, type PipelineConfig } from "./pipeline_config.ts";

function parsed(text: string): PipelineConfig {
  const { value, diagnostics } = parsePipelineConfig(text, "p.json");
  equal(diagnostics.length, 0, JSON.stringify(diagnostics));
  return value!;
}

const BASE = `{
  "name": "n",
  "cases": [{ "id": "a", "demand": "peak", "demandScale": 1.1, "generationScale": 0 }],
  "limits": { "thermal": { "limitPercent": 100, "warnPercent": 90 }, "lvMaxKv": 0.4 },
  "solver": { "maxIterations": 50, "tapControl": false }
}`;

Deno.test("hashPipelineConfig() is the SHA-256 of the canonical JSON, in lowercase hex", async () => {
  // Expected digest computed independently with GNU coreutils:
  //   printf '%s' '{"a":[{"c":null,"d":true}],"b":1.5,"e":"é"}' | sha256sum
  const config = { e: "é", b: 1.5, a: [{ d: true, c: null }], z: undefined };
  const hash = await hashPipelineConfig(config as unknown as PipelineConfig);
  equal(hash, "974ce45ab73e47c9c089035cb3e82b5b3d8dd7b9e66c022ebf36a4ed0376fcab");
  match(await hashPipelineConfig(parsed(BASE)), /^[0-9a-f]{64}$/);
});

Deno.test("hashPipelineConfig() does not change with key order, comments or spelled-out defaults", async () => {
  const reordered = `// the same config, written differently
{
  "solver": { "tapControl": false, "maxIterations": 50, "tolerancePu": 1e-9 },
  "limits": { "lvMaxKv": 0.4, "thermal": { "warnPercent": 90, "limitPercent": 100 } },
  /* cases last */
  "cases": [{ "generationScale": 0, "demandScale": 1.1, "demand": "peak", "id": "a" }],
  "checks": { "losses": true },
  "name": "n",
}`;
  equal(await hashPipelineConfig(parsed(reordered)), await hashPipelineConfig(parsed(BASE)));
});

Deno.test("hashPipelineConfig() changes when a value changes", async () => {
  const base = await hashPipelineConfig(parsed(BASE));
  const edits: readonly [string, string][] = [
    [`"limitPercent": 100`, `"limitPercent": 101`],
    [`"id": "a"`, `"id": "b"`],
    [`"demandScale": 1.1`, `"demandScale": 1.1000001`],
    [`"tapControl": false`, `"tapControl": true`],
    [`"name": "n"`, `"name": "m"`],
    [`"name": "n",`, `"name": "n", "description": "",`],
    [`"lvMaxKv": 0.4`, `"lvMaxKv": 0.4, "voltageBand": "ansi-range-b-style"`],
  ];
  for (const [from, to] of edits) {
    const text = BASE.replace(from, to);
    notEqual(text, BASE, `edit ${from} applies`);
    notEqual(await hashPipelineConfig(parsed(text)), base, `${from} → ${to}`);
  }
});
