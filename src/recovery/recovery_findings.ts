/**
 * Findings of the recovery screen, one per code and feeder with the worst fault as evidence:
 * - recovery.collapse (violation): after some fault is cleared the feeder's load flow finds no
 *   solution (voltage collapse with stalled motors and lost generation);
 * - recovery.low_voltage (violation): a bus stays below the recovery threshold after clearing;
 * - recovery.overload (violation): a branch overloads once the generation is lost;
 * - recovery.generation_lost (warning): generation that trips during or after a fault outside
 *   the section the fault takes out;
 * - recovery.motor_stall (warning): motor loads that stall.
 * Each message names the options a planner can choose from: a ride-through category required
 * of the units that trip, dynamic reactive support where the voltage stays low, faster
 * clearing by the device that clears.
 */
import type { Finding } from "../checks/finding.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { type FaultOutcome, type FeederRecovery, severity } from "./screen_recovery.ts";

const CASE = "recovery";

export function checkRecovery(form: FeederForm, r: FeederRecovery): Finding[] {
  const out: Finding[] = [];
  const feeder = { kind: "feeder" as const, id: form.feederId };
  const base = { feederId: form.feederId, caseId: CASE };
  const worstBy = (keep: (o: FaultOutcome) => boolean, score: (o: FaultOutcome) => number) => {
    let w: FaultOutcome | null = null;
    for (const o of r.faults) if (keep(o) && (w === null || score(o) > score(w))) w = o;
    return w;
  };
  const rank = (o: FaultOutcome) => severity(o, r.thresholdPu);
  const collapse = worstBy((o) => o.collapsed, rank);
  if (collapse !== null) {
    out.push({
      ...base,
      code: "recovery.collapse",
      severity: "violation",
      where: feeder,
      value: 0,
      limit: r.thresholdPu,
      unit: "pu",
      message:
        `The feeder does not recover after a ${faultText(collapse)}: no load-flow solution ` +
        `with ${lossText(collapse)}. ${options(collapse)}`,
    });
  }
  const low = worstBy((o) => !o.collapsed && o.belowThreshold > 0, (o) => -(o.vMinPu ?? 0));
  if (low !== null) {
    out.push({
      ...base,
      code: "recovery.low_voltage",
      severity: "violation",
      where: { kind: "bus", id: low.vMinBus! },
      value: low.vMinPu!,
      limit: r.thresholdPu,
      unit: "pu",
      message: `${low.belowThreshold} bus(es) stay below ${r.thresholdPu} pu after a ${
        faultText(low)
      }, lowest ${low.vMinPu!.toFixed(3)} pu, with ${lossText(low)}. ${options(low)}`,
    });
  }
  const over = worstBy(
    (o) => o.overloads.length > 0,
    (o) => Math.max(...o.overloads.map((x) => x.percent)),
  );
  if (over !== null) {
    const b = over.overloads.reduce((a, x) => (x.percent > a.percent ? x : a));
    out.push({
      ...base,
      code: "recovery.overload",
      severity: "violation",
      where: { kind: "branch", id: b.branch },
      value: b.percent,
      limit: 100,
      unit: "%",
      message: `"${b.branch}" carries ${b.percent.toFixed(0)} % of its rating once ${
        lossText(over)
      } after a ${faultText(over)}. ${options(over)}`,
    });
  }
  const lost = worstBy(
    (o) => o.trippedKw + o.trippedLaterKw > 0,
    (o) => o.trippedKw + o.trippedLaterKw,
  );
  if (lost !== null) {
    const mw = (lost.trippedKw + lost.trippedLaterKw) / 1000;
    out.push({
      ...base,
      code: "recovery.generation_lost",
      severity: "warning",
      where: feeder,
      value: mw,
      limit: 0,
      unit: "MW",
      message:
        `${mw.toFixed(2)} MW of generation outside the faulted section trips for a ${
          faultText(lost)
        }: ${[...lost.tripped, ...lost.trippedLater].join(", ")}. Option: require a ride-through ` +
        `category these units meet (e.g. IEEE 1547 Category III), or faster clearing${
          lost.clearedBy === null ? "" : ` by "${lost.clearedBy}"`
        }`,
    });
  }
  const stall = worstBy((o) => o.stalled.length > 0, (o) => o.stalled.length);
  if (stall !== null) {
    out.push({
      ...base,
      code: "recovery.motor_stall",
      severity: "warning",
      where: feeder,
      value: stall.stalled.length,
      limit: 0,
      unit: "loads",
      message: `Motors of ${stall.stalled.join(", ")} stall during a ${faultText(stall)}; ` +
        `stalled motors draw locked-rotor current after clearing`,
    });
  }
  return out;
}

function faultText(o: FaultOutcome): string {
  return `${o.type.replaceAll("_", " ")} fault at "${o.bus}" (${
    o.condition === "max" ? "maximum currents" : "minimum currents"
  }) cleared ${o.clearedBy === null ? "by no device of the feeder" : `by "${o.clearedBy}"`} in ${
    o.clearingS.toFixed(2)
  } s`;
}

function lossText(o: FaultOutcome): string {
  const parts: string[] = [];
  const lostKw = o.trippedKw + o.trippedLaterKw;
  if (lostKw > 0) parts.push(`${(lostKw / 1000).toFixed(2)} MW of generation tripped`);
  if (o.stalled.length > 0) parts.push(`${o.stalled.length} motor load(s) stalled`);
  return parts.length === 0 ? "nothing lost outside the faulted section" : parts.join(" and ");
}

function options(o: FaultOutcome): string {
  const opts: string[] = [];
  if (o.tripped.length + o.trippedLater.length > 0) {
    opts.push(`require a ride-through category of ${[...o.tripped, ...o.trippedLater].join(", ")}`);
  }
  if (o.vMinBus !== null || o.collapsed) {
    opts.push(`dynamic reactive support${o.vMinBus === null ? "" : ` near "${o.vMinBus}"`}`);
  }
  if (o.clearedBy !== null) opts.push(`faster clearing by "${o.clearedBy}"`);
  return `Options: ${opts.join("; ")}.`;
}
