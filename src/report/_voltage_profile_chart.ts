/**
 * Voltage profile of a feeder: every bus at its distance from the source (x) and its
 * voltage (y), the branches drawn between their buses, one colour per case, and dashed
 * rules at the limits of the voltage band of each level present.
 */
import type { CaseOutcome } from "../pipeline/study_feeder.ts";
import type { ReportContext } from "./report_context.ts";
import { renderVegaLiteSvg } from "./_vega_svg.ts";
import { LIMIT_COLOUR, SERIES_COLOURS } from "./_chart_palette.ts";
import { voltageLevelOf } from "./_voltage_band.ts";

/**
 * Above this many buses a case is drawn binned: a chart of every bus and branch of a very
 * large feeder is unreadable and takes seconds to render.
 */
export const PROFILE_DETAIL_BUSES = 150;
/** Distance bins of a binned profile. */
export const PROFILE_BINS = 60;

type Point = { case: string; bus: string; km: number; v: number };
type Segment = { case: string; km: number; km2: number; v: number; v2: number };

/** The lowest and highest voltage per distance bin, joined bin to bin. */
function binnedProfile(c: CaseOutcome, xMax: number, points: Point[], segments: Segment[]): void {
  const lo = new Float64Array(PROFILE_BINS).fill(Infinity);
  const hi = new Float64Array(PROFILE_BINS).fill(-Infinity);
  const loBus: string[] = [], hiBus: string[] = [];
  const width = xMax > 0 ? xMax / PROFILE_BINS : 1;
  for (const b of c.buses!) {
    const i = Math.min(PROFILE_BINS - 1, Math.floor(b.distanceKm / width));
    if (b.vPu < lo[i]!) {
      lo[i] = b.vPu;
      loBus[i] = b.id;
    }
    if (b.vPu > hi[i]!) {
      hi[i] = b.vPu;
      hiBus[i] = b.id;
    }
  }
  let prev = -1;
  for (let i = 0; i < PROFILE_BINS; i++) {
    if (!Number.isFinite(lo[i]!)) continue;
    const km = (i + 0.5) * width;
    points.push({ case: c.caseId, bus: loBus[i]!, km, v: lo[i]! });
    if (hi[i]! > lo[i]!) points.push({ case: c.caseId, bus: hiBus[i]!, km, v: hi[i]! });
    if (prev >= 0) {
      const km0 = (prev + 0.5) * width;
      segments.push({ case: c.caseId, km: km0, km2: km, v: lo[prev]!, v2: lo[i]! });
      segments.push({ case: c.caseId, km: km0, km2: km, v: hi[prev]!, v2: hi[i]! });
    }
    prev = i;
  }
}

export interface VoltageProfileChart {
  /** SVG text, or null when no case has bus results to draw. */
  readonly svg: string | null;
  /** Cases left out, and why, in plain words. */
  readonly notes: readonly string[];
}

export async function voltageProfileChart(
  cases: readonly CaseOutcome[],
  limits: ReportContext["limits"],
  idPrefix: string,
): Promise<VoltageProfileChart> {
  const notes: string[] = [];
  const drawn: CaseOutcome[] = [];
  for (const c of cases) {
    if (!c.converged) notes.push(`Case "${c.caseId}" did not converge and is not drawn.`);
    else if (c.buses === undefined || c.buses.length === 0) {
      notes.push(`Case "${c.caseId}" has no bus results in this run.`);
    } else drawn.push(c);
  }
  if (drawn.length === 0) return { svg: null, notes };

  const points: Point[] = [];
  const segments: Segment[] = [];
  const levels = new Set<"mv" | "lv">();
  let xMax = 0, vLo = Infinity, vHi = -Infinity;
  const detailed = drawn.every((c) => c.buses!.length <= PROFILE_DETAIL_BUSES);
  if (!detailed) {
    notes.push(
      `The feeder has more than ${PROFILE_DETAIL_BUSES} buses: each case is drawn as the lowest ` +
        `and highest bus voltage in each of ${PROFILE_BINS} equal distance bins.`,
    );
  }
  for (const c of drawn) {
    for (const b of c.buses!) {
      levels.add(voltageLevelOf(b.vnKv, limits));
      xMax = Math.max(xMax, b.distanceKm);
      vLo = Math.min(vLo, b.vPu);
      vHi = Math.max(vHi, b.vPu);
    }
  }
  for (const c of drawn) {
    if (!detailed) {
      binnedProfile(c, xMax, points, segments);
      continue;
    }
    const at = new Map<string, { km: number; v: number }>();
    for (const b of c.buses!) {
      at.set(b.id, { km: b.distanceKm, v: b.vPu });
      points.push({ case: c.caseId, bus: b.id, km: b.distanceKm, v: b.vPu });
    }
    for (const br of c.branches ?? []) {
      const f = at.get(br.from), t = at.get(br.to);
      if (f && t) segments.push({ case: c.caseId, km: f.km, km2: t.km, v: f.v, v2: t.v });
    }
  }
  const rules: { v: number; label: string }[] = [];
  for (const level of (["mv", "lv"] as const).filter((l) => levels.has(l))) {
    const band = limits.voltageBand[level];
    for (const v of [band.vMinPu, band.vMaxPu]) {
      const same = rules.find((r) => Math.abs(r.v - v) < 1e-9);
      const name = level.toUpperCase();
      if (same) same.label = same.label.replace(")", `, ${name})`);
      else rules.push({ v, label: `${v.toFixed(2)} pu (${name})` });
      vLo = Math.min(vLo, v);
      vHi = Math.max(vHi, v);
    }
  }
  const pad = Math.max(0.005, 0.06 * (vHi - vLo));
  const xEnd = xMax > 0 ? xMax : 1;
  const caseIds = drawn.map((c) => c.caseId);
  const colour = {
    field: "case",
    type: "nominal" as const,
    title: "Case",
    scale: { domain: caseIds, range: SERIES_COLOURS.slice(0, Math.max(1, caseIds.length)) },
    legend: { orient: "bottom" as const, direction: "horizontal" as const },
  };
  const x = {
    field: "km",
    type: "quantitative" as const,
    title: "Distance from the source (km)",
    scale: { domain: [0, xEnd], nice: false },
  };
  const y = {
    field: "v",
    type: "quantitative" as const,
    title: "Voltage (pu)",
    scale: { domain: [vLo - pad, vHi + pad], nice: false, zero: false },
    axis: { format: ".2f" },
  };
  const svg = await renderVegaLiteSvg({
    width: 640,
    height: 250,
    layer: [
      {
        data: { values: rules },
        mark: { type: "rule", color: LIMIT_COLOUR, strokeDash: [5, 4], strokeWidth: 1 },
        encoding: { y: { ...y, field: "v" } },
      },
      {
        data: { values: rules.map((r) => ({ ...r, km: 0 })) },
        mark: {
          type: "text",
          align: "left",
          dx: 4,
          baseline: "bottom",
          dy: -2,
          color: LIMIT_COLOUR,
          fontSize: 10,
        },
        encoding: { x, y, text: { field: "label", type: "nominal" } },
      },
      {
        data: { values: segments },
        // The branch lines add nothing a reader needs spelled out; the bus points keep theirs.
        mark: { type: "rule", strokeWidth: 1.6, clip: true, aria: false },
        encoding: {
          x,
          x2: { field: "km2" },
          y,
          y2: { field: "v2" },
          color: colour,
        },
      },
      {
        data: { values: points },
        mark: { type: "circle", size: 22, opacity: 1, clip: true },
        encoding: { x, y, color: colour },
      },
    ],
  }, idPrefix);
  return { svg, notes };
}
