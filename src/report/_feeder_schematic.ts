/**
 * The feeder schematic as SVG text: the tree of _feeder_tree_layout.ts drawn with elbow
 * connectors (down at the branching bus, then along), buses as dots filled by a
 * BusColouring, the source as a square, loop-closing branches dashed, a kilometre axis
 * below. The colouring's legend is the caller's (HTML beside the drawing). Hand-written
 * SVG: no script, no external reference.
 */
import type { TreeLayout } from "./_feeder_tree_layout.ts";
import type { BusColouring } from "./_bus_colouring.ts";
import { escapeHtml as esc } from "./_html.ts";

const WIDTH = 800;
const LEFT = 18;
const RIGHT = 118;
const TOP = 22;
const AXIS = 34;
const MAX_PLOT_HEIGHT = 560;
const LABEL_ROWS = 40;

const f1 = (v: number) => (Math.round(v * 10) / 10).toString();

/** A step of 1, 2 or 5 × 10^k giving about `target` intervals over `span`. */
function niceStep(span: number, target: number): number {
  const raw = span / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const m = raw / mag;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * mag;
}

export function renderFeederSchematic(
  layout: TreeLayout,
  colouring: BusColouring,
  label: string,
): string {
  const rowGap = layout.rows <= 1 ? 20 : Math.max(4, Math.min(20, MAX_PLOT_HEIGHT / layout.rows));
  const r = Math.max(1.8, Math.min(4.2, rowGap / 3.6));
  const plotW = WIDTH - LEFT - RIGHT;
  const spanKm = layout.maxDistanceKm > 0 ? layout.maxDistanceKm : 1;
  const x = (km: number) => LEFT + (km / spanKm) * plotW;
  const y = (row: number) => TOP + row * rowGap;
  const plotBottom = y(Math.max(0, layout.rows - 1)) + 10;
  const height = plotBottom + AXIS;
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" class="schematic" width="${WIDTH}" height="${
      f1(height)
    }" viewBox="0 0 ${WIDTH} ${f1(height)}" role="img" aria-label="${esc(label)}">`,
  );
  // Kilometre axis.
  const step = niceStep(spanKm, 8);
  out.push(`<g class="axis" font-size="10" fill="#3b4148">`);
  out.push(
    `<line x1="${LEFT}" y1="${f1(plotBottom)}" x2="${f1(x(spanKm))}" y2="${
      f1(plotBottom)
    }" stroke="#8a9097"/>`,
  );
  for (let km = 0; km <= spanKm + 1e-9; km += step) {
    const tick = Math.round(km / step) * step;
    out.push(
      `<line x1="${f1(x(tick))}" y1="${f1(plotBottom)}" x2="${f1(x(tick))}" y2="${
        f1(plotBottom + 4)
      }" stroke="#8a9097"/><text x="${f1(x(tick))}" y="${
        f1(plotBottom + 15)
      }" text-anchor="middle">${esc(String(Number(tick.toPrecision(6))))}</text>`,
    );
  }
  out.push(
    `<text x="${f1(LEFT + plotW / 2)}" y="${
      f1(plotBottom + 29)
    }" text-anchor="middle" font-weight="600">Distance from the source (km)</text></g>`,
  );
  // Branches of the tree, then loop-closing branches.
  out.push(`<g class="branches" fill="none" stroke="#70767d" stroke-width="1.3">`);
  for (const node of layout.nodes) {
    if (node.parent < 0) continue;
    const p = layout.nodes[node.parent]!;
    out.push(
      `<path d="M${f1(x(p.distanceKm))} ${f1(y(p.row))}V${f1(y(node.row))}H${
        f1(x(node.distanceKm))
      }"/>`,
    );
  }
  for (const loop of layout.loops) {
    const a = layout.nodes[loop.from]!, b = layout.nodes[loop.to]!;
    out.push(
      `<line class="loop" x1="${f1(x(a.distanceKm))}" y1="${f1(y(a.row))}" x2="${
        f1(x(b.distanceKm))
      }" y2="${f1(y(b.row))}" stroke="#7b4a86" stroke-dasharray="4 3"><title>${
        esc(`${loop.id}: closes a loop`)
      }</title></line>`,
    );
  }
  out.push(`</g><g class="buses" stroke="#2b2f33" stroke-width="0.7">`);
  const lastInRow = new Map<number, number>();
  layout.nodes.forEach((n, k) => {
    const was = lastInRow.get(n.row);
    if (was === undefined || n.distanceKm >= layout.nodes[was]!.distanceKm) lastInRow.set(n.row, k);
  });
  layout.nodes.forEach((n, k) => {
    const cx = f1(x(n.distanceKm)), cy = f1(y(n.row));
    const fill = colouring.colourOf(n.id);
    const title = `<title>${esc(colouring.describe(n.id))}</title>`;
    out.push(
      k === 0
        ? `<rect x="${f1(x(n.distanceKm) - r - 1)}" y="${f1(y(n.row) - r - 1)}" width="${
          f1(2 * r + 2)
        }" height="${f1(2 * r + 2)}" fill="${fill}">${title}</rect>`
        : `<circle cx="${cx}" cy="${cy}" r="${f1(r)}" fill="${fill}">${title}</circle>`,
    );
  });
  out.push(`</g>`);
  if (layout.rows <= LABEL_ROWS) {
    out.push(`<g class="labels" font-size="10" fill="#3b4148">`);
    for (const k of [0, ...lastInRow.values()].filter((k, i, a) => a.indexOf(k) === i)) {
      const n = layout.nodes[k];
      if (n === undefined) continue;
      out.push(
        k === 0
          ? `<text x="${f1(x(n.distanceKm) - r)}" y="${f1(y(n.row) - r - 4)}">${esc(n.id)}</text>`
          : `<text x="${f1(x(n.distanceKm) + r + 4)}" y="${f1(y(n.row) + 3.5)}">${
            esc(n.id)
          }</text>`,
      );
    }
    out.push(`</g>`);
  }
  out.push(`</svg>`);
  return out.join("");
}
