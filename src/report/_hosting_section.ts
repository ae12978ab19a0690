/**
 * The hosting capacity part of a feeder page: per reactive-power strategy the lowest and
 * median per-bus capacity and the capacity spread with demand, with the gain of each
 * strategy over the first (the reference); the capacity of every bus against its distance
 * from the source; the buses with the lowest capacity, with what binds and where; and the
 * generation applications in queue order, each with its verdict and what stops it.
 */
import type { FeederFile } from "./feeder_file.ts";
import type {
  FeederHosting,
  HostingBusRow,
  HostingStrategySummary,
} from "../hosting/host_feeder.ts";
import type { HostingCriterion } from "../hosting/hosting_margin.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { QueueRow } from "../hosting/check_queue.ts";
import { type Html, html, raw } from "./_html.ts";
import { formatNumber } from "./_number_text.ts";
import { CAUTION } from "./run_files.ts";
import { busDistances, hostingChart, strategyNames } from "./_hosting_chart.ts";

/** Buses listed in the per-bus table; beyond, the lowest-capacity ones. */
export const HOSTING_TABLE_BUSES = 30;

/** Below this reference capacity, kW, a gain in % means nothing and is not given. */
const GAIN_FLOOR_KW = 1;

const CRITERION_WORDS: Readonly<Record<HostingCriterion, string>> = {
  overvoltage: "overvoltage",
  undervoltage: "undervoltage",
  voltage_change: "voltage change by generation",
  thermal: "thermal loading",
  reverse_power: "reverse power",
  rapid_change: "rapid voltage change when the unit trips",
  breaker_duty: "breaker duty",
  protection: "protection",
  search_range: "top of the search range",
  no_solution: "load flow stops solving",
};

/** What binds, in plain words (the protection finding named). */
export function criterionWords(criterion: HostingCriterion, code = ""): string {
  const words = CRITERION_WORDS[criterion] ?? String(criterion).replaceAll("_", " ");
  if (criterion === "protection" && code.startsWith("protection.")) {
    return `${words}: ${code.slice("protection.".length).replaceAll("_", " ")}`;
  }
  return words;
}

function placeText(where: FindingPlace): string {
  return where.kind === "feeder" ? "on the feeder" : `at ${where.kind} ${where.id}`;
}

/** Change of `value` over `reference`, %; null when the reference is too small to compare. */
export function gainPercent(value: number, reference: number): number | null {
  if (!Number.isFinite(value) || !Number.isFinite(reference)) return null;
  if (reference < GAIN_FLOOR_KW) return null;
  return (100 * (value - reference)) / reference;
}

function signed(v: number | null, digits: number): string {
  const t = formatNumber(v, digits);
  return v !== null && t !== "–" && !t.startsWith("-") && /[1-9]/.test(t) ? `+${t}` : t;
}

const gainText = (v: number, ref: number): string => {
  const g = gainPercent(v, ref);
  return g === null ? "–" : `${signed(g, Math.abs(g) < 100 ? 1 : 0)} %`;
};

/** A capacity, marked "at least" when the search stopped at the top of its range. */
const capacityText = (kw: number, criterion: HostingCriterion): string =>
  `${criterion === "search_range" ? "≥ " : ""}${formatNumber(kw)}`;

function renderStrategyTable(h: FeederHosting, names: Map<string, string>): Html {
  const ref = h.strategies[0]!;
  const cell = (kw: number, refKw: number, isRef: boolean, detail: string): Html =>
    html`<td class="num">${formatNumber(kw)}<span class="detail">${
      isRef ? detail : `${gainText(kw, refKw)}${detail === "" ? "" : `; ${detail}`}`
    }</span></td>`;
  const row = (s: HostingStrategySummary, i: number): Html =>
    html`
      <tr>
        <td>${names.get(s.strategy)}${i === 0
          ? html`<span class="detail">reference</span>`
          : ""}</td>
        ${cell(s.minKw, ref.minKw, i === 0, `bus ${s.minBus}`)}
        ${cell(s.medianKw, ref.medianKw, i === 0, "")}
        <td class="num">${capacityText(s.spreadKw, s.spreadCriterion)}<span class="detail">${i === 0
          ? ""
          : gainText(s.spreadKw, ref.spreadKw)}</span></td>
        <td>${criterionWords(s.spreadCriterion)} ${placeText(s.spreadWhere)}</td>
        <td class="num">${signed(s.spreadSourceQShiftKvar, 0)}</td>
        <td class="num">${signed(s.spreadLossesChangeKw, 1)}</td>
      </tr>
    `;
  return html`
    <table class="hosting-strategies">
      <thead>
        <tr>
          <th scope="col">Strategy</th>
          <th scope="col" class="num">Lowest per-bus (kW)</th>
          <th scope="col" class="num">Median per-bus (kW)</th>
          <th scope="col" class="num">Spread with demand (kW)</th>
          <th scope="col">Spread bound by</th>
          <th scope="col" class="num">Extra reactive from the substation (kvar)</th>
          <th scope="col" class="num">Change in losses (kW)</th>
        </tr>
      </thead>
      <tbody>${h.strategies.map(row)}</tbody>
    </table>
  `;
}

