/**
 * A file written in pieces that appears whole or not at all: the pieces go to a temporary
 * file beside the target, which `commit` renames over it; `abandon` removes what is left
 * (a no-op after commit).
 */
import { dirname, join } from "node:path";

export interface AtomicFile {
  readonly write: (chunk: Uint8Array) => Promise<void>;
  commit(): Promise<void>;
  abandon(): Promise<void>;
}

let counter = 0;

export async function openAtomicFile(path: string): Promise<AtomicFile> {
  const dir = dirname(path);
  await Deno.mkdir(dir, { recursive: true });
  const tmp = join(dir, `.${Deno.pid}-stream-${counter++}.tmp`);
  const file = await Deno.open(tmp, { write: true, create: true, truncate: true });
  let open = true, done = false;
  const close = () => {
    if (open) file.close();
    open = false;
  };
  return {
    write: async (chunk) => {
      for (let off = 0; off < chunk.length;) off += await file.write(chunk.subarray(off));
    },
    async commit() {
      close();
      await Deno.rename(tmp, path);
      done = true;
    },
    async abandon() {
      close();
      if (!done) await Deno.remove(tmp).catch(() => {});
      done = true;
    },
  };
}
