/**
 * How far a trial — the feeder with new units added — is from its nearest load-flow limit:
 * the voltage band, the generation-caused voltage change and thermal loading (the same terms
 * as the headroom search, _limit_margin.ts), reverse power at feeder-head devices and
 * substation transformers, and the rapid voltage change when the new units trip with the
 * tap changers frozen where the trial left them. Negative inside every limit, zero on the
 * first one reached; the criterion and element of the largest term name what binds.
 *
 * Units of the terms: pu of voltage, pu of rating, MW of reverse power. Only the sign and
 * the place of the zero matter to the searches.
 */
import { BRANCH_TRANSFORMER, type FeederForm } from "../model/feeder_form.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import { limitMargin } from "../rank/_limit_margin.ts";
import type { HostingBase } from "./hosting_base.ts";
import { withTapPositions } from "../rank/modify_form.ts";

/** What binds a hosting capacity (docs/hosting.md). */
export type HostingCriterion =
  | "overvoltage"
  | "undervoltage"
  | "voltage_change"
  | "thermal"
  | "reverse_power"
  | "rapid_change"
  | "breaker_duty"
  | "protection"
  | "search_range"
  | "no_solution";

export interface TrialMargin {
  readonly margin: number;
  /** The second largest term: above zero, more than one limit is crossed. */
  readonly runnerUp: number;
  readonly criterion: HostingCriterion;
  /** For protection: the protection finding's code; otherwise the limit-check code. */
  readonly code: string;
  readonly where: FindingPlace;
  /** The trial's load flow (null when it did not solve). */
  readonly result: LoadFlowResult | null;
}

const CRITERION_OF_CODE: Readonly<Record<string, HostingCriterion>> = {
  "voltage.above_band": "overvoltage",
  "voltage.below_band": "undervoltage",
  "voltage.dg_change": "voltage_change",
  "thermal.overload": "thermal",
};

/**
 * Solves the trial form (warm start from the base case, or the start given) and measures
 * its margin; `rapid` false leaves out the rapid change when the new units trip.
 */
export function trialMargin(
  base: HostingBase,
  trial: FeederForm,
  rapid = true,
  start: { readonly vRePu: Float64Array; readonly vImPu: Float64Array } = base.solved,
): TrialMargin {
  base.loadFlows++;
  const r = solveLoadFlow(trial, base.lfCase, base.settings.solver, base.prepared, start);
  base.sweeps += r.value.iterations;
  return measureTrial(base, trial, r.value, rapid);
}

/** The margin of a solved trial. */
export function measureTrial(
  base: HostingBase,
  trial: FeederForm,
  r: LoadFlowResult,
  rapid = true,
): TrialMargin {
  const { settings, solved } = base;
  if (!r.converged) {
    return {
      margin: Infinity,
      runnerUp: Infinity,
      criterion: "no_solution",
      code: "loadflow.not_solved",
      where: { kind: "feeder", id: trial.feederId },
      result: null,
    };
  }
  const lim = limitMargin(
    trial,
    r,
    base.withoutGeneration,
    settings.limits,
    settings.checks,
    base.skip,
  );
  let margin = lim.margin, runnerUp = lim.runnerUp, code = lim.code, where = lim.where;
  let criterion: HostingCriterion = CRITERION_OF_CODE[lim.code] ?? "overvoltage";
  const take = (m: number, c: HostingCriterion, k: string, w: FindingPlace) => {
    if (m <= margin) {
      if (m > runnerUp) runnerUp = m;
    } else {
      runnerUp = margin;
      margin = m;
      criterion = c;
      code = k;
      where = w;
    }
  };
  const { headLimitKw, transformerLimitKw } = base.hosting.reversePower;
  if (headLimitKw !== null) {
    for (const d of trial.devices) {
      if (!d.isHead) continue;
      const before = -solved.pFromKw[d.branch]!;
      if (before > headLimitKw) continue; // already past without the new unit
      take((-r.pFromKw[d.branch]! - headLimitKw) / 1000, "reverse_power", "flow.reverse_head", {
        kind: "branch",
        id: d.id,
      });
    }
  }
  if (transformerLimitKw !== null) {
    for (const t of trial.transformers) {
      const b = t.branch;
      if (trial.branchTo[b]! >= trial.substationBusCount) continue;
      if (trial.branchKind[b] !== BRANCH_TRANSFORMER) continue;
      if (-solved.pFromKw[b]! > transformerLimitKw) continue;
      take(
        (-r.pFromKw[b]! - transformerLimitKw) / 1000,
        "reverse_power",
        "flow.reverse_transformer",
        {
          kind: "branch",
          id: t.id,
        },
      );
    }
  }
  if (rapid) {
    const tripped = trippedState(base, r);
    if (tripped === null) {
      take(Infinity, "no_solution", "loadflow.not_solved", { kind: "feeder", id: trial.feederId });
    } else {
      const { mvLimitPercent, lvLimitPercent } = base.hosting.rapidChange;
      const lvMax = settings.limits.lvMaxKv;
      for (let k = 0; k < trial.nBus; k++) {
        const limitPu = (trial.vnKv[k]! <= lvMax ? lvLimitPercent : mvLimitPercent) / 100;
        take(
          Math.abs(r.vMagPu[k]! - tripped.vMagPu[k]!) - limitPu,
          "rapid_change",
          "hosting.rapid_change",
          { kind: "bus", id: trial.busIds[k]! },
        );
      }
    }
  }
  return { margin, runnerUp, criterion, code, where, result: r };
}

/**
 * The feeder just after the new units trip: the base case itself when the tap changers did
 * not move, else the base feeder solved with the taps frozen where the trial left them.
 */
function trippedState(base: HostingBase, r: LoadFlowResult): LoadFlowResult | null {
  const taps = base.solved.tapPositions;
  let moved = false;
  for (let i = 0; i < taps.length; i++) if (taps[i] !== r.tapPositions[i]) moved = true;
  if (!moved) return base.solved;
  base.loadFlows++;
  const frozen = solveLoadFlow(
    withTapPositions(base.form, r.tapPositions),
    base.lfCase,
    { ...base.settings.solver, tapControl: false },
    base.prepared,
    r,
  ).value;
  base.sweeps += frozen.iterations;
  return frozen.converged ? frozen : null;
}
