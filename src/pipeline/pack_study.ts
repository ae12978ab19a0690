/**
 * A feeder's study packed for the trip back from a worker: the text of its result file
 * (serialised where it was computed, so the main thread only writes it) and what the fleet
 * files and the run store need — status, findings, diagnostics, key figures.
 */
import type { Diagnostic } from "../model/diagnostic.ts";
import type { Finding } from "../checks/finding.ts";
import type { FeederSummary } from "../model/summarize_feeder.ts";
import { feederJson, type FeederProvenance } from "../report/run_files.ts";
import type { FeederStudy } from "./study_feeder.ts";
import type { DgHeadroom, Need } from "../rank/need.ts";

export interface PackedStudy {
  readonly status: FeederStudy["status"];
  readonly fileText: string;
  readonly findings: readonly Finding[];
  readonly diagnostics: readonly Diagnostic[];
  readonly vMinPu: number | null;
  readonly vMaxPu: number | null;
  readonly maxLoadingPercent: number | null;
  readonly maxDgChangePercent: number | null;
  readonly needs: readonly Need[];
  readonly headroom: DgHeadroom | null;
}

function extreme(
  xs: readonly (number | null)[],
  pick: (a: number, b: number) => number,
): number | null {
  let out: number | null = null;
  for (const x of xs) if (x !== null) out = out === null ? x : pick(out, x);
  return out;
}

export function packStudy(
  summary: FeederSummary,
  study: FeederStudy,
  provenance: FeederProvenance,
): PackedStudy {
  const c = study.cases;
  return {
    status: study.status,
    fileText: feederJson(summary, study, provenance),
    findings: study.findings,
    diagnostics: study.diagnostics,
    vMinPu: extreme(c.map((x) => x.vMinPu), Math.min),
    vMaxPu: extreme(c.map((x) => x.vMaxPu), Math.max),
    maxLoadingPercent: extreme(c.map((x) => x.maxLoadingPercent), Math.max),
    maxDgChangePercent: extreme(c.map((x) => x.maxDgChangePercent), Math.max),
    needs: study.needs,
    headroom: study.headroom,
  };
}
