/** The short summary of a study run printed on stdout. */
import { join } from "node:path";
import type { Paint } from "./paint.ts";
import type { FeederChange, StudyRun } from "./run_study.ts";
import type { Finding } from "../checks/finding.ts";
import type { Need, RankedNeed } from "../rank/need.ts";
import { CAUTION } from "../report/run_files.ts";

export function formatStudySummary(run: StudyRun, outDir: string, paint: Paint): string {
  const c = run.record.counts;
  const out: string[] = [];
  out.push(paint.bold(
    `Studied ${c.studied} of ${c.feeders} feeders` +
      (c.failed > 0 ? `, ${c.failed} failed to solve` : "") +
      (c.setAside > 0 ? `, ${c.setAside} set aside for bad data` : ""),
  ));
  const byCode = new Map<string, { feeders: Set<string>; n: number; severity: string }>();
  for (const f of run.findings) {
    const e = byCode.get(f.code) ?? { feeders: new Set(), n: 0, severity: f.severity };
    e.feeders.add(f.feederId);
    e.n++;
    byCode.set(f.code, e);
  }
  if (byCode.size === 0) out.push("No findings.");
  else {
    out.push("Findings:");
    for (const [code, e] of [...byCode].sort((a, b) => (a[0] < b[0] ? -1 : 1))) {
      const sev = e.severity === "violation" ? paint.red(e.severity) : paint.yellow(e.severity);
      out.push(
        `  ${code.padEnd(26)} ${sev.padEnd(9)} ${
          String(e.n).padStart(5)
        } on ${e.feeders.size} feeder(s): ${[...e.feeders].sort().slice(0, 6).join(", ")}${
          e.feeders.size > 6 ? ", …" : ""
        }`,
      );
    }
  }
  if (run.cacheHits > 0) out.push(`Taken unchanged from earlier runs: ${run.cacheHits} feeder(s)`);
  for (const c of run.changes) out.push(...formatChange(c));
  const errors = run.diagnostics.filter((d) => d.severity === "error").length;
  const warnings = run.diagnostics.length - errors;
  out.push(`Diagnostics: ${errors} error(s), ${warnings} warning(s) (see diagnostics.csv)`);
  out.push(...formatRankingTop(run.ranking, run.record.config?.costs.currency ?? "", paint));
  out.push(`Run folder: ${outDir}`);
  out.push(`Report: ${join(outDir, "report.html")}`);
  out.push(paint.dim(CAUTION));
  return out.join("\n");
}

/** How many needs of the ranking the summary shows. */
export const RANKING_TOP = 10;

/** The top of the ranked upgrade list: rank, feeder, class, need, remedy and its cost. */
export function formatRankingTop(
  ranking: readonly RankedNeed[],
  currency: string,
  paint: Paint,
): string[] {
  if (ranking.length === 0) return ["Ranked upgrade list: no feeder needs work."];
  const out = [
    paint.bold(
      `Ranked upgrade list (${ranking.length} need(s) on ${
        new Set(ranking.map((n) => n.feederId)).size
      } feeder(s); ranking.csv, report.html):`,
    ),
  ];
  for (const n of ranking.slice(0, RANKING_TOP)) {
    const remedy = n.remedy === null
      ? "no catalogue remedy: engineering study needed"
      : `${n.remedy.kind.replaceAll("_", " ")}, ${n.remedy.cost} ${currency}` +
        (n.remedy.capacityUnlockedMw !== null && n.remedy.capacityUnlockedMw > 0
          ? `, unlocks ${n.remedy.capacityUnlockedMw.toFixed(2)} MW`
          : "");
    out.push(
      `  ${String(n.rank).padStart(3)}. ${n.feederId.padEnd(10)} ${n.needClass.padEnd(9)} ${
        n.kind.replaceAll("_", " ").padEnd(20)
      } ${remedy}`,
    );
  }
  if (ranking.length > RANKING_TOP) out.push(`  … ${ranking.length - RANKING_TOP} more`);
  return out;
}

const needKey = (n: Need) =>
  `${n.kind}: ${n.remedy === null ? "no remedy" : `${n.remedy.kind} ${n.remedy.cost}`}`;

const findingKey = (f: Finding) => `${f.caseId} ${f.code} at ${f.where.id}`;

/** What a rerun changed on one feeder: status, key figures, findings added and removed. */
export function formatChange(c: FeederChange): string[] {
  const out = [`Feeder ${c.feederId}:`];
  const b = c.before, a = c.after;
  if (b === undefined) {
    out.push(`  new in this run (${a.status})`);
    return out;
  }
  if (b.status !== a.status) out.push(`  status ${b.status} → ${a.status}`);
  const fig = (name: string, x: number | null, y: number | null, digits: number) => {
    if (x === y) return;
    out.push(
      `  ${name} ${x === null ? "–" : x.toFixed(digits)} → ${y === null ? "–" : y.toFixed(digits)}`,
    );
  };
  fig("lowest voltage, pu", b.vMinPu, a.vMinPu, 4);
  fig("highest voltage, pu", b.vMaxPu, a.vMaxPu, 4);
  fig("highest loading, %", b.maxLoadingPercent, a.maxLoadingPercent, 1);
  fig("largest voltage change from generation, %", b.maxDgChangePercent, a.maxDgChangePercent, 2);
  const before = new Set(b.findings.map(findingKey)), after = new Set(a.findings.map(findingKey));
  for (const k of [...after].filter((k) => !before.has(k)).sort()) out.push(`  + ${k}`);
  for (const k of [...before].filter((k) => !after.has(k)).sort()) out.push(`  − ${k}`);
  const needsBefore = new Set(b.needs.map(needKey)), needsAfter = new Set(a.needs.map(needKey));
  for (const k of [...needsAfter].filter((k) => !needsBefore.has(k)).sort()) {
    out.push(`  + need ${k}`);
  }
  for (const k of [...needsBefore].filter((k) => !needsAfter.has(k)).sort()) {
    out.push(`  − need ${k}`);
  }
  if (out.length === 1) out.push("  no change");
  return out;
}
