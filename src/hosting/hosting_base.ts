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
import { withTapPositions } from "../rank/modify_form.ts";

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
  /** Impedance of each bus's path from the source, pu (the screen's sensitivities). */
  readonly zpRe: Float64Array;
  readonly zpIm: Float64Array;
  /** Load flows and sweeps solved so far for this feeder (work counters for benchmarks). */
  loadFlows: number;
  sweeps: number;
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

/**
 * Start voltages for a trial with current J (pu) injected at bus k: the base solution plus
 * Z_common·J at every bus — the path's impedance up to where the bus's own path leaves k's
 * (parents come before children, so one pass). Written into `out`.
 */
export function screenedStart(
  base: HostingBase,
  k: number,
  jRe: number,
  jIm: number,
  out: { readonly vRePu: Float64Array; readonly vImPu: Float64Array },
  onPath: Uint8Array,
): void {
  const { form, solved, zpRe, zpIm } = base;
  for (let m = k; m > 0; m = form.parent[m]!) onPath[m] = 1;
  const dr = out.vRePu, di = out.vImPu; // hold the changes first
  dr[0] = 0;
  di[0] = 0;
  for (let i = 1; i < form.nBus; i++) {
    if (onPath[i]) {
      dr[i] = zpRe[i]! * jRe - zpIm[i]! * jIm;
      di[i] = zpRe[i]! * jIm + zpIm[i]! * jRe;
    } else {
      dr[i] = dr[form.parent[i]!]!;
      di[i] = di[form.parent[i]!]!;
    }
  }
  for (let m = k; m > 0; m = form.parent[m]!) onPath[m] = 0;
  for (let i = 0; i < form.nBus; i++) {
    dr[i] = dr[i]! + solved.vRePu[i]!;
    di[i] = di[i]! + solved.vImPu[i]!;
  }
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
  const n = form.nBus, zpRe = new Float64Array(n), zpIm = new Float64Array(n);
  for (let k = 1; k < n; k++) {
    zpRe[k] = zpRe[form.parent[k]!]! + prepared.zRe[k - 1]!;
    zpIm[k] = zpIm[form.parent[k]!]! + prepared.zIm[k - 1]!;
  }
  return {
    form: atTaps,
    lfCase,
    settings,
    hosting,
    prepared,
    solved,
    withoutGeneration,
    skip: exclusionsOf(atTaps, solved, withoutGeneration, settings.limits, settings.checks),
    zpRe,
    zpIm,
    loadFlows: form.generators.n === 0 ? 1 : 2,
    sweeps: solved.iterations + (withoutGeneration === solved ? 0 : withoutGeneration.iterations),
  };
}
