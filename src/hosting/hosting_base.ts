/**
 * What every hosting trial of one feeder shares: the studied case, its solution with the
 * connected generation (the state a new unit joins: its voltages start every trial and its
 * tap positions are where the tap changers stand), the solution without any generation
 * (the reference of the generation-caused voltage change), the load-flow preparation, and
 * the limit terms already crossed before any new unit (left out: the new unit did not
 * cause them).
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import { type PreparedLoadFlow, prepareLoadFlow } from "../solve/prepare_load_flow.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import type { CaseSettings, StudyCase } from "../pipeline/study_feeder.ts";
import { exclusionsOf, type MarginExclusions } from "../rank/_limit_margin.ts";
import type { HostingSettings } from "./hosting_settings.ts";
import { withTapPositions } from "./add_unit.ts";

export interface HostingBase {
  /** The feeder with its tap changers where the studied case leaves them. */
  readonly form: FeederForm;
  readonly lfCase: StudyCase;
  readonly settings: CaseSettings;
  readonly hosting: HostingSettings;
  readonly prepared: PreparedLoadFlow;
  /** The case solved with the connected generation, and without any generation. */
  readonly solved: LoadFlowResult;
  readonly withoutGeneration: LoadFlowResult;
  readonly skip: MarginExclusions;
  /** Load flows solved so far for this feeder (work counter for benchmarks). */
  loadFlows: number;
}

/** The case units are added to: the one named, else minimum demand with the most generation. */
export function hostingCase(settings: CaseSettings, hosting: HostingSettings): StudyCase | null {
  if (hosting.caseId !== null) {
    return settings.cases.find((c) => c.id.toLowerCase() === hosting.caseId!.toLowerCase()) ??
      null;
  }
  let best: StudyCase | null = null;
  const rank = (c: StudyCase) => (c.demand === "min" ? 1e6 : 0) + c.generationScale;
  for (const c of settings.cases) if (best === null || rank(c) > rank(best)) best = c;
  return best;
}

/** Null when the case is missing or does not solve (the feeder's study says why). */
export function prepareHostingBase(
  form: FeederForm,
  settings: CaseSettings,
  hosting: HostingSettings,
): HostingBase | null {
  const lfCase = hostingCase(settings, hosting);
  if (lfCase === null) return null;
  const prepared = prepareLoadFlow(form);
  const solved = solveLoadFlow(form, lfCase, settings.solver, prepared).value;
  const withoutGeneration = form.generators.n === 0 || lfCase.generationScale === 0
    ? solved
    : solveLoadFlow(form, { ...lfCase, generationScale: 0 }, settings.solver, prepared).value;
  if (!solved.converged || !withoutGeneration.converged) return null;
  const atTaps = withTapPositions(form, solved.tapPositions);
  return {
    form: atTaps,
    lfCase,
    settings,
    hosting,
    prepared,
    solved,
    withoutGeneration,
    skip: exclusionsOf(atTaps, solved, withoutGeneration, settings.limits, settings.checks),
    loadFlows: form.generators.n === 0 ? 1 : 2,
  };
}
