/**
 * Time–current plot of a feeder's protective devices on log–log axes: each relay's
 * characteristic per element (and per recloser curve set) as the fastest of its stages at
 * each current, and each fuse's melt and clear curves. Times come from
 * src/solve/overcurrent_time.ts. The plot spans 0.01–1000 s; a relay time below 0.01 s
 * (an instantaneous stage) is drawn at 0.01 s, and curves are clipped at the plot's edges.
 */
import type { RelayStage } from "../model/network.ts";
import { fuseTimeS, stageOperatingTimeS } from "../solve/overcurrent_time.ts";
import type { DeviceCurves } from "./feeder_file.ts";
import { renderVegaLiteSvg } from "./_vega_svg.ts";
import { SERIES_COLOURS } from "./_chart_palette.ts";

export const TCC_MIN_S = 0.01;
export const TCC_MAX_S = 1000;

export type CurveStyle = "phase" | "earth" | "melt" | "clear";

export interface TccSeries {
  readonly name: string;
  /** Curves sharing a key share a colour: a fuse's melt and clear curves. */
  readonly colourKey: string;
  readonly style: CurveStyle;
  /**
   * Points in ascending current; relay times raised to TCC_MIN_S, times above
   * 10 × TCC_MAX_S left out (the rest is clipped when drawn).
   */
  readonly points: readonly { readonly iA: number; readonly tS: number }[];
}

export interface TccData {
  readonly series: readonly TccSeries[];
  /** Current axis range, A: whole decades around every pickup and fuse point. */
  readonly iMinA: number;
  readonly iMaxA: number;
  readonly notes: readonly string[];
}

const SAMPLES = 160;
/** Extra samples just above each pickup, where inverse curves fall steeply. */
const NEAR_PICKUP = [1 + 1e-6, 1.001, 1.003, 1.01, 1.03, 1.1];

function usable(stage: RelayStage): boolean {
  try {
    stageOperatingTimeS(stage, 2 * stage.pickupA);
    return true;
  } catch {
    return false;
  }
}

