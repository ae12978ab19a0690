/**
 * Study of one feeder: every case's load flow, the companion no-generation solves the
 * voltage-change check needs, and the checks. Returns plain data for the report stage.
 */
import { roundTo } from "../model/round_to.ts";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { BRANCH_LINE, BRANCH_SWITCH, type FeederForm } from "../model/feeder_form.ts";
import type { LoadFlowCase, LoadFlowOptions, LoadFlowResult } from "../solve/load_flow_types.ts";
import { prepareLoadFlow } from "../solve/prepare_load_flow.ts";
import { arrayMax, arrayMaxAbs, arrayMin } from "../model/array_extremes.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import type { CheckLimits, CheckSelection } from "../checks/check_options.ts";
import { compareFindings, type Finding } from "../checks/finding.ts";
import { checkVoltageBand } from "../checks/check_voltage_band.ts";
import { checkVoltageChange, voltageChangePercent } from "../checks/check_voltage_change.ts";
import { computeVoltageChangeParts } from "../checks/voltage_change_parts.ts";
import { branchLoadingPercent, checkFlows } from "../checks/check_flows.ts";
import type { DgHeadroom, Need } from "../rank/need.ts";
import type { CostTable, RemedyOptions } from "../rank/cost_table.ts";
import { assessFeeder } from "../rank/assess_feeder.ts";
import type { DeviceCurves } from "../report/feeder_file.ts";
import { describeDevices } from "../report/describe_devices.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import { type FaultStudy, roundFaultStudy, studyFaults } from "../solve/study_faults.ts";
import { checkFaults } from "../checks/check_faults.ts";
import { checkProtection } from "../checks/check_protection.ts";
import { coordinationCollector, type CoordinationRow } from "../report/coordination_table.ts";
import type { ProtectionSettings } from "../solve/protection_settings.ts";
import type { HostingSettings } from "../hosting/hosting_settings.ts";
import { type FeederHosting, hostFeeder } from "../hosting/host_feeder.ts";
import { checkHostingTarget } from "../hosting/hosting_findings.ts";
import type { RecoverySettings } from "../recovery/recovery_settings.ts";
import { type FeederRecovery, screenRecovery } from "../recovery/screen_recovery.ts";

export interface StudyCase extends LoadFlowCase {
  readonly label?: string | undefined;
}

export interface CaseSettings {
  readonly cases: readonly StudyCase[];
  readonly limits: CheckLimits;
  readonly checks: CheckSelection;
  readonly solver: LoadFlowOptions;
  readonly output: { readonly busResults: boolean; readonly branchResults: boolean };
}

export interface StudySettings extends CaseSettings {
  readonly faults: FaultSettings;
  readonly protection: ProtectionSettings;
  readonly costs: CostTable;
  readonly remedies: RemedyOptions;
  readonly hosting: HostingSettings;
  readonly recovery: RecoverySettings;
}

export interface BusRow {
  readonly id: string;
  readonly vnKv: number;
  readonly distanceKm: number;
  readonly vPu: number;
  readonly angleDeg: number;
  /** Exact change caused by generation, %, and the formula's two parts, % (null without DG). */
  readonly dgChangePercent: number | null;
  readonly rpPercent: number | null;
  readonly xqPercent: number | null;
}

export interface BranchRow {
  readonly id: string;
  readonly kind: "line" | "transformer" | "switch";
  readonly from: string;
  readonly to: string;
  readonly pFromKw: number;
  readonly qFromKvar: number;
  readonly pToKw: number;
  readonly qToKvar: number;
  readonly iA: number;
  readonly loadingPercent: number;
}

export interface CaseOutcome {
  readonly caseId: string;
  readonly label: string | null;
  readonly converged: boolean;
  readonly iterations: number;
  readonly residualPu: number;
  readonly demandKw: number;
  readonly generationKw: number;
  readonly generationKvar: number;
  readonly sourcePKw: number;
  readonly sourceQKvar: number;
  readonly lossesKw: number;
  readonly lossesKvar: number;
  readonly vMinPu: number;
  readonly vMaxPu: number;
  readonly maxLoadingPercent: number;
  /** Largest voltage change caused by generation, % (null for a case without generation). */
  readonly maxDgChangePercent: number | null;
  /** Reactive power the substation supplies more because of the generation, kvar. */
  readonly sourceQShiftKvar: number | null;
  readonly taps: readonly { readonly transformer: string; readonly position: number }[];
  readonly buses?: readonly BusRow[];
  readonly branches?: readonly BranchRow[];
}

