/**
 * The post-fault recovery part of a feeder page: how many faults the screen simulated and how
 * many had consequences; the worst of them — where, how it is cleared, the lowest voltage once
 * it is cleared, the generation and motor loads lost, the overloads it causes; what each
 * generator does through it; the other faults with consequences in a short table; and the
 * options a planner chooses from.
 */
import type { FeederFile } from "./feeder_file.ts";
import type { FaultOutcome, FeederRecovery, UnitOutcome } from "../recovery/screen_recovery.ts";
import { type Html, html } from "./_html.ts";
import { formatNumber } from "./_number_text.ts";
import { CAUTION } from "./run_files.ts";

/** Faults listed in the table besides the worst. */
export const RECOVERY_TABLE_FAULTS = 15;

const OUTCOME_WORDS: Readonly<Record<UnitOutcome["outcome"], string>> = {
  rides_through: "rides through",
  ceases: "stops injecting during the dip",
  trips: "trips",
  trips_later: "trips after clearing",
  isolated: "cut off with the faulted section",
};

/** What a generator does through the fault, in plain words. */
export function outcomeWords(outcome: UnitOutcome["outcome"]): string {
  return OUTCOME_WORDS[outcome] ?? String(outcome).replaceAll("_", " ");
}

const typeWords = (o: FaultOutcome): string =>
  o.type === "three_phase" ? "three-phase" : "line-to-earth";

const conditionWords = (o: FaultOutcome): string =>
  o.condition === "max"
    ? "maximum currents"
    : o.condition === "minWithGeneration"
    ? "minimum currents, generation in service"
    : "minimum currents";

/** "cleared by "F-12" in 0.08 s" or the fault the feeder's own devices leave. */
export function clearingWords(o: FaultOutcome): string {
  return o.clearedBy === null
    ? `not cleared by the feeder's own devices (taken to last ${formatNumber(o.clearingS, 2)} s)`
    : `cleared by ${o.clearedBy} in ${formatNumber(o.clearingS, 2)} s`;
}

const kw = (v: number): string => `${formatNumber(v)} kW`;
const names = (ids: readonly string[]): string => ids.join(", ");

function sameFault(a: FaultOutcome, b: FaultOutcome): boolean {
  return a.bus === b.bus && a.type === b.type && a.condition === b.condition;
}

function afterClearing(o: FaultOutcome, thresholdPu: number): Html {
  if (o.collapsed || o.vMinPu === null) {
    return html`No load-flow solution after clearing: the feeder collapses.`;
  }
  const below = o.belowThreshold > 0
    ? `; ${formatNumber(o.belowThreshold)} bus(es) stay below ${formatNumber(thresholdPu, 2)} pu`
    : `; every energized bus is back above ${formatNumber(thresholdPu, 2)} pu`;
  return html`Lowest voltage after clearing ${formatNumber(o.vMinPu, 3)} pu at bus ${
    o.vMinBus ?? "–"
  }${below}.`;
}

function generationLost(o: FaultOutcome): Html {
  const parts: Html[] = [];
  if (o.tripped.length > 0) {
    parts.push(html`${kw(o.trippedKw)} during the fault (${names(o.tripped)})`);
  }
  if (o.trippedLater.length > 0) {
    parts.push(html`${kw(o.trippedLaterKw)} after clearing (${names(o.trippedLater)})`);
  }
  const tripped = parts.length === 0
    ? html`No generation trips.`
    : html`Generation tripped: ${parts.map((p, i) => html`${i > 0 ? ", and " : ""}${p}`)}; ${
      kw(o.trippedKw + o.trippedLaterKw)
    } in all.`;
  const ceased = o.ceased.length > 0
    ? html`
      ${kw(o.ceasedKw)} stops injecting during the dip and resumes after it (${names(o.ceased)}).
    `
    : "";
  return html`${tripped}${ceased}`;
}

function renderWorst(r: FeederRecovery, o: FaultOutcome): Html {
  const overloads = o.overloads.length === 0
    ? html`No branch overloads after clearing.`
    : html`Overloads caused: ${
      o.overloads.map((x, i) =>
        html`${i > 0 ? ", " : ""}branch ${x.branch} at ${formatNumber(x.percent)} %`
      )
    }.`;
  return html`
    <p>Worst fault: ${typeWords(o)} fault at bus ${o.bus} (${conditionWords(o)}), ${clearingWords(
      o,
    )}${o.isolatedBuses > 0
      ? `; ${formatNumber(o.isolatedBuses)} bus(es) cut off with the faulted section`
      : ""}.</p>
    <ul class="recovery-worst">
      <li>${afterClearing(o, r.thresholdPu)}</li>
      <li>${generationLost(o)}</li>
      <li>${o.stalled.length === 0
        ? "No motor load stalls."
        : `Motor loads stalled: ${names(o.stalled)}.`}</li>
      <li>${overloads}</li>
    </ul>
  `;
}

function renderUnits(units: readonly UnitOutcome[]): Html {
  if (units.length === 0) {
    return html`<p class="note">No generator is connected to this feeder.</p>`;
  }
  return html`
    <p
      class="note">What each generator does in the worst fault, with the voltage it keeps while the fault lasts.</p>
    <table class="recovery-units">
      <thead>
        <tr>
          <th scope="col">Unit</th>
          <th scope="col">Bus</th>
          <th scope="col">Ride-through category</th>
          <th scope="col" class="num">Voltage during the fault (pu)</th>
          <th scope="col">What it does</th>
        </tr>
      </thead>
      <tbody>${units.map((u) =>
        html`
          <tr>
            <td>${u.id}</td>
            <td>${u.bus}</td>
            <td>${u.category}</td>
            <td class="num">${formatNumber(u.retainedPu, 3)}</td>
            <td>${outcomeWords(u.outcome)}</td>
          </tr>
        `
      )}</tbody>
    </table>
  `;
}

