/**
 * The text parts of a feeder page: key figures, the cases, the needs with their evidence
 * and remedies, the generation headroom, and the findings and diagnostics in short.
 */
import type { Need } from "../rank/need.ts";
import type { FeederFile } from "./feeder_file.ts";
import { type Html, html } from "./_html.ts";
import { formatMoney, formatNumber } from "./_number_text.ts";
import { evidenceText, formatValue } from "./_evidence_text.ts";

/** Evidence rows shown per need; the rest are counted. */
const EVIDENCE_ROWS = 12;

const fig = (k: string, v: string, d?: string): Html =>
  html`
    <div
      class="fig"><span class="k">${k}</span><span class="v">${v}</span>${d === undefined
        ? ""
        : html`<span class="d">${d}</span>`}</div>
  `;

export function renderKeyFigures(file: FeederFile): Html {
  const s = file.summary;
  const kinds = Object.entries(s.generationByKindKw)
    .filter(([, kw]) => kw > 0)
    .map(([k, kw]) => `${k} ${formatNumber(kw)} kW`)
    .join(", ");
  return html`<div class="figures">${[
    fig(
      "Nominal voltage",
      s.vnKv === null ? "–" : `${formatNumber(s.vnKv, s.vnKv < 1 ? 2 : 1)} kV`,
    ),
    fig("Buses", formatNumber(s.buses)),
    fig("Reach", `${formatNumber(s.reachKm, 2)} km`),
    fig(
      "Lines",
      `${formatNumber(s.lineKm, 2)} km`,
      `overhead ${formatNumber(s.overheadKm, 2)}, cable ${formatNumber(s.cableKm, 2)}`,
    ),
    fig("Customers", formatNumber(s.customers)),
    fig("Peak load", `${formatNumber(s.peakLoadKw)} kW`, `minimum ${formatNumber(s.minLoadKw)} kW`),
    fig(
      "Generation",
      `${formatNumber(s.generationKw)} kW`,
      `${formatNumber(s.generators)} units${kinds === "" ? "" : `: ${kinds}`}`,
    ),
    fig(
      "Structure",
      s.structure,
      `${formatNumber(s.loops)} loops, ${formatNumber(s.openPoints)} open points`,
    ),
    fig("Protective devices", formatNumber(s.protectiveDevices)),
  ]}</div>`;
}

export function renderCaseTable(file: FeederFile): Html {
  if (file.cases.length === 0) return html`<p class="note">No case was studied.</p>`;
  return html`
    <table class="cases">
      <thead>
        <tr>
          <th scope="col">Case</th>
          <th scope="col">Converged</th>
          <th scope="col" class="num">Demand (kW)</th>
          <th scope="col" class="num">Generation (kW)</th>
          <th scope="col" class="num">Losses (kW)</th>
          <th scope="col" class="num">Lowest V (pu)</th>
          <th scope="col" class="num">Highest V (pu)</th>
          <th scope="col" class="num">Max loading (%)</th>
          <th scope="col" class="num">Change by generation (%)</th>
        </tr>
      </thead>
      <tbody>${file.cases.map((c) =>
        html`
          <tr>
            <td>${c.caseId}${c.label === null
              ? ""
              : html`<span class="detail">${c.label}</span>`}</td>
            <td>${c.converged ? "yes" : `no (${c.iterations} iterations)`}</td>
            <td class="num">${formatNumber(c.demandKw)}</td>
            <td class="num">${formatNumber(c.generationKw)}</td>
            <td class="num">${formatNumber(c.lossesKw, 1)}</td>
            <td class="num">${formatNumber(c.converged ? c.vMinPu : null, 3)}</td>
            <td class="num">${formatNumber(c.converged ? c.vMaxPu : null, 3)}</td>
            <td class="num">${formatNumber(c.converged ? c.maxLoadingPercent : null, 1)}</td>
            <td class="num">${formatNumber(c.maxDgChangePercent, 2)}</td>
          </tr>
        `
      )}</tbody>
    </table>
  `;
}

