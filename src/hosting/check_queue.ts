/**
 * The queue check: a feeder's generation applications (generation_queue.csv) taken in queue
 * order, each solved on top of the ones before it that fit, against every hosting criterion
 * (load flow: band, generation-caused change, thermal, reverse power, rapid change when it
 * trips; faults: breaking duty, protection findings it causes). An application that fits
 * joins the feeder for the ones after it; one that does not is marked with the upgrade it
 * needs — a control setting when another reactive strategy of the pipeline makes it fit,
 * else reinforcement (voltage, thermal, reverse power, switchgear duty) or protection — and
 * the criterion and place that stop it. It stays out of the base for later applications
 * (it connects only after its works).
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { FindingPlace } from "../checks/finding.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import type { HostingSettings, HostingStrategy } from "./hosting_settings.ts";
import { prepareHostingBase } from "./hosting_base.ts";
import { type HostingCriterion, trialMargin } from "./hosting_margin.ts";
import { withUnitsAdded } from "./add_unit.ts";
import { faultCriteria, type HostingFaultBase } from "./host_feeder.ts";

export interface QueueRow {
  readonly application: string;
  readonly position: number;
  readonly bus: string;
  readonly sizeKw: number;
  readonly kind: "converter" | "synchronous";
  readonly strategy: string;
  readonly verdict: "fits" | "needs_works" | "not_studied";
  readonly upgrade: "control_setting" | "reinforcement" | "protection" | null;
  /** For a control setting: the strategy that makes it fit. */
  readonly alternative: string | null;
  readonly criterion: HostingCriterion | null;
  readonly code: string | null;
  readonly where: FindingPlace | null;
}

const VOLTAGE: ReadonlySet<HostingCriterion> = new Set([
  "overvoltage",
  "voltage_change",
  "rapid_change",
]);

export function checkQueue(
  form: FeederForm,
  settings: CaseSettings,
  hosting: HostingSettings,
  faultBase: HostingFaultBase | null,
): QueueRow[] {
  const apps = [...form.applications].sort((a, b) => a.position - b.position);
  const out: QueueRow[] = [];
  let acc = form;
  const protectionOn = faultBase !== null && hosting.protection &&
    faultBase.protection.enabled && faultBase.protectionKeys !== null &&
    form.nBus <= hosting.protectionMaxBuses;
  const dutyOn = faultBase !== null && hosting.breakerDuty && faultBase.study !== null;
  const strategyOf = (id: string | null): HostingStrategy =>
    (id === null
      ? undefined
      : hosting.strategies.find((s) => s.id.toLowerCase() === id.toLowerCase())) ??
      hosting.strategies[0]!;
  for (const a of apps) {
    const strategy = strategyOf(a.strategy);
    const row = {
      application: a.id,
      position: a.position,
      bus: form.busIds[a.bus]!,
      sizeKw: a.pKw,
      kind: a.kind,
      strategy: strategy.id,
    };
    const base = prepareHostingBase(acc, settings, hosting);
    if (base === null) {
      out.push({
        ...row,
        verdict: "not_studied",
        upgrade: null,
        alternative: null,
        criterion: null,
        code: null,
        where: null,
      });
      continue;
    }
    const trialWith = (s: HostingStrategy) =>
      withUnitsAdded(
        base.form,
        [{ id: a.id, bus: a.bus, pKw: a.pKw, kind: a.kind, strategy: s }],
        base.lfCase.generationScale,
      );
    const judge = (s: HostingStrategy) => {
      const trial = trialWith(s);
      const m = trialMargin(base, trial);
      if (m.margin > 0) {
        return { trial, fail: { criterion: m.criterion, code: m.code, where: m.where } };
      }
      const f = faultBase === null
        ? null
        : faultCriteria(base, faultBase, trial, protectionOn, dutyOn);
      return { trial, fail: f };
    };
    const first = judge(strategy);
    if (first.fail === null) {
      out.push({
        ...row,
        verdict: "fits",
        upgrade: null,
        alternative: null,
        criterion: null,
        code: null,
        where: null,
      });
      acc = first.trial;
      continue;
    }
    let alternative: string | null = null;
    if (VOLTAGE.has(first.fail.criterion)) {
      for (const s of hosting.strategies) {
        if (s === strategy) continue;
        if (judge(s).fail === null) {
          alternative = s.id;
          break;
        }
      }
    }
    out.push({
      ...row,
      verdict: "needs_works",
      upgrade: alternative !== null
        ? "control_setting"
        : first.fail.criterion === "protection"
        ? "protection"
        : "reinforcement",
      alternative,
      ...first.fail,
    });
  }
  return out;
}