/** The load flows and checks of every case. */
export interface CasesStudy {
  readonly feederId: string;
  readonly status: "studied" | "failed";
  readonly cases: readonly CaseOutcome[];
  readonly findings: readonly Finding[];
  readonly diagnostics: readonly Diagnostic[];
}

/** The whole study of a feeder: its cases, its faults, and its needs with their remedies. */
export interface FeederStudy extends CasesStudy {
  /** The short-circuit study, rounded for the file (null when off or the cases failed). */
  readonly faults: FaultStudy | null;
  /** The protection's response to every fault simulated (null when the checks are off). */
  readonly coordination: readonly CoordinationRow[] | null;
  readonly needs: readonly Need[];
  readonly headroom: DgHeadroom | null;
  readonly devices: readonly DeviceCurves[];
  /** Hosting capacity per bus and strategy (null when off or not studied). */
  readonly hosting: FeederHosting | null;
  /** Recovery after faults (null when off or not screened). */
  readonly recovery: FeederRecovery | null;
}

export function studyFeeder(form: FeederForm, settings: StudySettings): FeederStudy {
  const cases = studyCases(form, settings);
  const faults = cases.status === "studied" && settings.faults.enabled
    ? studyFaults(form, settings.faults, settings.limits.lvMaxKv)
    : null;
  const coordination: CoordinationRow[] = [];
  const protectionOn = faults !== null && settings.protection.enabled &&
    form.nBus <= settings.protection.maxBuses;
  const protection = protectionOn
    ? checkProtection(
      form,
      settings.faults,
      settings.protection,
      settings.limits.lvMaxKv,
      coordinationCollector(form, coordination),
    )
    : [];
  const hosted = cases.status === "studied"
    ? hostFeeder(
      form,
      settings,
      settings.hosting,
      faults === null ? null : {
        settings: settings.faults,
        protection: settings.protection,
        study: faults,
        protectionKeys: protectionOn
          ? new Set(protection.map((f) => `${f.code}|${f.where.id}`))
          : null,
        reference: new Map(),
      },
    )
    : { hosting: null, diagnostics: [] };
  const recovered = cases.status === "studied" && faults !== null
    ? screenRecovery(form, settings, settings.faults, settings.recovery)
    : { recovery: null, findings: [], diagnostics: [] };
  const findings = [
    ...cases.findings,
    ...recovered.findings,
    ...(faults === null ? [] : checkFaults(form, faults, settings.faults)),
    ...protection,
    ...(hosted.hosting === null ? [] : checkHostingTarget(form, hosted.hosting, settings.hosting)),
  ].sort(compareFindings);
  const assessed = cases.status === "studied"
    ? assessFeeder(form, settings, findings, hosted.hosting)
    : { needs: [], headroom: null };
  return {
    ...cases,
    findings,
    diagnostics: [
      ...cases.diagnostics,
      ...(faults?.diagnostics ?? []),
      ...hosted.diagnostics,
      ...recovered.diagnostics,
      ...(faults !== null && settings.protection.enabled && !protectionOn
        ? [makeDiagnostic(
          "protection.too_large",
          "warning",
          `Feeder "${form.feederId}" has ${form.nBus} buses, more than the ${settings.protection.maxBuses} the protection study checks; its protection is not checked`,
          { feederId: form.feederId },
        )]
        : []),
    ],
    faults: faults === null ? null : roundFaultStudy(faults),
    coordination: protectionOn ? coordination : null,
    ...assessed,
    devices: describeDevices(form),
    hosting: hosted.hosting,
    recovery: recovered.recovery,
  };
}

