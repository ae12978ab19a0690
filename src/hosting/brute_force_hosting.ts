/**
 * The reference the screen-and-confirm method is measured against: plain bisection at every
 * bus on [0, maxMw] with a full load flow from a flat start at every trial, no screen and no
 * warm start. Load-flow criteria only (the fault criteria are the same code in both methods).
 * Slow by design; used by tests and the benchmark.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import type { HostingSettings, HostingStrategy } from "./hosting_settings.ts";
import { prepareHostingBase } from "./hosting_base.ts";
import { measureTrial } from "./hosting_margin.ts";
import { unitAt } from "./host_feeder.ts";

export interface BruteForceBus {
  readonly bus: string;
  readonly capacityKw: number;
  readonly criterion: string;
}

/** Every bus from the first feeder bus on; `toleranceKw` is the final bracket's width. */
export function bruteForceHosting(
  form: FeederForm,
  settings: CaseSettings,
  hosting: HostingSettings,
  strategy: HostingStrategy,
  toleranceKw: number,
): { buses: BruteForceBus[]; loadFlows: number; sweeps: number } {
  const base = prepareHostingBase(form, settings, hosting);
  if (base === null) return { buses: [], loadFlows: 0, sweeps: 0 };
  // Cold starts: every trial solves from the flat profile, like a plain loop of load flows.
  const cold = (pKw: number, k: number) => {
    const trial = unitAt(base, k, pKw, strategy);
    base.loadFlows++;
    const r = solveLoadFlow(trial, base.lfCase, settings.solver, base.prepared).value;
    base.sweeps += r.iterations;
    return r.converged ? measureTrial(base, trial, r) : null;
  };
  const buses: BruteForceBus[] = [];
  const first = form.substationBusCount > 0 ? form.substationBusCount : 1;
  for (let k = first; k < form.nBus; k++) {
    let lo = 0, hi = hosting.maxMw * 1000, criterion = "search_range";
    const top = cold(hi, k);
    if (top !== null && top.margin <= 0) {
      buses.push({ bus: form.busIds[k]!, capacityKw: hi, criterion });
      continue;
    }
    while (hi - lo > toleranceKw) {
      const mid = (lo + hi) / 2;
      const m = cold(mid, k);
      if (m !== null && m.margin <= 0) lo = mid;
      else {
        hi = mid;
        criterion = m === null ? "no_solution" : m.criterion;
      }
    }
    buses.push({ bus: form.busIds[k]!, capacityKw: lo, criterion });
  }
  return { buses, loadFlows: base.loadFlows, sweeps: base.sweeps };
}
