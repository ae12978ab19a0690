/**
 * The single-file offline report (report.html), built in pieces so a fleet of any size is
 * written without holding every feeder: renderReportHead (document head, provenance,
 * caution, fleet overview), then renderFeederPage once per feeder file in any order the
 * caller reads them, then renderReportTail. Charts are inline SVG rendered here; the one
 * script and the stylesheet are inline: opening the file fetches nothing. The text is the
 * same for the same input (the only times are those of the run record).
 */
import { CAUTION } from "./run_files.ts";
import type { DeviceCurves, FeederFile } from "./feeder_file.ts";
import type { ReportContext } from "./report_context.ts";
import { type Html, html, raw } from "./_html.ts";
import { formatNumber } from "./_number_text.ts";
import { feederAnchor } from "./_feeder_anchor.ts";
import { REPORT_CSS } from "./_report_style.ts";
import { REPORT_SCRIPT } from "./_report_script.ts";
import { renderFleetTable, renderProvenance, renderRanking } from "./_fleet_overview.ts";
import { headroomHistogramSvg, needsByClassSvg } from "./_fleet_charts.ts";
import {
  renderCaseTable,
  renderFindingsSummary,
  renderHeadroom,
  renderKeyFigures,
  renderNeeds,
} from "./_feeder_sections.ts";
import { voltageProfileChart } from "./_voltage_profile_chart.ts";
import { type FaultMark, timeCurrentChart } from "./_time_current_chart.ts";
import { layoutFeederTree } from "./_feeder_tree_layout.ts";
import { worstVoltageColouring } from "./_bus_colouring.ts";
import { renderFeederSchematic } from "./_feeder_schematic.ts";
import { renderFaultLevels } from "./_fault_levels.ts";
import { renderHostingSection } from "./_hosting_section.ts";
import { renderRecoverySection } from "./_recovery_section.ts";

/** Above this many buses the schematic is left out (unreadable, and megabytes of SVG). */
export const SCHEMATIC_MAX_BUSES = 2000;

const notes = (xs: readonly string[]): Html =>
  html`${xs.map((n) => html`<p class="note">${n}</p>`)}`;

const figure = (svg: string | null, caption: Html, missing: string): Html =>
  svg === null
    ? html`<p class="note">${missing}</p>`
    : html`<figure><figcaption>${caption}</figcaption>${raw(svg)}</figure>`;

/** Opening of the document through the fleet overview; feeder pages follow it. */
export async function renderReportHead(ctx: ReportContext): Promise<string> {
  const r = ctx.run;
  const title = `Screening report: ${r.network}${
    r.pipelineName === null ? "" : ` (${r.pipelineName})`
  }`;
  const [byClass, headroom] = await Promise.all([
    needsByClassSvg(ctx.ranking),
    headroomHistogramSvg(ctx.feeders),
  ]);
  const finished = r.finishedAt === undefined ? "" : ` · finished ${r.finishedAt}`;
  const withHeadroom = ctx.feeders.filter((f) => f.headroomMw !== null).length;
  return html`
    <!doctype html>
    <html lang="en">
      <head>
        <meta charset="utf-8">
        <meta name="viewport" content="width=device-width, initial-scale=1">
        <meta name="generator" content="${r.tool} ${r.version}">
        <title>${title}</title>
        <style>${raw(REPORT_CSS)}</style>
        <script>${raw(REPORT_SCRIPT)}</script>
      </head>
      <body>
        <header class="page-head">
          <h1>Feeder screening report</h1>
          <p class="sub">${r.network} · pipeline ${r.pipelineName ?? r.pipeline}${finished}</p>
          <nav class="toc"
            aria-label="Contents"><a href="#run">Run</a><a href="#needs">Needs</a><a href="#charts">Charts</a><a href="#fleet">Fleet</a><a href="#feeders">Feeder pages</a></nav>
        </header>
        <main>
          <p class="caution" role="note">${CAUTION}</p>
          <section id="run" aria-labelledby="run-h"><h2 id="run-h">Run</h2>${renderProvenance(
            ctx,
          )}</section>
          <section id="needs" aria-labelledby="needs-h"><h2 id="needs-h">Ranked needs</h2>
    <p class="note">${formatNumber(ctx.ranking.length)} needs on ${formatNumber(
      new Set(ctx.ranking.map((n) => n.feederId)).size,
    )} feeders, most urgent first. Press a column header to sort; the filter looks at every column. Costs are indicative (${ctx
      .costs.currency}).</p>
    ${renderRanking(ctx)}</section>
          <section id="charts" aria-labelledby="charts-h">
            <h2 id="charts-h">Fleet at a glance</h2>
            <div class="charts">${figure(
              byClass,
              html`<strong>Needs by class.</strong> Number of needs in each class, most urgent class first.`,
              "No needs to count.",
            )}${figure(
              headroom,
              html`<strong>Generation headroom.</strong> How many feeders (of ${
                formatNumber(withHeadroom)
              } with a value) could take how much more generation, MW; below 0, the connected generation already crosses a limit.`,
              "No feeder has a generation headroom in this run.",
            )}</div>
          </section>
          <section id="fleet" aria-labelledby="fleet-h"><h2 id="fleet-h">Fleet</h2>
    <p class="note">Every feeder of the run; values outside their band or above 100 % loading are in bold. The feeder id opens its page.</p>
    ${renderFleetTable(ctx)}</section>
          <section id="feeders" aria-labelledby="feeders-h">
            <h2 id="feeders-h">Feeder pages</h2>
            <p
              class="note">One section per feeder of the run: key figures, needs, generation headroom, hosting capacity, recovery after faults, voltage profile, schematic and protection curves.</p>
  `.__html.trimStart();
}

