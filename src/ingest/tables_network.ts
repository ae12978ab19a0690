/**
 * Table declarations of the network format, part 1: the network itself (settings,
 * buses, grid sources, line types and their detail tables, lines, transformers,
 * switching devices). docs/network-format.md describes every column.
 */
import { z } from "zod";
import {
  between,
  choice,
  defineTable,
  freeText,
  idText,
  integerText,
  nonNegative,
  numberText,
  optional,
  phasesText,
  positive,
  required,
  withDefault,
  yesNo,
} from "./table_kit.ts";
import { PHASES_ABC } from "../model/phases.ts";
import { parseVectorGroup } from "../model/vector_group.ts";

export const EARTHING_KINDS = ["solid", "impedance", "isolated", "resonant"] as const;

export const settingsTable = defineTable({
  file: "settings.csv",
  required: false,
  key: [],
  busColumns: [],
  units: { frequency: "Hz", earth_resistivity: "ohm m" },
  row: (q) =>
    z.object({
      company: optional(freeText),
      frequency: withDefault(positive(q.frequency), 50),
      earth_resistivity: withDefault(positive(q.earth_resistivity), 100),
    }),
});

export const busTable = defineTable({
  file: "buses.csv",
  required: true,
  key: ["id"],
  busColumns: ["id"],
  units: { nominal_voltage: "kV", x: "m", y: "m" },
  row: (q) =>
    z.object({
      id: required(idText),
      nominal_voltage: required(positive(q.nominal_voltage)),
      x: optional(q.x),
      y: optional(q.y),
      customers: withDefault(nonNegative(integerText), 0),
      feeder: optional(idText),
      name: optional(freeText),
    }),
});

export const gridSourceTable = defineTable({
  file: "grid_sources.csv",
  required: true,
  key: ["id"],
  busColumns: ["bus"],
  units: {
    nominal_voltage: "kV",
    sc_power_max: "MVA",
    sc_power_min: "MVA",
    voltage_setpoint: "pu",
    voltage_angle: "deg",
    neutral_r: "ohm",
    neutral_x: "ohm",
  },
  row: (q) =>
    z.object({
      id: required(idText),
      bus: required(idText),
      nominal_voltage: required(positive(q.nominal_voltage)),
      sc_power_max: required(positive(q.sc_power_max)),
      sc_power_min: required(positive(q.sc_power_min)),
      r_to_x: withDefault(nonNegative(numberText), 0.1),
      x0_to_x1: withDefault(nonNegative(numberText), 1),
      r0_to_x0: withDefault(nonNegative(numberText), 0.1),
      voltage_setpoint: withDefault(between(q.voltage_setpoint, 0.8, 1.2), 1),
      voltage_angle: withDefault(q.voltage_angle, 0),
      earthing: withDefault(choice(EARTHING_KINDS), "solid"),
      neutral_r: withDefault(nonNegative(q.neutral_r), 0),
      neutral_x: withDefault(q.neutral_x, 0),
    }).superRefine((r, ctx) => {
      if (r.sc_power_min > r.sc_power_max) {
        ctx.addIssue({
          code: "custom",
          path: ["sc_power_min"],
          message: "must not exceed sc_power_max",
        });
      }
    }),
});

export const lineTypeTable = defineTable({
  file: "line_types.csv",
  required: true,
  key: ["id"],
  busColumns: [],
  units: {
    r1: "ohm/km",
    x1: "ohm/km",
    r0: "ohm/km",
    x0: "ohm/km",
    b1: "uS/km",
    b0: "uS/km",
    c1: "nF/km",
    c0: "nF/km",
    ampacity: "A",
    ampacity_emergency: "A",
  },
  row: (q) =>
    z.object({
      id: required(idText),
      model: withDefault(choice(["sequence", "matrix", "geometry"] as const), "sequence"),
      construction: required(choice(["overhead", "cable"] as const)),
      conductor_class: optional(freeText),
      r1: optional(nonNegative(q.r1)),
      x1: optional(q.x1),
      r0: optional(nonNegative(q.r0)),
      x0: optional(q.x0),
      b1: optional(nonNegative(q.b1)),
      b0: optional(nonNegative(q.b0)),
      c1: optional(nonNegative(q.c1)),
      c0: optional(nonNegative(q.c0)),
      ampacity: required(positive(q.ampacity)),
      ampacity_emergency: optional(positive(q.ampacity_emergency)),
    }).superRefine((r, ctx) => {
      if (r.model !== "sequence") return;
      for (const k of ["r1", "x1", "r0", "x0"] as const) {
        if (r[k] === undefined) {
          ctx.addIssue({ code: "custom", path: [k], message: "is required for model sequence" });
        }
      }
      if (r.b1 !== undefined && r.c1 !== undefined) {
        ctx.addIssue({ code: "custom", path: ["c1"], message: "must not be given with b1" });
      }
      if (r.b0 !== undefined && r.c0 !== undefined) {
        ctx.addIssue({ code: "custom", path: ["c0"], message: "must not be given with b0" });
      }
    }),
});

