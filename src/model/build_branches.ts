/** Model-stage builders of the branches: lines, transformers and switching devices. */
import type { BuildContext } from "./_build_context.ts";
import type { GroupedCurves } from "./build_devices.ts";
import type { FuseCurve, Line, LineType, SwitchDevice, Transformer } from "./network.ts";
import { phaseCount, phaseLetters } from "./phases.ts";
import { earthing, sameLevel, VOLTAGE_LEVEL_TOLERANCE, WINDING_TOLERANCE } from "./_levels.ts";

export function buildLines(
  ctx: BuildContext,
  typeIds: ReadonlyMap<string, LineType>,
  badTypeIds: ReadonlySet<string>,
): Line[] {
  const { tables, error, taintBus, refBus, placeholder, cellAt } = ctx;
  const lines: Line[] = [];
  for (const { value: r, line } of tables.lines.rows) {
    const file = tables.lines.file;
    const from = refBus(`Line "${r.id}"`, file, line, "from", r.from);
    const to = refBus(`Line "${r.id}"`, file, line, "to", r.to);
    const type = typeIds.get(r.type.toLowerCase());
    const ends = [r.from, r.to];
    if (badTypeIds.has(r.type.toLowerCase())) {
      ends.forEach((b) => taintBus(b, "ref.rejected", file, line));
    } else if (type === undefined) {
      error(
        "ref.unknown",
        `Line "${r.id}" on line ${line}: type "${r.type}" is not a line type of ${tables.lineTypes.file}`,
        cellAt(file, line, "type"),
        ends,
      );
    } else if (
      type.zPhase.phases.length < 3 && phaseCount(r.phases) !== type.zPhase.phases.length
    ) {
      error(
        "phase.count",
        `Line "${r.id}" on line ${line}: phases "${
          phaseLetters(r.phases)
        }" do not match line type "${type.id}", which has ${type.zPhase.phases.length} phase conductor(s)`,
        cellAt(file, line, "phases"),
        ends,
      );
    }
    if (from === undefined || to === undefined) {
      ends.forEach((b) => taintBus(b, "ref.unknown", file, line));
      placeholder(r.id, r.from, r.to);
      continue;
    }
    if (!sameLevel(from.vnKv, to.vnKv, VOLTAGE_LEVEL_TOLERANCE)) {
      error(
        "voltage.mismatch",
        `Line "${r.id}" on line ${line} joins bus "${from.id}" at ${from.vnKv} kV and bus "${to.id}" at ${to.vnKv} kV`,
        cellAt(file, line, "to"),
        ends,
      );
    }
    lines.push({
      id: r.id,
      fromBusId: from.id,
      toBusId: to.id,
      typeId: type?.id ?? r.type,
      lengthKm: r.length,
      phases: r.phases,
      inService: r.in_service,
      at: { file, line },
    });
  }

  return lines;
}

