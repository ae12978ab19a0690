import { deepStrictEqual as assertEquals, match } from "node:assert/strict";
import { buildId } from "./build_id.ts";
import { VERSION } from "./version.ts";

Deno.test("buildId() is the version and a fingerprint of the sources, the same on every call", async () => {
  const id = await buildId();
  match(id, new RegExp(`^${VERSION.replaceAll(".", "\\.")}\\+[0-9a-f]{16}$`));
  assertEquals(await buildId(), id);
});
