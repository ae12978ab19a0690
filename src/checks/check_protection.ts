/**
 * Protection checks of a radial feeder, from its response to faults at every bus (three-
 * phase and line-to-earth; maximum currents with and without generation, minimum currents)
 * and at the busbar it hangs from. One finding per code and device, with the worst case as
 * evidence (fault bus, type, condition, currents, times):
 *
 * (Conditions: maximum currents with and without generation, minimum currents with and
 * without it.)
 *
 * - protection.wrong_device: a device not between the fault and the source operates first
 *   (it cuts off a healthy part, typically fed back by generation);
 * - protection.miscoordination: the backup operates before the primary, or less than the
 *   coordination interval after it;
 * - protection.insensitive: the primary does not see the minimum fault current in its zone
 *   with the sensitivity factor on its pickup;
 * - protection.blinding: generation between the primary and the source makes the primary
 *   slower by more than the coordination interval, or blind;
 * - protection.reverse_pickup: reverse current above pickup through a non-directional relay;
 * - protection.sympathetic_trip: the feeder-head device operates on the feeder's back-feed
 *   for a busbar fault before the busbar (or a neighbouring feeder) is cleared;
 * - protection.fuse_saving_lost: a recloser's fast trip is no longer faster than the melting
 *   of a fuse beyond it, for faults in the fuse's zone;
 * - protection.needs_directional (feeder): the grading only works one way — devices that
 *   must become directional.
 */
import type { FeederForm, FormDevice } from "../model/feeder_form.ts";
import type { Finding } from "./finding.ts";
import type { FaultSettings } from "../solve/fault_settings.ts";
import type { ProtectionSettings } from "../solve/protection_settings.ts";
import { type FaultModel, prepareFaultModel } from "../solve/fault_branch_currents.ts";
import {
  type DeviceResponse,
  type FaultResponse,
  type FaultType,
  isOnPath,
  protectiveDevices,
  simulateFaultProtection,
} from "../solve/simulate_fault_protection.ts";

export type Condition = "max" | "maxWithoutGeneration" | "min" | "minWithGeneration";
const CONDITIONS: readonly Condition[] = [
  "max",
  "maxWithoutGeneration",
  "min",
  "minWithGeneration",
];

interface Candidate {
  readonly code: string;
  readonly device: string;
  /** Larger is worse. */
  readonly badness: number;
  readonly value: number;
  readonly limit: number;
  readonly unit: string;
  readonly message: string;
}

/**
 * A narrower check for trials that only add generation: findings come from the conditions
 * named (those the generation changes); the responses without generation that blinding
 * compares with are the same in every trial, simulated once and kept in `reference`.
 */
export interface ProtectionScope {
  readonly conditions: ReadonlySet<Condition>;
  readonly reference: Map<string, FaultResponse>;
}

