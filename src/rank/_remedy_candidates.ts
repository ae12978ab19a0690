/**
 * The remedies the design tries for each need kind, in the order planners try them:
 * control settings (reactive mode of the generators, the tap changer's set-point), voltage
 * regulation, reconductoring, a new transformer or switching device. Each candidate is a
 * changed copy of the form with its bill of quantities; design_remedies.ts checks it.
 */
import { roundTo } from "../model/round_to.ts";
import { BRANCH_LINE, type FeederForm, GENERATOR_INDUCTION } from "../model/feeder_form.ts";
import type { ReactiveCurve, ReactiveMode } from "../model/network.ts";
import type { CatalogueConductor, CostTable, RemedyOptions } from "./cost_table.ts";
import type { NeedKind, RemedyItem, RemedyKind } from "./need.ts";
import type { FeederHosting } from "../hosting/host_feeder.ts";
import type { NeedDraft } from "./classify_needs.ts";
import { studyCases, type StudySettings } from "../pipeline/study_feeder.ts";
import {
  designDirectionalScheme,
  type ProposedSetting,
} from "../solve/design_directional_scheme.ts";
import {
  withBranchRating,
  withLineRegulator,
  withLinesRebuilt,
  withReactiveModes,
  withTapSetpoint,
  withTransformerRating,
} from "./modify_form.ts";

export interface Candidate {
  readonly kind: RemedyKind;
  /** What to do; for a candidate without a form, why none could be made. */
  readonly description: string;
  readonly items: readonly RemedyItem[];
  /** The changed feeder, or null when the kind cannot make one here (the reason above). */
  readonly form: FeederForm | null;
  readonly protectionSettings?: readonly ProposedSetting[];
  /** Already checked with full load flows by the study named (no second study). */
  readonly checkedBy?: string;
  /** Capacity it unlocks where the study that checked it says so, MW. */
  readonly unlocksMw?: number;
}

export interface CandidateContext {
  readonly form: FeederForm;
  readonly study: StudySettings;
  readonly costs: CostTable;
  readonly options: RemedyOptions;
  readonly lvMaxKv: number;
  /** The feeder's hosting study, where it ran. */
  readonly hosting?: FeederHosting | null;
}

/** Remedy kinds tried per need kind, in order. */
export const REMEDY_ORDER: Readonly<Record<NeedKind, readonly RemedyKind[]>> = {
  overvoltage: ["reactive_mode", "tap_setpoint", "voltage_regulator", "reconductor"],
  voltage_change: ["reactive_mode", "voltage_regulator", "reconductor"],
  undervoltage: ["tap_setpoint", "voltage_regulator", "reconductor"],
  line_overload: ["reconductor"],
  transformer_overload: ["transformer"],
  device_overload: ["switchgear"],
  device_duty: ["switchgear"],
  protection_direction: ["protection_scheme"],
  protection_grading: ["protection_scheme"],
  // A reactive strategy the hosting study found enough; works for capacity are the planner's
  // choice among the per-bus binding criteria.
  hosting_shortfall: ["connection_strategy"],
  // The recovery finding names the options (ride-through category, dynamic reactive support,
  // faster clearing); the catalogue holds the first.
  post_fault_recovery: ["ride_through"],
};

/**
 * Volt-var curve of the reactive-mode remedy: IEEE 1547-2018 Category B default
 * (REFERENCES.md E [memory]): +44 % of rating at 0.92 pu, dead band 0.98–1.02 pu, −44 % at
 * 1.08 pu (positive = injection).
 */
export const REMEDY_VOLT_VAR_CURVE: ReactiveCurve = {
  id: "remedy:volt-var-category-b",
  kind: "volt_var",
  points: [{ x: 0.92, y: 0.44 }, { x: 0.98, y: 0 }, { x: 1.02, y: 0 }, { x: 1.08, y: -0.44 }],
  at: { file: "pipeline" },
};

