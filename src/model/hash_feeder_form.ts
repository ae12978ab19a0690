/**
 * Content hash of a feeder's solver form: its plain fields as JSON (typed arrays replaced
 * by their kind and length) followed by the bytes of every typed array in the order JSON
 * met them. Two forms hash alike exactly when a study of them must give the same result,
 * so the hash keys the result cache.
 */
import type { FeederForm } from "./feeder_form.ts";
import { sha256Hex } from "./sha256_hex.ts";

/** SHA-256 of the form's content, lowercase hex. */
export async function hashFeederForm(form: FeederForm): Promise<string> {
  const arrays: Uint8Array[] = [];
  const text = JSON.stringify(form, (_key, value) => {
    if (ArrayBuffer.isView(value)) {
      const v = value as ArrayBufferView;
      arrays.push(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
      return `<${v.constructor.name}:${v.byteLength}>`;
    }
    return value;
  });
  return await sha256Hex([new TextEncoder().encode(text), ...arrays]);
}
