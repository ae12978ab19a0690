/**
 * Model stage: validated tables → the internal Network, with cross-table checks
 * (unknown references, voltage levels, transformer windings). Rows that failed
 * validation, and elements that fail a cross-table check, taint the buses they name, so
 * the topology stage sets their feeders aside instead of studying a partial network.
 */
import type { NetworkTables } from "../ingest/read_network.ts";
import { type Diagnostic, makeDiagnostic } from "./diagnostic.ts";
import type { Generator, GridSource, Load, Network, Shunt } from "./network.ts";
import { resolveLineTypes } from "./resolve_line_types.ts";
import { groupFuseCurves, groupReactiveCurves, toGenerator, toLoad } from "./build_devices.ts";
import { buildLines, buildSwitches, buildTransformers } from "./build_branches.ts";
import { buildRelays } from "./build_relays.ts";
import { buildPlanningInputs } from "./build_planning.ts";
import { createBuildContext } from "./_build_context.ts";
import { rejectedIds, sameLevel, VOLTAGE_LEVEL_TOLERANCE } from "./_levels.ts";

export { VOLTAGE_LEVEL_TOLERANCE, WINDING_TOLERANCE } from "./_levels.ts";

export interface BuildNetworkResult {
  readonly value: Network;
  readonly diagnostics: readonly Diagnostic[];
}

export function buildNetwork(tables: NetworkTables): BuildNetworkResult {
  const ctx = createBuildContext(tables);
  const { error, taintBus, refBus, diagnostics, cellAt } = ctx;
  const s = tables.settings.rows[0]?.value;
  const extra = tables.settings.rows[1];
  if (extra !== undefined) {
    diagnostics.push(makeDiagnostic(
      "table.rows",
      "warning",
      `${tables.settings.file} holds one row of settings; the rows from line ${extra.line} on are ignored`,
      { at: { file: tables.settings.file, line: extra.line } },
    ));
  }
  const settings = {
    ...(s?.company === undefined ? {} : { company: s.company }),
    frequencyHz: s?.frequency ?? 50,
    earthResistivityOhmM: s?.earth_resistivity ?? 100,
  };

  const lineTypes = resolveLineTypes(tables, settings.frequencyHz, settings.earthResistivityOhmM);
  diagnostics.push(...lineTypes.diagnostics);
  const typeIds = new Map(lineTypes.value.map((t) => [t.id.toLowerCase(), t]));
  const badTypeIds = new Set([
    ...lineTypes.failed,
    ...rejectedIds(tables.lineTypes.rejected, "id"),
    ...(tables.lineTypes.headerBroken ? tables.lineTypes.rows.map((r) => r.value.id) : []),
  ].map((x) => x.toLowerCase()));
  for (const detail of [tables.lineTypeMatrix, tables.lineGeometry] as const) {
    for (const r of detail.rejected) badTypeIds.add((r.cells.type ?? "").toLowerCase());
  }

  const sources: GridSource[] = [];
  for (const { value: r, line } of tables.gridSources.rows) {
    const file = tables.gridSources.file;
    const bus = refBus(`Grid source "${r.id}"`, file, line, "bus", r.bus);
    if (bus === undefined) continue;
    if (!sameLevel(bus.vnKv, r.nominal_voltage, VOLTAGE_LEVEL_TOLERANCE)) {
      error(
        "voltage.mismatch",
        `Grid source "${r.id}": nominal_voltage ${r.nominal_voltage} kV differs from bus "${bus.id}" at ${bus.vnKv} kV`,
        cellAt(file, line, "nominal_voltage"),
        [bus.id],
      );
    }
    sources.push({
      id: r.id,
      busId: bus.id,
      vnKv: r.nominal_voltage,
      skMaxMva: r.sc_power_max,
      skMinMva: r.sc_power_min,
      rToX: r.r_to_x,
      x0ToX1: r.x0_to_x1,
      r0ToX0: r.r0_to_x0,
      vSetPu: r.voltage_setpoint,
      angleDeg: r.voltage_angle,
      earthing: { kind: r.earthing, rOhm: r.neutral_r, xOhm: r.neutral_x },
      at: { file, line },
    });
  }

  const lines = buildLines(ctx, typeIds, badTypeIds);
  const transformers = buildTransformers(ctx);
  const fuseCurves = groupFuseCurves(tables, diagnostics);
  const switches = buildSwitches(ctx, fuseCurves);
  const loads: Load[] = [];
  for (const row of tables.loads.rows) {
    const bus = refBus(
      `Load "${row.value.id}"`,
      tables.loads.file,
      row.line,
      "bus",
      row.value.bus,
    );
    if (bus !== undefined) loads.push(toLoad(row, bus.id, tables.loads.file));
  }

  const shunts: Shunt[] = [];
  for (const { value: r, line } of tables.shunts.rows) {
    const bus = refBus(`Shunt "${r.id}"`, tables.shunts.file, line, "bus", r.bus);
    if (bus === undefined || !r.in_service) continue;
    shunts.push({
      id: r.id,
      busId: bus.id,
      qRatedKvar: r.rated_reactive_power,
      phases: r.phases,
      at: { file: tables.shunts.file, line },
    });
  }

  const curves = groupReactiveCurves(tables, diagnostics);
  const curveIds = new Set(curves.value.map((c) => c.id.toLowerCase()));
  const generators: Generator[] = [];
  for (const row of tables.generators.rows) {
    const file = tables.generators.file;
    const bus = refBus(
      `Generator "${row.value.id}"`,
      file,
      row.line,
      "bus",
      row.value.bus,
    );
    if (bus === undefined) continue;
    const curve = row.value.reactive_curve;
    const found = curve === undefined
      ? undefined
      : curves.value.find((c) => c.id.toLowerCase() === curve.toLowerCase());
    if (found !== undefined && found.kind !== row.value.reactive_mode) {
      error(
        "curve.kind",
        `Generator "${row.value.id}" on line ${row.line}: reactive_mode ${row.value.reactive_mode} cannot use curve "${found.id}" of kind ${found.kind}`,
        cellAt(file, row.line, "reactive_curve"),
        [bus.id],
      );
    }
    if (curve !== undefined && !curveIds.has(curve.toLowerCase())) {
      if (curves.bad.has(curve.toLowerCase())) taintBus(bus.id, "ref.rejected", file, row.line);
      else {
        error(
          "ref.unknown",
          `Generator "${row.value.id}" on line ${row.line}: reactive_curve "${curve}" is not a curve of ${tables.reactiveCurves.file}`,
          cellAt(file, row.line, "reactive_curve"),
          [bus.id],
        );
      }
    }
    generators.push(toGenerator(row, bus.id, file));
  }

  const relays = buildRelays(ctx, switches);
  const { applications, generationForecasts } = buildPlanningInputs(ctx);
  const taintedBuses = ctx.taintedBuses();
  const placeholderBuses = ctx.placeholderBuses;
  const placeholderEdges = ctx.placeholderEdges;
  return {
    value: {
      settings,
      buses: [...ctx.busById.values()],
      sources,
      lineTypes: lineTypes.value,
      lines,
      transformers,
      switches,
      loads,
      shunts,
      generators,
      reactiveCurves: curves.value,
      relays,
      fuseCurves: fuseCurves.value,
      applications,
      generationForecasts,
      taintedBuses,
      headers: ctx.headers,
      placeholderBuses: [...placeholderBuses].filter((b) => b !== ""),
      placeholderEdges,
    },
    diagnostics,
  };
}
