/**
 * Branch checks of one case: thermal loading of every line, transformer and rated switch
 * (in % of its rating, whatever the direction of flow), reverse active power through the
 * feeder head and the substation transformer, and the feeder's losses.
 */
import { BRANCH_TRANSFORMER, type FeederForm } from "../model/feeder_form.ts";
import type { LoadFlowResult } from "../solve/load_flow_types.ts";
import type { CheckLimits, CheckSelection } from "./check_options.ts";
import type { Finding } from "./finding.ts";

/** Loading of each branch in % of its rating (0 where it has none). */
export function branchLoadingPercent(form: FeederForm, result: LoadFlowResult): Float64Array {
  const out = new Float64Array(form.nBranch);
  for (let b = 0; b < form.nBranch; b++) {
    const rating = form.ratingA[b]!;
    out[b] = Number.isFinite(rating) && rating > 0 ? 100 * result.iA[b]! / rating : 0;
  }
  return out;
}

export function checkFlows(
  form: FeederForm,
  result: LoadFlowResult,
  limits: CheckLimits,
  selection: CheckSelection,
): Finding[] {
  const out: Finding[] = [];
  const base = { feederId: form.feederId, caseId: result.caseId };
  if (selection.thermal) {
    const loading = branchLoadingPercent(form, result);
    for (let b = 0; b < form.nBranch; b++) {
      const l = loading[b]!;
      const over = l > limits.thermal.limitPercent;
      if (!over && l <= limits.thermal.warnPercent) continue;
      const dir = result.pFromKw[b]! < 0 ? "toward the source" : "away from the source";
      out.push({
        ...base,
        code: over ? "thermal.overload" : "thermal.near_limit",
        severity: over ? "violation" : "warning",
        where: { kind: "branch", id: form.branchIds[b]! },
        value: l,
        limit: over ? limits.thermal.limitPercent : limits.thermal.warnPercent,
        unit: "%",
        message: `Branch "${form.branchIds[b]}" carries ${result.iA[b]!.toFixed(1)} A, ${
          l.toFixed(1)
        } % of its ${form.ratingA[b]!.toFixed(0)} A rating, with power flowing ${dir}`,
      });
    }
  }
  if (selection.reversePower) {
    for (const d of form.devices) {
      if (!d.isHead) continue;
      const p = -result.pFromKw[d.branch]!;
      if (p > limits.reversePower.headLimitKw) {
        out.push({
          ...base,
          code: "flow.reverse_head",
          severity: "warning",
          where: { kind: "branch", id: d.id },
          value: p,
          limit: limits.reversePower.headLimitKw,
          unit: "kW",
          message: `${
            p.toFixed(0)
          } kW flow back through feeder-head device "${d.id}" toward the busbar`,
        });
      }
    }
    for (const t of form.transformers) {
      // Substation transformers: those inside the substation part.
      if (form.branchTo[t.branch]! >= form.substationBusCount) continue;
      if (form.branchKind[t.branch] !== BRANCH_TRANSFORMER) continue;
      const p = -result.pFromKw[t.branch]!;
      if (p > limits.reversePower.transformerLimitKw) {
        out.push({
          ...base,
          code: "flow.reverse_transformer",
          severity: "warning",
          where: { kind: "branch", id: t.id },
          value: p,
          limit: limits.reversePower.transformerLimitKw,
          unit: "kW",
          message:
            `${
              p.toFixed(0)
            } kW of this feeder flow back through substation transformer "${t.id}" ` +
            "(other feeders on the busbar not counted)",
        });
      }
    }
  }
  if (selection.losses) {
    // Share of the power fed in: what the source imports plus what the generation injects.
    const fedIn = Math.max(result.sourcePKw, 0) + result.genPKw.reduce((s, p) => s + p, 0);
    const share = fedIn > 0 ? 100 * result.lossesKw / fedIn : 0;
    if (share > limits.losses.warnPercent) {
      out.push({
        ...base,
        code: "losses.high",
        severity: "warning",
        where: { kind: "feeder", id: form.feederId },
        value: share,
        limit: limits.losses.warnPercent,
        unit: "%",
        message: `Losses are ${result.lossesKw.toFixed(1)} kW, ${share.toFixed(1)} % of the ${
          fedIn.toFixed(0)
        } kW fed in (source import plus generation)`,
      });
    }
  }
  return out;
}
