/** Content hash of a network folder's tables, for run provenance and caching. */
import { sha256Hex } from "../model/sha256_hex.ts";
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
  return await sha256Hex(parts);
}
