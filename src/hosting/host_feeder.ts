/**
 * Hosting capacity of one feeder: for every bus and every reactive-power strategy, the
 * largest new unit (on top of the generation already connected) that keeps every criterion,
 * what binds and where, the reactive power the substation then supplies more and the change
 * in losses; per strategy the minimum and median over the buses and the capacity with new
 * generation spread over the buses in proportion to their demand.
 *
 * Load-flow criteria: screen (screen_hosting.ts) then confirm with full load flows
 * (confirm_hosting.ts) at every bus. Fault criteria — breaking and making duty, protection
 * findings the unit causes — do not depend on the reactive strategy: checked once per bus at
 * the largest load-flow capacity of any strategy, with a bisection (full short-circuit and
 * protection studies) only where they fail there. Converter duty comes straight from the
 * screen (it is linear in the unit's rating in the short-circuit model).
 */
import { roundTo } from "../model/round_to.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import type { FindingPlace } from "../checks/finding.ts";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import type { ProtectionSettings } from "../solve/protection_settings.ts";
import { type FaultStudy, studyFaults } from "../solve/study_faults.ts";
import { checkProtection, type Condition } from "../checks/check_protection.ts";
import type { FaultResponse } from "../solve/simulate_fault_protection.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import type { HostingSettings, HostingStrategy } from "./hosting_settings.ts";
import { type HostingBase, prepareHostingBase, screenedStart } from "./hosting_base.ts";
import { type HostingCriterion, trialMargin } from "./hosting_margin.ts";
import { screenConverterDuty, screenHosting } from "./screen_hosting.ts";
import { confirmCapacity, type Confirmed, type ConfirmOptions } from "./confirm_hosting.ts";
import { withUnitsAdded } from "./add_unit.ts";
import { checkQueue, type QueueRow } from "./check_queue.ts";

export interface HostingBusRow {
  readonly bus: string;
  readonly strategy: string;
  readonly capacityKw: number;
  readonly criterion: HostingCriterion;
  /** The finding or check code behind the criterion (e.g. protection.blinding). */
  readonly code: string;
  readonly where: FindingPlace;
  /** At the capacity: reactive power the substation supplies more, kvar; change in losses, kW. */
  readonly sourceQShiftKvar: number | null;
  readonly lossesChangeKw: number | null;
  /** The screen's estimate, kW, and the load flows the confirmation took. */
  readonly screenedKw: number;
  readonly loadFlows: number;
}

export interface HostingStrategySummary {
  readonly strategy: string;
  readonly label: string;
  readonly minKw: number;
  readonly minBus: string;
  readonly medianKw: number;
  /** New generation spread over the buses in proportion to their peak demand, kW in all. */
  readonly spreadKw: number;
  readonly spreadCriterion: HostingCriterion;
  readonly spreadWhere: FindingPlace;
  readonly spreadSourceQShiftKvar: number | null;
  readonly spreadLossesChangeKw: number | null;
}

export interface FeederHosting {
  readonly caseId: string;
  readonly unitKind: "converter" | "synchronous";
  readonly protectionChecked: boolean;
  readonly strategies: readonly HostingStrategySummary[];
  readonly buses: readonly HostingBusRow[];
  /** The feeder's generation applications in queue order, each checked on those before it. */
  readonly queue: readonly QueueRow[];
  /** Load flows, and their sweeps, solved for the whole hosting study of the feeder. */
  readonly loadFlows: number;
  readonly sweeps: number;
}

export interface HostingFaultBase {
  readonly settings: FaultSettings;
  readonly protection: ProtectionSettings;
  /** The feeder's short-circuit study (null: off or not solved) and its protection findings. */
  readonly study: FaultStudy | null;
  readonly protectionKeys: ReadonlySet<string> | null;
  /** Responses without generation, shared by every trial of the feeder (filled on use). */
  readonly reference?: Map<string, FaultResponse>;
}

/** The protection conditions a new unit changes: maximum and minimum with generation. */
const GENERATION_CONDITIONS: ReadonlySet<Condition> = new Set(["max", "minWithGeneration"]);

export interface HostingOutcome {
  readonly hosting: FeederHosting | null;
  readonly diagnostics: readonly Diagnostic[];
}

const UNIT_ID = "hosting-unit";
/**
 * The fault criteria have no continuous margin (a finding appears or not) and each trial is a
 * whole short-circuit and protection study: their limit is bracketed to 5 % (or the study's
 * absolute tolerance).
 */
const FAULT_TOLERANCE_PERCENT = 5;
/**
 * How far the screen's slope may be off the nonlinear one: up to 18 % seen on synthetic
 * feeders with ZIP loads and tap changers (BENCHMARKS.md), and a tenth of that once the
 * parent's confirmation has scaled it.
 */
