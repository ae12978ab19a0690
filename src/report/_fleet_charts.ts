/**
 * The fleet overview's charts: needs by class (bars) and the distribution of the feeders'
 * generation headroom (histogram). SVG text, or null when there is nothing to draw.
 */
import { NEED_CLASSES, type RankedNeed } from "../rank/need.ts";
import type { FleetFeederRow } from "./report_context.ts";
import { renderVegaLiteSvg } from "./_vega_svg.ts";
import { BAR_COLOUR } from "./_chart_palette.ts";

/** Number of needs in each class, every class shown, most urgent first. */
export function needsByClassSvg(ranking: readonly RankedNeed[]): Promise<string | null> {
  if (ranking.length === 0) return Promise.resolve(null);
  const counts = NEED_CLASSES.map((c) => ({
    needClass: c,
    needs: ranking.filter((n) => n.needClass === c).length,
  }));
  return renderVegaLiteSvg({
    width: 320,
    height: 190,
    data: { values: counts },
    layer: [
      {
        mark: { type: "bar", color: BAR_COLOUR, width: { band: 0.6 } },
        encoding: {
          x: {
            field: "needClass",
            type: "nominal",
            sort: [...NEED_CLASSES],
            title: "Need class",
            axis: { labelAngle: 0 },
          },
          y: { field: "needs", type: "quantitative", title: "Needs", axis: { tickMinStep: 1 } },
        },
      },
      {
        mark: { type: "text", dy: -7, color: "#1f2428", fontSize: 11 },
        encoding: {
          x: { field: "needClass", type: "nominal", sort: [...NEED_CLASSES] },
          y: { field: "needs", type: "quantitative" },
          text: { field: "needs", type: "quantitative" },
        },
      },
    ],
  }, "chart-needs-by-class");
}

/** Histogram of the feeders' generation headroom, MW (feeders without a value left out). */
export function headroomHistogramSvg(feeders: readonly FleetFeederRow[]): Promise<string | null> {
  const values = feeders.flatMap((f) =>
    f.headroomMw === null || !Number.isFinite(f.headroomMw) ? [] : [{ headroomMw: f.headroomMw }]
  );
  if (values.length === 0) return Promise.resolve(null);
  return renderVegaLiteSvg({
    width: 320,
    height: 190,
    data: { values },
    mark: { type: "bar", color: BAR_COLOUR, binSpacing: 1 },
    encoding: {
      x: {
        field: "headroomMw",
        type: "quantitative",
        bin: { maxbins: 20 },
        title: "Generation headroom (MW)",
      },
      y: { aggregate: "count", type: "quantitative", title: "Feeders", axis: { tickMinStep: 1 } },
    },
  }, "chart-headroom");
}
