/** Atomic file writes: a temporary file beside the target, then a rename over it. */
import { dirname, join } from "node:path";

let counter = 0;

export async function writeFileAtomic(path: string, text: string): Promise<void> {
  await Deno.mkdir(dirname(path), { recursive: true });
  const tmp = join(dirname(path), `.${Deno.pid}-${counter++}.tmp`);
  try {
    await Deno.writeTextFile(tmp, text);
    await Deno.rename(tmp, path);
  } catch (e) {
    await Deno.remove(tmp).catch(() => {});
    throw e;
  }
}
