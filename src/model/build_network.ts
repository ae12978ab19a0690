/**
 * Model stage: validated tables → the internal Network, with cross-table checks
 * (unknown references, voltage levels, transformer windings). Rows that failed
 * validation, and elements that fail a cross-table check, taint the buses they name, so
 * the topology stage sets their feeders aside instead of studying a partial network.
 */
import type { NetworkTables } from "../ingest/read_network.ts";
import type { RejectedRow, TableResult } from "../ingest/read_table.ts";
import type { TableSpec } from "../ingest/table_kit.ts";
import { TABLES } from "../ingest/read_network.ts";
import { type Diagnostic, makeDiagnostic, type SourceLocation } from "./diagnostic.ts";
import type {
  Bus,
  Earthing,
  EarthingKind,
  Generator,
  GridSource,
  Line,
  Load,
  Network,
  PlaceholderEdge,
  Relay,
  SwitchDevice,
  Taint,
  Transformer,
} from "./network.ts";
import { resolveLineTypes } from "./resolve_line_types.ts";
import { groupFuseCurves, groupReactiveCurves, toGenerator, toLoad } from "./build_devices.ts";
import { phaseCount, phaseLetters } from "./phases.ts";

/** Relative difference above which two nominal voltages are taken as different levels. */
export const VOLTAGE_LEVEL_TOLERANCE = 0.05;
/** Relative difference between a transformer winding and its bus's nominal voltage. */
export const WINDING_TOLERANCE = 0.15;

export interface BuildNetworkResult {
  readonly value: Network;
  readonly diagnostics: readonly Diagnostic[];
}

type Row<K extends keyof NetworkTables> = NetworkTables[K]["rows"][number];

