/**
 * The fleet ranking: every feeder's needs in one ordered list (docs/ranking.md).
 *
 * Benefit points = perCustomer · customers + perMwUnlocked · max(0, MW unlocked)
 * + perExcessPercent · excess over the limit (% of the allowed margin).
 * Benefit per cost = benefit ÷ cost (in the cost table's currency), costs below one unit
 * counted as one unit. A need without a remedy in the catalogue
 * is priced, for ordering only, at the highest remedy cost in the list (at least one unit):
 * it needs an engineering study whose cost is not known, and is not ranked as if free.
 *
 * "class-first" (default): severity class in the configured order, then benefit per cost.
 * "weighted": score = class weight × benefit per cost, highest first.
 * Ties, in both: class order, larger excess, more customers, feeder id, then need kind, so
 * the order is total and does not depend on the order the feeders finished in.
 */
import { roundTo } from "../model/round_to.ts";
import type { RankingOptions } from "./cost_table.ts";
import type { Need, RankedNeed } from "./need.ts";

export function needBenefit(need: Need, options: RankingOptions): number {
  const b = options.benefit;
  return b.perCustomer * need.customers +
    b.perMwUnlocked * Math.max(0, need.remedy?.capacityUnlockedMw ?? 0) +
    b.perExcessPercent * Math.max(0, need.excessPercent);
}

export function rankNeeds(needs: readonly Need[], options: RankingOptions): RankedNeed[] {
  const classIndex = new Map(options.classOrder.map((c, i) => [c, i]));
  let unknownCost = 1;
  for (const n of needs) if (n.remedy !== null) unknownCost = Math.max(unknownCost, n.remedy.cost);
  const scored = needs.map((need) => {
    const benefit = roundTo(needBenefit(need, options), 6);
    const cost = Math.max(1, need.remedy?.cost ?? unknownCost);
    const perCost = benefit / cost;
    const score = options.method === "weighted"
      ? options.classWeights[need.needClass] * perCost
      : perCost;
    return {
      need,
      benefit,
      benefitPerCost: need.remedy === null ? null : roundTo(perCost, 6),
      score: roundTo(score, 6),
      classAt: classIndex.get(need.needClass) ?? options.classOrder.length,
    };
  });
  scored.sort((a, b) =>
    (options.method === "class-first" ? a.classAt - b.classAt : 0) ||
    b.score - a.score ||
    a.classAt - b.classAt ||
    b.need.excessPercent - a.need.excessPercent ||
    b.need.customers - a.need.customers ||
    cmp(a.need.feederId, b.need.feederId) ||
    cmp(a.need.kind, b.need.kind)
  );
  return scored.map((s, i) => ({
    ...s.need,
    rank: i + 1,
    benefit: s.benefit,
    benefitPerCost: s.benefitPerCost,
    score: s.score,
  }));
}

function cmp(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
