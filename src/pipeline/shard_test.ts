import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { hashFeederId, inShard, parseShard } from "./shard.ts";

Deno.test("hashFeederId() is 32-bit FNV-1a (published test vectors)", () => {
  // FNV-1a 32-bit test vectors (Fowler/Noll/Vo reference test suite, recalled [memory]): "" → 0x811c9dc5,
  // "a" → 0xe40c292c, "foobar" → 0xbf9cf968.
  assertEquals(hashFeederId(""), 0x811c9dc5);
  assertEquals(hashFeederId("a"), 0xe40c292c);
  assertEquals(hashFeederId("foobar"), 0xbf9cf968);
  assertEquals(hashFeederId("FOOBAR"), hashFeederId("foobar"));
});

Deno.test("inShard() puts every feeder in exactly one of N shares", () => {
  const ids = Array.from({ length: 500 }, (_, i) => `SYN-${i}`);
  for (const count of [1, 2, 3, 7]) {
    for (const id of ids) {
      const hits = Array.from({ length: count }, (_, i) => inShard(id, { index: i + 1, count }))
        .filter(Boolean);
      assertEquals(hits.length, 1);
    }
  }
  // Shares are roughly even: within ±30 % of N/3 for 500 ids over 3 shards.
  const sizes = [1, 2, 3].map((index) =>
    ids.filter((id) => inShard(id, { index, count: 3 })).length
  );
  assert(sizes.every((s) => Math.abs(s - 500 / 3) < 50), String(sizes));
});

Deno.test("parseShard() reads i/N with 1 ≤ i ≤ N", () => {
  assertEquals(parseShard("2/3"), { index: 2, count: 3 });
  for (const bad of ["0/3", "4/3", "1/0", "a/b", "1", "1/2/3", ""]) {
    assertEquals(parseShard(bad), undefined, bad);
  }
});
