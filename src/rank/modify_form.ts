/**
 * Copies of a feeder's solver form with one remedy applied, for the trial studies that
 * check a remedy: generation scaled, reactive modes changed, a tap changer's set-point
 * moved, lines rebuilt, a transformer or a switching device replaced, a line voltage
 * regulator added. The original form is never changed.
 */
import type { FeederForm, FormTransformer } from "../model/feeder_form.ts";
import type { ReactiveCurve, ReactiveMode } from "../model/network.ts";
import type { CatalogueConductor } from "./cost_table.ts";

/** Every generator's active power and rating times `factor` (the headroom search). */
export function withGenerationScaled(form: FeederForm, factor: number): FeederForm {
  const g = form.generators;
  return {
    ...form,
    generators: {
      ...g,
      pKw: g.pKw.map((p) => p * factor),
      sRatedKva: g.sRatedKva.map((s) => s * factor),
    },
  };
}

/** New reactive modes for some generators (by index); a curve they use may be added. */
export function withReactiveModes(
  form: FeederForm,
  modes: ReadonlyMap<number, ReactiveMode>,
  curve?: ReactiveCurve,
): FeederForm {
  return {
    ...form,
    generators: {
      ...form.generators,
      reactive: form.generators.reactive.map((r, i) => modes.get(i) ?? r),
    },
    reactiveCurves: curve === undefined ? form.reactiveCurves : [...form.reactiveCurves, curve],
  };
}

/** Every transformer's tap at the given positions (a solved case's). */
export function withTapPositions(form: FeederForm, positions: Int32Array): FeederForm {
  return {
    ...form,
    transformers: form.transformers.map((t, i) =>
      t.tap.position === positions[i] ? t : { ...t, tap: { ...t.tap, position: positions[i]! } }
    ),
  };
}

/** The voltage set-point of transformer `index`'s tap-changer control. */
export function withTapSetpoint(form: FeederForm, index: number, vSetPu: number): FeederForm {
  return {
    ...form,
    transformers: form.transformers.map((t, i) =>
      i === index && t.tap.control !== undefined
        ? { ...t, tap: { ...t.tap, control: { ...t.tap.control, vSetPu } } }
        : t
    ),
  };
}

/** Lines (branch indices) rebuilt with a conductor: impedance and rating of the new one. */
export function withLinesRebuilt(
  form: FeederForm,
  rebuilt: ReadonlyMap<number, CatalogueConductor>,
): FeederForm {
  const r1Ohm = Float64Array.from(form.r1Ohm), x1Ohm = Float64Array.from(form.x1Ohm);
  const ratingA = Float64Array.from(form.ratingA), cable = Uint8Array.from(form.cable);
  const conductorClass = [...form.conductorClass];
  for (const [b, c] of rebuilt) {
    r1Ohm[b] = c.r1OhmPerKm * form.lengthKm[b]!;
    x1Ohm[b] = c.x1OhmPerKm * form.lengthKm[b]!;
    ratingA[b] = c.ampacityA;
    cable[b] = c.construction === "cable" ? 1 : 0;
    conductorClass[b] = c.conductorClass;
  }
  return { ...form, r1Ohm, x1Ohm, ratingA, cable, conductorClass };
}

/**
 * Transformer `index` replaced by one of `sRatedMva` with the same short-circuit voltage:
 * its series impedance scales with old/new rating, its current rating with new/old.
 */
export function withTransformerRating(
  form: FeederForm,
  index: number,
  sRatedMva: number,
): FeederForm {
  const t = form.transformers[index]!;
  const k = t.sRatedMva / sRatedMva, b = t.branch;
  const r1Ohm = Float64Array.from(form.r1Ohm), x1Ohm = Float64Array.from(form.x1Ohm);
  const ratingA = Float64Array.from(form.ratingA);
  r1Ohm[b] = r1Ohm[b]! * k;
  x1Ohm[b] = x1Ohm[b]! * k;
  ratingA[b] = ratingA[b]! / k;
  return {
    ...form,
    r1Ohm,
    x1Ohm,
    ratingA,
    transformers: form.transformers.map((x, i) => i === index ? { ...x, sRatedMva } : x),
  };
}

/** The thermal rating of one branch (a replaced switching device), A. */
export function withBranchRating(form: FeederForm, branch: number, ratingA: number): FeederForm {
  const r = Float64Array.from(form.ratingA);
  r[branch] = ratingA;
  return { ...form, ratingA: r };
}

/**
 * A line voltage regulator on tree line `branch`: an on-load tap changer of ±rangePercent
 * in 32 steps (common practice) holding its load-side voltage at vSetPu within a band of
 * two steps. It joins the transformers list, so the load flow's tap-changer loop moves it.
 */
export function withLineRegulator(
  form: FeederForm,
  branch: number,
  vSetPu: number,
  rangePercent: number,
): FeederForm {
  const vn = form.vnKv[form.branchTo[branch]!]!;
  const stepPercent = rangePercent / 16;
  const regulator: FormTransformer = {
    id: `regulator on ${form.branchIds[branch]}`,
    branch,
    hvIsFrom: true,
    sRatedMva: Infinity,
    hvKv: vn,
    lvKv: vn,
    ukPercent: 0,
    uk0Percent: 0,
    loadLossKw: 0,
    noLoadLossKw: 0,
    vectorGroup: { hv: "YN", lv: "yn", clock: 0 },
    tap: {
      side: "lv",
      min: -16,
      max: 16,
      neutral: 0,
      position: 0,
      stepPercent,
      onLoad: true,
      control: { vSetPu, bandPu: 2 * stepPercent / 100, ldcROhm: 0, ldcXOhm: 0 },
    },
    hvEarthing: { kind: "solid", rOhm: 0, xOhm: 0 },
    lvEarthing: { kind: "solid", rOhm: 0, xOhm: 0 },
  };
  return { ...form, transformers: [...form.transformers, regulator] };
}