/** The feeder's devices with the settings of a proposed protection scheme, or null without one. */
function proposedDevices(file: FeederFile): DeviceCurves[] | null {
  const settings = (file.needs ?? []).flatMap((n) => n.remedy?.protectionSettings ?? []);
  if (settings.length === 0) return null;
  return file.devices.map((d) => {
    const mine = settings.filter((s) => s.device === d.id);
    if (mine.length === 0) return d;
    const directional = mine.some((s) => s.direction === "forward");
    return {
      ...d,
      relays: d.relays.map((r) => ({
        ...r,
        stages: r.stages.map((st) => {
          const s = mine.find((x) => x.relay === r.id && x.stage === st.stage);
          return {
            ...st,
            ...(directional ? { direction: "forward" as const } : {}),
            ...(s === undefined ? {} : { pickupA: s.pickupA, timeMultiplier: s.timeMultiplier }),
          };
        }),
      })),
    };
  });
}

/** The fault currents the time–current plot marks: the largest and the smallest on the feeder. */
function faultMarks(file: FeederFile): FaultMark[] {
  const f = file.faults;
  if (f === undefined || f === null || f.buses.length === 0) return [];
  const own = f.buses.filter((b) => b.id !== f.buses[0]!.id);
  const rows = own.length > 0 ? own : f.buses;
  // A loop, not a spread: a feeder may have 100,000 buses.
  const ka = (xs: (number | null)[], pick: (a: number, b: number) => number) => {
    let out: number | null = null;
    for (const x of xs) if (x !== null && x > 0) out = out === null ? x : pick(out, x);
    return out;
  };
  const marks: FaultMark[] = [];
  const max3 = ka(rows.map((b) => b.max.ik3Ka), Math.max);
  const min2 = ka(rows.map((b) => b.min.ik2Ka), Math.min);
  const min1 = ka(rows.map((b) => b.min.ik1Ka), Math.min);
  if (max3 !== null) marks.push({ label: `max I″k3 ${max3.toFixed(2)} kA`, iA: 1000 * max3 });
  if (min2 !== null) marks.push({ label: `min I″k2 ${min2.toFixed(2)} kA`, iA: 1000 * min2 });
  if (min1 !== null) marks.push({ label: `min I″k1 ${min1.toFixed(2)} kA`, iA: 1000 * min1 });
  return marks;
}

