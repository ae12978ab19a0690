/**
 * The grading programme against a brute-force search over multipliers on a small case: a
 * chain of three IEC standard-inverse relays (REFERENCES.md C: k 0.14, α 0.02) with faults
 * in each zone; and a case no multipliers can grade.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { curveFactorS, gradeTimeMultipliers, type GradingPair } from "./grade_time_multipliers.ts";

const SI = { a: 0.14, p: 0.02, b: 0 };
const relays = ["R1", "R2", "R3"].map((id) => ({ id, minTms: 0.05, maxTms: 1.0 }));
// Invented currents for the test: pickups 600, 400, 200 A; faults in each downstream zone.
const pickup: Record<string, number> = { R1: 600, R2: 400, R3: 200 };
const pair = (primary: string, backup: string, iA: number): GradingPair => ({
  primary,
  backup,
  primaryFactorS: curveFactorS(SI, iA, pickup[primary]!),
  backupFactorS: curveFactorS(SI, iA, pickup[backup]!),
});
const pairs = [
  pair("R3", "R2", 3000),
  pair("R3", "R2", 1200),
  pair("R2", "R1", 5000),
  pair("R2", "R1", 2000),
];

Deno.test("gradeTimeMultipliers() agrees with a brute-force search on a three-relay chain", () => {
  const r = gradeTimeMultipliers({ relays, pairs, intervalS: 0.3 });
  assert(r.status === "optimal");
  // Brute force on a 0.001 grid: the smallest total primary time with every pair graded.
  const grid = (lo: number, hi: number) =>
    Array.from({ length: Math.round((hi - lo) / 0.001) + 1 }, (_, i) => lo + 0.001 * i);
  let best = Infinity, bestTms: number[] = [];
  // Each multiplier only needs to be the least that grades it behind the one below.
  for (const t3 of grid(0.05, 0.2)) {
    const need2 = Math.max(
      0.05,
      ...pairs.filter((p) => p.primary === "R3").map((p) =>
        (0.3 + p.primaryFactorS * t3) / p.backupFactorS
      ),
    );
    const t2 = Math.ceil(need2 / 0.001) * 0.001;
    const need1 = Math.max(
      0.05,
      ...pairs.filter((p) => p.primary === "R2").map((p) =>
        (0.3 + p.primaryFactorS * t2) / p.backupFactorS
      ),
    );
    const t1 = Math.ceil(need1 / 0.001) * 0.001;
    if (t1 > 1 || t2 > 1) continue;
    const total = pairs.reduce(
      (s, p) =>
        s + p.primaryFactorS * ({ R1: t1, R2: t2, R3: t3 } as Record<string, number>)[p.primary]!,
      0,
    );
    if (total < best) {
      best = total;
      bestTms = [t1, t2, t3];
    }
  }
  // The grid rounds each multiplier up to 0.001 and the rounding carries up the chain, so
  // the exact answer lies at most three steps below the grid's, never above.
  for (
    const [id, grid] of [["R3", bestTms[2]!], ["R2", bestTms[1]!], ["R1", bestTms[0]!]] as const
  ) {
    const x: number = r.tms[id]!;
    assert(x <= grid + 1e-9 && grid - x <= 0.003, `${id}: ${x} vs ${grid}`);
  }
  // Total primary time no worse than the grid's best (the backup term adds under 0.1 %).
  const primaryTotal = pairs.reduce((t, p) => t + p.primaryFactorS * r.tms[p.primary]!, 0);
  assert(primaryTotal <= best + 1e-9, `${primaryTotal} vs ${best}`);
  // Every pair graded by the programme's answer.
  for (const p of pairs) {
    assert(p.backupFactorS * r.tms[p.backup]! - p.primaryFactorS * r.tms[p.primary]! >= 0.3 - 1e-7);
  }
});

Deno.test("gradeTimeMultipliers() reports a pair no multipliers can grade", () => {
  // The backup's multiplier is capped so low that it can never wait 0.3 s behind the primary.
  const r = gradeTimeMultipliers({
    relays: [{ id: "A", minTms: 0.05, maxTms: 1 }, { id: "B", minTms: 0.05, maxTms: 0.1 }],
    pairs: [{ primary: "A", backup: "B", primaryFactorS: 2, backupFactorS: 2 }],
    intervalS: 0.3,
  });
  assertEquals(r.status, "infeasible");
});