export function checkProtection(
  form: FeederForm,
  faults: FaultSettings,
  s: ProtectionSettings,
  lvMaxKv: number,
  /** Told every fault simulated at a bus of the feeder (for the coordination table). */
  onFault?: (condition: Condition, r: FaultResponse) => void,
  scope?: ProtectionScope,
): Finding[] {
  const devices = protectiveDevices(form);
  if (devices.length === 0 || form.nBranch !== form.nBus - 1) return [];
  const models: Partial<Record<Condition, FaultModel>> = {};
  for (const c of CONDITIONS) {
    if (c === "minWithGeneration" && form.generators.n === 0) continue;
    const m = prepareFaultModel(form, faults, lvMaxKv, c);
    if (m !== null) models[c] = m;
  }
  const worst = new Map<string, Candidate>();
  const note = (c: Candidate) => {
    const key = `${c.code}|${c.device}`;
    const had = worst.get(key);
    if (had === undefined || c.badness > had.badness) worst.set(key, c);
  };
  const withGeneration = form.generators.n > 0;
  const types: FaultType[] = ["three_phase", "line_to_earth"];
  const where = (r: FaultResponse, cond: Condition) =>
    `${r.type.replaceAll("_", " ")} fault at bus "${form.busIds[r.bus]}" (${cond}, ${
      (r.faultKa * 1000).toFixed(0)
    } A)`;
  const secs = (t: number) => (Number.isFinite(t) ? `${t.toFixed(2)} s` : "no operation");
  for (let k = form.substationBusCount; k < form.nBus; k++) {
    for (const type of types) {
      const res: Partial<Record<Condition, FaultResponse>> = {};
      for (const cond of CONDITIONS) {
        const m = models[cond];
        if (m === undefined) continue;
        if (type === "line_to_earth" && !Number.isFinite(m.t0.zthRe[k]!)) continue;
        if (scope !== undefined && !scope.conditions.has(cond)) {
          if (cond !== "maxWithoutGeneration") continue;
          const key = `${k}|${type}`;
          let r = scope.reference.get(key);
          if (r === undefined) {
            r = simulateFaultProtection(m, devices, k, type);
            scope.reference.set(key, r);
          }
          res[cond] = r;
          continue;
        }
        res[cond] = simulateFaultProtection(m, devices, k, type);
        onFault?.(cond, res[cond]!);
      }
      for (const [cond, r] of Object.entries(res) as [Condition, FaultResponse][]) {
        if (scope !== undefined && !scope.conditions.has(cond)) continue;
        const p = r.primary, b = r.backup, first = r.first;
        if (p === null) continue;
        const onPath = (d: DeviceResponse) => isOnPath(form, d.branch, k);
        if (first !== null && !onPath(first) && first.tripS < p.tripS) {
          note({
            code: "protection.wrong_device",
            device: first.device,
            badness: p.tripS - first.tripS,
            value: first.tripS,
            limit: p.tripS,
            unit: "s",
            message: `Device "${first.device}" operates first (${secs(first.tripS)}, ${
              first.direction < 0 ? "reverse" : "forward"
            } current ${first.iA.toFixed(0)} A) for a ${
              where(r, cond)
            }; the expected device "${p.device}" operates at ${secs(p.tripS)}`,
          });
        }
        if (b !== null && Number.isFinite(b.tripS)) {
          const margin = b.tripS - p.tripS;
          if (margin < s.coordinationIntervalS) {
            note({
              code: "protection.miscoordination",
              device: b.device,
              badness: s.coordinationIntervalS - margin,
              value: margin,
              limit: s.coordinationIntervalS,
              unit: "s",
              message: `Backup "${b.device}" (${
                secs(b.tripS)
              }) is not graded ${s.coordinationIntervalS} s behind primary "${p.device}" (${
                secs(p.tripS)
              }) for a ${where(r, cond)}`,
            });
          }
        }
        if (cond === "min" || cond === "minWithGeneration") {
          const pickup = lowestPickupA(devices.find((d) => d.id === p.device)!, type);
          const seen = type === "line_to_earth" && pickup.earth ? p.residualA : p.iA;
          const needed = s.sensitivityFactor * (pickup.earth ?? pickup.phase ?? 0);
          if (!Number.isFinite(p.tripS) || (needed > 0 && seen < needed)) {
            note({
              code: "protection.insensitive",
              device: p.device,
              badness: needed > 0 ? needed / Math.max(seen, 1e-9) : Infinity,
              value: seen,
              limit: needed,
              unit: "A",
              message: `Primary "${p.device}" sees ${seen.toFixed(0)} A for a ${
                where(r, cond)
              }, less than ${s.sensitivityFactor} × its pickup (${needed.toFixed(0)} A)${
                Number.isFinite(p.tripS) ? "" : "; it does not operate"
              }`,
            });
          }
        }
        for (const d of r.devices) {
          const dev = devices.find((x) => x.id === d.device)!;
          const pickup = lowestPickupA(dev, "three_phase").phase;
          if (d.direction < 0 && isNonDirectional(dev) && pickup !== null && d.iA > pickup) {
            note({
              code: "protection.reverse_pickup",
              device: d.device,
              badness: d.iA / pickup,
              value: d.iA,
              limit: pickup,
              unit: "A",
              message: `Non-directional "${d.device}" carries ${
                d.iA.toFixed(0)
              } A in reverse, above its ${pickup.toFixed(0)} A pickup, for a ${where(r, cond)}`,
            });
          }
        }
      }
      // Blinding: generation makes the primary slower by more than the interval, or blind.
      const a = res.max?.primary, z = res.maxWithoutGeneration?.primary;
      if (withGeneration && a && z && a.device === z.device && Number.isFinite(z.tripS)) {
        const slower = a.tripS - z.tripS;
        if (slower > s.coordinationIntervalS) {
          note({
            code: "protection.blinding",
            device: a.device,
            badness: slower,
            value: a.tripS,
            limit: z.tripS + s.coordinationIntervalS,
            unit: "s",
            message: `Generation blinds "${a.device}": ${a.iA.toFixed(0)} A instead of ${
              z.iA.toFixed(0)
            } A for a ${where(res.max!, "max")}, operating at ${secs(a.tripS)} instead of ${
              secs(z.tripS)
            }`,
          });
        }
      }
      fuseSaving(form, devices, res.max, "max", k, note, where, secs);
      if (scope === undefined || scope.conditions.has("min")) {
        fuseSaving(form, devices, res.min, "min", k, note, where, secs);
      }
    }
  }
  // Sympathetic tripping: a fault on the busbar the head device hangs from.
  const max = models.max;
  if (max !== undefined && withGeneration) {
    for (const head of devices.filter((d) => d.isHead)) {
      const busbar = form.branchFrom[head.branch]!;
      for (const type of types) {
        if (type === "line_to_earth" && !Number.isFinite(max.t0.zthRe[busbar]!)) continue;
        const r = simulateFaultProtection(max, devices, busbar, type);
        const h = r.devices.find((d) => d.device === head.id)!;
        if (h.direction < 0 && h.tripS < s.neighbourClearingS) {
          note({
            code: "protection.sympathetic_trip",
            device: head.id,
            badness: s.neighbourClearingS - h.tripS,
            value: h.tripS,
            limit: s.neighbourClearingS,
            unit: "s",
            message: `Feeder-head "${head.id}" trips on ${h.iA.toFixed(0)} A of back-feed in ${
              secs(h.tripS)
            } for a ${
              where(r, "max")
            } on the busbar, before the busbar or a neighbouring feeder is cleared (${s.neighbourClearingS} s)`,
          });
        }
      }
    }
  }
  const out: Finding[] = [...worst.values()].map((c) => ({
    feederId: form.feederId,
    code: c.code,
    severity: "violation",
    where: { kind: "branch", id: c.device },
    value: c.value,
    limit: c.limit,
    unit: c.unit,
    caseId: "protection",
    message: c.message,
  }));
  const oneWay = [...worst.values()].filter((c) =>
    ["protection.wrong_device", "protection.reverse_pickup", "protection.sympathetic_trip"]
      .includes(c.code)
  );
  if (withGeneration && oneWay.length > 0) {
    const ids = [...new Set(oneWay.map((c) => c.device))].sort();
    out.push({
      feederId: form.feederId,
      code: "protection.needs_directional",
      severity: "violation",
      where: { kind: "feeder", id: form.feederId },
      value: ids.length,
      limit: 0,
      unit: "devices",
      caseId: "protection",
      message: `Generation feeds faults from the feeder end: ${
        ids.map((i) => `"${i}"`).join(", ")
      } must become directional (bidirectional protection), with settings graded for each direction`,
    });
  }
  return out;
}