/** One sentence per strategy after the first: what it buys over the reference. */
function gainSentences(h: FeederHosting, names: Map<string, string>): Html {
  const ref = h.strategies[0]!;
  const others = h.strategies.slice(1);
  if (others.length === 0) return html``;
  return html`<ul class="hosting-gains">${
    others.map((s) =>
      html`<li>${names.get(s.strategy)} against ${names.get(ref.strategy)}: spread capacity ${
        gainText(s.spreadKw, ref.spreadKw)
      }, median per-bus ${gainText(s.medianKw, ref.medianKw)}, lowest per-bus ${
        gainText(s.minKw, ref.minKw)
      }.</li>`
    )
  }</ul>`;
}

function renderBusTable(
  h: FeederHosting,
  names: Map<string, string>,
  km: ReadonlyMap<string, number>,
): Html {
  const byBus = new Map<string, Map<string, HostingBusRow>>();
  for (const r of h.buses) {
    let m = byBus.get(r.bus);
    if (m === undefined) byBus.set(r.bus, m = new Map());
    m.set(r.strategy, r);
  }
  let buses = [...byBus.keys()];
  const capped = buses.length > HOSTING_TABLE_BUSES;
  if (capped) {
    const lowest = (b: string) => {
      let v = Infinity;
      for (const r of byBus.get(b)!.values()) v = Math.min(v, r.capacityKw);
      return v;
    };
    const low = new Map(buses.map((b) => [b, lowest(b)]));
    buses = buses
      .sort((a, b) => low.get(a)! - low.get(b)! || (a < b ? -1 : a > b ? 1 : 0))
      .slice(0, HOSTING_TABLE_BUSES);
  }
  const strategies = h.strategies.map((s) => s.strategy);
  const note = capped
    ? `The ${HOSTING_TABLE_BUSES} buses of ${
      formatNumber(byBus.size)
    } with the lowest capacity under any strategy, lowest first; every bus is in hosting.csv of the run.`
    : "Every bus of the feeder, from the source outwards; also in hosting.csv of the run.";
  return html`
    <p class="note">${note}</p>
    <table class="hosting-buses">
      <thead>
        <tr>
          <th scope="col">Bus</th>
          <th scope="col" class="num">Distance (km)</th>
          ${strategies.map((s) => html`<th scope="col" class="num">${names.get(s)} (kW)</th>`)}
        </tr>
      </thead>
      <tbody>${buses.map((b) =>
        html`
          <tr>
            <td>${b}</td>
            <td class="num">${formatNumber(km.get(b), 2)}</td>
            ${strategies.map((s) => {
              const r = byBus.get(b)!.get(s);
              return r === undefined ? html`<td class="num">–</td>` : html`
                <td
                  class="num">${capacityText(
                    r.capacityKw,
                    r.criterion,
                  )}<span class="detail">${criterionWords(
                    r.criterion,
                    r.code,
                  )} ${placeText(r.where)}</span></td>
              `;
            })}
          </tr>
        `
      )}</tbody>
    </table>
  `;
}

const UPGRADE_WORDS: Readonly<Record<NonNullable<QueueRow["upgrade"]>, string>> = {
  control_setting: "control setting",
  reinforcement: "reinforcement",
  protection: "protection",
};