export function buildNetwork(tables: NetworkTables): BuildNetworkResult {
  const diagnostics: Diagnostic[] = [];
  const taint = new Map<string, Map<string, Taint>>();
  const taintBus = (busId: string | undefined, code: string, file: string, line: number) => {
    if (busId === undefined || busId === "") return;
    const key = busId.toLowerCase();
    if (!taint.has(key)) taint.set(key, new Map());
    taint.get(key)!.set(`${code}@${file}:${line}`, { code, file, line });
  };
  const error = (code: string, message: string, at: SourceLocation, buses: string[]) => {
    diagnostics.push(makeDiagnostic(code, "error", message, { at }));
    for (const b of buses) taintBus(b, code, at.file, at.line ?? 0);
  };
  /** Connectivity of rows that could not be used, so their feeder is found and set aside. */
  const placeholderEdges: PlaceholderEdge[] = [];
  const placeholder = (id: string | undefined, a: string | undefined, b: string | undefined) => {
    if (a && b) placeholderEdges.push({ id: id ?? "", aBusId: a, bBusId: b });
  };

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

  // Buses: ids are matched case-insensitively throughout.
  const busById = new Map<string, Bus>();
  for (const { value: r, line } of tables.buses.rows) {
    const bus: Bus = {
      id: r.id,
      vnKv: r.nominal_voltage,
      ...(r.x === undefined ? {} : { xM: r.x }),
      ...(r.y === undefined ? {} : { yM: r.y }),
      customers: r.customers,
      ...(r.feeder === undefined ? {} : { feederHint: r.feeder }),
      ...(r.name === undefined ? {} : { name: r.name }),
      at: { file: tables.buses.file, line },
    };
    busById.set(r.id.toLowerCase(), bus);
  }
  const placeholderBuses = new Set(tables.buses.rejected.map((r) => r.cells.id ?? ""));
  const rejectedBusIds = new Set(
    tables.buses.rejected.map((r) => (r.cells.id ?? "").toLowerCase()),
  );
  /** Checks a bus reference; unknown ones are errors located at the referencing cell. */
  const refBus = (
    what: string,
    file: string,
    line: number,
    field: string,
    id: string,
    spec: TableSpec<string, unknown>,
  ): Bus | undefined => {
    const bus = busById.get(id.toLowerCase());
    if (bus !== undefined) return bus;
    if (rejectedBusIds.has(id.toLowerCase()) || !tables.buses.present) {
      taintBus(id, "ref.rejected", file, line);
      return undefined;
    }
    error(
      "ref.unknown",
      `${what} on line ${line}: ${field} "${id}" is not a bus of ${tables.buses.file}`,
      {
        file,
        line,
        ...columnOf(tables, spec, field),
        field,
      },
      [],
    );
    return undefined;
  };

  // Rejected rows and broken tables: taint what they name.
  for (
    const [key, spec] of Object.entries(TABLES) as [
      keyof NetworkTables,
      TableSpec<string, unknown>,
    ][]
  ) {
    const t = tables[key] as TableResult<Record<string, unknown>>;
    const rows: readonly { line: number; cells: Readonly<Record<string, unknown>> }[] =
      t.headerBroken
        ? [...t.rejected, ...t.rows.map((r) => ({ line: r.line, cells: r.value }))]
        : t.rejected;
    for (const r of rows) {
      const ends = spec.busColumns.map((c) => String(r.cells[c] ?? ""));
      for (const b of ends) taintBus(b, "row.rejected", t.file, r.line);
      if (ends.length === 2) placeholder(String(r.cells.id ?? ""), ends[0], ends[1]);
    }
  }

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
    const bus = refBus(`Grid source "${r.id}"`, file, line, "bus", r.bus, TABLES.gridSources);
    if (bus === undefined) continue;
    if (!sameLevel(bus.vnKv, r.nominal_voltage, VOLTAGE_LEVEL_TOLERANCE)) {
      error(
        "voltage.mismatch",
        `Grid source "${r.id}": nominal_voltage ${r.nominal_voltage} kV differs from bus "${bus.id}" at ${bus.vnKv} kV`,
        {
          file,
          line,
          ...columnOf(tables, TABLES.gridSources, "nominal_voltage"),
          field: "nominal_voltage",
        },
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

  const lines: Line[] = [];
  for (const { value: r, line } of tables.lines.rows) {
    const file = tables.lines.file;
    const from = refBus(`Line "${r.id}"`, file, line, "from", r.from, TABLES.lines);
    const to = refBus(`Line "${r.id}"`, file, line, "to", r.to, TABLES.lines);
    const type = typeIds.get(r.type.toLowerCase());
    const ends = [r.from, r.to];
    if (badTypeIds.has(r.type.toLowerCase())) {
      ends.forEach((b) => taintBus(b, "ref.rejected", file, line));
    } else if (type === undefined) {
      error(
        "ref.unknown",
        `Line "${r.id}" on line ${line}: type "${r.type}" is not a line type of ${tables.lineTypes.file}`,
        { file, line, ...columnOf(tables, TABLES.lines, "type"), field: "type" },
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
        { file, line, ...columnOf(tables, TABLES.lines, "phases"), field: "phases" },
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
        { file, line, ...columnOf(tables, TABLES.lines, "to"), field: "to" },
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

  const transformers: Transformer[] = [];
  for (const { value: r, line } of tables.transformers.rows) {
    const file = tables.transformers.file;
    const hv = refBus(`Transformer "${r.id}"`, file, line, "hv_bus", r.hv_bus, TABLES.transformers);
    const lv = refBus(`Transformer "${r.id}"`, file, line, "lv_bus", r.lv_bus, TABLES.transformers);
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
          { file, line, ...columnOf(tables, TABLES.transformers, side), field: side },
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

  const fuseCurves = groupFuseCurves(tables, diagnostics);
  const fuseIds = new Set(fuseCurves.value.map((f) => f.id.toLowerCase()));
  const switches: SwitchDevice[] = [];
  for (const { value: r, line } of tables.switches.rows) {
    const file = tables.switches.file;
    const from = refBus(`Switch "${r.id}"`, file, line, "from", r.from, TABLES.switches);
    const to = refBus(`Switch "${r.id}"`, file, line, "to", r.to, TABLES.switches);
    if (from === undefined || to === undefined) {
      [r.from, r.to].forEach((b) => taintBus(b, "ref.unknown", file, line));
      if (r.normal_state === "closed") placeholder(r.id, r.from, r.to);
      continue;
    }
    if (!sameLevel(from.vnKv, to.vnKv, VOLTAGE_LEVEL_TOLERANCE)) {
      error(
        "voltage.mismatch",
        `Switch "${r.id}" on line ${line} joins bus "${from.id}" at ${from.vnKv} kV and bus "${to.id}" at ${to.vnKv} kV`,
        { file, line, ...columnOf(tables, TABLES.switches, "to"), field: "to" },
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
          { file, line, ...columnOf(tables, TABLES.switches, "fuse_curve"), field: "fuse_curve" },
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

  const loads: Load[] = [];
  for (const row of tables.loads.rows) {
    const bus = refBus(
      `Load "${row.value.id}"`,
      tables.loads.file,
      row.line,
      "bus",
      row.value.bus,
      TABLES.loads,
    );
    if (bus !== undefined) loads.push(toLoad(row, bus.id, tables.loads.file));
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
      TABLES.generators,
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
        {
          file,
          line: row.line,
          ...columnOf(tables, TABLES.generators, "reactive_curve"),
          field: "reactive_curve",
        },
        [bus.id],
      );
    }
    if (curve !== undefined && !curveIds.has(curve.toLowerCase())) {
      if (curves.bad.has(curve.toLowerCase())) taintBus(bus.id, "ref.rejected", file, row.line);
      else {
        error(
          "ref.unknown",
          `Generator "${row.value.id}" on line ${row.line}: reactive_curve "${curve}" is not a curve of ${tables.reactiveCurves.file}`,
          {
            file,
            line: row.line,
            ...columnOf(tables, TABLES.generators, "reactive_curve"),
            field: "reactive_curve",
          },
          [bus.id],
        );
      }
    }
    generators.push(toGenerator(row, bus.id, file));
  }

  const switchById = new Map(switches.map((sw) => [sw.id.toLowerCase(), sw]));
  const relays: Relay[] = [];
  const byRelay = new Map<string, Row<"relayStages">[]>();
  for (const row of tables.relayStages.rows) {
    const k = row.value.relay.toLowerCase();
    if (!byRelay.has(k)) byRelay.set(k, []);
    byRelay.get(k)!.push(row);
  }
  const rejectedSwitches = new Set(
    rejectedIds(tables.switches.rejected, "id").map((x) => x.toLowerCase()),
  );
  for (const rows of byRelay.values()) {
    const first = rows[0]!;
    const file = tables.relayStages.file;
    const device = switchById.get(first.value.device.toLowerCase());
    const mixed = rows.find((r) =>
      r.value.device.toLowerCase() !== first.value.device.toLowerCase()
    );
    if (mixed !== undefined) {
      error(
        "relay.device",
        `Relay "${first.value.relay}" on line ${mixed.line}: device "${mixed.value.device}" differs from "${first.value.device}" on line ${first.line}`,
        {
          file,
          line: mixed.line,
          ...columnOf(tables, TABLES.relayStages, "device"),
          field: "device",
        },
        device === undefined ? [] : [device.fromBusId, device.toBusId],
      );
    }
    if (device === undefined) {
      if (!rejectedSwitches.has(first.value.device.toLowerCase())) {
        error(
          "ref.unknown",
          `Relay "${first.value.relay}" on line ${first.line}: device "${first.value.device}" is not a switch of ${tables.switches.file}`,
          {
            file,
            line: first.line,
            ...columnOf(tables, TABLES.relayStages, "device"),
            field: "device",
          },
          [],
        );
      }
      continue;
    }
    relays.push({
      id: first.value.relay,
      deviceId: device.id,
      stages: rows.map((r) => ({
        stage: r.value.stage,
        element: r.value.element,
        characteristic: r.value.characteristic,
        pickupA: r.value.pickup,
        ...(r.value.time_multiplier === undefined
          ? {}
          : { timeMultiplier: r.value.time_multiplier }),
        ...(r.value.delay === undefined ? {} : { delayS: r.value.delay }),
        direction: r.value.direction,
        curveSet: r.value.curve_set,
      })).sort((a, b) => a.stage - b.stage),
      at: { file, line: first.line },
    });
  }
  for (const r of tables.relayStages.rejected) {
    const sw = switchById.get((r.cells.device ?? "").toLowerCase());
    if (sw !== undefined) {
      const file = tables.relayStages.file;
      [sw.fromBusId, sw.toBusId].forEach((b) => taintBus(b, "row.rejected", file, r.line));
    }
  }

  const taintedBuses: Record<string, Taint[]> = {};
  for (const [k, reasons] of taint) taintedBuses[k] = [...reasons.values()];
  return {
    value: {
      settings,
      buses: [...busById.values()],
      sources,
      lineTypes: lineTypes.value,
      lines,
      transformers,
      switches,
      loads,
      generators,
      reactiveCurves: curves.value,
      relays,
      fuseCurves: fuseCurves.value,
      taintedBuses,
      headers: Object.fromEntries(
        (Object.keys(TABLES) as (keyof NetworkTables)[]).map((k) => [
          tables[k].file,
          tables[k].columns,
        ]),
      ),
      placeholderBuses: [...placeholderBuses].filter((b) => b !== ""),
      placeholderEdges,
    },
    diagnostics,
  };
}

function sameLevel(a: number, b: number, tolerance: number): boolean {
  return Math.abs(a - b) <= tolerance * Math.max(Math.abs(a), Math.abs(b));
}

function earthing(kind: EarthingKind, rOhm: number, xOhm: number): Earthing {
  return { kind, rOhm, xOhm };
}

function rejectedIds(rows: readonly RejectedRow[], column: string): string[] {
  return rows.map((r) => r.cells[column] ?? "").filter((x) => x !== "");
}

/** The CSV column of a field in a table's header, when the header has it. */
function columnOf(
  tables: NetworkTables,
  spec: TableSpec<string, unknown>,
  field: string,
): { column?: number } {
  const key = (Object.keys(TABLES) as (keyof NetworkTables)[]).find((k) => TABLES[k] === spec);
  const idx = key === undefined ? -1 : tables[key].columns.indexOf(field);
  return idx < 0 ? {} : { column: idx + 1 };
}
