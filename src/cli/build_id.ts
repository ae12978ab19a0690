/**
 * The identity of the code that studies, for the run store's cache key: the tool version
 * and a SHA-256 of the study's source files (everything under src/ but tests), so that a
 * changed solver never reuses results computed by the old one, even when the version
 * number was not raised. Where the sources cannot be read (a compiled binary), the
 * version alone.
 */
import { dirname, join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { sha256Hex } from "../model/sha256_hex.ts";
import { VERSION } from "./version.ts";

let cached: Promise<string> | undefined;

export function buildId(): Promise<string> {
  cached ??= computeBuildId();
  return cached;
}

async function computeBuildId(): Promise<string> {
  try {
    const src = join(dirname(fileURLToPath(import.meta.url)), "..");
    const files: string[] = [];
    const walk = async (dir: string) => {
      for await (const e of Deno.readDir(dir)) {
        const path = join(dir, e.name);
        if (e.isDirectory) await walk(path);
        else if (e.name.endsWith(".ts") && !e.name.endsWith("_test.ts")) files.push(path);
      }
    };
    await walk(src);
    files.sort();
    const enc = new TextEncoder();
    const parts: Uint8Array[] = [];
    for (const f of files) {
      parts.push(enc.encode(`${relative(src, f)}\n`), await Deno.readFile(f));
    }
    return `${VERSION}+${(await sha256Hex(parts)).slice(0, 16)}`;
  } catch {
    return VERSION;
  }
}
