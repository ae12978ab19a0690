/**
 * A directional protection scheme for a radial feeder whose grading breaks with generation:
 * the relays that must see direction get forward (away from the source) elements, so the
 * generation's back-feed no longer trips them; their time multipliers, and those of every
 * other inverse-time relay, are graded again by linear programming (grade_time_multipliers.ts)
 * over faults at every bus, three-phase, for maximum currents with and without generation and
 * minimum currents: every primary–backup pair of relays keeps the coordination interval.
 * Pickups are kept where they lie between a margin above the largest load current and the
 * smallest fault current over the sensitivity factor, and moved into that window otherwise.
 * The proposal is then simulated again, so the caller can show it before and after.
 *
 * A screening proposal: settings must be verified by a licensed protection engineer.
 */
import type { FeederForm, FormDevice } from "../model/feeder_form.ts";
import type { RelayStage } from "../model/network.ts";
import type { FaultSettings } from "./fault_settings.ts";
import type { ProtectionSettings } from "./protection_settings.ts";
import { prepareFaultModel } from "./fault_branch_currents.ts";
import { protectiveDevices, simulateFaultProtection } from "./simulate_fault_protection.ts";
import { INVERSE_CURVES } from "./overcurrent_time.ts";
import { curveFactorS, gradeTimeMultipliers, type GradingPair } from "./grade_time_multipliers.ts";

export interface ProposedSetting {
  readonly device: string;
  readonly relay: string;
  readonly stage: number;
  readonly characteristic: RelayStage["characteristic"];
  readonly direction: RelayStage["direction"];
  readonly pickupA: number;
  readonly timeMultiplier: number;
  /** What was there before. */
  readonly before: {
    readonly direction: RelayStage["direction"];
    readonly pickupA: number;
    readonly timeMultiplier: number;
  };
}

export type SchemeResult =
  | {
    readonly status: "proposed";
    readonly settings: readonly ProposedSetting[];
    readonly form: FeederForm;
  }
  | { readonly status: "infeasible"; readonly reason: string };

/** The graded stage of a device: its first inverse-time phase stage. */
function gradedStage(d: FormDevice): { relay: string; stage: RelayStage } | null {
  for (const r of d.relays) {
    for (const s of r.stages) {
      if (s.element === "phase" && s.characteristic in INVERSE_CURVES) {
        return { relay: r.id, stage: s };
      }
    }
  }
  return null;
}

export function designDirectionalScheme(
  form: FeederForm,
  directional: ReadonlySet<string>,
  loadCurrentA: ReadonlyMap<string, number>,
  faults: FaultSettings,
  lvMaxKv: number,
  o: ProtectionSettings,
): SchemeResult {
  const devices = protectiveDevices(form);
  const graded = devices.flatMap((d) => {
    const g = gradedStage(d);
    return g === null ? [] : [{ device: d, ...g }];
  });
  if (graded.length === 0) {
    return {
      status: "infeasible",
      reason:
        "no relay with an inverse-time stage to regrade (fuses and definite-time stages only)",
    };
  }
  const models = (["max", "maxWithoutGeneration", "min"] as const)
    .map((c) => prepareFaultModel(form, faults, lvMaxKv, c))
    .filter((m) => m !== null);
  // Pickup window: above the load, below the smallest fault current each relay must see.
  const pickup = new Map<string, number>();
  const minFault = new Map<string, number>();
  for (const m of models) {
    if (m.nets.condition !== "min") continue;
    for (let k = form.substationBusCount; k < form.nBus; k++) {
      const r = simulateFaultProtection(m, devices, k, "three_phase");
      if (r.primary !== null) {
        minFault.set(
          r.primary.device,
          Math.min(minFault.get(r.primary.device) ?? Infinity, r.primary.iA),
        );
      }
    }
  }
  for (const g of graded) {
    const low = o.loadMargin * (loadCurrentA.get(g.device.id) ?? 0);
    const high = (minFault.get(g.device.id) ?? Infinity) / o.sensitivityFactor;
    if (low > high) {
      return {
        status: "infeasible",
        reason: `"${g.device.id}" cannot tell load from fault: ${
          low.toFixed(0)
        } A of load margin is above ${
          high.toFixed(0)
        } A, the smallest fault current over the sensitivity factor`,
      };
    }
    pickup.set(g.device.id, Math.min(Math.max(g.stage.pickupA, low), high));
  }
  // The proposed form: directions and pickups first, multipliers after the programme.
  const withStages = (
    f: FeederForm,
    tms: (id: string, s: RelayStage) => number,
  ): FeederForm => ({
    ...f,
    devices: f.devices.map((d) => {
      const g = graded.find((x) => x.device.id === d.id);
      if (g === undefined) return d;
      return {
        ...d,
        relays: d.relays.map((r) => ({
          ...r,
          stages: r.stages.map((s) => ({
            ...s,
            direction: directional.has(d.id) ? "forward" as const : s.direction,
            ...(s === g.stage ? { pickupA: pickup.get(d.id)!, timeMultiplier: tms(d.id, s) } : {}),
          })),
        })),
      };
    }),
  });
  const trial = withStages(form, (_, s) => s.timeMultiplier ?? 1);
  const trialDevices = protectiveDevices(trial);
  const pairs: GradingPair[] = [];
  const factorOf = (id: string, iA: number) => {
    const g = graded.find((x) => x.device.id === id)!;
    const c = INVERSE_CURVES[g.stage.characteristic as keyof typeof INVERSE_CURVES];
    return curveFactorS(c, iA, pickup.get(id)!);
  };
  for (const cond of ["max", "maxWithoutGeneration", "min"] as const) {
    const m = prepareFaultModel(trial, faults, lvMaxKv, cond);
    if (m === null) continue;
    for (let k = trial.substationBusCount; k < trial.nBus; k++) {
      const r = simulateFaultProtection(m, trialDevices, k, "three_phase");
      // Relays between the fault and the source, nearest first.
      const chain: typeof r.devices[number][] = [];
      for (let u = k; u > 0; u = trial.parent[u]!) {
        for (const d of r.devices) if (d.branch === u - 1 && pickup.has(d.device)) chain.push(d);
      }
      for (let i = 0; i + 1 < chain.length; i++) {
        const p = chain[i]!, b = chain[i + 1]!;
        pairs.push({
          primary: p.device,
          backup: b.device,
          primaryFactorS: factorOf(p.device, p.iA),
          backupFactorS: factorOf(b.device, b.iA),
        });
      }
    }
  }
  const result = gradeTimeMultipliers({
    relays: graded.map((g) => ({ id: g.device.id, minTms: o.minTms, maxTms: o.maxTms })),
    pairs,
    intervalS: o.coordinationIntervalS,
  });
  if (result.status === "infeasible") return result;
  const round = (x: number) => Math.ceil(x * 1000) / 1000; // settable steps of 0.001, never faster
  const proposed = withStages(form, (id) => round(result.tms[id]!));
  return {
    status: "proposed",
    form: proposed,
    settings: graded.map((g) => ({
      device: g.device.id,
      relay: g.relay,
      stage: g.stage.stage,
      characteristic: g.stage.characteristic,
      direction: directional.has(g.device.id) ? "forward" : g.stage.direction,
      pickupA: pickup.get(g.device.id)!,
      timeMultiplier: round(result.tms[g.device.id]!),
      before: {
        direction: g.stage.direction,
        pickupA: g.stage.pickupA,
        timeMultiplier: g.stage.timeMultiplier ?? 1,
      },
    })),
  };
}
