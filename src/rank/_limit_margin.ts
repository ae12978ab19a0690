/**
 * How far a solved case is from its nearest limit: the largest of (bus voltage − band edge,
 * pu), (generation-caused voltage change − planning limit, pu) and (branch current ÷ rating −
 * thermal limit, per unit of rating), over the elements and checks that are on. Negative
 * inside every limit, zero on the first one reached. Elements already past a limit without
 * any generation are left out (the generation did not put them there). A continuous
 * measure, so the headroom search can home in on the limit instead of halving blindly.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { CheckLimits, CheckSelection } from "../checks/check_options.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";

export interface LimitMargin {
  readonly margin: number;
  /** The second largest term (−Infinity when there is one term or none). */
  readonly runnerUp: number;
  /** The check and element of the largest term. */
  readonly code: string;
  readonly where: FindingPlace;
}

/** Terms left out, as `<code>|<element index>`. */
export type MarginExclusions = ReadonlySet<string>;

type Visit = (m: number, code: string, kind: "bus" | "branch", index: number) => void;

/** Every term of the margin, with its code and element. */
function eachTerm(
  form: FeederForm,
  result: LoadFlowResult,
  base: LoadFlowResult | null,
  limits: CheckLimits,
  checks: CheckSelection,
  visit: Visit,
): void {
  for (let k = 0; k < form.nBus; k++) {
    const lv = form.vnKv[k]! <= limits.lvMaxKv;
    const v = result.vMagPu[k]!;
    if (checks.voltageBand) {
      const band = lv ? limits.voltageBand.lv : limits.voltageBand.mv;
      const hi = v - band.vMaxPu, lo = band.vMinPu - v;
      visit(hi >= lo ? hi : lo, hi >= lo ? "voltage.above_band" : "voltage.below_band", "bus", k);
    }
    if (checks.voltageChange && base !== null) {
      const limitPu =
        (lv ? limits.voltageChange.lvLimitPercent : limits.voltageChange.mvLimitPercent) / 100;
      visit(Math.abs(v - base.vMagPu[k]!) - limitPu, "voltage.dg_change", "bus", k);
    }
  }
  if (checks.thermal) {
    for (let b = 0; b < form.nBranch; b++) {
      const rating = form.ratingA[b]!;
      if (!(rating > 0) || !Number.isFinite(rating)) continue;
      visit(
        result.iA[b]! / rating - limits.thermal.limitPercent / 100,
        "thermal.overload",
        "branch",
        b,
      );
    }
  }
}

export function limitMargin(
  form: FeederForm,
  result: LoadFlowResult,
  base: LoadFlowResult | null,
  limits: CheckLimits,
  checks: CheckSelection,
  skip: MarginExclusions,
): LimitMargin {
  let margin = -Infinity, runnerUp = -Infinity, code = "";
  let where: FindingPlace = { kind: "feeder", id: form.feederId };
  eachTerm(form, result, base, limits, checks, (m, c, kind, i) => {
    if (m <= runnerUp || skip.has(`${c}|${i}`)) return;
    if (m <= margin) {
      runnerUp = m;
      return;
    }
    runnerUp = margin;
    margin = m;
    code = c;
    where = { kind, id: kind === "bus" ? form.busIds[i]! : form.branchIds[i]! };
  });
  return { margin, runnerUp, code, where };
}

/** The terms already past their limit in a solved case, to leave out of later margins. */
export function exclusionsOf(
  form: FeederForm,
  result: LoadFlowResult,
  base: LoadFlowResult | null,
  limits: CheckLimits,
  checks: CheckSelection,
): MarginExclusions {
  const out = new Set<string>();
  eachTerm(form, result, base, limits, checks, (m, c, _kind, i) => {
    if (m > 0) out.add(`${c}|${i}`);
  });
  return out;
}