/** One feeder's section; its id is the feeder's anchor. */
export async function renderFeederPage(file: FeederFile, ctx: ReportContext): Promise<string> {
  const anchor = feederAnchor(file.feederId);
  const drawnCase = file.cases.find((c) => c.converged && (c.buses?.length ?? 0) > 0);
  const proposed = proposedDevices(file);
  const [profile, tcc, faultLevels, tccAfter, hosting] = await Promise.all([
    voltageProfileChart(file.cases, ctx.limits, `${anchor}-vp`),
    timeCurrentChart(file.devices, `${anchor}-tc`, faultMarks(file)),
    renderFaultLevels(file, `${anchor}-fl`),
    proposed === null
      ? Promise.resolve(null)
      : timeCurrentChart(proposed, `${anchor}-tca`, faultMarks(file)),
    renderHostingSection(file, `${anchor}-hc`),
  ]);
  let schematic: Html =
    html`<p class="note">No case has bus and branch results to draw the schematic from.</p>`;
  if (drawnCase !== undefined && drawnCase.buses!.length > SCHEMATIC_MAX_BUSES) {
    schematic = html`
      <p
        class="note">The feeder has ${String(
          drawnCase.buses!.length,
        )} buses, more than the ${String(
          SCHEMATIC_MAX_BUSES,
        )} a readable schematic can show; its bus voltages are in buses.parquet.</p>
    `;
  } else if (drawnCase !== undefined) {
    const layout = layoutFeederTree(drawnCase.buses!, drawnCase.branches ?? []);
    const colouring = worstVoltageColouring(file.cases, ctx.limits);
    schematic = html`
      <p
        class="note">${colouring
          .title}. Buses sit at their distance from the source; each branch-off starts a new row. The square is the source bus; buses joined by transformers and switches share a position. Hover a bus for its voltage. Colouring by hosting capacity is not part of this run.</p>
      <div class="schematic-wrap">${raw(
        renderFeederSchematic(layout, colouring, `Schematic of feeder ${file.feederId}`),
      )}<ul class="legend">${colouring.legend.map((l) =>
        html`<li><span class="swatch" style="background:${l.colour}"></span>${l.label}</li>`
      )}${layout.loops.length > 0
        ? html`<li><svg width="14" height="6" aria-hidden="true"><line x1="0" y1="3" x2="14" y2="3" stroke="#7b4a86" stroke-dasharray="4 3"/></svg>Branch closing a loop</li>`
        : ""}</ul></div>
    `;
  }
  const failure = file.status === "failed"
    ? html`<p class="note">The study of this feeder failed${
      file.failure ? `: ${file.failure}` : ""
    }.</p>`
    : file.status === "set_aside"
    ? html`<p class="note">Set aside: ${
      file.summary.reasons.map((x) => `${x.code} (${x.file} line ${x.line})`).join("; ") ||
      "no reason recorded"
    }.</p>`
    : "";
  return html`
    <section class="feeder" id="${anchor}" aria-labelledby="${anchor}-h">
    <h2 id="${anchor}-h">Feeder ${file.feederId} <span class="status status-${file.status}">${file
      .status.replace(
        "_",
        " ",
      )}</span><a class="back" href="#fleet">Back to the fleet table</a></h2>
    ${failure}
    <h3>Key figures</h3>
    ${renderKeyFigures(file)}
    ${renderCaseTable(file)}
    <h3>Needs</h3>
    ${renderNeeds(file, ctx.costs.currency)}
    <h3>Generation headroom</h3>
    ${renderHeadroom(file)}
    <h3>Hosting capacity</h3>
    ${hosting}
    <h3>Recovery after faults</h3>
    ${renderRecoverySection(file)}
    <h3>Voltage profile</h3>
    ${figure(
      profile.svg,
      html`Voltage of every bus against its distance from the source, one colour per case; lines join the two buses of each branch. Dashed: the limits of the voltage band.`,
      "No case has bus results to draw.",
    )}${notes(profile.notes)}
    <h3>Schematic</h3>
    ${schematic}
    <h3>Fault levels</h3>
    ${faultLevels}
    <h3>Protection: time–current curves</h3>
    ${figure(
      tcc.svg,
      html`Operating time against current, log–log. Relays: the fastest stage at each current, per element (and per recloser curve set). Fuses: melting and total clearing curves. Each relay curve rises at its lowest pickup; relay times below 0.01 s (instantaneous stages) are drawn at 0.01 s.`,
      "No protective device with time–current settings on this feeder.",
    )}${notes(tcc.notes)}
    <p class="note">${file.faults === undefined || file.faults === null ||
        file.faults.buses.length === 0
      ? "Fault currents are not computed in this run, so none are marked on the curves."
      : "Dotted lines: the largest three-phase fault current on the feeder (maximum condition, generation in service) and the smallest line-to-line and line-to-earth currents (minimum condition), which the protection must clear."}</p>
    ${tccAfter === null ? "" : html`<h3>Protection: proposed directional scheme</h3>${
      figure(
        tccAfter.svg,
        html`The same devices with the settings the proposed scheme gives them (protection.csv): directional relays operate only for current flowing away from the source. A screening proposal, to be verified by a licensed protection engineer.`,
        "No curves to draw.",
      )
    }`}
    <h3>Findings</h3>
    ${renderFindingsSummary(file)}
    </section>
  `.__html;
}

/** Closing of the document, with the caution again. */
export function renderReportTail(ctx: ReportContext): string {
  return html`
    </section>
    </main>
    <footer class="page-foot">
      <p class="caution" role="note">${CAUTION}</p>
      <p>Written by ${ctx.run.tool} ${ctx.run.version} from the run of ${ctx.run
        .network}${ctx.run.finishedAt === undefined ? "" : ` finished ${ctx.run.finishedAt}`}.</p>
    </footer>
    </body>
    </html>
  `.__html;
}
