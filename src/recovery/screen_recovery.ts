/**
 * Screen of a feeder's recovery after faults. For every fault of the protection study —
 * every bus, three-phase and line-to-earth, maximum currents and minimum currents (with the
 * generation in service when there is any) — from the simulated protection: the clearing
 * device and time (relay time plus breaker opening; a fuse's clearing time), the voltage
 * retained at every bus while the fault lasts (retained_voltage.ts), what each generator does
 * (ride_through.ts: rides through, ceases momentarily, trips) and which motor loads stall.
 * Then the feeder after clearing (post_fault_form.ts): the cleared section isolated, tripped
 * units gone, stalled motors at locked-rotor impedance, tap changers frozen where the
 * pre-fault case left them — solved by the load flow, with units that the post-fault voltage
 * keeps below a trip point removed in turn (up to three rounds). Faults with the same
 * clearing device, tripped units and stalled loads share one post-fault solve.
 *
 * The pre-fault state is the recovery case: peak demand and the connected generation, each
 * scaled (recovery settings). Screening: no machine dynamics, no reclosing, positive-sequence
 * voltages.
 */
import { roundTo } from "../model/round_to.ts";
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import type { CaseSettings } from "../pipeline/study_feeder.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import { prepareFaultModel } from "../solve/fault_branch_currents.ts";
import {
  isOnPath,
  protectiveDevices,
  simulateFaultProtection,
} from "../solve/simulate_fault_protection.ts";
import { retainedScratch, retainedVoltages } from "../solve/retained_voltage.ts";
import { solveLoadFlow } from "../solve/solve_load_flow.ts";
import { prepareLoadFlow } from "../solve/prepare_load_flow.ts";
import type { LoadFlowCase, LoadFlowResult } from "../solve/load_flow_types.ts";
import { withTapPositions } from "../rank/modify_form.ts";
import type { RecoverySettings, RideThroughCategory } from "./recovery_settings.ts";
import { rideThrough, tripsLater } from "./ride_through.ts";
import { postFaultForm } from "./post_fault_form.ts";
import { checkRecovery } from "./recovery_findings.ts";
import type { Finding } from "../checks/finding.ts";

export interface FaultOutcome {
  readonly bus: string;
  readonly type: "three_phase" | "line_to_earth";
  readonly condition: "max" | "min" | "minWithGeneration";
  /** Clearing time, s, and the device that clears (null: no device clears it). */
  readonly clearingS: number;
  readonly clearedBy: string | null;
  readonly isolatedBuses: number;
  /** Units that trip during the fault, that cease momentarily, that trip after it. */
  readonly tripped: readonly string[];
  readonly trippedKw: number;
  readonly ceased: readonly string[];
  readonly ceasedKw: number;
  readonly trippedLater: readonly string[];
  readonly trippedLaterKw: number;
  readonly stalled: readonly string[];
  /** After clearing: the lowest energized bus voltage and where (null when it collapses). */
  readonly vMinPu: number | null;
  readonly vMinBus: string | null;
  readonly belowThreshold: number;
  readonly collapsed: boolean;
  readonly overloads: readonly { readonly branch: string; readonly percent: number }[];
}

export interface UnitOutcome {
  readonly id: string;
  readonly bus: string;
  readonly category: string;
  readonly retainedPu: number;
  readonly outcome: "rides_through" | "ceases" | "trips" | "trips_later" | "isolated";
}

export interface FeederRecovery {
  readonly thresholdPu: number;
  readonly faultsSimulated: number;
  readonly faultsWithConsequences: number;
  /** The worst fault (collapse, then lowest voltage, then generation lost). */
  readonly worst: FaultOutcome | null;
  /** What each generator does in the worst fault. */
  readonly units: readonly UnitOutcome[];
  /** Faults with consequences, worst first, up to recovery.maxFaultsListed. */
  readonly faults: readonly FaultOutcome[];
}

export interface RecoveryOutcome {
  readonly recovery: FeederRecovery | null;
  /** From every fault, not only the ones listed (recovery_findings.ts). */
  readonly findings: readonly Finding[];
  readonly diagnostics: readonly Diagnostic[];
}

interface PostFault {
  readonly result: LoadFlowResult | null;
  readonly trippedLater: readonly number[];
}

