/**
 * Differences between two runs, feeder by feeder: status, key figures per case, findings
 * added or removed, and needs added or removed (a need whose remedy or cost changed counts
 * as removed and added). Works on the parsed feeder files of the two run folders.
 */

/** What the diff reads from a feeders/<id>.json file. */
export interface FeederResultFile {
  readonly feederId: string;
  readonly status: string;
  readonly cases: readonly {
    readonly caseId: string;
    readonly vMinPu: number;
    readonly vMaxPu: number;
    readonly maxLoadingPercent: number;
    readonly maxDgChangePercent: number | null;
    readonly lossesKw: number;
  }[];
  readonly findings: readonly {
    readonly caseId: string;
    readonly code: string;
    readonly where: { readonly id: string };
    readonly severity: string;
  }[];
  /** Absent in files written before the ranking stage. */
  readonly needs?: readonly {
    readonly kind: string;
    readonly remedy: { readonly kind: string; readonly cost: number } | null;
  }[];
}

export interface FigureChange {
  readonly caseId: string;
  readonly figure: string;
  readonly before: number | null;
  readonly after: number | null;
}

export interface FeederDiff {
  readonly feederId: string;
  readonly change: "added" | "removed" | "changed";
  readonly statusBefore: string | null;
  readonly statusAfter: string | null;
  readonly figures: readonly FigureChange[];
  readonly findingsAdded: readonly string[];
  readonly findingsRemoved: readonly string[];
  readonly needsAdded: readonly string[];
  readonly needsRemoved: readonly string[];
}

const FIGURES = [
  "vMinPu",
  "vMaxPu",
  "maxLoadingPercent",
  "maxDgChangePercent",
  "lossesKw",
] as const;

/** Relative change below which a figure counts as unchanged (rounding in the files). */
const SAME = 1e-9;

function findingKeys(f: FeederResultFile): Set<string> {
  return new Set(f.findings.map((x) => `${x.caseId} ${x.severity} ${x.code} at ${x.where.id}`));
}

function needKeys(f: FeederResultFile): Set<string> {
  return new Set(
    (f.needs ?? []).map((n) =>
      `${n.kind}: ${n.remedy === null ? "no remedy" : `${n.remedy.kind}, cost ${n.remedy.cost}`}`
    ),
  );
}

export function diffRuns(
  before: ReadonlyMap<string, FeederResultFile>,
  after: ReadonlyMap<string, FeederResultFile>,
): FeederDiff[] {
  const ids = [...new Set([...before.keys(), ...after.keys()])].sort();
  const out: FeederDiff[] = [];
  for (const id of ids) {
    const a = before.get(id), b = after.get(id);
    if (a === undefined || b === undefined) {
      const f = (a ?? b)!;
      out.push({
        feederId: id,
        change: a === undefined ? "added" : "removed",
        statusBefore: a?.status ?? null,
        statusAfter: b?.status ?? null,
        figures: [],
        findingsAdded: a === undefined ? [...findingKeys(f)].sort() : [],
        findingsRemoved: b === undefined ? [...findingKeys(f)].sort() : [],
        needsAdded: a === undefined ? [...needKeys(f)].sort() : [],
        needsRemoved: b === undefined ? [...needKeys(f)].sort() : [],
      });
      continue;
    }
    const figures: FigureChange[] = [];
    const caseIds = [...new Set([...a.cases, ...b.cases].map((c) => c.caseId))].sort();
    for (const caseId of caseIds) {
      const ca = a.cases.find((c) => c.caseId === caseId),
        cb = b.cases.find((c) => c.caseId === caseId);
      for (const figure of FIGURES) {
        const x = ca?.[figure] ?? null, y = cb?.[figure] ?? null;
        const same = x === y ||
          (x !== null && y !== null &&
            Math.abs(x - y) <= SAME * Math.max(Math.abs(x), Math.abs(y), 1));
        if (!same) figures.push({ caseId, figure, before: x, after: y });
      }
    }
    const ka = findingKeys(a), kb = findingKeys(b);
    const added = [...kb].filter((k) => !ka.has(k)).sort();
    const removed = [...ka].filter((k) => !kb.has(k)).sort();
    const na = needKeys(a), nb = needKeys(b);
    const needsAdded = [...nb].filter((k) => !na.has(k)).sort();
    const needsRemoved = [...na].filter((k) => !nb.has(k)).sort();
    if (
      a.status === b.status && figures.length === 0 && added.length === 0 &&
      removed.length === 0 && needsAdded.length === 0 && needsRemoved.length === 0
    ) continue;
    out.push({
      feederId: id,
      change: "changed",
      statusBefore: a.status,
      statusAfter: b.status,
      figures,
      findingsAdded: added,
      findingsRemoved: removed,
      needsAdded,
      needsRemoved,
    });
  }
  return out;
}

export function formatDiff(diffs: readonly FeederDiff[]): string {
  if (diffs.length === 0) return "No feeder changed.";
  const out: string[] = [`${diffs.length} feeder(s) changed:`];
  const num = (v: number | null) => (v === null ? "–" : String(Math.round(v * 1e4) / 1e4));
  for (const d of diffs) {
    out.push(
      `${d.feederId} (${d.change}${
        d.statusBefore !== d.statusAfter
          ? `, ${d.statusBefore ?? "–"} → ${d.statusAfter ?? "–"}`
          : ""
      })`,
    );
    for (const f of d.figures) {
      out.push(`  ${f.caseId} ${f.figure}: ${num(f.before)} → ${num(f.after)}`);
    }
    for (const k of d.findingsAdded) out.push(`  + ${k}`);
    for (const k of d.findingsRemoved) out.push(`  − ${k}`);
    for (const k of d.needsAdded) out.push(`  + need ${k}`);
    for (const k of d.needsRemoved) out.push(`  − need ${k}`);
  }
  return out.join("\n");
}
