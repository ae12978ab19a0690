/**
 * From findings to needs: each violation finding belongs to a need kind (overvoltage,
 * undervoltage, generation-caused voltage change, line, transformer or switching-device
 * overload) and each kind to a severity class. One need per kind per feeder gathers all
 * its findings as evidence, names the worst one and counts the customers it touches.
 * Warnings and information do not make needs. Later studies add their codes to NEED_RULES.
 */
import { roundTo } from "../model/round_to.ts";
import { BRANCH_LINE, BRANCH_TRANSFORMER, type FeederForm } from "../model/feeder_form.ts";
import type { Finding } from "../checks/finding.ts";
import type { Need, NeedClass, NeedEvidence, NeedKind } from "./need.ts";

/** Which need kind and class a violation code makes; a branch finding's kind may depend on the branch. */
export const NEED_RULES: Readonly<
  Record<string, { readonly needClass: NeedClass; readonly kind: NeedKind | "by_branch" }>
> = {
  "voltage.above_band": { needClass: "statutory", kind: "overvoltage" },
  "voltage.below_band": { needClass: "statutory", kind: "undervoltage" },
  "voltage.dg_change": { needClass: "planning", kind: "voltage_change" },
  "thermal.overload": { needClass: "statutory", kind: "by_branch" },
  "fault.breaking_duty": { needClass: "safety", kind: "device_duty" },
  "fault.making_duty": { needClass: "safety", kind: "device_duty" },
  // Too little room for the generation the feeder is expected to take.
  "hosting.shortfall": { needClass: "hosting", kind: "hosting_shortfall" },
  // The feeder does not come back after a fault is cleared.
  ...Object.fromEntries(
    ["collapse", "low_voltage", "overload"].map((c) => [`recovery.${c}`, {
      needClass: "planning" as const,
      kind: "post_fault_recovery" as const,
    }]),
  ),
  // Generation feeding faults from the feeder end: the grading works one way only.
  ...Object.fromEntries(
    ["wrong_device", "reverse_pickup", "sympathetic_trip", "blinding", "needs_directional"].map(
      (
        c,
      ) => [`protection.${c}`, {
        needClass: "safety" as const,
        kind: "protection_direction" as const,
      }],
    ),
  ),
  // Grading and sensitivity of the settings themselves.
  ...Object.fromEntries(
    ["miscoordination", "insensitive", "fuse_saving_lost"].map(
      (
        c,
      ) => [`protection.${c}`, {
        needClass: "safety" as const,
        kind: "protection_grading" as const,
      }],
    ),
  ),
};

const NEED_KIND_ORDER: readonly NeedKind[] = [
  "device_duty",
  "protection_direction",
  "protection_grading",
  "overvoltage",
  "undervoltage",
  "voltage_change",
  "line_overload",
  "transformer_overload",
  "device_overload",
  "post_fault_recovery",
  "hosting_shortfall",
];

/** A need before its remedy is designed. */
export type NeedDraft = Omit<Need, "remedy" | "tried">;

/** The need kind a violation finding belongs to, or null when it makes no need. */
export function needKindOf(
  form: FeederForm,
  f: Pick<Finding, "code" | "severity" | "where">,
): NeedKind | null {
  const rule = NEED_RULES[f.code];
  if (rule === undefined || f.severity !== "violation") return null;
  if (rule.kind !== "by_branch") return rule.kind;
  const b = form.branchIds.indexOf(f.where.id);
  const kind = b < 0 ? -1 : form.branchKind[b];
  return kind === BRANCH_LINE
    ? "line_overload"
    : kind === BRANCH_TRANSFORMER
    ? "transformer_overload"
    : "device_overload";
}

/**
 * Excess of a finding over what its limit allows, in % of the allowed margin: for the
 * voltage band the margin is the band edge's distance from 1 pu (1.12 pu against a
 * 1.10 pu edge is 20 %); for every other limit the limit itself (120 % loading against
 * 100 % is 20 %).
 */
export function excessPercent(f: Pick<Finding, "code" | "value" | "limit">): number {
  if (f.code.startsWith("protection.")) {
    // Protection limits are crossed from either side (a margin too short, a current too
    // high or too low): the distance from the limit.
    const limit = Math.abs(f.limit);
    return limit > 0 ? 100 * Math.abs(f.value - f.limit) / limit : 100 * Math.abs(f.value);
  }
  if (f.code === "recovery.low_voltage" || f.code === "recovery.collapse") {
    // How far below the recovery threshold (a collapse: all the way).
    return f.limit > 0 ? 100 * Math.max(f.limit - f.value, 0) / f.limit : 0;
  }
  if (f.code === "hosting.shortfall") {
    // A capacity below its target: the shortfall, % of the target.
    return f.limit > 0 ? 100 * Math.max(f.limit - f.value, 0) / f.limit : 0;
  }
  if (f.code === "voltage.above_band" || f.code === "voltage.below_band") {
    const margin = Math.abs(f.limit - 1);
    return margin > 0 ? 100 * Math.abs(f.value - f.limit) / margin : 0;
  }
  const limit = Math.abs(f.limit);
  return limit > 0 ? 100 * (Math.abs(f.value) - limit) / limit : 0;
}