/** An application's verdict in plain words; strategy ids are shown by their names. */
export function queueVerdictWords(r: QueueRow, names: ReadonlyMap<string, string>): string {
  if (r.verdict === "fits") return "fits";
  if (r.verdict === "not_studied") return "not studied";
  if (r.upgrade === null) return "needs works";
  const words = `needs works: ${
    UPGRADE_WORDS[r.upgrade] ?? String(r.upgrade).replaceAll("_", " ")
  }`;
  return r.upgrade === "control_setting" && r.alternative !== null
    ? `${words} — use ${names.get(r.alternative) ?? r.alternative}`
    : words;
}

function renderQueueTable(h: FeederHosting, names: ReadonlyMap<string, string>): Html {
  if (h.queue.length === 0) return html``;
  const stops = (r: QueueRow): string =>
    r.criterion === null
      ? "–"
      : `${criterionWords(r.criterion, r.code ?? "")}${
        r.where === null ? "" : ` ${placeText(r.where)}`
      }`;
  return html`
    <h4>Generation applications in queue order</h4>
    <p>Each application is checked on top of the earlier ones that fit; one that needs works stays out of the base for later ones.</p>
    <table class="hosting-queue">
      <thead>
        <tr>
          <th scope="col" class="num">Position</th>
          <th scope="col">Application</th>
          <th scope="col">Bus</th>
          <th scope="col" class="num">Size (kW)</th>
          <th scope="col">Unit kind</th>
          <th scope="col">Strategy</th>
          <th scope="col">Verdict</th>
          <th scope="col">What stops it</th>
        </tr>
      </thead>
      <tbody>${h.queue.map((r) =>
        html`
          <tr>
            <td class="num">${formatNumber(r.position)}</td>
            <td>${r.application}</td>
            <td>${r.bus}</td>
            <td class="num">${formatNumber(r.sizeKw)}</td>
            <td>${r.kind === "converter" ? "converter-connected" : "synchronous"}</td>
            <td>${names.get(r.strategy) ?? r.strategy}</td>
            <td>${queueVerdictWords(r, names)}</td>
            <td>${stops(r)}</td>
          </tr>
        `
      )}</tbody>
    </table>
  `;
}

function notStudied(file: FeederFile): Html {
  const why = file.diagnostics.find((d) => d.code === "hosting.not_studied");
  return why === undefined
    ? html`<p class="note">Per-bus hosting capacity is not part of this run.</p>`
    : html`<p class="note">Per-bus hosting capacity was not studied on this feeder: ${why.message}.</p>`;
}

/** The section's body (under its heading); `idPrefix` must be unique on the page. */
export async function renderHostingSection(file: FeederFile, idPrefix: string): Promise<Html> {
  const h = file.hosting;
  if (h === undefined || h === null) return notStudied(file);
  if (h.strategies.length === 0 || h.buses.length === 0) {
    return html`<p class="note">The hosting study of this feeder has no bus to place a new unit at.</p>`;
  }
  const names = strategyNames(h);
  const chart = await hostingChart(file, h, idPrefix);
  const km = busDistances(file, h.caseId);
  const unit = h.unitKind === "converter" ? "converter-connected" : "synchronous";
  return html`
    <p>The largest new ${unit} unit each bus takes, on top of the generation already connected, in case ${h
      .caseId}, for each way of running its reactive power. The first strategy is the reference for the gains in %.</p>
    ${renderStrategyTable(h, names)}
    ${gainSentences(h, names)}
    <p
      class="note">Spread with demand: new generation shared over all buses in proportion to their peak demand, kW in all, and the limit it reaches first. Extra reactive power and change in losses are at that spread capacity, against the case without it.</p>
    ${chart.svg === null
      ? html`<p class="note">No bus has a distance from the source to draw the capacities against.</p>`
      : html`<figure><figcaption>Hosting capacity of every bus against its distance from the source, one colour and shape per strategy.</figcaption>${
        raw(chart.svg)
      }</figure>`}
    ${chart.notes.map((n) => html`<p class="note">${n}</p>`)}
    ${renderBusTable(h, names, km)}
    ${renderQueueTable(h, names)}
    ${h.protectionChecked ? "" : html`
      <p
        class="note">The protection criterion is not included on this feeder: its protection was not checked, so the capacities may exceed what the protection allows.</p>
    `}
    <p class="note">${CAUTION}</p>
  `;
}
