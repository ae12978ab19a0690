/**
 * Generation headroom of a feeder: the largest multiple of its connected generation — the
 * same units in the same places, active power and rating scaled together — that keeps
 * every violation check clear, in the case with the most generation. Limits already
 * crossed without any generation (an undervoltage at peak, say) are not the generation's
 * doing and do not bind. Found by bisection with full nonlinear load flows.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import { type CaseSettings, studyCases } from "../pipeline/study_feeder.ts";
import type { DgHeadroom } from "./need.ts";
import { excessPercent, needKindOf } from "./classify_needs.ts";
import { withGenerationScaled } from "./modify_form.ts";

/** Bisection steps: the factor is found to maxFactor / 2^STEPS. */
const STEPS = 16;

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
  const lean: CaseSettings = {
    ...settings,
    cases: [lfCase],
    output: { busResults: false, branchResults: false },
  };
  const keyOf = (f: { code: string; where: { id: string } }) => `${f.code}|${f.where.id}`;
  const violations = (factor: number) => {
    const r = studyCases(withGenerationScaled(form, factor), lean);
    return {
      solved: r.status === "studied",
      generationKw: r.cases[0]?.generationKw ?? 0,
      found: r.findings.filter((f) => needKindOf(form, f) !== null),
    };
  };
  const baseline = new Set(violations(0).found.map(keyOf));
  const atOne = violations(1);
  const connectedMw = atOne.generationKw / 1000;
  const newOnes = (v: ReturnType<typeof violations>) =>
    v.found.filter((f) => !baseline.has(keyOf(f)));
  const fits = (v: ReturnType<typeof violations>) => v.solved && newOnes(v).length === 0;

  let lo = 0, hi = maxFactor, atHi = violations(maxFactor);
  if (fits(atHi)) return result(maxFactor, null);
  if (fits(atOne)) lo = 1;
  else {
    hi = 1;
    atHi = atOne;
  }
  for (let i = 0; i < STEPS; i++) {
    const mid = (lo + hi) / 2;
    const v = violations(mid);
    if (fits(v)) lo = mid;
    else {
      hi = mid;
      atHi = v;
    }
  }
  let binding: DgHeadroom["binding"] = null;
  let worst = -Infinity;
  for (const f of newOnes(atHi)) {
    const e = excessPercent(f);
    if (e > worst) {
      worst = e;
      binding = { code: f.code, where: f.where };
    }
  }
  if (binding === null && !atHi.solved) {
    binding = { code: "loadflow.not_solved", where: { kind: "feeder", id: form.feederId } };
  }
  return result(lo, binding);

  function result(factor: number, b: DgHeadroom["binding"]): DgHeadroom {
    return {
      caseId: lfCase!.id,
      connectedMw: round(connectedMw),
      factor: round(factor),
      headroomMw: round((factor - 1) * connectedMw),
      binding: b,
    };
  }
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