export function* candidatesFor(
  kind: RemedyKind,
  need: NeedDraft,
  ctx: CandidateContext,
): Generator<Candidate> {
  switch (kind) {
    case "reactive_mode":
      yield* reactiveCandidates(ctx);
      break;
    case "tap_setpoint":
      yield* tapCandidates(ctx, need.kind === "undervoltage" ? 1 : -1);
      break;
    case "voltage_regulator":
      yield* regulatorCandidates(need, ctx);
      break;
    case "reconductor":
      yield* need.kind === "line_overload"
        ? overloadReconductorCandidates(need, ctx)
        : pathReconductorCandidates(need, ctx);
      break;
    case "transformer":
      yield* transformerCandidates(need, ctx);
      break;
    case "protection_scheme":
      yield* protectionCandidates(need, ctx);
      break;
    case "switchgear":
      yield* need.kind === "device_duty"
        ? dutySwitchgearCandidates(need, ctx)
        : switchgearCandidates(need, ctx);
      break;
    case "ride_through":
      yield rideThroughCandidate(ctx);
      break;
    case "connection_strategy":
      yield* connectionCandidates(need, ctx);
      break;
  }
}

/**
 * For a hosting shortfall: each reactive strategy of the pipeline whose spread capacity (the
 * hosting study's, confirmed with full load flows) reaches the target, cheapest rule first
 * (all cost the same; the one that takes the most wins the order).
 */
function* connectionCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const h = ctx.hosting, ref = h?.strategies[0];
  if (h === undefined || h === null || ref === undefined) return;
  const targetMw = need.worst.limit;
  const enough = h.strategies.slice(1).filter((s) => s.spreadKw / 1000 >= targetMw)
    .sort((a, b) => b.spreadKw - a.spreadKw);
  for (const s of enough) {
    yield {
      kind: "connection_strategy",
      description: `Connect new generation on this feeder with ${s.label}: it takes ${
        (s.spreadKw / 1000).toFixed(2)
      } MW spread with demand, against ${targetMw.toFixed(2)} MW expected (${
        (ref.spreadKw / 1000).toFixed(2)
      } MW with ${ref.label})`,
      items: [
        item("connection rule for new generation", 1, "feeder", ctx.costs.connectionRulePerFeeder),
      ],
      form: null,
      checkedBy: "the hosting study",
      unlocksMw: Math.round((s.spreadKw - ref.spreadKw) / 10) / 100,
    };
  }
}

/** The category a ride-through remedy requires: the preset that rides through the most. */
export const REMEDY_RIDE_THROUGH_CATEGORY = "III";

/**
 * Every generator not already in the remedy's category required to meet it (IEEE 1547-2018
 * Category III: trips only below 0.50 pu after 2 s or 0.88 pu after 21 s [memory]).
 */
function rideThroughCandidate(ctx: CandidateContext): Candidate {
  const g = ctx.form.generators, want = REMEDY_RIDE_THROUGH_CATEGORY;
  const chosen: number[] = [];
  for (let i = 0; i < g.n; i++) {
    if ((g.rideThrough[i] ?? ctx.study.recovery.defaultCategory) !== want) chosen.push(i);
  }
  if (chosen.length === 0) {
    return {
      kind: "ride_through",
      description: `every generator already meets ride-through Category ${want}`,
      items: [],
      form: null,
    };
  }
  const set = new Set(chosen);
  return {
    kind: "ride_through",
    description: `Require ride-through Category ${want} of ${
      chosen.map((i) => `"${g.ids[i]}"`).join(", ")
    }`,
    items: [
      item(
        "ride-through requirement of a generator",
        chosen.length,
        "each",
        ctx.costs.rideThroughPerGenerator,
      ),
    ],
    form: {
      ...ctx.form,
      generators: {
        ...g,
        rideThrough: g.rideThrough.map((r, i) => (set.has(i) ? want : r)),
      },
    },
  };
}

function item(what: string, quantity: number, unit: string, unitCost: number): RemedyItem {
  const q = roundTo(quantity, 3); // the cost follows the quantity as shown
  return { what, quantity: q, unit, unitCost, cost: roundTo(q * unitCost, 2) };
}