/** Every case's load flow and checks (what remedy trials repeat on changed forms). */
export function studyCases(form: FeederForm, settings: CaseSettings): CasesStudy {
  const prepared = prepareLoadFlow(form);
  const diagnostics: Diagnostic[] = [];
  const solved = new Map<string, LoadFlowResult>();
  const solve = (c: LoadFlowCase): LoadFlowResult => {
    const key = `${c.demand}|${c.demandScale}|${c.generationScale}`;
    const hit = solved.get(key);
    if (hit) return hit.caseId === c.id ? hit : { ...hit, caseId: c.id };
    const r = solveLoadFlow(form, c, settings.solver, prepared);
    diagnostics.push(...r.diagnostics);
    solved.set(key, r.value);
    return r.value;
  };
  const findings: Finding[] = [];
  const cases: CaseOutcome[] = [];
  for (const c of settings.cases) {
    const res = solve(c);
    const outcome: { -readonly [K in keyof CaseOutcome]: CaseOutcome[K] } = {
      caseId: c.id,
      label: c.label ?? null,
      converged: res.converged,
      iterations: res.iterations,
      residualPu: res.residualPu,
      demandKw: roundTo(sum(res.loadPKw), 3),
      generationKw: roundTo(sum(res.genPKw), 3),
      generationKvar: roundTo(sum(res.genQKvar), 3),
      sourcePKw: roundTo(res.sourcePKw, 3),
      sourceQKvar: roundTo(res.sourceQKvar, 3),
      lossesKw: roundTo(res.lossesKw, 3),
      lossesKvar: roundTo(res.lossesKvar, 3),
      vMinPu: roundTo(arrayMin(res.vMagPu), 6),
      vMaxPu: roundTo(arrayMax(res.vMagPu), 6),
      maxLoadingPercent: 0,
      maxDgChangePercent: null,
      sourceQShiftKvar: null,
      taps: form.transformers.map((t, i) => ({
        transformer: t.id,
        position: res.tapPositions[i]!,
      })),
    };
    if (!res.converged) {
      cases.push(outcome);
      continue;
    }
    const loading = branchLoadingPercent(form, res);
    outcome.maxLoadingPercent = roundTo(arrayMax(loading, 0), 3);
    if (settings.checks.voltageBand) findings.push(...checkVoltageBand(form, res, settings.limits));
    findings.push(...checkFlows(form, res, settings.limits, settings.checks));

    let change: Float64Array | null = null;
    let parts: ReturnType<typeof computeVoltageChangeParts> | null = null;
    if (c.generationScale > 0 && form.generators.n > 0) {
      const base = solve({
        id: `${c.id} without generation`,
        demand: c.demand,
        demandScale: c.demandScale,
        generationScale: 0,
      });
      if (base.converged) {
        change = voltageChangePercent(res, base);
        parts = computeVoltageChangeParts(
          form,
          prepared.zRe,
          prepared.zIm,
          res.genPKw,
          res.genQKvar,
        );
        outcome.maxDgChangePercent = roundTo(arrayMaxAbs(change), 4);
        outcome.sourceQShiftKvar = roundTo(res.sourceQKvar - base.sourceQKvar, 3);
        if (settings.checks.voltageChange) {
          findings.push(...checkVoltageChange(form, c.id, change, parts, settings.limits));
        }
      }
    }
    if (settings.output.busResults) {
      outcome.buses = form.busIds.map((id, k) => ({
        id,
        vnKv: form.vnKv[k]!,
        distanceKm: roundTo(form.distanceKm[k]!, 4),
        vPu: roundTo(res.vMagPu[k]!, 6),
        angleDeg: roundTo(Math.atan2(res.vImPu[k]!, res.vRePu[k]!) * 180 / Math.PI, 4),
        dgChangePercent: change === null ? null : roundTo(change[k]!, 4),
        rpPercent: parts === null ? null : roundTo(100 * parts.rpPu[k]!, 4),
        xqPercent: parts === null ? null : roundTo(100 * parts.xqPu[k]!, 4),
      }));
    }
    if (settings.output.branchResults) {
      outcome.branches = form.branchIds.map((id, b) => ({
        id,
        kind: form.branchKind[b] === BRANCH_LINE
          ? "line"
          : form.branchKind[b] === BRANCH_SWITCH
          ? "switch"
          : "transformer",
        from: form.busIds[form.branchFrom[b]!]!,
        to: form.busIds[form.branchTo[b]!]!,
        pFromKw: roundTo(res.pFromKw[b]!, 3),
        qFromKvar: roundTo(res.qFromKvar[b]!, 3),
        pToKw: roundTo(res.pToKw[b]!, 3),
        qToKvar: roundTo(res.qToKvar[b]!, 3),
        iA: roundTo(res.iA[b]!, 3),
        loadingPercent: roundTo(loading[b]!, 3),
      }));
    }
    cases.push(outcome);
  }
  return {
    feederId: form.feederId,
    status: cases.every((c) => c.converged) ? "studied" : "failed",
    cases,
    findings: findings.sort(compareFindings),
    diagnostics,
  };
}

function sum(xs: Float64Array): number {
  let s = 0;
  for (const x of xs) s += x;
  return s;
}
