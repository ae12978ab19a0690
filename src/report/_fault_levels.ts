/**
 * A feeder's fault levels on its page: the short-circuit currents of every bus against its
 * distance from the source (maximum three-phase with and without generation, minimum
 * line-to-line and line-to-earth), and the duty of each switching device against its ratings.
 */
import type { FeederFile } from "./feeder_file.ts";
import { type Html, html, raw } from "./_html.ts";
import { formatNumber } from "./_number_text.ts";
import { renderVegaLiteSvg } from "./_vega_svg.ts";
import { SERIES_COLOURS } from "./_chart_palette.ts";
import { PROFILE_BINS, PROFILE_DETAIL_BUSES } from "./_voltage_profile_chart.ts";

const SERIES = [
  "max I″k3, generation in",
  "max I″k3, generation out",
  "min I″k2",
  "min I″k1",
] as const;

type Point = { series: string; km: number; ka: number; bus: string };

/** Per series, the lowest and highest current in each of PROFILE_BINS distance bins. */
function binExtremes(values: readonly Point[]): Point[] {
  let kmMax = 0;
  for (const v of values) kmMax = Math.max(kmMax, v.km);
  const width = kmMax > 0 ? kmMax / PROFILE_BINS : 1;
  const keep = new Map<string, { lo: Point; hi: Point }>();
  for (const v of values) {
    const key = `${v.series}|${Math.min(PROFILE_BINS - 1, Math.floor(v.km / width))}`;
    const e = keep.get(key);
    if (e === undefined) keep.set(key, { lo: v, hi: v });
    else {
      if (v.ka < e.lo.ka) e.lo = v;
      if (v.ka > e.hi.ka) e.hi = v;
    }
  }
  return [...keep.values()].flatMap((e) => (e.lo === e.hi ? [e.lo] : [e.lo, e.hi]));
}

export async function renderFaultLevels(file: FeederFile, idPrefix: string): Promise<Html> {
  const f = file.faults;
  if (f === undefined || f === null || f.buses.length === 0) {
    return html`<p class="note">The short-circuit study is not part of this run.</p>`;
  }
  const distance = new Map<string, number>();
  for (const c of file.cases) for (const b of c.buses ?? []) distance.set(b.id, b.distanceKm);
  let values: Point[] = [];
  for (const b of f.buses) {
    const km = distance.get(b.id);
    if (km === undefined) continue;
    const add = (series: string, ka: number | null) => {
      if (ka !== null && ka > 0) values.push({ series, km, ka, bus: b.id });
    };
    add(SERIES[0], b.max.ik3Ka);
    add(SERIES[1], b.maxWithoutGeneration.ik3Ka);
    add(SERIES[2], b.min.ik2Ka);
    add(SERIES[3], b.min.ik1Ka);
  }
  const binned = f.buses.length > PROFILE_DETAIL_BUSES;
  if (binned) values = binExtremes(values);
  const svg = values.length === 0 ? null : await renderVegaLiteSvg({
    width: 560,
    height: 220,
    data: { values },
    mark: { type: "point", filled: true, size: 18, opacity: 0.85 },
    encoding: {
      x: { field: "km", type: "quantitative", title: "Distance from the source (km)" },
      y: {
        field: "ka",
        type: "quantitative",
        title: "Short-circuit current (kA)",
        scale: { type: "log" },
        axis: { format: "~g" },
      },
      color: {
        field: "series",
        type: "nominal",
        title: "Current",
        scale: { domain: [...SERIES], range: SERIES_COLOURS.slice(0, 4) },
        legend: { orient: "bottom", direction: "horizontal", columns: 2 },
      },
    },
  }, idPrefix);
  const earthFault = f.buses.filter((b) => b.capacitiveEarthFaultA !== null);
  const rows = f.devices.map((d) => {
    const breaking = d.breakingCurrentA === null
      ? null
      : 100 * 1000 * d.dutyKa / d.breakingCurrentA;
    const making = d.makingCurrentA === null ? null : 100 * 1000 * d.peakKa / d.makingCurrentA;
    const over = (breaking ?? 0) > 100 || (making ?? 0) > 100;
    return html`
      <tr class="${over ? "over" : ""}">
        <td>${d.id}</td>
        <td>${d.kind}</td>
        <td class="num">${formatNumber(d.forwardKa, 2)}</td>
        <td class="num">${formatNumber(d.reverseKa, 2)}</td>
        <td class="num">${d.breakingCurrentA === null
          ? "–"
          : formatNumber(d.breakingCurrentA / 1000, 1)}</td>
        <td class="num">${breaking === null ? "–" : `${formatNumber(breaking, 0)} %`}</td>
        <td class="num">${formatNumber(d.peakKa, 2)}</td>
        <td class="num">${making === null ? "–" : `${formatNumber(making, 0)} %`}</td>
      </tr>
    `;
  });
  return html`
    ${svg === null
      ? ""
      : html`<figure><figcaption>Initial short-circuit current at every bus against its distance from the source (IEC 60909-0, equivalent voltage source)${
        binned
          ? `; the feeder has more than ${PROFILE_DETAIL_BUSES} buses, so each current shows its lowest and highest value in each of ${PROFILE_BINS} distance bins`
          : ""
      }.</figcaption>${raw(svg)}</figure>`}
    ${rows.length === 0 ? "" : html`
      <table class="data">
        <thead>
          <tr>
            <th>Device</th>
            <th>Kind</th>
            <th class="num">Beyond it (kA)</th>
            <th class="num">Fed back (kA)</th>
            <th class="num">Breaking (kA)</th>
            <th class="num">Breaking duty</th>
            <th class="num">Peak (kA)</th>
            <th class="num">Making duty</th>
          </tr>
        </thead>
        <tbody>${rows}</tbody>
      </table>
    `}
    ${earthFault.length === 0 ? "" : html`
      <p
        class="note">${String(
          earthFault.length,
        )} bus(es) have no earth path (isolated or resonant neutral): their capacitive earth-fault current from this feeder's lines is up to ${formatNumber(
          earthFault.reduce((m, b) => Math.max(m, b.capacitiveEarthFaultA!), 0),
          1,
        )} A.</p>
    `}
  `;
}