/** The curves to draw, sampled at log-spaced currents plus every pickup and fuse point. */
export function timeCurrentSeries(devices: readonly DeviceCurves[]): TccData | null {
  const notes: string[] = [];
  const groups: {
    name: string;
    colourKey: string;
    style: CurveStyle;
    floor: number;
    /** Relays: the lowest pickup, drawn as a rise to the top of the plot. */
    pickupA: number | null;
    time: (iA: number) => number;
  }[] = [];
  const knees: number[] = [];
  const fuses = new Map<
    string,
    { curve: NonNullable<DeviceCurves["fuseCurve"]>; deviceIds: string[] }
  >();
  let lo = Infinity, hi = 0;
  for (const d of devices) {
    for (const relay of d.relays) {
      const ok = relay.stages.filter((s) => {
        if (usable(s)) return true;
        notes.push(`Stage ${s.stage} of relay "${relay.id}" lacks a setting and is not drawn.`);
        return false;
      });
      for (const element of ["phase", "earth"] as const) {
        const own = ok.filter((s) => s.element === element);
        if (own.length === 0) continue;
        const sets = own.some((s) => s.curveSet !== "both") ? ["fast", "delayed"] as const : [null];
        for (const set of sets) {
          const stages = own.filter((s) =>
            set === null || s.curveSet === set || s.curveSet === "both"
          );
          if (stages.length === 0) continue;
          const directions = [...new Set(stages.map((s) => s.direction))]
            .filter((x) => x !== "non_directional");
          const name = [d.id, relay.id, element, set, ...directions]
            .filter((x) => x !== null)
            .join(" · ");
          groups.push({
            name,
            colourKey: name,
            style: element,
            floor: TCC_MIN_S,
            pickupA: Math.min(...stages.map((s) => s.pickupA)),
            time: (iA) => Math.min(...stages.map((s) => stageOperatingTimeS(s, iA))),
          });
          for (const s of stages) {
            knees.push(s.pickupA, ...NEAR_PICKUP.map((m) => m * s.pickupA));
            lo = Math.min(lo, s.pickupA);
            hi = Math.max(hi, 20 * s.pickupA);
          }
        }
      }
    }
    if (d.fuseCurve !== null) {
      const fc = d.fuseCurve;
      const key = JSON.stringify([fc.id, fc.melt, fc.clear]);
      const same = fuses.get(key);
      if (same) same.deviceIds.push(d.id);
      else fuses.set(key, { curve: fc, deviceIds: [d.id] });
    }
    const drawn = d.relays.some((r) => r.stages.length > 0) || d.fuseCurve !== null;
    if (d.breakingCurrentA !== null && drawn) hi = Math.max(hi, d.breakingCurrentA);
  }
  // Fuse links of the same curve are drawn once, naming their devices.
  for (const { curve: fc, deviceIds } of fuses.values()) {
    const who = deviceIds.length <= 3
      ? deviceIds.join(", ")
      : `${deviceIds.slice(0, 2).join(", ")} and ${deviceIds.length - 2} more`;
    for (const [style, pts] of [["melt", fc.melt], ["clear", fc.clear]] as const) {
      if (pts.length === 0) continue;
      groups.push({
        name: `${who} · ${fc.id} · ${style}`,
        colourKey: `${who} · ${fc.id}`,
        style,
        floor: 0,
        pickupA: null,
        time: (iA) => fuseTimeS(pts, iA),
      });
      for (const p of pts) knees.push(p.x);
      lo = Math.min(lo, pts[0]!.x);
      hi = Math.max(hi, 2 * pts[pts.length - 1]!.x);
    }
  }
  if (groups.length === 0) {
    return notes.length > 0 ? { series: [], iMinA: 1, iMaxA: 10, notes } : null;
  }
  const iMinA = 10 ** Math.floor(Math.log10(lo));
  const iMaxA = 10 ** Math.ceil(Math.log10(hi));
  const span = Math.log(iMaxA / iMinA);
  const currents = [
    ...Array.from({ length: SAMPLES + 1 }, (_, k) => iMinA * Math.exp((span * k) / SAMPLES)),
    ...knees.filter((i) => i >= iMinA && i <= iMaxA),
  ].sort((a, b) => a - b);
  const series = groups.map((g) => ({
    name: g.name,
    colourKey: g.colourKey,
    style: g.style,
    points: [
      ...(g.pickupA === null ? [] : [{ iA: g.pickupA, tS: 10 * TCC_MAX_S }]),
      ...currents.flatMap((iA) => {
        const t = g.time(iA);
        return t > 10 * TCC_MAX_S || !Number.isFinite(t) || !(t > 0 || g.floor > 0)
          ? []
          : [{ iA, tS: Math.max(t, g.floor) }];
      }),
    ],
  }));
  return { series, iMinA, iMaxA, notes };
}

/** SVG of the time–current plot, or null when no device has curves. */
/** A fault current marked on the plot as a vertical line with its label. */
export interface FaultMark {
  readonly label: string;
  readonly iA: number;
}

