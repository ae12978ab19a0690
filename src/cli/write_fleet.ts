/** Writes a synthetic fleet, streamed chunk by chunk, into a network folder. */
import { join } from "node:path";
import { synthesizeFleet, type SynthOptions } from "../synth/synthesize_fleet.ts";

export async function writeSynthFleet(o: SynthOptions, outDir: string): Promise<number> {
  await Deno.mkdir(outDir, { recursive: true });
  const files = new Map<string, Deno.FsFile>();
  const enc = new TextEncoder();
  let bytes = 0;
  try {
    for (const chunk of synthesizeFleet(o)) {
      let f = files.get(chunk.file);
      if (f === undefined) {
        f = await Deno.open(join(outDir, chunk.file), {
          write: true,
          create: true,
          truncate: true,
        });
        files.set(chunk.file, f);
      }
      const data = enc.encode(chunk.text);
      bytes += data.length;
      for (let off = 0; off < data.length;) off += await f.write(data.subarray(off));
    }
  } finally {
    for (const f of files.values()) f.close();
  }
  return bytes;
}