/** Generators whose reactive mode can be changed to absorb: not induction, not already absorbing. */
function* reactiveCandidates(ctx: CandidateContext): Generator<Candidate> {
  const g = ctx.form.generators;
  const eligible: number[] = [];
  for (let i = 0; i < g.n; i++) {
    if (g.kind[i] === GENERATOR_INDUCTION) continue;
    const r = g.reactive[i]!;
    const injecting = r.mode === "unity" ||
      (r.mode === "fixed_power_factor" && r.sense === "injecting") ||
      (r.mode === "fixed_q" && r.qKvar >= 0);
    if (injecting) eligible.push(i);
  }
  eligible.sort((a, b) => g.pKw[b]! - g.pKw[a]! || (g.ids[a]! < g.ids[b]! ? -1 : 1));
  const pf = ctx.options.absorbingPowerFactor;
  for (let size = 1;; size = Math.min(2 * size, eligible.length)) {
    if (eligible.length === 0) return;
    const chosen = eligible.slice(0, size);
    const ids = chosen.map((i) => `"${g.ids[i]}"`).join(", ");
    const cost = item(
      "reactive-mode change of a generator",
      size,
      "each",
      ctx.costs.reactiveSettingPerGenerator,
    );
    const modes = (mode: ReactiveMode) => new Map(chosen.map((i) => [i, mode]));
    yield {
      kind: "reactive_mode",
      description: `Set ${ids} to volt-var Q(U) on the IEEE 1547-2018 Category B default curve`,
      items: [cost],
      form: withReactiveModes(
        ctx.form,
        modes({ mode: "volt_var", curveId: REMEDY_VOLT_VAR_CURVE.id }),
        REMEDY_VOLT_VAR_CURVE,
      ),
    };
    yield {
      kind: "reactive_mode",
      description: `Set ${ids} to a fixed power factor of ${pf} absorbing`,
      items: [cost],
      form: withReactiveModes(
        ctx.form,
        modes({ mode: "fixed_power_factor", powerFactor: pf, sense: "absorbing" }),
      ),
    };
    if (size === eligible.length) return;
  }
}

/** Substation on-load tap changers with voltage control: set-point moved by up to four half-bands. */
function* tapCandidates(ctx: CandidateContext, direction: 1 | -1): Generator<Candidate> {
  const f = ctx.form;
  for (let ti = 0; ti < f.transformers.length; ti++) {
    const t = f.transformers[ti]!;
    const c = t.tap.control;
    if (!t.tap.onLoad || c === undefined || f.branchTo[t.branch]! >= f.substationBusCount) continue;
    const step = Math.max(c.bandPu / 2, t.tap.stepPercent / 100);
    for (let k = 1; k <= 4; k++) {
      const v = roundTo(c.vSetPu + direction * k * step, 4);
      yield {
        kind: "tap_setpoint",
        description: `${
          direction > 0 ? "Raise" : "Lower"
        } the voltage set-point of on-load tap changer "${t.id}" from ${c.vSetPu} to ${v} pu; the busbar supplies other feeders too, which must be studied with the new set-point`,
        items: [item("tap-changer set-point change", 1, "each", ctx.costs.tapSetpointChange)],
        form: withTapSetpoint(f, ti, v),
      };
    }
  }
}

/** Tree line branches from the source to bus k, source end first. */
function pathLines(form: FeederForm, k: number): number[] {
  const out: number[] = [];
  for (let b = k; b > 0; b = form.parent[b]!) {
    if (form.branchKind[b - 1] === BRANCH_LINE) out.push(b - 1);
  }
  return out.reverse();
}

function worstBus(need: NeedDraft, form: FeederForm): number {
  return need.worst.where.kind === "bus" ? form.busIds.indexOf(need.worst.where.id) : -1;
}

