/**
 * Table declarations of the network format, part 2: what connects to buses (loads,
 * generators and their reactive-power curves) and the protection (relay stages, fuse
 * time–current points). docs/network-format.md describes every column.
 */
import { z } from "zod";
import {
  between,
  choice,
  defineTable,
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

const CONNECTION = choice(["wye", "delta"] as const);

export const loadTable = defineTable({
  file: "loads.csv",
  required: false,
  key: ["id"],
  busColumns: ["bus"],
  units: {
    peak_p: "kW",
    peak_q: "kvar",
    min_p: "kW",
    min_q: "kvar",
    motor_share: "%",
    stall_voltage: "pu",
    stall_time: "s",
  },
  row: (q) =>
    z.object({
      id: required(idText),
      bus: required(idText),
      peak_p: required(nonNegative(q.peak_p)),
      peak_q: optional(q.peak_q),
      peak_power_factor: optional(between(numberText, 0.1, 1)),
      min_p: required(nonNegative(q.min_p)),
      min_q: optional(q.min_q),
      min_power_factor: optional(between(numberText, 0.1, 1)),
      voltage_model: withDefault(
        choice(["power", "current", "impedance", "zip"] as const),
        "power",
      ),
      zip_z: optional(between(numberText, -1, 2)),
      zip_i: optional(between(numberText, -1, 2)),
      zip_p: optional(between(numberText, -1, 2)),
      motor_share: withDefault(between(q.motor_share, 0, 100), 0),
      stall_voltage: optional(between(q.stall_voltage, 0, 1)),
      stall_time: optional(positive(q.stall_time)),
      customers: withDefault(nonNegative(integerText), 0),
      phases: withDefault(phasesText, PHASES_ABC),
      connection: withDefault(CONNECTION, "wye"),
    }).superRefine((r, ctx) => {
      for (const level of ["peak", "min"] as const) {
        const qv = r[`${level}_q`], pf = r[`${level}_power_factor`];
        if (qv === undefined && pf === undefined) {
          ctx.addIssue({
            code: "custom",
            path: [`${level}_q`],
            message: `or ${level}_power_factor is required`,
          });
        } else if (qv !== undefined && pf !== undefined) {
          ctx.addIssue({
            code: "custom",
            path: [`${level}_power_factor`],
            message: `must not be given with ${level}_q`,
          });
        }
      }
      if (r.min_p > r.peak_p) {
        ctx.addIssue({ code: "custom", path: ["min_p"], message: "must not exceed peak_p" });
      }
      if (r.voltage_model === "zip") {
        const { zip_z: zz, zip_i: zi, zip_p: zp } = r;
        if (zz === undefined || zi === undefined || zp === undefined) {
          ctx.addIssue({
            code: "custom",
            path: ["zip_z"],
            message: "zip_z, zip_i and zip_p are required for voltage_model zip",
          });
        } else if (Math.abs(zz + zi + zp - 1) > 1e-6) {
          ctx.addIssue({
            code: "custom",
            path: ["zip_p"],
            message: `zip_z + zip_i + zip_p must equal 1 (found ${zz + zi + zp})`,
          });
        }
      }
    }),
});

export const shuntTable = defineTable({
  file: "shunts.csv",
  required: false,
  key: ["id"],
  busColumns: ["bus"],
  units: { rated_reactive_power: "kvar" },
  row: (q) =>
    z.object({
      id: required(idText),
      bus: required(idText),
      rated_reactive_power: required(q.rated_reactive_power),
      in_service: withDefault(yesNo, true),
      phases: withDefault(phasesText, PHASES_ABC),
    }).superRefine((r, ctx) => {
      if (r.rated_reactive_power === 0) {
        ctx.addIssue({
          code: "custom",
          path: ["rated_reactive_power"],
          message: "must not be zero (positive for a capacitor, negative for a reactor)",
        });
      }
    }),
});

export const GENERATOR_KINDS = ["converter", "synchronous", "induction"] as const;
export const REACTIVE_MODES = [
  "unity",
  "fixed_power_factor",
  "fixed_q",
  "volt_var",
  "power_factor_of_p",
  "voltage_control",
] as const;

export const generatorTable = defineTable({
  file: "generators.csv",
  required: false,
  key: ["id"],
  busColumns: ["bus"],
  units: {
    rated_power: "kVA",
    active_power: "kW",
    reactive_power: "kvar",
    voltage_setpoint: "pu",
    fault_current_limit: "pu",
    xd_subtransient: "pu",
  },
  row: (q) =>
    z.object({
      id: required(idText),
      bus: required(idText),
      kind: required(choice(GENERATOR_KINDS)),
      rated_power: required(positive(q.rated_power)),
      active_power: required(nonNegative(q.active_power)),
      phases: withDefault(phasesText, PHASES_ABC),
      connection: withDefault(CONNECTION, "wye"),
      reactive_mode: withDefault(choice(REACTIVE_MODES), "unity"),
      power_factor: optional(between(numberText, 0.1, 1)),
      power_factor_sense: optional(choice(["absorbing", "injecting"] as const)),
      reactive_power: optional(q.reactive_power),
      reactive_curve: optional(idText),
      voltage_setpoint: optional(between(q.voltage_setpoint, 0.8, 1.2)),
      ride_through: optional(idText),
      fault_current_limit: optional(between(q.fault_current_limit, 0.5, 10)),
      xd_subtransient: optional(between(q.xd_subtransient, 0.01, 2)),
      r_to_x: optional(nonNegative(numberText)),
      locked_rotor_ratio: optional(between(numberText, 1, 15)),
    }).superRefine((r, ctx) => {
      const need = (field: keyof typeof r, why: string) => {
        if (r[field] === undefined) {
          ctx.addIssue({ code: "custom", path: [field], message: `is required ${why}` });
        }
      };
      if (r.active_power > r.rated_power * 1.0000001) {
        ctx.addIssue({
          code: "custom",
          path: ["active_power"],
          message: "must not exceed rated_power",
        });
      }
      if (r.reactive_mode === "fixed_power_factor") {
        need("power_factor", "for reactive_mode fixed_power_factor");
        need("power_factor_sense", "for reactive_mode fixed_power_factor");
      }
      if (r.reactive_mode === "fixed_q") need("reactive_power", "for reactive_mode fixed_q");
      if (r.reactive_mode === "volt_var" || r.reactive_mode === "power_factor_of_p") {
        need("reactive_curve", `for reactive_mode ${r.reactive_mode}`);
      }
      if (r.reactive_mode === "voltage_control") {
        need("voltage_setpoint", "for reactive_mode voltage_control");
      }
      if (r.kind === "synchronous") need("xd_subtransient", "for a synchronous generator");
      if (r.kind === "induction") need("locked_rotor_ratio", "for an induction generator");
    }),
});

export const reactiveCurveTable = defineTable({
  file: "reactive_curves.csv",
  required: false,
  key: ["curve", "point"],
  busColumns: [],
  units: {},
  row: () =>
    z.object({
      curve: required(idText),
      kind: required(choice(["volt_var", "power_factor_of_p"] as const)),
      point: required(positive(integerText)),
      x: required(numberText),
      y: required(numberText),
    }),
});

export const RELAY_CHARACTERISTICS = [
  "iec_standard_inverse",
  "iec_very_inverse",
  "iec_extremely_inverse",
  "iec_long_time_inverse",
  "ieee_moderately_inverse",
  "ieee_very_inverse",
  "ieee_extremely_inverse",
  "definite_time",
  "instantaneous",
] as const;

export const relayStageTable = defineTable({
  file: "relay_stages.csv",
  required: false,
  key: ["relay", "stage"],
  busColumns: [],
  units: { pickup: "A", delay: "s" },
  row: (q) =>
    z.object({
      relay: required(idText),
      device: required(idText),
      stage: required(positive(integerText)),
      element: withDefault(choice(["phase", "earth"] as const), "phase"),
      characteristic: required(choice(RELAY_CHARACTERISTICS)),
      pickup: required(positive(q.pickup)),
      time_multiplier: optional(positive(numberText)),
      delay: optional(nonNegative(q.delay)),
      direction: withDefault(
        choice(["forward", "reverse", "non_directional"] as const),
        "non_directional",
      ),
      curve_set: withDefault(choice(["fast", "delayed", "both"] as const), "both"),
    }).superRefine((r, ctx) => {
      const inverse = r.characteristic.startsWith("iec_") || r.characteristic.startsWith("ieee_");
      if (inverse && r.time_multiplier === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["time_multiplier"],
          message: `is required for characteristic ${r.characteristic}`,
        });
      }
      if (r.characteristic === "definite_time" && r.delay === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["delay"],
          message: "is required for characteristic definite_time",
        });
      }
    }),
});

export const fuseCurveTable = defineTable({
  file: "fuse_curves.csv",
  required: false,
  key: ["curve", "kind", "current"],
  busColumns: [],
  units: { current: "A", time: "s" },
  row: (q) =>
    z.object({
      curve: required(idText),
      kind: required(choice(["melt", "clear"] as const)),
      current: required(positive(q.current)),
      time: required(positive(q.time)),
    }),
});
