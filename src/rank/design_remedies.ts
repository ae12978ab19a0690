/**
 * Remedy design: for each need, the candidates of every remedy kind in the planners'
 * order are tried one by one until one removes the need — checked by studying the feeder
 * again with the remedy applied, every case and every check — without causing a need of a
 * kind the feeder did not have. Of the kinds that succeed, the cheapest wins (ties go to
 * the earlier kind). What each kind gave is kept as `tried`, for the evidence.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import { type CaseSettings, studyCases, type StudySettings } from "../pipeline/study_feeder.ts";
import { studyFaults } from "../solve/study_faults.ts";
import { checkFaults } from "../checks/check_faults.ts";
import { checkProtection } from "../checks/check_protection.ts";
import { screenRecovery } from "../recovery/screen_recovery.ts";
import type { FeederHosting } from "../hosting/host_feeder.ts";
import type { Finding } from "../checks/finding.ts";

import type { CostTable, RemedyOptions } from "./cost_table.ts";
import type { DgHeadroom, Need, NeedKind, Remedy, RemedyTried } from "./need.ts";
import { type NeedDraft, needKindOf } from "./classify_needs.ts";
import { type Candidate, candidatesFor, REMEDY_ORDER } from "./_remedy_candidates.ts";
import { computeDgHeadroom } from "./dg_headroom.ts";

export interface RemedySettings {
  readonly settings: StudySettings;
  readonly costs: CostTable;
  readonly options: RemedyOptions;
  /** Headroom of the feeder as it is (null without generation). */
  readonly headroom: DgHeadroom | null;
  /** The feeder's hosting study, where it ran (a shortfall's remedies come from it). */
  readonly hosting?: FeederHosting | null;
}

/** Candidates tried per remedy kind at most (the path reconductoring can offer many). */
const MAX_TRIALS_PER_KIND = 40;

export function designRemedies(
  form: FeederForm,
  drafts: readonly NeedDraft[],
  s: RemedySettings,
): Need[] {
  const lean: CaseSettings = { ...s.settings, output: { busResults: false, branchResults: false } };
  const kindsBefore = new Set<NeedKind>(drafts.map((d) => d.kind));
  const ctx = {
    form,
    study: s.settings,
    costs: s.costs,
    options: s.options,
    lvMaxKv: s.settings.limits.lvMaxKv,
    hosting: s.hosting ?? null,
  };
  const check = (need: NeedDraft, c: Candidate): string | null => {
    if (c.checkedBy !== undefined) return null;
    if (c.form === null) return c.description;
    const trial = c.form;
    // The need's own cases first: most candidates fail there, at a fraction of the cost.
    const own = new Set(need.evidence.map((e) => e.caseId));
    const first = lean.cases.filter((x) => own.has(x.id));
    // (Skipped when the evidence comes from the fault or protection study: no case to run.)
    if (first.length > 0 && first.length < lean.cases.length) {
      const quick = studyCases(trial, { ...lean, cases: first });
      const left = quick.findings.filter((f) => needKindOf(form, f) === need.kind).length;
      if (quick.status !== "studied") return "the feeder does not solve with it";
      if (left > 0) return `${left} finding(s) of the need remain`;
    }
    const r = studyCases(trial, lean);
    if (r.status !== "studied") return "the feeder does not solve with it";
    const findings: Finding[] = [...r.findings];
    // The short-circuit study too: it shows a duty need removed, and a remedy that raises
    // fault levels (new copper, say) beyond what a device can interrupt.
    if (s.settings.faults.enabled) {
      const f = s.settings.faults;
      findings.push(...checkFaults(trial, studyFaults(trial, f, lean.limits.lvMaxKv), f));
      // The protection checks for a protection need (and for no other: they are the study's
      // dearest part, and other remedies leave the settings alone).
      if (
        (need.kind === "protection_grading" || need.kind === "protection_direction") &&
        s.settings.protection.enabled && trial.nBus <= s.settings.protection.maxBuses
      ) {
        findings.push(
          ...checkProtection(trial, f, s.settings.protection, lean.limits.lvMaxKv),
        );
      }
    }
    // The recovery screen for a recovery need (it re-runs the faults of the protection study).
    if (need.kind === "post_fault_recovery" && s.settings.faults.enabled) {
      findings.push(
        ...screenRecovery(trial, lean, s.settings.faults, s.settings.recovery).findings,
      );
    }
    const left = findings.filter((f) => needKindOf(form, f) === need.kind);
    if (left.length > 0) {
      return `${left.length} finding(s) of the need remain`;
    }
    const caused = [
      ...new Set(
        findings.map((f) => needKindOf(form, f)).filter((k): k is NeedKind =>
          k !== null && !kindsBefore.has(k)
        ),
      ),
    ];
    return caused.length > 0 ? `it causes ${caused.join(", ")}` : null;
  };
  return drafts.map((need) => {
    const tried: RemedyTried[] = [];
    const found: Candidate[] = [];
    for (const kind of REMEDY_ORDER[need.kind]) {
      let trials = 0,
        lastWhy = "no candidate applies to this feeder",
        success: Candidate | null = null;
      for (const c of candidatesFor(kind, need, ctx)) {
        if (++trials > MAX_TRIALS_PER_KIND) break;
        const why = check(need, c);
        if (why === null) {
          success = c;
          break;
        }
        lastWhy = why;
      }
      if (success === null) {
        tried.push({
          kind,
          outcome: trials === 0
            ? lastWhy
            : `${
              Math.min(trials, MAX_TRIALS_PER_KIND)
            } trial(s), none removed it: last, ${lastWhy}`,
        });
      } else {
        found.push(success);
        tried.push({ kind, outcome: `removes it for ${costOf(success)} ${s.costs.currency}` });
      }
    }
    let best: Candidate | null = null;
    for (const c of found) if (best === null || costOf(c) < costOf(best)) best = c;
    return { ...need, remedy: best === null ? null : toRemedy(best, s), tried };
  });
}

function costOf(c: Candidate): number {
  return Math.round(c.items.reduce((t, i) => t + i.cost, 0) * 100) / 100;
}

function toRemedy(c: Candidate, s: RemedySettings): Remedy {
  let capacityUnlockedMw: number | null = c.unlocksMw ?? null;
  if (c.unlocksMw === undefined && s.headroom !== null) {
    const after = c.form === null
      ? null
      : computeDgHeadroom(c.form, s.settings, s.options.headroomMaxFactor);
    if (after !== null) {
      capacityUnlockedMw = Math.round((after.headroomMw - s.headroom.headroomMw) * 1e4) / 1e4;
    }
  }
  return {
    kind: c.kind,
    description: c.description,
    items: c.items,
    cost: costOf(c),
    capacityUnlockedMw,
    ...(c.protectionSettings === undefined ? {} : { protectionSettings: c.protectionSettings }),
  };
}