function renderNeed(n: Need, currency: string): Html {
  const shown = n.evidence.slice(0, EVIDENCE_ROWS);
  const evidence = html`
    <table>
      <thead>
        <tr>
          <th scope="col">Finding</th>
          <th scope="col">Case</th>
          <th scope="col">Where</th>
          <th scope="col" class="num">Value</th>
          <th scope="col" class="num">Limit</th>
        </tr>
      </thead>
      <tbody>${shown.map((e) =>
        html`
          <tr>
            <td><code>${e.code}</code></td>
            <td>${e.caseId}</td>
            <td>${e.where.kind} ${e.where.id}</td>
            <td class="num">${formatValue(e.value, e.unit)}</td>
            <td class="num">${formatValue(e.limit, e.unit)}</td>
          </tr>
        `
      )}</tbody>
    </table>${n.evidence.length > shown.length
      ? html`<p class="note">and ${n.evidence.length - shown.length} more findings.</p>`
      : ""}
  `;
  const remedy = n.remedy === null
    ? html`<p><strong>Remedy:</strong> none in the catalogue removes this need.</p>`
    : html`
      <p><strong>Remedy:</strong> ${n.remedy.description} <span class="muted">(${n.remedy.kind
        .replaceAll("_", " ")}; capacity unlocked ${n.remedy.capacityUnlockedMw === null
        ? "not applicable"
        : `${formatNumber(n.remedy.capacityUnlockedMw, 2)} MW`})</span></p>
      <table>
        <thead>
          <tr>
            <th scope="col">Item</th>
            <th scope="col" class="num">Quantity</th>
            <th scope="col">Unit</th>
            <th scope="col" class="num">Unit cost</th>
            <th scope="col" class="num">Cost</th>
          </tr>
        </thead>
        <tbody>${n.remedy.items.map((it) =>
          html`
            <tr>
              <td>${it.what}</td>
              <td class="num">${formatNumber(
                it.quantity,
                Number.isInteger(it.quantity) ? 0 : 2,
              )}</td>
              <td>${it.unit}</td>
              <td class="num">${formatMoney(it.unitCost, currency)}</td>
              <td class="num">${formatMoney(it.cost, currency)}</td>
            </tr>
          `
        )}<tr><th scope="row" colspan="4">Indicative total</th><td class="num"><strong>${formatMoney(
          n.remedy.cost,
          currency,
        )}</strong></td></tr></tbody>
      </table>
    `;
  const tried = n.tried.length === 0 ? "" : html`
    <p><strong>Remedy kinds tried, in order (the cheapest that works is proposed):</strong></p>
    <ul>${n.tried.map((t) => html`<li>${t.kind.replaceAll("_", " ")}: ${t.outcome}</li>`)}</ul>
  `;
  return html`<article class="need need-${n.needClass}">
<h4><span class="badge badge-${n.needClass}">${n.needClass}</span> ${
    n.kind.replaceAll("_", " ")
  }</h4>
<p>${n.summary}</p>
<p class="note">Worst: ${evidenceText(n.worst)}; ${
    formatNumber(n.excessPercent, 1)
  } % past the limit; ${formatNumber(n.customers)} customers touched.</p>
${evidence}${remedy}${tried}
</article>`;
}

export function renderNeeds(file: FeederFile, currency: string): Html {
  if (file.needs.length === 0) return html`<p class="note">No needs on this feeder.</p>`;
  return html`${file.needs.map((n) => renderNeed(n, currency))}`;
}

export function renderHeadroom(file: FeederFile): Html {
  const h = file.headroom;
  if (h === null) {
    return html`<p class="note">The feeder's generation headroom was not computed in this run.</p>`;
  }
  const binding = h.binding === null
    ? "no limit was reached within the search range"
    : `the first limit crossed is ${h.binding.code} at ${h.binding.where.kind} ${h.binding.where.id}`;
  return html`<div class="figures">${[
    fig(
      "Headroom",
      `${formatNumber(h.headroomMw, 2)} MW`,
      h.headroomMw < 0 ? "limit already crossed" : undefined,
    ),
    fig("Connected generation", `${formatNumber(h.connectedMw, 2)} MW`, `in case ${h.caseId}`),
    fig("Largest multiple within limits", `${formatNumber(h.factor, 2)} ×`),
  ]}</div>
<p>The connected generation, grown in the same places and proportions, stays within every limit up to ${
    formatNumber(h.factor, 2)
  } times its size in case ${h.caseId}; ${binding}.</p>`;
}

export function renderFindingsSummary(file: FeederFile): Html {
  const counts = new Map<string, number>();
  for (const f of file.findings) {
    const k = `${f.severity}\u0000${f.code}`;
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  const rows = [...counts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  const diag = file.diagnostics.length === 0
    ? "No diagnostics."
    : `${file.diagnostics.length} diagnostics: see diagnostics.csv of the run.`;
  if (rows.length === 0) return html`<p class="note">No findings. ${diag}</p>`;
  return html`
    <table class="findings">
      <thead>
        <tr>
          <th scope="col">Severity</th>
          <th scope="col">Code</th>
          <th scope="col" class="num">Findings</th>
        </tr>
      </thead>
      <tbody>${rows.map(([k, n]) => {
        const [severity, code] = k.split("\u0000");
        return html`
          <tr>
            <td>${severity}</td>
            <td><code>${code}</code></td>
            <td class="num">${n}</td>
          </tr>
        `;
      })}</tbody>
    </table>
    <p class="note">Every finding is listed in findings.csv of the run. ${diag}</p>
  `;
}