const PHASE_LETTER = choice(["a", "b", "c"] as const);

export const lineTypeMatrixTable = defineTable({
  file: "line_type_matrix.csv",
  required: false,
  key: ["type", "row", "col"],
  busColumns: [],
  units: { r: "ohm/km", x: "ohm/km", b: "uS/km" },
  row: (q) =>
    z.object({
      type: required(idText),
      row: required(PHASE_LETTER),
      col: required(PHASE_LETTER),
      r: required(q.r),
      x: required(q.x),
      b: withDefault(q.b, 0),
    }),
});

export const conductorTable = defineTable({
  file: "conductors.csv",
  required: false,
  key: ["id"],
  busColumns: [],
  units: { resistance: "ohm/km", gmr: "mm", diameter: "mm", ampacity: "A" },
  row: (q) =>
    z.object({
      id: required(idText),
      resistance: required(positive(q.resistance)),
      gmr: required(positive(q.gmr)),
      diameter: required(positive(q.diameter)),
      ampacity: optional(positive(q.ampacity)),
    }),
});

export const lineGeometryTable = defineTable({
  file: "line_geometry.csv",
  required: false,
  key: ["type", "position"],
  busColumns: [],
  units: { x: "m", y: "m" },
  row: (q) =>
    z.object({
      type: required(idText),
      position: required(choice(["a", "b", "c", "n"] as const)),
      conductor: required(idText),
      x: required(q.x),
      y: required(positive(q.y)),
    }),
});

export const lineTable = defineTable({
  file: "lines.csv",
  required: true,
  key: ["id"],
  busColumns: ["from", "to"],
  units: { length: "km" },
  row: (q) =>
    z.object({
      id: required(idText),
      from: required(idText),
      to: required(idText),
      type: required(idText),
      length: required(positive(q.length)),
      phases: withDefault(phasesText, PHASES_ABC),
      in_service: withDefault(yesNo, true),
    }).superRefine((r, ctx) => {
      if (r.from === r.to) {
        ctx.addIssue({ code: "custom", path: ["to"], message: "must differ from from" });
      }
    }),
});

/** Winding connection letters and clock number, e.g. Dyn11, YNyn0, Yzn11. */
const vectorGroupText = z.string().transform((s, ctx) => {
  const group = parseVectorGroup(s);
  if (group === undefined) {
    ctx.issues.push({
      code: "custom",
      input: s,
      message:
        "must be a vector group such as Dyn11, YNyn0 or Yzn11 (clock 0 to 11; odd for star–delta, even for star–star and delta–delta)",
    });
    return z.NEVER;
  }
  return group;
});

