/**
 * Confirmation of a screened capacity with full nonlinear load flows: the largest size whose
 * trial stays inside every limit, found from the screen's estimate by Newton steps on the
 * limit margin (the screen's slope first, then the secant of the last two trials when they
 * bind on the same term), kept inside the bracket the trials build and falling back to
 * bisection when a step does not shrink it (a tap changer stepping, a different criterion
 * taking over). Done when the bracket is narrower than the tolerance, or when a Newton step
 * d from a trial, with a slope that may be off by a fraction u (the screen's, scaled or not;
 * a secant's), shows the root within the tolerance: from a trial inside the limits, the
 * root at most the tolerance above it (d·(1 + u) ≤ tol; the answer is the trial); from a
 * trial past the limit on one term only, d·u ≤ tol/2 (the answer is the lower end of the
 * band d ± d·u) — the nonlinear root to within the tolerance, not the linear estimate.
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

/** How far a secant through two nonlinear trials on the same term may be off the root's slope. */
const SECANT_UNCERTAINTY = 0.03;

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
  /**
   * The screen's slope of its binding term, that term (code and element), and how far the
   * slope may be off (a fraction) — null: unknown.
   */
  screenSlope: {
    readonly perKw: number;
    readonly code: string;
    readonly whereId: string;
    readonly uncertainty: number;
  } | null,
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
    let s = 0, own = false, uncertainty = 1;
    if (screenSlope !== null && screenSlope.perKw > 0) {
      s = screenSlope.perKw;
      own = screenSlope.code === m.code && screenSlope.whereId === m.where.id;
      uncertainty = screenSlope.uncertainty;
    }
    if (
      prev !== null && Number.isFinite(prev.margin) && Number.isFinite(m.margin) &&
      prev.code === m.code && prev.where.id === m.where.id && x !== prevX
    ) {
      const secant = (m.margin - prev.margin) / (x - prevX);
      if (secant > 0) {
        s = secant;
        own = true;
        uncertainty = SECANT_UNCERTAINTY;
      }
    }
    let next = s > 0 && Number.isFinite(m.margin) ? x - m.margin / s : NaN;
    // A step of d with a slope off by a fraction u ends within d·u of the root: accept it
    // when that is within half the tolerance.
    // The root is then within next ± |d|·u. Inside the limits, the trial itself is the
    // answer when the root is at most the tolerance above it (sizes above it are untried:
    // another term might bind there). Past the limit on this term alone, the lower end of
    // the band is (the other terms hold at the trial, so below it too).
    const d = Math.abs(next - x);
    if (own && Number.isFinite(next) && next < o.maxKw) {
      if (m.margin <= 0 && d * (1 + uncertainty) <= tol(x)) return answer(x, m);
      const safe = Math.min(next - d * uncertainty, hi);
      if (m.margin > 0 && d * uncertainty <= tol(x) / 2 && safe > lo && m.runnerUp <= 0) {
        return answer(safe, m);
      }
    }
    if (!(next > lo && next < hi) || slow >= 2) {
      next = Number.isFinite(hi) ? (lo + hi) / 2 : Math.min(o.maxKw, Math.max(2 * x, x + tol(x)));
      slow = 0;
    }
    prevX = x;
    prev = m;
    x = Math.min(next, o.maxKw);
  }
  if (atLo !== null) return answer(lo, atLo);
  // Nothing tried was inside the limits: the capacity is below the tolerance.
  return { ...answer(0, atHi!), pKw: 0 };
}
