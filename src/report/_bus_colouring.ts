/**
 * Colours of the buses in the feeder schematic. The schematic takes any BusColouring; the
 * one this run can give is the worst voltage per bus across the converged cases, in five
 * classes of a scale of our own: where the voltage sits in its level's band (cool below
 * 1 pu, warm above, darkest outside the band).
 */
import type { CaseOutcome } from "../pipeline/study_feeder.ts";
import type { ReportContext } from "./report_context.ts";
import { bandOf, bandShare } from "./_voltage_band.ts";

export interface BusColouring {
  readonly title: string;
  readonly legend: readonly { readonly label: string; readonly colour: string }[];
  /** Fill colour of a bus (NO_RESULT_COLOUR when there is none). */
  readonly colourOf: (busId: string) => string;
  /** Tooltip text of a bus. */
  readonly describe: (busId: string) => string;
}

export const NO_RESULT_COLOUR = "#ffffff";

const CLASSES = [
  { upTo: -1, colour: "#23426e", label: "Below the band" },
  { upTo: -0.5, colour: "#86a6cf", label: "Low: more than half the allowed drop" },
  { upTo: 0.5, colour: "#a3b89c", label: "Near nominal: within half the allowed deviation" },
  { upTo: 1, colour: "#e2a66f", label: "High: more than half the allowed rise" },
  { upTo: Infinity, colour: "#9c3a1e", label: "Above the band" },
] as const;

/** Share of the band → class colour (limits themselves count as inside the band). */
export function voltageClassColour(share: number): string {
  for (const c of CLASSES) {
    if (c.upTo === -1 ? share < -1 : share <= c.upTo) return c.colour;
  }
  return CLASSES[CLASSES.length - 1]!.colour;
}

export function worstVoltageColouring(
  cases: readonly CaseOutcome[],
  limits: ReportContext["limits"],
): BusColouring {
  const worst = new Map<string, { share: number; vPu: number; caseId: string; band: string }>();
  for (const c of cases) {
    if (!c.converged) continue;
    for (const b of c.buses ?? []) {
      const band = bandOf(b.vnKv, limits);
      const share = bandShare(b.vPu, band);
      const was = worst.get(b.id);
      if (was === undefined || Math.abs(share) > Math.abs(was.share)) {
        worst.set(b.id, {
          share,
          vPu: b.vPu,
          caseId: c.caseId,
          band: `${band.vMinPu.toFixed(2)}–${band.vMaxPu.toFixed(2)} pu`,
        });
      }
    }
  }
  return {
    title: "Worst voltage across the cases, against the band of the bus's level",
    legend: [
      ...CLASSES.map(({ label, colour }) => ({ label, colour })),
      { label: "No result", colour: NO_RESULT_COLOUR },
    ],
    colourOf: (id) => {
      const w = worst.get(id);
      return w === undefined ? NO_RESULT_COLOUR : voltageClassColour(w.share);
    },
    describe: (id) => {
      const w = worst.get(id);
      return w === undefined
        ? `${id}: no result`
        : `${id}: ${w.vPu.toFixed(3)} pu in case ${w.caseId} (band ${w.band})`;
    },
  };
}