/** A line regulator at a third, half and two thirds of the path resistance to the worst bus. */
function* regulatorCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form;
  const k = worstBus(need, f);
  if (k < 0) return;
  const path = pathLines(f, k);
  const total = path.reduce((s, b) => s + f.r1Ohm[b]!, 0);
  const vSet = need.kind === "undervoltage" ? 1.02 : 1.0;
  const tried = new Set<number>();
  for (const share of [0.5, 1 / 3, 2 / 3]) {
    let acc = 0;
    const at = path.find((b) => (acc += f.r1Ohm[b]!) >= share * total);
    if (at === undefined || tried.has(at)) continue;
    tried.add(at);
    yield {
      kind: "voltage_regulator",
      description:
        `Install a line voltage regulator (±${ctx.options.regulatorRangePercent} %, set-point ${vSet} pu) on line "${
          f.branchIds[at]
        }"`,
      items: [item("line voltage regulator", 1, "each", ctx.costs.voltageRegulator)],
      form: withLineRegulator(f, at, vSet, ctx.options.regulatorRangePercent),
    };
  }
}

function levelOf(form: FeederForm, b: number, lvMaxKv: number): "mv" | "lv" {
  return form.vnKv[form.branchTo[b]!]! <= lvMaxKv ? "lv" : "mv";
}

/** Catalogue conductors for line b that satisfy `ok`, the line's own construction first, then by cost. */
function conductorsFor(
  ctx: CandidateContext,
  b: number,
  ok: (c: CatalogueConductor) => boolean,
): CatalogueConductor[] {
  const f = ctx.form;
  const level = levelOf(f, b, ctx.lvMaxKv);
  const construction = f.cable[b] === 1 ? "cable" : "overhead";
  return ctx.costs.conductors
    .filter((c) => c.level === level && ok(c))
    .sort((a, c) =>
      Number(a.construction !== construction) - Number(c.construction !== construction) ||
      a.costPerKm - c.costPerKm
    );
}

function reconductorItems(form: FeederForm, rebuilt: ReadonlyMap<number, CatalogueConductor>) {
  const km = new Map<CatalogueConductor, number>();
  for (const [b, c] of rebuilt) km.set(c, (km.get(c) ?? 0) + form.lengthKm[b]!);
  return [...km].map(([c, l]) =>
    item(`rebuild line with ${c.conductorClass}`, l, "km", c.costPerKm)
  );
}

function describeRebuild(
  form: FeederForm,
  rebuilt: ReadonlyMap<number, CatalogueConductor>,
): string {
  const byClass = new Map<string, number[]>();
  for (const [b, c] of rebuilt) {
    byClass.set(c.conductorClass, [...(byClass.get(c.conductorClass) ?? []), b]);
  }
  const parts = [...byClass].map(([name, branches]) => {
    const km = branches.reduce((s, b) => s + form.lengthKm[b]!, 0);
    const ids = branches.map((b) => `"${form.branchIds[b]}"`);
    const shown = ids.length > 6
      ? `${ids.slice(0, 6).join(", ")} and ${ids.length - 6} more`
      : ids.join(", ");
    return `${roundTo(km, 3)} km with ${name} (${shown})`;
  });
  return `Rebuild line: ${parts.join("; ")}`;
}

/**
 * Voltage needs: rebuild the lines on the path to the worst bus, the largest section
 * resistance first, one more line per candidate, with a catalogue conductor of at least
 * 20 % less resistance per km and no less ampacity.
 */
function* pathReconductorCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form;
  const k = worstBus(need, f);
  if (k < 0) return;
  const order = pathLines(f, k).sort((a, b) => f.r1Ohm[b]! - f.r1Ohm[a]! || a - b);
  const rebuilt = new Map<number, CatalogueConductor>();
  for (const b of order) {
    const rPerKm = f.lengthKm[b]! > 0 ? f.r1Ohm[b]! / f.lengthKm[b]! : 0;
    const rating = f.ratingA[b]!;
    const pick = conductorsFor(
      ctx,
      b,
      (c) => c.r1OhmPerKm <= 0.8 * rPerKm && (!Number.isFinite(rating) || c.ampacityA >= rating),
    )[0];
    if (pick === undefined) continue;
    rebuilt.set(b, pick);
    const copy = new Map(rebuilt);
    yield {
      kind: "reconductor",
      description: describeRebuild(f, copy),
      items: reconductorItems(f, copy),
      form: withLinesRebuilt(f, copy),
    };
  }
}