/** Customers at each bus: those given on the bus plus those of its loads. */
export function customersAt(form: FeederForm): Float64Array {
  const out = Float64Array.from(form.customers);
  const l = form.loads;
  for (let i = 0; i < l.n; i++) out[l.bus[i]!] = out[l.bus[i]!]! + l.customers[i]!;
  return out;
}

/** Customers at each bus and beyond it (its subtree), from the breadth-first order. */
export function customersBeyond(form: FeederForm, at: Float64Array): Float64Array {
  const out = Float64Array.from(at);
  for (let k = form.nBus - 1; k > 0; k--) out[form.parent[k]!] = out[form.parent[k]!]! + out[k]!;
  return out;
}

export function classifyNeeds(form: FeederForm, findings: readonly Finding[]): NeedDraft[] {
  const groups = new Map<NeedKind, Finding[]>();
  for (const f of findings) {
    const kind = needKindOf(form, f);
    if (kind === null) continue;
    const list = groups.get(kind) ?? [];
    list.push(f);
    groups.set(kind, list);
  }
  const busIndex = new Map(form.busIds.map((id, k) => [id, k]));
  const at = customersAt(form);
  const beyond = customersBeyond(form, at);
  const drafts: NeedDraft[] = [];
  for (const kind of NEED_KIND_ORDER) {
    const list = groups.get(kind);
    if (list === undefined) continue;
    let worst = list[0]!;
    for (const f of list) if (excessPercent(f) > excessPercent(worst)) worst = f;
    // Customers: at the buses named, or beyond the branches named; each bus counted once.
    const touched = new Set<number>();
    let customers = 0;
    for (const f of list) {
      if (f.where.kind === "bus") {
        const k = busIndex.get(f.where.id);
        if (k !== undefined && !touched.has(k)) {
          touched.add(k);
          customers += at[k]!;
        }
      } else if (f.where.kind === "branch") {
        const b = form.branchIds.indexOf(f.where.id);
        if (b >= 0) customers = Math.max(customers, beyond[form.branchTo[b]!]!);
      }
    }
    const places = new Set(list.map((f) => f.where.id));
    const cases = [...new Set(list.map((f) => f.caseId))];
    drafts.push({
      feederId: form.feederId,
      id: `${form.feederId}/${kind}`,
      kind,
      needClass: NEED_RULES[worst.code]!.needClass,
      summary: summarize(kind, worst, places.size, cases),
      worst: evidenceOf(worst),
      excessPercent: roundTo(excessPercent(worst), 3),
      evidence: list.map(evidenceOf),
      customers,
    });
  }
  return drafts;
}

function evidenceOf(f: Finding): NeedEvidence {
  return {
    code: f.code,
    caseId: f.caseId,
    where: f.where,
    value: roundTo(f.value, 6),
    limit: f.limit,
    unit: f.unit,
  };
}

const WHAT: Record<NeedKind, string> = {
  overvoltage: "Voltage above the band",
  undervoltage: "Voltage below the band",
  voltage_change: "Generation changes the voltage beyond the planning limit",
  line_overload: "Line overloaded",
  transformer_overload: "Transformer overloaded",
  device_overload: "Switching device overloaded",
  device_duty: "Fault current beyond what a switching device can interrupt or make",
  protection_direction:
    "Generation feeds faults from the feeder end: protection must become directional",
  protection_grading: "Protection settings do not coordinate",
  hosting_shortfall: "Too little room for the generation expected on the feeder",
  post_fault_recovery: "The feeder does not recover after a fault is cleared",
};

function summarize(kind: NeedKind, worst: Finding, places: number, cases: string[]): string {
  const v = worst.unit === "pu" ? worst.value.toFixed(3) : worst.value.toFixed(1);
  const at = `${worst.where.kind} "${worst.where.id}"`;
  const more = places > 1 ? ` and ${places - 1} more place(s)` : "";
  return `${WHAT[kind]}: worst ${v} ${worst.unit} at ${at} against ${worst.limit} ${worst.unit}` +
    `${more}, in case(s) ${cases.join(", ")}`;
}
