/**
 * Content hash of a feeder's solver form: every typed array's bytes and every plain field,
 * in a fixed key order. Two forms hash alike exactly when a study of them must give the
 * same result, so the hash keys the result cache.
 */
import { sha256Hex } from "./sha256_hex.ts";
import type { FeederForm } from "./feeder_form.ts";

const enc = new TextEncoder();

function collect(value: unknown, parts: Uint8Array[]): void {
  if (ArrayBuffer.isView(value)) {
    const v = value as ArrayBufferView;
    parts.push(enc.encode(`<${v.constructor.name}:${v.byteLength}>`));
    parts.push(new Uint8Array(v.buffer, v.byteOffset, v.byteLength).slice());
    return;
  }
  if (Array.isArray(value)) {
    parts.push(enc.encode(`[${value.length}`));
    for (const x of value) collect(x, parts);
    parts.push(enc.encode("]"));
    return;
  }
  if (value !== null && typeof value === "object") {
    const keys = Object.keys(value).sort();
    parts.push(enc.encode("{"));
    for (const k of keys) {
      parts.push(enc.encode(JSON.stringify(k) + ":"));
      collect((value as Record<string, unknown>)[k], parts);
    }
    parts.push(enc.encode("}"));
    return;
  }
  parts.push(enc.encode(JSON.stringify(value ?? null) + ","));
}

/** SHA-256 of the form's content, lowercase hex. */
export async function hashFeederForm(form: FeederForm): Promise<string> {
  const parts: Uint8Array[] = [];
  collect(form, parts);
  return await sha256Hex(parts);
}