function renderOtherFaults(r: FeederRecovery, worst: FaultOutcome): Html {
  const others = r.faults.filter((o) => !sameFault(o, worst));
  if (others.length === 0) {
    return html`<p class="note">No other fault has consequences.</p>`;
  }
  const shown = others.slice(0, RECOVERY_TABLE_FAULTS);
  const notListed = r.faultsWithConsequences - 1 - shown.length;
  const row = (o: FaultOutcome): Html => {
    const lostKw = o.trippedKw + o.trippedLaterKw;
    return html`
      <tr>
        <td>${o.bus}</td>
        <td>${typeWords(o)}<span class="detail">${conditionWords(o)}</span></td>
        <td class="num">${formatNumber(o.clearingS, 2)} s<span class="detail">${o.clearedBy ??
          "no feeder device"}</span></td>
        <td class="num">${formatNumber(lostKw)}<span class="detail">${names([
          ...o.tripped,
          ...o.trippedLater,
        ])}</span></td>
        <td class="num">${formatNumber(o.stalled.length)}<span class="detail">${names(
          o.stalled,
        )}</span></td>
        <td class="num">${o.collapsed || o.vMinPu === null
          ? "collapses"
          : formatNumber(o.vMinPu, 3)}<span class="detail">${o.collapsed || o.vMinBus === null
          ? "no load-flow solution"
          : `bus ${o.vMinBus}`}</span></td>
      </tr>
    `;
  };
  return html`
    <p class="note">Other faults with consequences, worst first${notListed > 0
      ? `; ${formatNumber(notListed)} more are not listed`
      : ""}.</p>
    <table class="recovery-faults">
      <thead>
        <tr>
          <th scope="col">Fault bus</th>
          <th scope="col">Type</th>
          <th scope="col" class="num">Clearing</th>
          <th scope="col" class="num">Generation lost (kW)</th>
          <th scope="col" class="num">Motors stalled</th>
          <th scope="col" class="num">Lowest voltage (pu)</th>
        </tr>
      </thead>
      <tbody>${shown.map(row)}</tbody>
    </table>
  `;
}

/** The options the findings name, for the worst fault. */
function optionsNote(o: FaultOutcome): Html {
  const opts: Html[] = [];
  const trip = [...o.tripped, ...o.trippedLater];
  if (trip.length > 0) {
    opts.push(
      html`require of ${names(trip)} a ride-through category that rides through this fault`,
    );
  }
  if (o.collapsed || o.belowThreshold > 0 || o.stalled.length > 0) {
    opts.push(html`dynamic reactive support${o.vMinBus === null ? "" : ` near bus ${o.vMinBus}`}`);
  }
  if (o.clearedBy !== null) opts.push(html`faster clearing by ${o.clearedBy}`);
  else opts.push(html`protection on the feeder that clears this fault`);
  return html`
    <p
      class="note">Options to choose from for the worst fault: ${opts.map((x, i) =>
        html`${i > 0 ? "; " : ""}${x}`
      )}. Each is a change to weigh with the network owner and the unit owners, not a result of this screen.</p>
  `;
}

function notScreened(file: FeederFile): Html {
  const why = file.diagnostics.find((d) => d.code === "recovery.not_screened");
  if (why !== undefined) {
    const reason = /^Feeder ".*?": (.*); its recovery after faults is not screened$/s.exec(
      why.message,
    )?.[1] ?? why.message;
    return html`<p class="note">Recovery after faults was not screened on this feeder: ${reason}.</p>`;
  }
  return html`<p class="note">The screen of recovery after faults is not part of this run.</p>`;
}

/** The section's body (under its heading). */
export function renderRecoverySection(file: FeederFile): Html {
  const r = file.recovery;
  if (r === undefined || r === null) return notScreened(file);
  const scope = html`<p>${
    formatNumber(r.faultsSimulated)
  } fault(s) simulated (three-phase and line-to-earth at every bus, maximum and minimum currents); ${
    formatNumber(r.faultsWithConsequences)
  } with consequences (generation that trips or stops injecting, a motor that stalls, a bus below ${
    formatNumber(r.thresholdPu, 2)
  } pu after clearing, an overload). Recovery threshold: ${formatNumber(r.thresholdPu, 2)} pu.</p>`;
  const o = r.worst;
  if (o === null) {
    return html`
      ${scope}
      <p
        class="note">No fault has consequences: every generator rides through, no motor load stalls and every bus is back above ${formatNumber(
          r.thresholdPu,
          2,
        )} pu once the fault is cleared.</p>
      <p class="note">${CAUTION}</p>
    `;
  }
  return html`
    ${scope}
    ${renderWorst(r, o)}
    ${renderUnits(r.units)}
    ${renderOtherFaults(r, o)}
    ${optionsNote(o)}
    <p
      class="note">Screening: no machine dynamics, no reclosing, positive-sequence voltages; the pre-fault state is peak demand and the connected generation, scaled as the recovery settings give.</p>
    <p class="note">${CAUTION}</p>
  `;
}
