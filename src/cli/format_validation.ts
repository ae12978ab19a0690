/** Text rendering of a validation result for the terminal. */
import type { Diagnostic } from "../model/diagnostic.ts";
import type { ValidatedFleet } from "../pipeline/validate_fleet.ts";
import type { Paint } from "./paint.ts";

const CAUTION =
  "Screening study: verify results with a licensed engineer and against local codes before acting.";

function pad(s: string, width: number, right = false): string {
  const len = [...s].length;
  if (len >= width) return s;
  return right ? " ".repeat(width - len) + s : s + " ".repeat(width - len);
}

function fixed(v: number | null, digits: number): string {
  return v === null ? "–" : v.toFixed(digits);
}

/** A location as `file:line:column`. */
export function formatLocation(d: Diagnostic): string {
  if (d.at === undefined) return "";
  return [d.at.file, d.at.line, d.at.column].filter((x) => x !== undefined).join(":");
}

export function formatDiagnostic(d: Diagnostic, paint: Paint): string {
  const sev = d.severity === "error"
    ? paint.red("error")
    : d.severity === "warning"
    ? paint.yellow("warning")
    : paint.dim("info");
  const where = formatLocation(d);
  const feeder = d.feederId === undefined ? "" : paint.dim(` [feeder ${d.feederId}]`);
  return `${where === "" ? "" : where + ": "}${sev} ${paint.dim(d.code)}: ${d.message}${feeder}`;
}

export function formatValidation(
  fleet: ValidatedFleet,
  diagnostics: readonly Diagnostic[],
  paint: Paint,
): string {
  const out: string[] = [];
  const valid = fleet.feeders.filter((f) => f.status === "valid").length;
  const aside = fleet.feeders.length - valid;
  out.push(
    paint.bold(
      `Fleet${
        fleet.company === null ? "" : ` of ${fleet.company}`
      }: ${fleet.feeders.length} feeders, ${valid} valid, ${aside} set aside`,
    ),
  );
  out.push("");
  const header = [
    pad("feeder", 16),
    pad("state", 9),
    pad("kV", 6, true),
    pad("buses", 6, true),
    pad("line km", 8, true),
    pad("cable", 6, true),
    pad("peak MW", 8, true),
    pad("DG MW", 7, true),
    pad("DG", 4, true),
    "  structure",
  ].join(" ");
  out.push(paint.dim(header));
  for (const f of fleet.feeders) {
    const state = f.status === "valid"
      ? paint.green(pad("valid", 9))
      : paint.red(pad("set aside", 9));
    const notes = [
      f.structure === "meshed" ? `meshed (${f.loops} loop${f.loops === 1 ? "" : "s"})` : "radial",
    ];
    if (f.openPoints > 0) notes.push(`${f.openPoints} open point${f.openPoints === 1 ? "" : "s"}`);
    if (f.feederIds.length > 1) notes.push(`joins ${f.feederIds.join(", ")}`);
    out.push([
      pad(f.feederId, 16),
      state,
      pad(fixed(f.vnKv, f.vnKv !== null && f.vnKv < 1 ? 2 : 1), 6, true),
      pad(String(f.buses), 6, true),
      pad(fixed(f.lineKm, 2), 8, true),
      pad(f.lineKm > 0 ? `${Math.round(100 * f.cableKm / f.lineKm)}%` : "–", 6, true),
      pad(fixed(f.peakLoadKw / 1000, 2), 8, true),
      pad(fixed(f.generationKw / 1000, 2), 7, true),
      pad(String(f.generators), 4, true),
      "  " + notes.join(", "),
    ].join(" "));
  }
  if (fleet.islands.length > 0) {
    out.push("");
    out.push(
      `De-energised islands: ${fleet.islands.length} (${
        fleet.islands.reduce((s, i) => s + i.busIds.length, 0)
      } buses)`,
    );
  }
  const errors = diagnostics.filter((d) => d.severity === "error").length;
  const warnings = diagnostics.filter((d) => d.severity === "warning").length;
  if (diagnostics.length > 0) {
    out.push("");
    out.push(
      paint.bold(
        `Diagnostics: ${errors} error${errors === 1 ? "" : "s"}, ${warnings} warning${
          warnings === 1 ? "" : "s"
        }`,
      ),
    );
    for (const d of diagnostics) out.push(formatDiagnostic(d, paint));
  }
  out.push("");
  out.push(paint.dim(CAUTION));
  return out.join("\n");
}
