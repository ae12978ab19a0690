import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { arrayMax, arrayMaxAbs, arrayMin } from "./array_extremes.ts";

Deno.test("arrayMax() and arrayMin() handle arrays too long to spread into Math.max", () => {
  // Engines cap the number of call arguments (a few hundred thousand in V8, common practice),
  // so Math.max(...xs) throws on the largest feeders; these loops do not.
  const xs = Float64Array.from({ length: 500_000 }, (_, i) => Math.sin(i));
  assertEquals(arrayMax(xs), xs.reduce((a, b) => Math.max(a, b), -Infinity));
  assertEquals(arrayMin(xs), xs.reduce((a, b) => Math.min(a, b), Infinity));
  assertEquals(arrayMaxAbs(Float64Array.of(-3, 2)), 3);
  assertEquals(arrayMax([], 0), 0);
});