const RAW_SLOPE_UNCERTAINTY = 1;
const CORRECTED_SLOPE_UNCERTAINTY = 0.3;

export function hostFeeder(
  form: FeederForm,
  settings: CaseSettings,
  hosting: HostingSettings,
  faultBase: HostingFaultBase | null,
): HostingOutcome {
  const skipped = (why: string): HostingOutcome => ({
    hosting: null,
    diagnostics: [
      makeDiagnostic(
        "hosting.not_studied",
        "warning",
        `Feeder "${form.feederId}": ${why}; no hosting capacity`,
        { feederId: form.feederId },
      ),
    ],
  });
  if (!hosting.enabled || hosting.strategies.length === 0) {
    return { hosting: null, diagnostics: [] };
  }
  if (form.nBranch !== form.nBus - 1) {
    return skipped("it is meshed (the hosting study covers radial feeders)");
  }
  if (form.nBus > hosting.maxBuses) {
    return skipped(`it has ${form.nBus} buses, more than hosting.maxBuses (${hosting.maxBuses})`);
  }
  const base = prepareHostingBase(form, settings, hosting);
  if (base === null) return skipped("the hosting case is missing or does not solve");
  const opts = {
    toleranceKw: hosting.toleranceKw,
    tolerancePercent: hosting.tolerancePercent,
    maxKw: hosting.maxMw * 1000,
  };
  const first = form.substationBusCount > 0 ? form.substationBusCount : 1;
  const buses: number[] = [];
  for (let k = first; k < form.nBus; k++) buses.push(k);

  // Load-flow capacity of every bus and strategy.
  const perStrategy = hosting.strategies.map((strategy) =>
    confirmBuses(base, strategy, buses, opts)
  );

  // Fault criteria, once per bus.
  const protectionChecked = faultBase !== null && hosting.protection &&
    faultBase.protection.enabled && faultBase.protectionKeys !== null &&
    form.nBus <= hosting.protectionMaxBuses;
  const dutyOn = faultBase !== null && hosting.breakerDuty && faultBase.study !== null;
  const dutyScreen = dutyOn && hosting.unitKind === "converter"
    ? screenConverterDuty(form, faultBase!.study!, faultBase!.settings, hosting.strategies[0]!)
    : null;
  // A bus's fault-criteria limit starts from its parent's (limits change slowly along a
  // protection zone): two trials straddling it usually settle it.
  const trialLimit = new Float64Array(form.nBus).fill(NaN);
  const faultLimit = buses.map((k, i) => {
    let pMax = 0;
    for (const rows of perStrategy) pMax = Math.max(pMax, rows[i]!.confirmed.pKw);
    if (faultBase === null || pMax <= 0) return null;
    const exactDuty = dutyScreen !== null;
    const needsTrial = protectionChecked || (dutyOn && !exactDuty);
    let upper = pMax;
    let bound:
      | { pKw: number; criterion: HostingCriterion; code: string; where: FindingPlace }
      | null = null;
    if (dutyScreen !== null && dutyScreen.limitKw[k]! < pMax) {
      upper = Math.max(dutyScreen.limitKw[k]!, 0);
      bound = {
        pKw: upper,
        criterion: "breaker_duty",
        code: "fault.breaking_duty",
        where: { kind: "branch", id: dutyScreen.device[k]! },
      };
    }
    if (!needsTrial || upper <= 0) return bound;
    const check = (pKw: number) =>
      faultCheck(base, faultBase, k, pKw, protectionChecked, dutyOn && !exactDuty);
    const atUpper = check(upper);
    if (atUpper === null) return bound;
    // Search on [0, upper] (the fault criteria have no continuous margin): first two trials
    // around the parent's limit, then bisection.
    const tol = (p: number) => Math.max(opts.toleranceKw, FAULT_TOLERANCE_PERCENT / 100 * p);
    let lo = 0, hi = upper, why = atUpper;
    const step = (p: number) => {
      const r = check(p);
      if (r === null) lo = p;
      else {
        hi = p;
        why = r;
      }
    };
    const guess = trialLimit[form.parent[k]!]!;
    if (guess > 0 && guess < upper) {
      step(Math.max(guess - tol(guess) / 2, 0));
      const above = lo + tol(lo);
      if (lo > 0 && above < hi) step(above);
    }
    while (hi - lo > tol(lo)) step((lo + hi) / 2);
    trialLimit[k] = lo;
    return { pKw: lo, ...why };
  });

  const rows: HostingBusRow[] = [];
  const summaries: HostingStrategySummary[] = [];
  hosting.strategies.forEach((strategy, si) => {
    const caps: number[] = [];
    let minKw = Infinity, minBus = form.busIds[buses[0] ?? 0]!;
    perStrategy[si]!.forEach(({ k, screenedKw, confirmed, loadFlows }, i) => {
      const f = faultLimit[i];
      const limited = f !== null && f !== undefined && f.pKw < confirmed.pKw;
      const pKw = limited ? f.pKw : confirmed.pKw;
      const r = limited ? null : confirmed.result;
      rows.push({
        bus: form.busIds[k]!,
        strategy: strategy.id,
        capacityKw: roundTo(pKw, 1),
        criterion: limited ? f.criterion : confirmed.criterion,
        code: limited ? f.code : confirmed.code,
        where: limited ? f.where : confirmed.where,
        sourceQShiftKvar: r === null ? null : roundTo(r.sourceQKvar - base.solved.sourceQKvar, 1),
        lossesChangeKw: r === null ? null : roundTo(r.lossesKw - base.solved.lossesKw, 2),
        screenedKw: roundTo(screenedKw, 1),
        loadFlows,
      });
      caps.push(pKw);
      if (pKw < minKw) {
        minKw = pKw;
        minBus = form.busIds[k]!;
      }
    });
    const spread = spreadCapacity(base, strategy, median(caps), opts);
    summaries.push({
      strategy: strategy.id,
      label: strategy.label,
      minKw: roundTo(Number.isFinite(minKw) ? minKw : 0, 1),
      minBus,
      medianKw: roundTo(median(caps), 1),
      spreadKw: roundTo(spread.pKw, 1),
      spreadCriterion: spread.criterion,
      spreadWhere: spread.where,
      spreadSourceQShiftKvar: spread.result === null
        ? null
        : roundTo(spread.result.sourceQKvar - base.solved.sourceQKvar, 1),
      spreadLossesChangeKw: spread.result === null
        ? null
        : roundTo(spread.result.lossesKw - base.solved.lossesKw, 2),
    });
  });
  const diagnostics: Diagnostic[] = [];
  const known = new Set(hosting.strategies.map((s) => s.id.toLowerCase()));
  for (const a of form.applications) {
    if (a.strategy === null || known.has(a.strategy.toLowerCase())) continue;
    diagnostics.push(makeDiagnostic(
      "hosting.unknown_strategy",
      "warning",
      `Feeder "${form.feederId}": application "${a.id}" names reactive strategy "${a.strategy}", which the pipeline does not define; it is checked with "${
        hosting.strategies[0]!.id
      }"`,
      { feederId: form.feederId },
    ));
  }
  if (
    faultBase !== null && hosting.protection && faultBase.protection.enabled && !protectionChecked
  ) {
    diagnostics.push(makeDiagnostic(
      "hosting.protection_unchecked",
      "info",
      `Feeder "${form.feederId}" has ${form.nBus} buses, more than hosting.protectionMaxBuses (${hosting.protectionMaxBuses}): its hosting capacities do not include the protection criterion`,
      { feederId: form.feederId },
    ));
  }
  return {
    hosting: {
      caseId: base.lfCase.id,
      unitKind: hosting.unitKind,
      protectionChecked,
      strategies: summaries,
      buses: rows,
      queue: checkQueue(form, settings, hosting, faultBase),
      loadFlows: base.loadFlows,
      sweeps: base.sweeps,
    },
    diagnostics,
  };
}

