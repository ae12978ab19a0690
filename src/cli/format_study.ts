/** The short summary of a study run printed on stdout. */
import type { Paint } from "./paint.ts";
import type { StudyRun } from "./run_study.ts";
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
  const errors = run.diagnostics.filter((d) => d.severity === "error").length;
  const warnings = run.diagnostics.length - errors;
  out.push(`Diagnostics: ${errors} error(s), ${warnings} warning(s) (see diagnostics.csv)`);
  out.push(`Run folder: ${outDir}`);
  out.push(paint.dim(CAUTION));
  return out.join("\n");
}