export async function timeCurrentChart(
  devices: readonly DeviceCurves[],
  idPrefix: string,
  faultMarks: readonly FaultMark[] = [],
): Promise<{ svg: string | null; notes: readonly string[] }> {
  const series = timeCurrentSeries(devices);
  if (series === null) return { svg: null, notes: [] };
  if (series.series.length === 0) return { svg: null, notes: series.notes };
  // The current axis reaches the marked fault currents too, in whole decades.
  const marks = faultMarks.filter((m) => m.iA > 0 && Number.isFinite(m.iA));
  const data = {
    ...series,
    iMinA: Math.min(series.iMinA, ...marks.map((m) => 10 ** Math.floor(Math.log10(m.iA)))),
    iMaxA: Math.max(series.iMaxA, ...marks.map((m) => 10 ** Math.ceil(Math.log10(m.iA)))),
  };
  const keys = [...new Set(data.series.map((s) => s.colourKey))];
  const values = data.series.flatMap((s) =>
    s.points.map((p) => ({ series: s.name, key: s.colourKey, style: s.style, iA: p.iA, tS: p.tS }))
  );
  const decades = (lo: number, hi: number, steps: readonly number[]) => {
    const out: number[] = [];
    for (let d = lo; d < hi * 1.0001; d *= 10) {
      for (const m of steps) if (m * d <= hi * 1.0001) out.push(Number((m * d).toPrecision(6)));
    }
    return out;
  };
  const xMinor = decades(data.iMinA, data.iMaxA, [1, 2, 3, 4, 5, 6, 7, 8, 9]);
  const yMinor = decades(TCC_MIN_S, TCC_MAX_S, [1, 2, 3, 4, 5, 6, 7, 8, 9]);
  const x = {
    field: "iA",
    type: "quantitative" as const,
    title: "Current (A)",
    scale: { type: "log" as const, domain: [data.iMinA, data.iMaxA], nice: false },
    axis: { format: "~s", grid: false, values: decades(data.iMinA, data.iMaxA, [1, 2, 5]) },
  };
  const y = {
    field: "tS",
    type: "quantitative" as const,
    title: "Time (s)",
    scale: { type: "log" as const, domain: [TCC_MIN_S, TCC_MAX_S], nice: false },
    axis: { format: "~g", grid: false, values: decades(TCC_MIN_S, TCC_MAX_S, [1, 2, 5]) },
  };
  const isDecade = (v: number) => Math.abs(Math.log10(v) - Math.round(Math.log10(v))) < 1e-9;
  /** Log-paper grid: light rules at 2–9 of each decade, darker ones at the decades. */
  const gridLayer = (decade: boolean) => ({
    data: {
      values: [
        ...xMinor.filter((v) => isDecade(v) === decade)
          .map((v) => ({ iA: v, iA2: v, tS: TCC_MIN_S, tS2: TCC_MAX_S })),
        ...yMinor.filter((v) => isDecade(v) === decade)
          .map((v) => ({ iA: data.iMinA, iA2: data.iMaxA, tS: v, tS2: v })),
      ],
    },
    mark: { type: "rule" as const, strokeWidth: 1, color: decade ? "#c3c8ce" : "#eceef1" },
    encoding: { x, x2: { field: "iA2" }, y, y2: { field: "tS2" } },
  });
  const svg = await renderVegaLiteSvg({
    width: 560,
    height: 380,
    layer: [
      gridLayer(false),
      gridLayer(true),
      {
        data: { values: marks.map((m) => ({ ...m, tS: TCC_MIN_S, tS2: TCC_MAX_S })) },
        mark: { type: "rule" as const, strokeWidth: 1.2, color: "#5a2d0c", strokeDash: [2, 2] },
        encoding: { x, y, y2: { field: "tS2" } },
      },
      {
        data: { values: marks.map((m, i) => ({ ...m, tS: TCC_MAX_S / 1.6 ** (i * 2 + 1) })) },
        mark: {
          type: "text" as const,
          align: "left" as const,
          dx: 3,
          fontSize: 9,
          color: "#5a2d0c",
        },
        encoding: { x, y, text: { field: "label", type: "nominal" as const } },
      },
      {
        data: { values },
        mark: { type: "line", strokeWidth: 1.7, clip: true, interpolate: "linear" },
        encoding: {
          x,
          y,
          order: { field: "iA", type: "quantitative" },
          detail: { field: "series", type: "nominal" },
          color: {
            field: "key",
            type: "nominal",
            title: "Curves",
            scale: {
              domain: keys,
              range: keys.map((_, k) => SERIES_COLOURS[k % SERIES_COLOURS.length]!),
            },
            legend: {
              orient: "right",
              direction: "vertical",
              labelLimit: 420,
              symbolType: "stroke",
              symbolStrokeWidth: 2.5,
            },
          },
          strokeDash: {
            field: "style",
            type: "nominal",
            title: "Line",
            scale: {
              domain: ["phase", "earth", "melt", "clear"],
              range: [[1, 0], [7, 3], [1, 0], [3, 2]],
            },
            legend: {
              orient: "right",
              symbolType: "stroke",
              symbolStrokeWidth: 2,
              symbolSize: 260,
            },
          },
        },
      },
    ],
  }, idPrefix);
  return { svg, notes: data.notes };
}
