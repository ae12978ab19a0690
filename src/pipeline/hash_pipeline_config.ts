/** The fingerprint of a pipeline config that run provenance records. */
import type { PipelineConfig } from "./pipeline_config.ts";
import { sha256Hex } from "../model/sha256_hex.ts";

/**
 * SHA-256, as lowercase hex, of the config in canonical JSON: object keys sorted at every
 * level, no whitespace, absent optional keys left out. Hash the parsed, fully-defaulted
 * config, so that comments, key order and spelled-out defaults do not change it.
 */
export async function hashPipelineConfig(config: PipelineConfig): Promise<string> {
  return await sha256Hex([new TextEncoder().encode(canonicalJson(config))]);
}

function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.entries(value)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
  }
  if (typeof value === "number" && !Number.isFinite(value)) {
    throw new TypeError(`Cannot hash a non-finite number: ${value}`);
  }
  return JSON.stringify(value);
}