/** One bus's load-flow capacity: the screen's estimate and the confirmed answer. */
export interface ConfirmedBus {
  readonly k: number;
  readonly screenedKw: number;
  readonly confirmed: Confirmed;
  readonly loadFlows: number;
}

/**
 * The load-flow capacity of each bus (in tree order) for one strategy: screen, then confirm.
 * What the screen leaves out (load voltage dependence, other units' controls, tap changers)
 * varies slowly along the feeder, so a bus starts from its screen scaled by the ratio its
 * parent's confirmation found for the same criterion (parents come first).
 */
export function confirmBuses(
  base: HostingBase,
  strategy: HostingStrategy,
  buses: readonly number[],
  opts: ConfirmOptions,
): ConfirmedBus[] {
  const form = base.form;
  const screened = screenHosting(base, strategy);
  const ratio = new Float64Array(form.nBus).fill(1);
  const ratioFor = new Array<HostingCriterion | null>(form.nBus).fill(null);
  const start = { vRePu: new Float64Array(form.nBus), vImPu: new Float64Array(form.nBus) };
  const onPath = new Uint8Array(form.nBus);
  return buses.map((k) => {
    const s = screened[k]!, p = form.parent[k]!;
    const c0 = ratioFor[p] === s.criterion ? ratio[p]! : 1;
    const before = base.loadFlows;
    const c = confirmCapacity(
      (pKw) => {
        screenedStart(base, k, pKw / 1000 * s.wRe, pKw / 1000 * s.wIm, start, onPath);
        return trialMargin(base, unitAt(base, k, pKw, strategy), true, start);
      },
      s.pKw * c0,
      {
        perKw: s.slopePerKw / c0,
        code: s.code,
        whereId: s.where.id,
        uncertainty: c0 === 1 ? RAW_SLOPE_UNCERTAINTY : CORRECTED_SLOPE_UNCERTAINTY,
      },
      opts,
    );
    if (c.criterion === s.criterion && s.pKw > 0 && c.pKw > 0) {
      ratio[k] = c.pKw / s.pKw;
      ratioFor[k] = s.criterion;
    }
    return { k, screenedKw: s.pKw, confirmed: c, loadFlows: base.loadFlows - before };
  });
}

