/**
 * The fleet part of the report: the provenance block, the ranking of needs (sortable,
 * filterable) and the table of every feeder, linking to the feeder pages.
 */
import { NEED_CLASSES, type RankedNeed } from "../rank/need.ts";
import type { FleetFeederRow, ReportContext } from "./report_context.ts";
import { type Html, html } from "./_html.ts";
import { formatMoney, formatNumber } from "./_number_text.ts";
import { feederAnchor } from "./_feeder_anchor.ts";
import { bandOf } from "./_voltage_band.ts";
import { evidenceText } from "./_evidence_text.ts";

const sortValue = (v: number | null | undefined) =>
  v === null || v === undefined || !Number.isFinite(v) ? "" : String(v);

const numCell = (v: number | null | undefined, digits: number, out = false): Html =>
  html`<td class="${out ? "num out" : "num"}" data-sort="${sortValue(v)}">${
    formatNumber(v, digits)
  }</td>`;

const head = (label: string, numeric: boolean, sorted = false): Html =>
  html`
    <th scope="col" ${numeric
      ? html`
        class="num" data-type="num"
      `
      : ""}${sorted
      ? html`
        aria-sort="ascending"
      `
      : ""}><button type="button">${label}</button></th>
  `;

export function renderProvenance(ctx: ReportContext): Html {
  const r = ctx.run;
  const tally = (t: Readonly<Record<string, number>>) => {
    const parts = Object.entries(t).map(([k, n]) => `${formatNumber(n)} ${k}`);
    return parts.length === 0 ? "none" : parts.join(", ");
  };
  const item = (k: string, v: Html | string) =>
    html`
      <dt>${k}</dt>
      <dd>${v}</dd>
    `;
  return html`<dl class="provenance">${[
    item("Tool", `${r.tool} ${r.version} (${r.command})`),
    item("Network folder", html`<code>${r.network}</code>`),
    item(
      "Pipeline",
      html`<code>${r.pipeline}</code>${r.pipelineName === null ? "" : ` (${r.pipelineName})`}`,
    ),
    item("Input hash", html`<code>${r.inputHash}</code>`),
    item("Config hash", html`<code>${r.configHash}</code>`),
    r.startedAt === undefined ? "" : item("Started", r.startedAt),
    r.finishedAt === undefined ? "" : item("Finished", r.finishedAt),
    item(
      "Feeders",
      `${formatNumber(r.counts.feeders)}: ${formatNumber(r.counts.studied)} studied, ` +
        `${formatNumber(r.counts.failed)} failed, ${formatNumber(r.counts.setAside)} set aside`,
    ),
    item("Findings", tally(r.counts.findings)),
    item("Diagnostics", tally(r.counts.diagnostics)),
    r.shard === undefined ? "" : item("Shard", `${r.shard.index} of ${r.shard.count}`),
    item("Costs", `indicative, in ${ctx.costs.currency}; source: ${ctx.costs.source}`),
  ]}</dl>`;
}

function rankingRow(n: RankedNeed, currency: string): Html {
  const more = n.evidence.length > 1 ? `; ${n.evidence.length} findings in all` : "";
  const remedy = n.remedy === null
    ? html`<td class="muted">No remedy in the catalogue removes it${
      n.tried.length > 0 ? ` (${n.tried.length} tried)` : ""
    }</td>`
    : html`<td>${n.remedy.description}</td>`;
  return html`<tr data-class="${n.needClass}">
<td class="num" data-sort="${n.rank}">${n.rank}</td>
<td><a href="#${feederAnchor(n.feederId)}">${n.feederId}</a></td>
<td data-sort="${
    NEED_CLASSES.indexOf(n.needClass)
  }"><span class="badge badge-${n.needClass}">${n.needClass}</span></td>
<td>${n.summary}<span class="detail">Worst: ${evidenceText(n.worst)}${more}</span></td>
${remedy}
<td class="num" data-sort="${sortValue(n.remedy?.cost)}">${
    formatMoney(n.remedy?.cost, currency)
  }</td>
${numCell(n.remedy?.capacityUnlockedMw, 2)}
${numCell(n.customers, 0)}
</tr>`;
}

