/**
 * The hosting study's finding: a feeder whose capacity for new generation spread over its
 * buses in proportion to demand, with the reference (first) strategy, falls short of its
 * target — the feeder's forecast where the forecast table gives one, else the pipeline's
 * target. The message says what the best strategy would reach.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { Finding } from "../checks/finding.ts";
import type { FeederHosting } from "./host_feeder.ts";
import type { HostingSettings } from "./hosting_settings.ts";

export function hostingTargetMw(form: FeederForm, settings: HostingSettings): {
  readonly mw: number;
  readonly source: "forecast" | "config";
} | null {
  if (form.forecastGenerationMw !== null) {
    return { mw: form.forecastGenerationMw, source: "forecast" };
  }
  return settings.targetMw === null ? null : { mw: settings.targetMw, source: "config" };
}

export function checkHostingTarget(
  form: FeederForm,
  hosting: FeederHosting,
  settings: HostingSettings,
): Finding[] {
  const target = hostingTargetMw(form, settings);
  const ref = hosting.strategies[0];
  if (target === null || ref === undefined) return [];
  const haveMw = ref.spreadKw / 1000;
  if (haveMw >= target.mw) return [];
  let best = ref;
  for (const s of hosting.strategies) if (s.spreadKw > best.spreadKw) best = s;
  const bestText = best === ref
    ? "no other strategy does better"
    : `with ${best.label} it would take ${(best.spreadKw / 1000).toFixed(2)} MW${
      best.spreadKw / 1000 >= target.mw ? ", enough" : ""
    }`;
  return [{
    feederId: form.feederId,
    code: "hosting.shortfall",
    severity: "violation",
    where: { kind: "feeder", id: form.feederId },
    value: haveMw,
    limit: target.mw,
    unit: "MW",
    caseId: hosting.caseId,
    message: `Takes ${
      haveMw.toFixed(2)
    } MW of new generation spread with demand (${ref.label}; bound by ${
      ref.spreadCriterion.replace("_", " ")
    } at ${ref.spreadWhere.id}) against a ${
      target.source === "forecast" ? "forecast" : "target"
    } of ${target.mw.toFixed(2)} MW; ${bestText}`,
  }];
}
