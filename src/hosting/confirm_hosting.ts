/**
 * Confirmation of a screened capacity with full nonlinear load flows: the largest size whose
 * trial stays inside every limit, found from the screen's estimate by Newton steps on the
 * limit margin (the screen's slope first, then the secant of the last two trials when they
 * bind on the same term), kept inside the bracket the trials build and falling back to
 * bisection when a step does not shrink it (a tap changer stepping, a different criterion
 * taking over). Done when the bracket is narrower than the tolerance, or when a Newton step
 * from a trial is smaller than half of it: the answer is then that trial's size if it is
 * inside the limits, else the step's end — the nonlinear root to within the tolerance, not
 * the linear estimate.
 */
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { HostingCriterion, TrialMargin } from "./hosting_margin.ts";

export interface Confirmed {
  readonly pKw: number;
  readonly criterion: HostingCriterion;
  readonly code: string;
  readonly where: FindingPlace;
  /** The load flow of the trial nearest the answer (null when none solved). */
  readonly result: LoadFlowResult | null;
  readonly evaluations: number;
}

export interface ConfirmOptions {
  /** Absolute and relative tolerance of the answer. */
  readonly toleranceKw: number;
  readonly tolerancePercent: number;
  readonly maxKw: number;
  readonly maxEvaluations?: number;
}

export function confirmCapacity(
  evaluate: (pKw: number) => TrialMargin,
  guessKw: number,
  /** The screen's slope of its binding term, and that term (code and element) — null: unknown. */
  screenSlope: { readonly perKw: number; readonly code: string; readonly whereId: string } | null,
  o: ConfirmOptions,
): Confirmed {
  const tol = (p: number) => Math.max(o.toleranceKw, o.tolerancePercent / 100 * p);
  const maxEval = o.maxEvaluations ?? 40;
  let lo = 0, hi = Infinity;
  let atLo: TrialMargin | null = null, atHi: TrialMargin | null = null;
  let evaluations = 0, slow = 0;
  let prevX = NaN, prev: TrialMargin | null = null;
  let x = Math.min(o.maxKw, Math.max(guessKw, o.toleranceKw));
  const answer = (pKw: number, m: TrialMargin): Confirmed => ({
    pKw,
    criterion: m.criterion,
    code: m.code,
    where: m.where,
    result: m.result,
    evaluations,
  });
  for (;;) {
    const m = evaluate(x);
    evaluations++;
    const width = hi - lo;
    if (m.margin <= 0) {
      lo = x;
      atLo = m;
      if (x >= o.maxKw) {
        return { ...answer(x, m), criterion: "search_range", code: "hosting.range" };
      }
    } else {
      hi = x;
      atHi = m;
    }
    if (hi - lo <= tol(lo) || evaluations >= maxEval) break;
    slow = Number.isFinite(width) && hi - lo > 0.6 * width ? slow + 1 : 0;
    // The slope of the trial's binding term: the secant of the last two trials when they bind
    // on the same term, else the screen's when it names that term. A step may only end the
    // search when its slope belongs to the term that binds.
    let s = 0, own = false;
    if (screenSlope !== null && screenSlope.perKw > 0) {
      s = screenSlope.perKw;
      own = screenSlope.code === m.code && screenSlope.whereId === m.where.id;
    }
    if (
      prev !== null && Number.isFinite(prev.margin) && Number.isFinite(m.margin) &&
      prev.code === m.code && prev.where.id === m.where.id && x !== prevX
    ) {
      const secant = (m.margin - prev.margin) / (x - prevX);
      if (secant > 0) {
        s = secant;
        own = true;
      }
    }
    let next = s > 0 && Number.isFinite(m.margin) ? x - m.margin / s : NaN;
    if (own && Number.isFinite(next) && Math.abs(next - x) <= tol(x)) {
      if (m.margin <= 0) return answer(x, m);
      // Past the limit by less than half the tolerance, on this term only.
      if (next > lo && m.runnerUp <= 0) return answer(next, m);
    }
    if (!(next > lo && next < hi) || slow >= 2) {
      next = Number.isFinite(hi) ? (lo + hi) / 2 : Math.min(o.maxKw, Math.max(2 * x, x + tol(x)));
      slow = 0;
    }
    prevX = x;
    prev = m;
    x = next;
  }
  if (atLo !== null) return answer(lo, atLo);
  // Nothing tried was inside the limits: the capacity is below the tolerance.
  return { ...answer(0, atHi!), pKw: 0 };
}