/** The base feeder with one new unit of pKw at bus k. */
export function unitAt(
  base: HostingBase,
  k: number,
  pKw: number,
  strategy: HostingStrategy,
): FeederForm {
  return withUnitsAdded(
    base.form,
    [{ id: UNIT_ID, bus: k, pKw, kind: base.hosting.unitKind, strategy }],
    base.lfCase.generationScale,
  );
}

/**
 * The fault criteria for a unit of pKw at bus k: null when they hold, else what fails —
 * a device's breaking or making duty past its rating, or a protection finding (violation)
 * that the feeder did not have without the unit.
 */
function faultCheck(
  base: HostingBase,
  fb: HostingFaultBase,
  k: number,
  pKw: number,
  protection: boolean,
  duty: boolean,
): { criterion: HostingCriterion; code: string; where: FindingPlace } | null {
  return faultCriteria(
    base,
    fb,
    unitAt(base, k, pKw, base.hosting.strategies[0]!),
    protection,
    duty,
  );
}

/** The fault criteria of a trial form (the base feeder with new units). */
export function faultCriteria(
  base: HostingBase,
  fb: HostingFaultBase,
  trial: FeederForm,
  protection: boolean,
  duty: boolean,
): { criterion: HostingCriterion; code: string; where: FindingPlace } | null {
  const lvMaxKv = base.settings.limits.lvMaxKv;
  if (duty) {
    const before = new Map(fb.study!.devices.map((d) => [d.id, d]));
    for (const d of studyFaults(trial, fb.settings, lvMaxKv).devices) {
      const was = before.get(d.id);
      const over = (row: typeof d) =>
        (row.breakingCurrentA !== null && 1000 * row.dutyKa > row.breakingCurrentA) ||
        (row.makingCurrentA !== null && 1000 * row.peakKa > row.makingCurrentA);
      if (over(d) && (was === undefined || !over(was))) {
        return {
          criterion: "breaker_duty",
          code: "fault.breaking_duty",
          where: { kind: "branch", id: d.id },
        };
      }
    }
  }
  if (protection) {
    const scope = { conditions: GENERATION_CONDITIONS, reference: fb.reference ?? new Map() };
    for (const f of checkProtection(trial, fb.settings, fb.protection, lvMaxKv, undefined, scope)) {
      if (f.severity !== "violation" || fb.protectionKeys!.has(`${f.code}|${f.where.id}`)) continue;
      return { criterion: "protection", code: f.code, where: f.where };
    }
  }
  return null;
}

/**
 * New generation spread over every bus with demand, in proportion to its peak demand: the
 * largest total that keeps the load-flow criteria (steady state; a simultaneous trip of all
 * of it is the recovery screen's question, not a hosting limit).
 */
function spreadCapacity(
  base: HostingBase,
  strategy: HostingStrategy,
  guessKw: number,
  opts: { toleranceKw: number; tolerancePercent: number; maxKw: number },
) {
  const form = base.form, L = form.loads;
  const demand = new Float64Array(form.nBus);
  let total = 0;
  for (let i = 0; i < L.n; i++) {
    demand[L.bus[i]!] = demand[L.bus[i]!]! + Math.max(L.peakPKw[i]!, 0);
    total += Math.max(L.peakPKw[i]!, 0);
  }
  const at: number[] = [];
  for (let k = 1; k < form.nBus; k++) if (demand[k]! > 0) at.push(k);
  const none = {
    pKw: 0,
    criterion: "search_range" as HostingCriterion,
    where: { kind: "feeder" as const, id: form.feederId },
    result: null as LoadFlowResult | null,
  };
  if (total <= 0 || at.length === 0) return none;
  return confirmCapacity(
    (pKw) =>
      trialMargin(
        base,
        withUnitsAdded(
          form,
          at.map((k, i) => ({
            id: `hosting-spread-${i}`,
            bus: k,
            pKw: pKw * demand[k]! / total,
            kind: base.hosting.unitKind,
            strategy,
          })),
          base.lfCase.generationScale,
        ),
        false,
      ),
    Math.max(guessKw, opts.toleranceKw),
    null,
    { ...opts, maxKw: opts.maxKw * 4 },
  );
}

function median(xs: readonly number[]): number {
  if (xs.length === 0) return 0;
  const s = [...xs].sort((a, b) => a - b), h = s.length >> 1;
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}
