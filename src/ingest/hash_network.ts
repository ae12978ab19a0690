/** Content hash of a network folder's tables, for run provenance and caching. */
import { join } from "node:path";
import { TABLES } from "./read_network.ts";

/**
 * SHA-256 over every table of the format present in `dir`, in file-name order, each as
 * its name, a NUL, its bytes and a NUL. Other files in the folder do not count.
 */
export async function hashNetworkFolder(dir: string): Promise<string> {
  const names = Object.values(TABLES).map((t) => t.file).sort();
  const parts: Uint8Array[] = [];
  const enc = new TextEncoder();
  for (const name of names) {
    let bytes: Uint8Array;
    try {
      bytes = await Deno.readFile(join(dir, name));
    } catch (e) {
      if (e instanceof Deno.errors.NotFound) continue;
      throw e;
    }
    parts.push(enc.encode(name + "\u0000"), bytes, enc.encode("\u0000"));
  }
  const total = parts.reduce((s, p) => s + p.length, 0);
  const all = new Uint8Array(total);
  let at = 0;
  for (const p of parts) {
    all.set(p, at);
    at += p.length;
  }
  const digest = await crypto.subtle.digest("SHA-256", all);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}
