/**
 * A Vega-Lite chart rendered to SVG text at build time, with no DOM and no canvas
 * (renderer "none"), in the report's sober chart theme. The ids inside the SVG (clip
 * paths) come from a counter global to the process; they are renumbered under a prefix of
 * the caller's, so the same chart gives the same text whatever was rendered before, and
 * two charts on one page never share an id.
 */
import * as vega from "vega";
import { compile, type TopLevelSpec } from "vega-lite";

type Config = NonNullable<TopLevelSpec["config"]>;

const FONT = "sans-serif";

/** The theme every chart of the report shares. */
export const CHART_CONFIG: Config = {
  font: FONT,
  background: "#ffffff",
  padding: 6,
  view: { stroke: "#c9ccd1" },
  axis: {
    labelColor: "#3b4148",
    titleColor: "#3b4148",
    titleFontWeight: 600,
    labelFontSize: 11,
    titleFontSize: 11,
    domainColor: "#8a9097",
    tickColor: "#8a9097",
    gridColor: "#e6e8eb",
  },
  legend: {
    labelColor: "#3b4148",
    titleColor: "#3b4148",
    labelFontSize: 11,
    titleFontSize: 11,
    titleFontWeight: 600,
    labelLimit: 260,
  },
  title: { color: "#1f2428", fontSize: 12, fontWeight: 600, anchor: "start" },
};

const silent = {
  level(_?: number) {
    return 0;
  },
  error() {
    return this;
  },
  warn() {
    return this;
  },
  info() {
    return this;
  },
  debug() {
    return this;
  },
};

/** Renumbers every id of an SVG text (and its url(#…) and href="#…" uses) under `prefix`. */
export function scopeSvgIds(svg: string, prefix: string): string {
  const ids = new Map<string, string>();
  for (const m of svg.matchAll(/\sid="([^"]+)"/g)) {
    if (!ids.has(m[1]!)) ids.set(m[1]!, `${prefix}-${ids.size + 1}`);
  }
  if (ids.size === 0) return svg;
  return svg
    .replace(/(\sid=")([^"]+)(")/g, (all, a, id, b) => ids.has(id) ? a + ids.get(id) + b : all)
    .replace(/url\(#([^)]+)\)/g, (all, id) => ids.has(id) ? `url(#${ids.get(id)})` : all)
    .replace(
      /(href=")#([^"]+)(")/g,
      (all, a, id, b) => ids.has(id) ? `${a}#${ids.get(id)}${b}` : all,
    );
}

/** SVG text of a Vega-Lite spec; `idPrefix` must be unique on the page and id-safe. */
export async function renderVegaLiteSvg(spec: TopLevelSpec, idPrefix: string): Promise<string> {
  const compiled = compile(spec, { config: CHART_CONFIG, logger: silent }).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: "none", logger: silent });
  try {
    const svg = await view.toSVG();
    return scopeSvgIds(svg, idPrefix);
  } finally {
    view.finalize();
  }
}
