/**
 * The coordination table of a feeder: for every fault the protection study simulates (bus,
 * type, condition), the fault current, the expected primary device and its backup with
 * their operating times, the device that operates first and how many buses it disconnects.
 */
import type { FeederForm } from "../model/feeder_form.ts";
import type { Condition } from "../checks/check_protection.ts";
import type { FaultResponse } from "../solve/simulate_fault_protection.ts";
import { roundTo } from "../model/round_to.ts";

export interface CoordinationRow {
  readonly bus: string;
  readonly type: string;
  readonly condition: Condition;
  readonly faultKa: number;
  readonly primary: string | null;
  readonly primaryS: number | null;
  readonly backup: string | null;
  readonly backupS: number | null;
  readonly first: string | null;
  readonly firstS: number | null;
  /** Buses beyond the first device's branch: what loses supply when it opens. */
  readonly busesLost: number;
}

/** A collector for checkProtection's onFault that fills `rows`. */
export function coordinationCollector(
  form: FeederForm,
  rows: CoordinationRow[],
): (condition: Condition, r: FaultResponse) => void {
  const beyond = new Int32Array(form.nBus).fill(1);
  for (let k = form.nBus - 1; k > 0; k--) {
    beyond[form.parent[k]!] = beyond[form.parent[k]!]! + beyond[k]!;
  }
  const time = (t: number | undefined) =>
    t === undefined || !Number.isFinite(t) ? null : roundTo(t, 4);
  return (condition, r) => {
    rows.push({
      bus: form.busIds[r.bus]!,
      type: r.type,
      condition,
      faultKa: roundTo(r.faultKa, 6),
      primary: r.primary?.device ?? null,
      primaryS: time(r.primary?.tripS),
      backup: r.backup?.device ?? null,
      backupS: time(r.backup?.tripS),
      first: r.first?.device ?? null,
      firstS: time(r.first?.tripS),
      busesLost: r.first === null ? 0 : beyond[r.first.branch + 1]!,
    });
  };
}