export function screenRecovery(
  form: FeederForm,
  settings: CaseSettings,
  faultSettings: FaultSettings,
  rec: RecoverySettings,
): RecoveryOutcome {
  const skip = (why: string): RecoveryOutcome => ({
    recovery: null,
    findings: [],
    diagnostics: [makeDiagnostic(
      "recovery.not_screened",
      "warning",
      `Feeder "${form.feederId}": ${why}; its recovery after faults is not screened`,
      { feederId: form.feederId },
    )],
  });
  if (!rec.enabled) return { recovery: null, findings: [], diagnostics: [] };
  if (form.nBranch !== form.nBus - 1) return skip("it is meshed");
  if (form.nBus > rec.maxBuses) {
    return skip(`it has ${form.nBus} buses, more than recovery.maxBuses (${rec.maxBuses})`);
  }
  const lvMaxKv = settings.limits.lvMaxKv;
  const lfCase: LoadFlowCase = {
    id: "recovery",
    demand: "peak",
    demandScale: rec.demandScale,
    generationScale: rec.generationScale,
  };
  const prepared = prepareLoadFlow(form);
  const pre = solveLoadFlow(form, lfCase, settings.solver, prepared).value;
  if (!pre.converged) return skip("the pre-fault recovery case does not solve");
  const base = withTapPositions(form, pre.tapPositions);
  const frozen = { ...settings.solver, tapControl: false };
  const n = form.nBus, G = form.generators, L = form.loads;
  const thermalLimit = settings.limits.thermal.limitPercent;
  const loading = (r: LoadFlowResult, b: number) => 100 * r.iA[b]! / form.ratingA[b]!;
  const rated = (b: number) => form.ratingA[b]! > 0 && Number.isFinite(form.ratingA[b]!);

  const categoryOf = (g: number): [string, RideThroughCategory] => {
    const name = G.rideThrough[g] ?? rec.defaultCategory;
    const c = rec.categories[name] ?? rec.categories[name.toUpperCase()];
    return c !== undefined
      ? [name, c]
      : [rec.defaultCategory, rec.categories[rec.defaultCategory]!];
  };
  const genKw = (g: number) => Math.min(G.pKw[g]! * rec.generationScale, G.sRatedKva[g]!);

  const conditions = (G.n > 0 ? ["max", "minWithGeneration"] : ["max", "min"]) as (
    | "max"
    | "min"
    | "minWithGeneration"
  )[];
  const devices = protectiveDevices(form);
  const scratch = retainedScratch(n), retained = new Float64Array(n);
  const isolated = new Uint8Array(n);
  const memo = new Map<string, PostFault>();
  const outcomes: FaultOutcome[] = [];
  let simulated = 0;
  let worst: { o: FaultOutcome; units: UnitOutcome[] } | null = null;

  const postFault = (clearedBy: string | null, out: Set<number>, stalled: Set<number>) => {
    const key = `${clearedBy}|${[...out].join(",")}|${[...stalled].join(",")}`;
    const hit = memo.get(key);
    if (hit !== undefined) return hit;
    const gone = new Set(out);
    const later: number[] = [];
    let result: LoadFlowResult | null = null;
    for (let round = 0; round < 4; round++) {
      const f = postFaultForm(base, {
        isolated,
        generatorsOut: gone,
        stalled,
        lockedRotorRatio: rec.motor.lockedRotorRatio,
        lockedRotorPowerFactor: rec.motor.lockedRotorPowerFactor,
      });
      const r = solveLoadFlow(f, lfCase, frozen, prepared, pre).value;
      result = r.converged ? r : null;
      if (result === null || round === 3) break;
      let more = false;
      for (let g = 0; g < G.n; g++) {
        if (gone.has(g)) continue;
        if (tripsLater(categoryOf(g)[1], result.vMagPu[G.bus[g]!]!)) {
          gone.add(g);
          later.push(g);
          more = true;
        }
      }
      if (!more) break;
    }
    const p = { result, trippedLater: later };
    memo.set(key, p);
    return p;
  };

  for (const condition of conditions) {
    const model = prepareFaultModel(form, faultSettings, lvMaxKv, condition);
    if (model === null) continue;
    for (let k = form.substationBusCount; k < n; k++) {
      for (const type of ["three_phase", "line_to_earth"] as const) {
        if (type === "line_to_earth" && !Number.isFinite(model.t0.zthRe[k]!)) continue;
        simulated++;
        const response = simulateFaultProtection(model, devices, k, type);
        // The first device between the fault and the source to operate clears it.
        let clearingS = Infinity, clearedBy: string | null = null, cutAt = -1;
        for (const d of response.devices) {
          if (!Number.isFinite(d.tripS) || !isOnPath(form, d.branch, k)) continue;
          const t = d.tripS + (d.kind === "fuse" ? 0 : rec.breakerOpeningS);
          if (t < clearingS) {
            clearingS = t;
            clearedBy = d.device;
            cutAt = d.branch + 1;
          }
        }
        if (clearedBy === null) {
          clearingS = rec.unclearedS;
          cutAt = form.substationBusCount; // the upstream protection takes the whole feeder
        }
        isolated.fill(0);
        let isolatedBuses = 0;
        for (let i = 1; i < n; i++) {
          if (i === cutAt || isolated[form.parent[i]!]) {
            isolated[i] = 1;
            isolatedBuses++;
          }
        }
        retainedVoltages(model, k, type, scratch, retained);
        const units: UnitOutcome[] = [];
        const tripped: number[] = [], ceased: number[] = [];
        const out = new Set<number>();
        for (let g = 0; g < G.n; g++) {
          const bus = G.bus[g]!, [name, cat] = categoryOf(g);
          const v = retained[bus]!;
          let outcome: UnitOutcome["outcome"];
          if (isolated[bus]) {
            outcome = "isolated";
            out.add(g);
          } else {
            outcome = rideThrough(cat, v, clearingS);
            if (outcome === "trips") {
              tripped.push(g);
              out.add(g);
            } else if (outcome === "ceases") ceased.push(g);
          }
          units.push({
            id: G.ids[g]!,
            bus: form.busIds[bus]!,
            category: name,
            retainedPu: roundTo(v, 4),
            outcome,
          });
        }
        const stalled = new Set<number>();
        for (let i = 0; i < L.n; i++) {
          const bus = L.bus[i]!;
          if (!(L.motorShare[i]! > 0) || isolated[bus]) continue;
          const vStall = Number.isFinite(L.stallVoltagePu[i]!)
            ? L.stallVoltagePu[i]!
            : rec.motor.stallVoltagePu;
          const tStall = Number.isFinite(L.stallTimeS[i]!)
            ? L.stallTimeS[i]!
            : rec.motor.stallTimeS;
          if (retained[bus]! < vStall && clearingS >= tStall) stalled.add(i);
        }
        const post = postFault(clearedBy, out, stalled);
        const r = post.result;
        let vMin = Infinity, vMinAt = -1, below = 0;
        const overloads: { branch: string; percent: number }[] = [];
        if (r !== null) {
          for (let i = form.substationBusCount; i < n; i++) {
            if (isolated[i]) continue;
            const v = r.vMagPu[i]!;
            if (v < vMin) {
              vMin = v;
              vMinAt = i;
            }
            if (v < rec.recoveryThresholdPu) below++;
          }
          for (let b = 0; b < form.nBranch; b++) {
            if (!rated(b) || isolated[form.branchTo[b]!]) continue;
            const pct = loading(r, b);
            if (pct > thermalLimit && loading(pre, b) <= thermalLimit) {
              overloads.push({ branch: form.branchIds[b]!, percent: roundTo(pct, 1) });
            }
          }
        }
        for (const g of post.trippedLater) {
          const u = units[g]!;
          units[g] = { ...u, outcome: "trips_later" };
        }
        const sumKw = (gs: readonly number[]) => roundTo(gs.reduce((s, g) => s + genKw(g), 0), 1);
        const o: FaultOutcome = {
          bus: form.busIds[k]!,
          type,
          condition,
          clearingS: roundTo(clearingS, 4),
          clearedBy,
          isolatedBuses,
          tripped: tripped.map((g) => G.ids[g]!),
          trippedKw: sumKw(tripped),
          ceased: ceased.map((g) => G.ids[g]!),
          ceasedKw: sumKw(ceased),
          trippedLater: post.trippedLater.map((g) => G.ids[g]!),
          trippedLaterKw: sumKw(post.trippedLater),
          stalled: [...stalled].map((i) => L.ids[i]!),
          vMinPu: r === null || vMinAt < 0 ? null : roundTo(vMin, 5),
          vMinBus: r === null || vMinAt < 0 ? null : form.busIds[vMinAt]!,
          belowThreshold: below,
          collapsed: r === null,
          overloads,
        };
        const consequential = o.collapsed || below > 0 || overloads.length > 0 ||
          tripped.length > 0 || ceased.length > 0 || stalled.size > 0 ||
          post.trippedLater.length > 0;
        if (!consequential) continue;
        outcomes.push(o);
        if (
          worst === null ||
          severity(o, rec.recoveryThresholdPu) > severity(worst.o, rec.recoveryThresholdPu)
        ) {
          worst = { o, units };
        }
      }
    }
  }
  outcomes.sort((a, b) =>
    severity(b, rec.recoveryThresholdPu) - severity(a, rec.recoveryThresholdPu)
  );
  const all: FeederRecovery = {
    thresholdPu: rec.recoveryThresholdPu,
    faultsSimulated: simulated,
    faultsWithConsequences: outcomes.length,
    worst: worst?.o ?? null,
    units: worst?.units ?? [],
    faults: outcomes,
  };
  return {
    recovery: { ...all, faults: outcomes.slice(0, rec.maxFaultsListed) },
    findings: checkRecovery(form, all),
    diagnostics: [],
  };
}

/** Collapse first, then how far below the threshold, then overloads, then generation lost. */
export function severity(o: FaultOutcome, thresholdPu: number): number {
  if (o.collapsed) return 1e12;
  const dip = o.vMinPu === null ? 0 : Math.max(thresholdPu - o.vMinPu, 0);
  return dip * 1e9 + o.overloads.length * 1e7 + o.trippedKw + o.trippedLaterKw +
    0.001 * o.stalled.length;
}
