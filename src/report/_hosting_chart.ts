/**
 * Hosting capacity along a feeder: the capacity of every bus (y, kW) against the bus's
 * distance from the source (x, km), one colour and shape per reactive-power strategy.
 * Distances come from the bus results of the feeder's cases, the hosting case first.
 */
import type { FeederFile } from "./feeder_file.ts";
import type { FeederHosting } from "../hosting/host_feeder.ts";
import { renderVegaLiteSvg } from "./_vega_svg.ts";
import { SERIES_COLOURS } from "./_chart_palette.ts";

/** Above this many buses each strategy is drawn binned, like the voltage profile. */
export const HOSTING_DETAIL_BUSES = 150;
/** Distance bins of a binned chart. */
export const HOSTING_BINS = 60;

const SHAPES = ["circle", "square", "triangle-up", "diamond", "cross", "triangle-down"];

export interface HostingChart {
  /** SVG text, or null when no bus has both a capacity and a distance. */
  readonly svg: string | null;
  readonly notes: readonly string[];
}

/** Distance from the source of every bus with results, the hosting case's first. */
export function busDistances(file: FeederFile, caseId: string): Map<string, number> {
  const out = new Map<string, number>();
  const ordered = [
    ...file.cases.filter((c) => c.caseId === caseId),
    ...file.cases.filter((c) => c.caseId !== caseId),
  ];
  for (const c of ordered) {
    for (const b of c.buses ?? []) if (!out.has(b.id)) out.set(b.id, b.distanceKm);
  }
  return out;
}

/** The name each strategy has in the chart and tables: its label, made unique if needed. */
export function strategyNames(h: FeederHosting): Map<string, string> {
  const seen = new Map<string, number>();
  for (const s of h.strategies) seen.set(s.label, (seen.get(s.label) ?? 0) + 1);
  return new Map(
    h.strategies.map((
      s,
    ) => [s.strategy, seen.get(s.label)! > 1 ? `${s.label} (${s.strategy})` : s.label]),
  );
}

type Point = { strategy: string; bus: string; km: number; kw: number };

export async function hostingChart(
  file: FeederFile,
  h: FeederHosting,
  idPrefix: string,
): Promise<HostingChart> {
  const notes: string[] = [];
  const km = busDistances(file, h.caseId);
  const names = strategyNames(h);
  const all: Point[] = [];
  const missing = new Set<string>();
  for (const r of h.buses) {
    const d = km.get(r.bus);
    const name = names.get(r.strategy);
    if (name === undefined || !Number.isFinite(r.capacityKw)) continue;
    if (d === undefined) missing.add(r.bus);
    else all.push({ strategy: name, bus: r.bus, km: d, kw: r.capacityKw });
  }
  if (missing.size > 0) {
    notes.push(
      `${missing.size} buses have no distance from the source in this run's results and are not drawn.`,
    );
  }
  if (all.length === 0) return { svg: null, notes };
  let xMax = 0;
  const buses = new Set<string>();
  for (const p of all) {
    xMax = Math.max(xMax, p.km);
    buses.add(p.bus);
  }
  let points = all;
  if (buses.size > HOSTING_DETAIL_BUSES) {
    notes.push(
      `The feeder has more than ${HOSTING_DETAIL_BUSES} buses: each strategy is drawn as the ` +
        `lowest bus capacity in each of ${HOSTING_BINS} equal distance bins.`,
    );
    points = binLowest(all, xMax);
  }
  const domain = h.strategies.map((s) => names.get(s.strategy)!);
  const n = Math.max(1, domain.length);
  const legend = { orient: "bottom" as const, direction: "vertical" as const, labelLimit: 420 };
  const svg = await renderVegaLiteSvg({
    width: 640,
    height: 250,
    data: { values: points },
    mark: { type: "point", filled: true, size: 30, opacity: 0.9, clip: true },
    encoding: {
      x: {
        field: "km",
        type: "quantitative",
        title: "Distance from the source (km)",
        scale: { domain: [0, xMax > 0 ? xMax : 1], nice: false },
      },
      y: {
        field: "kw",
        type: "quantitative",
        title: "Hosting capacity at the bus (kW)",
        scale: { zero: true },
        axis: { format: ",.0f" },
      },
      color: {
        field: "strategy",
        type: "nominal",
        title: "Strategy",
        scale: { domain, range: SERIES_COLOURS.slice(0, n) },
        legend,
      },
      shape: {
        field: "strategy",
        type: "nominal",
        title: "Strategy",
        scale: { domain, range: SHAPES.slice(0, n) },
        legend,
      },
    },
  }, idPrefix);
  return { svg, notes };
}

/** Per strategy, the lowest capacity in each distance bin, at the bin's centre. */
function binLowest(all: readonly Point[], xMax: number): Point[] {
  const width = xMax > 0 ? xMax / HOSTING_BINS : 1;
  const lowest = new Map<string, Point>();
  for (const p of all) {
    const i = Math.min(HOSTING_BINS - 1, Math.floor(p.km / width));
    const key = `${p.strategy}\u0000${i}`;
    const was = lowest.get(key);
    if (was === undefined || p.kw < was.kw) {
      lowest.set(key, { ...p, km: (i + 0.5) * width });
    }
  }
  return [...lowest.values()];
}
