/**
 * How the protection of a radial feeder responds to one fault: the current and its
 * direction through every protective device (relays and fuses), each device's operating
 * time, the device expected to clear the fault (the nearest protective device between the
 * fault and the source) and its backup (the next one towards the source), and the device
 * that actually operates first. The building block of the protection study.
 *
 * A device's forward direction is away from the source (towards its branch's far bus).
 * Relay stages: phase elements measure the phase current, earth elements the residual
 * current 3·I0; a directional stage operates only for current in its direction; the first
 * trip of a recloser uses its fast curve set, later ones the delayed set. Fuses operate at
 * their total clearing time; their melting time is kept for fuse-saving checks. Operating
 * times from overcurrent_time.ts (IEC 60255-151, IEEE C37.112; fuses log–log).
 */
import type { FeederForm, FormDevice } from "../model/feeder_form.ts";
import type { RelayStage } from "../model/network.ts";
import { fuseTimeS, stageOperatingTimeS } from "./overcurrent_time.ts";
import {
  branchCurrentsForFault,
  type BranchFaultCurrents,
  type FaultModel,
} from "./fault_branch_currents.ts";

export type FaultType = "three_phase" | "line_to_earth";
export type Shot = "fast" | "delayed";

export interface DeviceResponse {
  readonly device: string;
  readonly kind: FormDevice["kind"];
  readonly branch: number;
  /** Phase and residual current through the device, A. */
  readonly iA: number;
  readonly residualA: number;
  /** +1 forward (away from the source), −1 reverse, 0 no current. */
  readonly direction: number;
  /** Operating time, s (Infinity: does not operate). */
  readonly tripS: number;
  /** Fuses: melting time, s (Infinity otherwise). */
  readonly meltS: number;
}

export interface FaultResponse {
  readonly bus: number;
  readonly type: FaultType;
  readonly faultKa: number;
  readonly devices: readonly DeviceResponse[];
  /** The nearest protective device between the fault and the source, and the next one. */
  readonly primary: DeviceResponse | null;
  readonly backup: DeviceResponse | null;
  /** The device that operates first (null when none operates). */
  readonly first: DeviceResponse | null;
}

/** True when tree branch `branch` lies between bus k and the source (a device there sees the fault). */
export function isOnPath(form: FeederForm, branch: number, k: number): boolean {
  for (let u = k; u > 0; u = form.parent[u]!) if (u - 1 === branch) return true;
  return false;
}

/** Devices with protection: relay stages or a fuse curve, on a tree branch. */
export function protectiveDevices(form: FeederForm): FormDevice[] {
  return form.devices.filter((d) =>
    d.branch < form.nBus - 1 &&
    (d.relays.some((r) => r.stages.length > 0) || d.fuseCurve !== undefined)
  );
}

export function simulateFaultProtection(
  model: FaultModel,
  devices: readonly FormDevice[],
  bus: number,
  type: FaultType,
  shot: Shot = "fast",
): FaultResponse {
  const form = model.form;
  const currents = branchCurrentsForFault(model, bus, type);
  const responses = devices.map((d) => respond(d, currents, type, shot));
  // Devices between the fault and the source, nearest first.
  const byBranch = new Map<number, DeviceResponse[]>();
  for (const r of responses) byBranch.set(r.branch, [...(byBranch.get(r.branch) ?? []), r]);
  const onPath: DeviceResponse[] = [];
  for (let k = bus; k > 0; k = form.parent[k]!) onPath.push(...(byBranch.get(k - 1) ?? []));
  let first: DeviceResponse | null = null;
  for (const r of responses) {
    if (Number.isFinite(r.tripS) && (first === null || r.tripS < first.tripS)) first = r;
  }
  return {
    bus,
    type,
    faultKa: currents.faultKa,
    devices: responses,
    primary: onPath[0] ?? null,
    backup: onPath[1] ?? null,
    first,
  };
}

function respond(
  d: FormDevice,
  c: BranchFaultCurrents,
  type: FaultType,
  shot: Shot,
): DeviceResponse {
  const b = d.branch;
  const iA = 1000 * c.iKa[b]!, residualA = type === "line_to_earth" ? 1000 * c.residualKa[b]! : 0;
  const direction = c.direction[b]!;
  let tripS = Infinity, meltS = Infinity;
  if (d.fuseCurve !== undefined) {
    tripS = fuseTimeS(d.fuseCurve.clear.length > 0 ? d.fuseCurve.clear : d.fuseCurve.melt, iA);
    meltS = fuseTimeS(d.fuseCurve.melt, iA);
  }
  for (const relay of d.relays) {
    for (const stage of relay.stages) {
      if (!inShot(stage, d, shot) || !inDirection(stage, direction)) continue;
      const measured = stage.element === "earth" ? residualA : iA;
      tripS = Math.min(tripS, stageOperatingTimeS(stage, measured));
    }
  }
  return { device: d.id, kind: d.kind, branch: b, iA, residualA, direction, tripS, meltS };
}

function inShot(stage: RelayStage, d: FormDevice, shot: Shot): boolean {
  if (d.kind !== "recloser" || stage.curveSet === "both") return true;
  return stage.curveSet === shot;
}

function inDirection(stage: RelayStage, direction: number): boolean {
  if (stage.direction === "non_directional") return true;
  return stage.direction === "forward" ? direction > 0 : direction < 0;
}