function lowestPickupA(
  d: FormDevice,
  type: FaultType,
): { phase: number | null; earth: number | null } {
  let phase: number | null = null, earth: number | null = null;
  for (const r of d.relays) {
    for (const st of r.stages) {
      if (st.element === "phase") phase = phase === null ? st.pickupA : Math.min(phase, st.pickupA);
      else if (type === "line_to_earth") {
        earth = earth === null ? st.pickupA : Math.min(earth, st.pickupA);
      }
    }
  }
  if (d.fuseCurve !== undefined && d.fuseCurve.melt.length > 0 && phase === null) {
    phase = d.fuseCurve.melt[0]!.x; // the fuse's minimum melting current
  }
  return { phase, earth };
}

function isNonDirectional(d: FormDevice): boolean {
  return d.relays.length > 0 &&
    d.relays.every((r) => r.stages.every((s) => s.direction === "non_directional"));
}

/** A recloser's fast trip must beat the melting of a fuse it protects, for faults in the fuse's zone. */
function fuseSaving(
  form: FeederForm,
  devices: readonly FormDevice[],
  r: FaultResponse | undefined,
  cond: Condition,
  k: number,
  note: (c: Candidate) => void,
  where: (r: FaultResponse, cond: Condition) => string,
  secs: (t: number) => string,
): void {
  if (r === undefined || r.primary === null || r.primary.kind !== "fuse") return;
  const fuse = r.primary;
  for (const d of r.devices) {
    if (d.kind !== "recloser" || !isOnPath(form, d.branch, k)) continue;
    const rec = devices.find((x) => x.id === d.device)!;
    if (rec.fastShots <= 0) continue;
    if (!(d.tripS < fuse.meltS)) {
      note({
        code: "protection.fuse_saving_lost",
        device: fuse.device,
        badness: d.tripS - fuse.meltS,
        value: d.tripS,
        limit: fuse.meltS,
        unit: "s",
        message: `Recloser "${d.device}" fast trip (${
          secs(d.tripS)
        }) is not faster than fuse "${fuse.device}" melting (${secs(fuse.meltS)}) for a ${
          where(r, cond)
        }`,
      });
    }
  }
}