/** Worst value per branch among a need's findings (loading in %). */
function worstPerBranch(need: NeedDraft, form: FeederForm): Map<number, number> {
  const out = new Map<number, number>();
  for (const e of need.evidence) {
    const b = form.branchIds.indexOf(e.where.id);
    if (b >= 0) out.set(b, Math.max(out.get(b) ?? 0, e.value / e.limit));
  }
  return out;
}

/**
 * Overloaded lines rebuilt with the cheapest conductor of their own construction that
 * carries the current (then the next one); another construction only where none does.
 */
function* overloadReconductorCandidates(
  need: NeedDraft,
  ctx: CandidateContext,
): Generator<Candidate> {
  const f = ctx.form;
  const over = worstPerBranch(need, f);
  for (let grade = 0; grade < 2; grade++) {
    const rebuilt = new Map<number, CatalogueConductor>();
    for (const [b, ratio] of over) {
      const needA = f.ratingA[b]! * ratio;
      const fits = conductorsFor(ctx, b, (c) => c.ampacityA >= needA);
      const pick = fits[Math.min(grade, fits.length - 1)];
      if (pick === undefined) return;
      rebuilt.set(b, pick);
    }
    yield {
      kind: "reconductor",
      description: describeRebuild(f, rebuilt),
      items: reconductorItems(f, rebuilt),
      form: withLinesRebuilt(f, rebuilt),
    };
  }
}

/** Overloaded transformers replaced by the next standard sizes that carry the load. */
function* transformerCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form;
  const over = worstPerBranch(need, f);
  for (let grade = 0; grade < 2; grade++) {
    let form = f;
    const items: RemedyItem[] = [];
    const parts: string[] = [];
    for (const [b, ratio] of over) {
      const ti = f.transformers.findIndex((t) => t.branch === b);
      const t = f.transformers[ti];
      if (t === undefined) return;
      const sizes = ctx.options.transformerSizesMva.filter((s) => s >= t.sRatedMva * ratio);
      const size = sizes[grade];
      if (size === undefined) return;
      form = withTransformerRating(form, ti, size);
      items.push(
        item(`new ${size} MVA transformer (fixed part)`, 1, "each", ctx.costs.transformerFixed),
      );
      items.push(
        item(`new ${size} MVA transformer (per MVA)`, size, "MVA", ctx.costs.transformerPerMva),
      );
      parts.push(`"${t.id}" (${t.sRatedMva} MVA) by a ${size} MVA unit`);
    }
    yield {
      kind: "transformer",
      description: `Replace transformer ${parts.join(", ")}`,
      items,
      form,
    };
  }
}

/** Overloaded switching devices replaced by the next standard ratings that carry the current. */
function* switchgearCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form;
  const over = worstPerBranch(need, f);
  for (let grade = 0; grade < 2; grade++) {
    let form = f;
    const parts: string[] = [];
    for (const [b, ratio] of over) {
      const ratings = ctx.options.switchRatingsA.filter((a) => a >= f.ratingA[b]! * ratio);
      const rating = ratings[grade];
      if (rating === undefined) return;
      form = withBranchRating(form, b, rating);
      parts.push(`"${f.branchIds[b]}" by a ${rating} A device`);
    }
    yield {
      kind: "switchgear",
      description: `Replace switching device ${parts.join(", ")}`,
      items: [
        item("switching device replacement", over.size, "each", ctx.costs.switchgearReplacement),
      ],
      form,
    };
  }
}

