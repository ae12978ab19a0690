/**
 * The regulator's list and the fleet file: `ranking.csv` (one row per need, in rank order,
 * with provenance and the caution in `#` comment lines above the header) and `fleet.json`
 * (every feeder's key figures, the ranking with its evidence and remedies, provenance).
 * Text only; the CLI writes the files. Deterministic: no times.
 */
import type { RankedNeed } from "../rank/need.ts";
import type { RankingOptions } from "../rank/cost_table.ts";
import type { FleetFeederRow } from "./report_context.ts";
import { CAUTION, csv, provenanceLines } from "./run_files.ts";

/** What every ranking output says about where it comes from. */
export interface RankingProvenance {
  readonly tool: string;
  readonly version: string;
  readonly network: string;
  readonly pipeline: string;
  readonly pipelineName: string | null;
  readonly inputHash: string;
  readonly configHash: string;
  readonly currency: string;
  readonly costSource: string;
}

export const RANKING_COLUMNS = [
  "rank",
  "feeder",
  "need_class",
  "need",
  "evidence",
  "findings",
  "worst_code",
  "worst_place",
  "worst_case",
  "worst_value",
  "limit",
  "unit",
  "excess_percent",
  "remedy_kind",
  "remedy",
  "cost",
  "currency",
  "capacity_unlocked_mw",
  "customers",
  "benefit",
  "benefit_per_cost",
] as const;

export function rankingCsv(ranking: readonly RankedNeed[], p: RankingProvenance): string {
  const rows = ranking.map((n) => [
    n.rank,
    n.feederId,
    n.needClass,
    n.kind,
    n.summary,
    n.evidence.length,
    n.worst.code,
    `${n.worst.where.kind} ${n.worst.where.id}`,
    n.worst.caseId,
    n.worst.value,
    n.worst.limit,
    n.worst.unit,
    n.excessPercent,
    n.remedy?.kind ?? "",
    n.remedy?.description ??
      `no remedy in the catalogue removes it (${n.tried.map((t) => t.kind).join(", ")} tried)`,
    n.remedy?.cost ?? "",
    p.currency,
    n.remedy?.capacityUnlockedMw ?? "",
    n.customers,
    n.benefit,
    n.benefitPerCost ?? "",
  ]);
  return provenanceLines("ranked upgrade list", p, [`costs in ${p.currency}: ${p.costSource}`]) +
    csv(RANKING_COLUMNS, rows);
}

export function fleetJson(
  feeders: readonly FleetFeederRow[],
  ranking: readonly RankedNeed[],
  options: RankingOptions,
  p: RankingProvenance,
): string {
  const byClass: Record<string, number> = {};
  for (const c of options.classOrder) byClass[c] = 0;
  for (const n of ranking) byClass[n.needClass] = (byClass[n.needClass] ?? 0) + 1;
  const feedersWithNeeds = new Set(ranking.map((n) => n.feederId)).size;
  const costed = ranking.filter((n) => n.remedy !== null);
  return JSON.stringify(
    {
      provenance: p,
      caution: CAUTION,
      ranking: { method: options.method, classOrder: options.classOrder, options },
      totals: {
        feeders: feeders.length,
        feedersWithNeeds,
        needs: ranking.length,
        needsByClass: byClass,
        needsWithoutRemedy: ranking.length - costed.length,
        indicativeCost: Math.round(costed.reduce((s, n) => s + n.remedy!.cost, 0) * 100) / 100,
        capacityUnlockedMw: Math.round(
          costed.reduce((s, n) => s + Math.max(0, n.remedy!.capacityUnlockedMw ?? 0), 0) * 1e4,
        ) / 1e4,
      },
      feeders,
      needs: ranking,
    },
    null,
    2,
  ) + "\n";
}