export function renderRanking(ctx: ReportContext): Html {
  if (ctx.ranking.length === 0) {
    return html`<p class="note">No needs: no feeder of this run crossed a limit the ranking looks at.</p>`;
  }
  return html`
    <div class="controls">
      <label>Filter <input type="search" id="ranking-filter" data-filter-for="ranking-table" placeholder="feeder, bus, remedy…" autocomplete="off"></label>
      <label>Need class <select id="ranking-class" data-filter-for="ranking-table" data-filter-attr="class">
    <option value="">all</option>${NEED_CLASSES.map((c) =>
      html`<option value="${c}">${c}</option>`
    )}
    </select></label>
      <output data-count-for="ranking-table"
        aria-live="polite">${ctx.ranking.length} of ${ctx.ranking.length} shown</output>
    </div>
    <div class="scroll">
      <table id="ranking-table" data-sortable>
        <thead>
          <tr>${[
            head("Rank", true, true),
            head("Feeder", false),
            head("Class", false),
            head("Need and evidence", false),
            head("Remedy", false),
            head(`Indicative cost (${ctx.costs.currency})`, true),
            head("Capacity unlocked (MW)", true),
            head("Customers", true),
          ]}</tr>
        </thead>
        <tbody>
    ${ctx.ranking.map((n) => rankingRow(n, ctx.costs.currency))}
        </tbody>
      </table>
    </div>
  `;
}

function fleetRow(f: FleetFeederRow, limits: ReportContext["limits"]): Html {
  const band = f.vnKv === null ? null : bandOf(f.vnKv, limits);
  const low = band !== null && f.vMinPu !== null && f.vMinPu < band.vMinPu;
  const high = band !== null && f.vMaxPu !== null && f.vMaxPu > band.vMaxPu;
  const over = f.maxLoadingPercent !== null && f.maxLoadingPercent > 100;
  return html`<tr data-status="${f.status}">
<td><a href="#${feederAnchor(f.feederId)}">${f.feederId}</a></td>
<td><span class="status status-${f.status}">${f.status.replace("_", " ")}</span></td>
${numCell(f.vnKv, f.vnKv !== null && f.vnKv < 1 ? 2 : 1)}
${numCell(f.buses, 0)}
${numCell(f.customers, 0)}
${numCell(f.generationKw, 0)}
${numCell(f.vMinPu, 3, low)}
${numCell(f.vMaxPu, 3, high)}
${numCell(f.maxLoadingPercent, 1, over)}
${numCell(f.headroomMw, 2, f.headroomMw !== null && f.headroomMw < 0)}
${numCell(f.needs, 0)}
<td data-sort="${f.worstClass === null ? "" : String(NEED_CLASSES.indexOf(f.worstClass))}">${
    f.worstClass === null
      ? ""
      : html`<span class="badge badge-${f.worstClass}">${f.worstClass}</span>`
  }</td>
</tr>`;
}

export function renderFleetTable(ctx: ReportContext): Html {
  return html`
    <div class="controls">
      <label>Filter <input type="search" id="fleet-filter" data-filter-for="fleet-table" placeholder="feeder id, status…" autocomplete="off"></label>
      <output data-count-for="fleet-table" aria-live="polite">${ctx.feeders.length} of ${ctx.feeders
        .length} shown</output>
    </div>
    <div class="scroll">
      <table id="fleet-table" data-sortable>
        <thead>
          <tr>${[
            head("Feeder", false),
            head("Status", false),
            head("kV", true),
            head("Buses", true),
            head("Customers", true),
            head("Generation (kW)", true),
            head("Lowest V (pu)", true),
            head("Highest V (pu)", true),
            head("Max loading (%)", true),
            head("Headroom (MW)", true),
            head("Needs", true),
            head("Worst class", true),
          ]}</tr>
        </thead>
        <tbody>
    ${ctx.feeders.map((f) => fleetRow(f, ctx.limits))}
        </tbody>
      </table>
    </div>
  `;
}
