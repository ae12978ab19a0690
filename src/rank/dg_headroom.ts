/**
 * Generation headroom of a feeder: the largest multiple of its connected generation — the
 * same units in the same places, active power and rating scaled together — that keeps
 * every limit of the voltage band, voltage-change and thermal checks, in the case with the
 * most generation. Limits already crossed without any generation (an undervoltage at peak,
 * say) are not the generation's doing and do not bind.
 *
 * Full nonlinear load flows at each trial factor; the factor is the root of the limit margin
 * (_limit_margin.ts), found by false position with the Illinois modification and a bisection
 * step whenever the bracket shrinks too slowly, until the factor is within 1e-7 (pu of
 * voltage or of rating) of the limit from inside, or the bracket is 1e-4 of the connected
 * generation wide. The demand-only solve and the per-unit preparation are done once.
 */
import { roundTo } from "../model/round_to.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { prepareLoadFlow } from "../solve/prepare_load_flow.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import type { DgHeadroom } from "./need.ts";
import { withGenerationScaled } from "./modify_form.ts";
import { exclusionsOf, limitMargin } from "./_limit_margin.ts";

/** Width of the final bracket, in multiples of the connected generation. */
const TOLERANCE = 1e-4;
const MAX_EVALUATIONS = 40;
/** An inner margin this close to zero is on the limit: pu of voltage, or of rating. */
const MARGIN_TOL = 1e-7;

export function computeDgHeadroom(
  form: FeederForm,
  settings: CaseSettings,
  maxFactor: number,
): DgHeadroom | null {
  if (form.generators.n === 0) return null;
  let lfCase = settings.cases[0];
  for (const c of settings.cases) {
    if (c.generationScale > (lfCase?.generationScale ?? 0)) lfCase = c;
  }
  if (lfCase === undefined || lfCase.generationScale <= 0) return null;
  const prepared = prepareLoadFlow(form); // generation does not enter the preparation
  const { limits, checks, solver } = settings;
  const base = solveLoadFlow(form, { ...lfCase, generationScale: 0 }, solver, prepared).value;
  if (!base.converged) return null;
  const solveAt = (factor: number) =>
    solveLoadFlow(withGenerationScaled(form, factor), lfCase!, solver, prepared).value;
  // Factor 0 is the case without generation: what is past a limit there is not the
  // generation's doing.
  const skip = exclusionsOf(form, base, base, limits, checks);
  let evaluations = 0;
  const marginOf = (r: typeof base) => {
    if (!r.converged) {
      return {
        margin: Infinity,
        code: "loadflow.not_solved",
        where: { kind: "feeder" as const, id: form.feederId },
        generationKw: 0,
      };
    }
    let generationKw = 0;
    for (const p of r.genPKw) generationKw += p;
    return { ...limitMargin(form, r, base, limits, checks, skip), generationKw };
  };
  const marginAt = (factor: number) => {
    evaluations++;
    return marginOf(solveAt(factor));
  };

  const one = marginAt(1);
  const connectedMw = one.generationKw / 1000;
  const result = (factor: number, binding: DgHeadroom["binding"]): DgHeadroom => ({
    caseId: lfCase!.id,
    connectedMw: roundTo(connectedMw, 4),
    factor: roundTo(factor, 4),
    headroomMw: roundTo((factor - 1) * connectedMw, 4),
    binding,
  });
  let lo = 0, fLo = marginOf(base).margin;
  let hi = 1, atHi = one;
  if (fLo > 0) return result(0, { code: one.code, where: one.where }); // not even a little fits
  if (one.margin <= 0) {
    // Within limits at the connected generation: extrapolate the margin along the last
    // secant, overshooting by 2 %, until a trial crosses a limit or the search range ends.
    let xPrev = 0, fPrev = fLo;
    lo = 1;
    fLo = one.margin;
    for (;;) {
      const slope = (fLo - fPrev) / (lo - xPrev);
      const guess = slope > 0 ? lo - 1.02 * fLo / slope : 2 * lo;
      const x = Math.min(maxFactor, Math.max(guess, lo * 1.05));
      const m = marginAt(x);
      if (m.margin > 0) {
        hi = x;
        atHi = m;
        break;
      }
      if (x >= maxFactor || evaluations >= MAX_EVALUATIONS) return result(x, null);
      xPrev = lo;
      fPrev = fLo;
      lo = x;
      fLo = m.margin;
    }
  }
  // Safeguarded false position (Illinois) on the margin, bracket [lo, hi] with f(lo) ≤ 0 < f(hi).
  // Done when the bracket is narrow or the inner end sits on the limit (within MARGIN_TOL).
  let fHi = Number.isFinite(atHi.margin) ? atHi.margin : 1, side = 0, slow = 0;
  const moveHi = (x: number, m: ReturnType<typeof marginAt>) => {
    hi = x;
    atHi = m;
    fHi = Number.isFinite(m.margin) ? m.margin : 2 * Math.abs(fLo) + 1;
  };
  while (hi - lo > TOLERANCE && -fLo > MARGIN_TOL && evaluations < MAX_EVALUATIONS) {
    const width = hi - lo;
    let x = slow >= 2 ? (lo + hi) / 2 : lo - fLo * (hi - lo) / (fHi - fLo);
    if (!(x > lo && x < hi)) x = (lo + hi) / 2;
    const m = marginAt(x);
    if (m.margin <= 0) {
      lo = x;
      fLo = m.margin;
      if (side === -1) fHi /= 2;
      side = -1;
    } else {
      moveHi(x, m);
      if (side === 1) fLo /= 2;
      side = 1;
    }
    slow = hi - lo > 0.9 * width ? slow + 1 : 0;
  }
  return result(lo, { code: atHi.code, where: atHi.where });
}