/**
 * Devices that cannot interrupt or make the fault current, replaced by the next standard
 * breaking currents that can (making current 2.5 × breaking, IEC 62271-100 at 50 Hz
 * [memory]); the evidence gives each device's duty in % of its rating.
 */
function* dutySwitchgearCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form;
  const requiredKa = new Map<number, number>();
  for (const e of need.evidence) {
    const i = f.devices.findIndex((d) => d.id === e.where.id);
    const d = f.devices[i];
    if (d === undefined) return;
    const rated = e.code === "fault.making_duty"
      ? (d.makingCurrentA ?? 0) / 2.5
      : d.breakingCurrentA ?? 0;
    requiredKa.set(i, Math.max(requiredKa.get(i) ?? 0, rated * e.value / 100 / 1000));
  }
  for (let grade = 0; grade < 2; grade++) {
    const devices = [...f.devices];
    const parts: string[] = [];
    for (const [i, ka] of requiredKa) {
      const rating = ctx.options.breakingRatingsKa.filter((r) => r >= ka)[grade];
      if (rating === undefined) return;
      devices[i] = {
        ...devices[i]!,
        breakingCurrentA: 1000 * rating,
        makingCurrentA: 2500 * rating,
      };
      parts.push(`"${devices[i]!.id}" by one rated ${rating} kA breaking`);
    }
    yield {
      kind: "switchgear",
      description: `Replace switching device ${parts.join(", ")}`,
      items: [
        item(
          "switching device replacement",
          requiredKa.size,
          "each",
          ctx.costs.switchgearReplacement,
        ),
      ],
      form: { ...f, devices },
    };
  }
}

/** Codes of the findings that show a relay must see direction. */
const ONE_WAY_CODES = new Set([
  "protection.reverse_pickup",
  "protection.wrong_device",
  "protection.sympathetic_trip",
]);

/**
 * A directional scheme (design_directional_scheme.ts): forward elements on the relays the
 * evidence shows tripping on back-feed, every inverse-time relay regraded by the linear
 * programme, pickups above the largest load current the load-flow cases put through them.
 */
function* protectionCandidates(need: NeedDraft, ctx: CandidateContext): Generator<Candidate> {
  const f = ctx.form, p = ctx.study.protection;
  const directional = new Set(
    need.evidence.filter((e) => ONE_WAY_CODES.has(e.code)).map((e) => e.where.id),
  );
  const loads = studyCases(f, { ...ctx.study, output: { busResults: false, branchResults: true } });
  const load = new Map<string, number>();
  for (const c of loads.cases) {
    for (const b of c.branches ?? []) load.set(b.id, Math.max(load.get(b.id) ?? 0, b.iA));
  }
  const scheme = designDirectionalScheme(f, directional, load, ctx.study.faults, ctx.lvMaxKv, p);
  if (scheme.status === "infeasible") {
    yield { kind: "protection_scheme", description: scheme.reason, items: [], form: null };
    return;
  }
  const changed = scheme.settings.filter((s) =>
    s.direction !== s.before.direction || Math.abs(s.pickupA - s.before.pickupA) > 1e-9 ||
    Math.abs(s.timeMultiplier - s.before.timeMultiplier) > 1e-9
  );
  const made = scheme.settings.filter((s) => s.direction !== s.before.direction);
  const parts = changed.map((s) =>
    `"${s.device}" ${s.direction === "forward" ? "forward-directional, " : ""}pickup ${
      roundTo(s.pickupA, 0)
    } A, multiplier ${s.before.timeMultiplier} → ${s.timeMultiplier}`
  );
  yield {
    kind: "protection_scheme",
    description: `Directional protection scheme: ${
      parts.join("; ")
    } (a screening proposal for a protection engineer to verify)`,
    items: [
      ...(made.length > 0
        ? [
          item("directional element on a relay", made.length, "each", ctx.costs.directionalElement),
        ]
        : []),
      item("new relay settings", changed.length, "each", ctx.costs.protectionSettingPerRelay),
    ],
    form: scheme.form,
    protectionSettings: scheme.settings,
  };
}
