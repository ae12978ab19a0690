import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { parseVectorGroup, passesZeroSequence, phaseShiftDeg } from "./vector_group.ts";

// Vector groups and their clock numbers as in IEC 60076-1 [memory]: star–delta pairs shift by
// odd multiples of 30°, like pairs by even ones; zigzag allows both (common practice).
const CASES: [string, { hv: string; lv: string; clock: number } | undefined][] = [
  ["Dyn11", { hv: "D", lv: "YN", clock: 11 }],
  ["Dyn5", { hv: "D", lv: "YN", clock: 5 }],
  ["YNd11", { hv: "YN", lv: "D", clock: 11 }],
  ["YNyn0", { hv: "YN", lv: "YN", clock: 0 }],
  ["Yy6", { hv: "Y", lv: "Y", clock: 6 }],
  ["Dd0", { hv: "D", lv: "D", clock: 0 }],
  ["Yzn11", { hv: "Y", lv: "ZN", clock: 11 }],
  ["Dzn0", { hv: "D", lv: "ZN", clock: 0 }],
  ["Yy1", undefined],
  ["Dyn0", undefined],
  ["Dy12", undefined],
  ["Dy11n", undefined],
  ["dyn11", undefined],
  ["", undefined],
];

Deno.test("parseVectorGroup() reads IEC 60076-1 vector groups and refuses impossible ones", () => {
  for (const [text, expected] of CASES) {
    const g = parseVectorGroup(text);
    assertEquals(
      g === undefined ? undefined : { hv: g.hv, lv: g.lv, clock: g.clock },
      expected,
      text,
    );
  }
});

Deno.test("phaseShiftDeg() is the clock number times 30°", () => {
  assertEquals(phaseShiftDeg(parseVectorGroup("Dyn11")!), 330);
  assertEquals(phaseShiftDeg(parseVectorGroup("Dyn5")!), 150);
});

Deno.test("passesZeroSequence() is true only for earthed star and zigzag windings", () => {
  assertEquals(
    (["D", "Y", "YN", "Z", "ZN"] as const).map(passesZeroSequence),
    [false, false, true, false, true],
  );
});
