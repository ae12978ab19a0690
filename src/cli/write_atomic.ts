/** Atomic file writes: a temporary file beside the target, then a rename over it. */
import { dirname, join } from "node:path";

let counter = 0;

export async function writeFileAtomic(path: string, text: string): Promise<void> {
  const dir = dirname(path);
  const tmp = join(dir, `.${Deno.pid}-${counter++}.tmp`);
  try {
    try {
      await Deno.writeTextFile(tmp, text);
    } catch (e) {
      // The folder is created on first need only, not on every write.
      if (!(e instanceof Deno.errors.NotFound)) throw e;
      await Deno.mkdir(dir, { recursive: true });
      await Deno.writeTextFile(tmp, text);
    }
    await Deno.rename(tmp, path);
  } catch (e) {
    await Deno.remove(tmp).catch(() => {});
    throw e;
  }
}