export const transformerTable = defineTable({
  file: "transformers.csv",
  required: false,
  key: ["id"],
  busColumns: ["hv_bus", "lv_bus"],
  units: {
    rated_power: "MVA",
    hv_voltage: "kV",
    lv_voltage: "kV",
    sc_voltage: "%",
    load_losses: "kW",
    no_load_losses: "kW",
    zero_seq_sc_voltage: "%",
    tap_step: "%",
    control_setpoint: "pu",
    control_band: "pu",
    ldc_r: "ohm",
    ldc_x: "ohm",
    hv_neutral_r: "ohm",
    hv_neutral_x: "ohm",
    lv_neutral_r: "ohm",
    lv_neutral_x: "ohm",
  },
  row: (q) =>
    z.object({
      id: required(idText),
      hv_bus: required(idText),
      lv_bus: required(idText),
      rated_power: required(positive(q.rated_power)),
      hv_voltage: required(positive(q.hv_voltage)),
      lv_voltage: required(positive(q.lv_voltage)),
      sc_voltage: required(between(q.sc_voltage, 0.5, 40)),
      load_losses: withDefault(nonNegative(q.load_losses), 0),
      no_load_losses: withDefault(nonNegative(q.no_load_losses), 0),
      zero_seq_sc_voltage: optional(positive(q.zero_seq_sc_voltage)),
      vector_group: required(vectorGroupText),
      tap_side: withDefault(choice(["hv", "lv"] as const), "hv"),
      tap_min: withDefault(integerText, 0),
      tap_max: withDefault(integerText, 0),
      tap_neutral: withDefault(integerText, 0),
      tap_position: withDefault(integerText, 0),
      tap_step: withDefault(nonNegative(q.tap_step), 0),
      on_load_tap_changer: withDefault(yesNo, false),
      control_setpoint: optional(between(q.control_setpoint, 0.8, 1.2)),
      control_band: optional(positive(q.control_band)),
      ldc_r: withDefault(q.ldc_r, 0),
      ldc_x: withDefault(q.ldc_x, 0),
      hv_earthing: withDefault(choice(EARTHING_KINDS), "solid"),
      hv_neutral_r: withDefault(nonNegative(q.hv_neutral_r), 0),
      hv_neutral_x: withDefault(q.hv_neutral_x, 0),
      lv_earthing: withDefault(choice(EARTHING_KINDS), "solid"),
      lv_neutral_r: withDefault(nonNegative(q.lv_neutral_r), 0),
      lv_neutral_x: withDefault(q.lv_neutral_x, 0),
    }).superRefine((r, ctx) => {
      if (r.lv_voltage >= r.hv_voltage) {
        ctx.addIssue({ code: "custom", path: ["lv_voltage"], message: "must be below hv_voltage" });
      }
      if (r.tap_min > r.tap_max) {
        ctx.addIssue({ code: "custom", path: ["tap_min"], message: "must not exceed tap_max" });
      }
      if (r.tap_position < r.tap_min || r.tap_position > r.tap_max) {
        ctx.addIssue({
          code: "custom",
          path: ["tap_position"],
          message: `must be between tap_min ${r.tap_min} and tap_max ${r.tap_max}`,
        });
      }
      if (r.on_load_tap_changer && r.control_setpoint === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["control_setpoint"],
          message: "is required when on_load_tap_changer is yes",
        });
      }
      if (r.hv_bus === r.lv_bus) {
        ctx.addIssue({ code: "custom", path: ["lv_bus"], message: "must differ from hv_bus" });
      }
    }),
});

export const SWITCH_KINDS = [
  "breaker",
  "recloser",
  "fuse",
  "load_break_switch",
  "disconnector",
] as const;

export const switchTable = defineTable({
  file: "switches.csv",
  required: false,
  key: ["id"],
  busColumns: ["from", "to"],
  units: { rated_current: "A", breaking_current: "A", making_current: "A" },
  row: (q) =>
    z.object({
      id: required(idText),
      from: required(idText),
      to: required(idText),
      kind: required(choice(SWITCH_KINDS)),
      normal_state: withDefault(choice(["closed", "open"] as const), "closed"),
      heads_feeder: optional(idText),
      rated_current: optional(positive(q.rated_current)),
      breaking_current: optional(positive(q.breaking_current)),
      making_current: optional(positive(q.making_current)),
      fuse_curve: optional(idText),
      fast_shots: withDefault(nonNegative(integerText), 0),
      delayed_shots: withDefault(nonNegative(integerText), 0),
      phases: withDefault(phasesText, PHASES_ABC),
    }).superRefine((r, ctx) => {
      if (r.from === r.to) {
        ctx.addIssue({ code: "custom", path: ["to"], message: "must differ from from" });
      }
      if (r.kind === "fuse" && r.fuse_curve === undefined) {
        ctx.addIssue({ code: "custom", path: ["fuse_curve"], message: "is required for a fuse" });
      }
      if (r.kind !== "fuse" && r.fuse_curve !== undefined) {
        ctx.addIssue({ code: "custom", path: ["fuse_curve"], message: "applies to fuses only" });
      }
      if (r.heads_feeder !== undefined && r.normal_state === "open") {
        ctx.addIssue({
          code: "custom",
          path: ["normal_state"],
          message: "must be closed for a feeder-head device",
        });
      }
    }),
});
