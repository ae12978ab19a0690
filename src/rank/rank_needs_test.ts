/**
 * The fleet ranking on hand-built needs: class order, benefit and benefit-per-cost
 * arithmetic (worked by hand beside each check), the tie-break chain, the weighted option,
 * and needs without a remedy.
 */
import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { DEFAULT_RANKING_OPTIONS, type RankingOptions } from "./cost_table.ts";
import type { Need, NeedClass, NeedKind } from "./need.ts";
import { needBenefit, rankNeeds } from "./rank_needs.ts";

function need(
  feederId: string,
  kind: NeedKind,
  needClass: NeedClass,
  o: { customers?: number; excess?: number; cost?: number | null; mw?: number | null },
): Need {
  const cost = o.cost === undefined ? 10 : o.cost;
  return {
    feederId,
    id: `${feederId}/${kind}`,
    kind,
    needClass,
    summary: "",
    worst: {
      code: "x",
      caseId: "c",
      where: { kind: "bus", id: "b" },
      value: 0,
      limit: 0,
      unit: "%",
    },
    excessPercent: o.excess ?? 0,
    evidence: [],
    customers: o.customers ?? 0,
    remedy: cost === null ? null : {
      kind: "reconductor",
      description: "",
      items: [],
      cost,
      capacityUnlockedMw: o.mw ?? null,
    },
    tried: [],
  };
}

const ids = (xs: readonly Need[]) => xs.map((n) => n.id);

Deno.test("needBenefit() adds customers, capacity unlocked and excess with their weights", () => {
  // Defaults 1 per customer, 200 per MW, 20 per % of excess: 120 + 200·1.5 + 20·12.5 = 670.
  const n = need("F", "voltage_change", "planning", { customers: 120, excess: 12.5, mw: 1.5 });
  assertEquals(needBenefit(n, DEFAULT_RANKING_OPTIONS), 670);
  // Negative capacity unlocked counts as none: 120 + 0 + 250 = 370.
  const m = need("F", "voltage_change", "planning", { customers: 120, excess: 12.5, mw: -0.3 });
  assertEquals(needBenefit(m, DEFAULT_RANKING_OPTIONS), 370);
});

Deno.test("rankNeeds() orders by class first, then benefit per cost", () => {
  const ranked = rankNeeds([
    need("A", "voltage_change", "planning", { customers: 1000, cost: 1 }), // 1000 per unit
    need("B", "line_overload", "statutory", { customers: 10, cost: 100 }), // 0.1 per unit
    need("C", "undervoltage", "statutory", { customers: 50, cost: 10 }), // 5 per unit
    need("D", "line_overload", "safety", { customers: 1, cost: 1000 }), // 0.001 per unit
  ], DEFAULT_RANKING_OPTIONS);
  assertEquals(ids(ranked), [
    "D/line_overload",
    "C/undervoltage",
    "B/line_overload",
    "A/voltage_change",
  ]);
  assertEquals(ranked.map((n) => n.rank), [1, 2, 3, 4]);
  assertEquals(ranked.map((n) => n.benefitPerCost), [0.001, 5, 0.1, 1000]);
});

Deno.test("rankNeeds() breaks ties by excess, customers, feeder id, then kind", () => {
  // Same class and the same benefit per cost (100 points for 10 units) in every row.
  const rows = [
    need("F2", "overvoltage", "statutory", { customers: 100 }),
    need("F1", "undervoltage", "statutory", { customers: 100 }),
    need("F1", "overvoltage", "statutory", { customers: 100 }),
    need("F3", "overvoltage", "statutory", { customers: 80, excess: 1 }), // 80 + 20 = 100
    need("F4", "overvoltage", "statutory", { customers: 60, excess: 2 }), // 60 + 40 = 100
  ];
  const expected = [
    "F4/overvoltage", // largest excess
    "F3/overvoltage",
    "F1/overvoltage", // then feeder id, then kind
    "F1/undervoltage",
    "F2/overvoltage",
  ];
  assertEquals(ids(rankNeeds(rows, DEFAULT_RANKING_OPTIONS)), expected);
  // The input order does not matter.
  assertEquals(ids(rankNeeds([...rows].reverse(), DEFAULT_RANKING_OPTIONS)), expected);
});

Deno.test("rankNeeds() with the weighted method lets a large benefit outrank a higher class", () => {
  const rows = [
    need("S", "line_overload", "safety", { customers: 10, cost: 100 }), // 0.1 per unit
    need("P", "voltage_change", "planning", { customers: 500, cost: 10 }), // 50 per unit
  ];
  assertEquals(ids(rankNeeds(rows, DEFAULT_RANKING_OPTIONS)), [
    "S/line_overload",
    "P/voltage_change",
  ]);
  const weighted: RankingOptions = {
    ...DEFAULT_RANKING_OPTIONS,
    method: "weighted",
    classWeights: { safety: 10, statutory: 5, planning: 1, hosting: 1 },
  };
  // Scores: 10 · 0.1 = 1 against 1 · 50 = 50.
  const ranked = rankNeeds(rows, weighted);
  assertEquals(ids(ranked), ["P/voltage_change", "S/line_overload"]);
  assertEquals(ranked.map((n) => n.score), [50, 1]);
  // A reordered class list changes the class-first order.
  const reordered: RankingOptions = {
    ...DEFAULT_RANKING_OPTIONS,
    classOrder: ["planning", "safety", "statutory", "hosting"],
  };
  assertEquals(ids(rankNeeds(rows, reordered)), ["P/voltage_change", "S/line_overload"]);
});

Deno.test("rankNeeds() prices a need without remedy at the dearest remedy, not as free", () => {
  const rows = [
    need("A", "overvoltage", "statutory", { customers: 100, cost: 50 }), // 2 per unit
    need("B", "overvoltage", "statutory", { customers: 90, cost: null }), // 90 / 50 = 1.8
    need("C", "overvoltage", "statutory", { customers: 10, cost: 10 }), // 1 per unit
  ];
  const ranked = rankNeeds(rows, DEFAULT_RANKING_OPTIONS);
  assertEquals(ids(ranked), ["A/overvoltage", "B/overvoltage", "C/overvoltage"]);
  assertEquals(ranked[1]!.benefitPerCost, null);
  assertEquals(ranked[1]!.score, 1.8);
});