export function buildTransformers(ctx: BuildContext): Transformer[] {
  const { tables, error, taintBus, refBus, placeholder, cellAt } = ctx;
  const transformers: Transformer[] = [];
  for (const { value: r, line } of tables.transformers.rows) {
    const file = tables.transformers.file;
    const hv = refBus(`Transformer "${r.id}"`, file, line, "hv_bus", r.hv_bus);
    const lv = refBus(`Transformer "${r.id}"`, file, line, "lv_bus", r.lv_bus);
    if (hv === undefined || lv === undefined) {
      [r.hv_bus, r.lv_bus].forEach((b) => taintBus(b, "ref.unknown", file, line));
      placeholder(r.id, r.hv_bus, r.lv_bus);
      continue;
    }
    for (
      const [side, bus, kv] of [["hv_voltage", hv, r.hv_voltage], [
        "lv_voltage",
        lv,
        r.lv_voltage,
      ]] as const
    ) {
      if (!sameLevel(bus.vnKv, kv, WINDING_TOLERANCE)) {
        error(
          "winding.mismatch",
          `Transformer "${r.id}" on line ${line}: ${side} ${kv} kV disagrees with bus "${bus.id}" at ${bus.vnKv} kV`,
          cellAt(file, line, side),
          [hv.id, lv.id],
        );
      }
    }
    const control = r.on_load_tap_changer && r.control_setpoint !== undefined
      ? {
        control: {
          vSetPu: r.control_setpoint,
          bandPu: r.control_band ?? 0.015,
          ldcROhm: r.ldc_r,
          ldcXOhm: r.ldc_x,
        },
      }
      : {};
    transformers.push({
      id: r.id,
      hvBusId: hv.id,
      lvBusId: lv.id,
      sRatedMva: r.rated_power,
      hvKv: r.hv_voltage,
      lvKv: r.lv_voltage,
      ukPercent: r.sc_voltage,
      loadLossKw: r.load_losses,
      noLoadLossKw: r.no_load_losses,
      uk0Percent: r.zero_seq_sc_voltage ?? r.sc_voltage,
      vectorGroup: r.vector_group,
      tap: {
        side: r.tap_side,
        min: r.tap_min,
        max: r.tap_max,
        neutral: r.tap_neutral,
        position: r.tap_position,
        stepPercent: r.tap_step,
        onLoad: r.on_load_tap_changer,
        ...control,
      },
      hvEarthing: earthing(r.hv_earthing, r.hv_neutral_r, r.hv_neutral_x),
      lvEarthing: earthing(r.lv_earthing, r.lv_neutral_r, r.lv_neutral_x),
      at: { file, line },
    });
  }

  return transformers;
}

export function buildSwitches(
  ctx: BuildContext,
  fuseCurves: GroupedCurves<FuseCurve>,
): SwitchDevice[] {
  const { tables, error, taintBus, refBus, placeholder, cellAt } = ctx;
  const fuseIds = new Set(fuseCurves.value.map((f) => f.id.toLowerCase()));
  const switches: SwitchDevice[] = [];
  for (const { value: r, line } of tables.switches.rows) {
    const file = tables.switches.file;
    const from = refBus(`Switch "${r.id}"`, file, line, "from", r.from);
    const to = refBus(`Switch "${r.id}"`, file, line, "to", r.to);
    if (from === undefined || to === undefined) {
      [r.from, r.to].forEach((b) => taintBus(b, "ref.unknown", file, line));
      if (r.normal_state === "closed") placeholder(r.id, r.from, r.to);
      continue;
    }
    if (!sameLevel(from.vnKv, to.vnKv, VOLTAGE_LEVEL_TOLERANCE)) {
      error(
        "voltage.mismatch",
        `Switch "${r.id}" on line ${line} joins bus "${from.id}" at ${from.vnKv} kV and bus "${to.id}" at ${to.vnKv} kV`,
        cellAt(file, line, "to"),
        [from.id, to.id],
      );
    }
    if (r.fuse_curve !== undefined && !fuseIds.has(r.fuse_curve.toLowerCase())) {
      const rejected = fuseCurves.bad.has(r.fuse_curve.toLowerCase());
      if (rejected) [from.id, to.id].forEach((b) => taintBus(b, "ref.rejected", file, line));
      else {
        error(
          "ref.unknown",
          `Switch "${r.id}" on line ${line}: fuse_curve "${r.fuse_curve}" is not a curve of ${tables.fuseCurves.file}`,
          cellAt(file, line, "fuse_curve"),
          [from.id, to.id],
        );
      }
    }
    switches.push({
      id: r.id,
      fromBusId: from.id,
      toBusId: to.id,
      kind: r.kind,
      normallyClosed: r.normal_state === "closed",
      ...(r.heads_feeder === undefined ? {} : { headsFeeder: r.heads_feeder }),
      ...(r.rated_current === undefined ? {} : { ratedCurrentA: r.rated_current }),
      ...(r.breaking_current === undefined ? {} : { breakingCurrentA: r.breaking_current }),
      ...(r.making_current === undefined ? {} : { makingCurrentA: r.making_current }),
      ...(r.fuse_curve === undefined ? {} : { fuseCurveId: r.fuse_curve }),
      fastShots: r.fast_shots,
      delayedShots: r.delayed_shots,
      phases: r.phases,
      at: { file, line },
    });
  }

  return switches;
}
