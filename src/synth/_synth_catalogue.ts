/** Fixed data of synthetic fleets: conductor types, fuse and relay data, the tables written once, and the streamed tables' headers. */
import { round, sig3 } from "./_number_text.ts";

export interface SynthOptions {
  /** Number of MV feeders, ≥ 1. */
  readonly feeders: number;
  /** Buses per feeder, exactly (see the module comment), ≥ 2. */
  readonly busesPerFeeder: number;
  /** Any safe integer; the same seed gives the same text. */
  readonly seed: number;
  /** Total generation as a share of total peak demand, ≥ 0; default 0.6. */
  readonly dgPenetration?: number;
}

/** A piece of one CSV file; append the chunks of a file in the order they come. */
export interface FleetChunk {
  readonly file: string;
  readonly text: string;
}

/** A buffer is yielded once it reaches this many characters (a few rows may follow). */
export const CHUNK_CHARS = 256 * 1024;

export const MV_KV = 20;
export const SQRT3 = Math.sqrt(3);
/** Largest reach, km per kV of nominal voltage. */
export const MAX_REACH_KM_PER_KV = 1.2;
/** Largest linear voltage-drop estimate at peak, pu. */
export const DROP_BUDGET_PU = 0.06;
/** Design loading of a conductor by the downstream load or generation. */
export const DESIGN_LOADING = 0.75;

// ---------------------------------------------------------------------------------------
// Static tables

/** Invented 20 kV line types with the usual magnitudes of XLPE Al cables and Al/St lines. */
export const TYPES = [
  // id, cable?, class, r1, x1, r0, x0 (ohm/km), c1, c0 (uF/km), ampacity, emergency (A)
  ["SYN-C20-AL50", 1, "20 kV XLPE 3x1x50 Al", 0.641, 0.14, 2.5, 0.5, 0.17, 0.17, 170, 195],
  ["SYN-C20-AL95", 1, "20 kV XLPE 3x1x95 Al", 0.32, 0.13, 1.28, 0.46, 0.21, 0.21, 250, 285],
  ["SYN-C20-AL150", 1, "20 kV XLPE 3x1x150 Al", 0.206, 0.12, 0.82, 0.43, 0.25, 0.25, 320, 365],
  ["SYN-C20-AL240", 1, "20 kV XLPE 3x1x240 Al", 0.125, 0.11, 0.5, 0.4, 0.3, 0.3, 420, 480],
  ["SYN-C20-AL300", 1, "20 kV XLPE 3x1x300 Al", 0.1, 0.105, 0.4, 0.38, 0.33, 0.33, 470, 535],
  ["SYN-OH20-ALST35", 0, "Al/St 35/6", 0.83, 0.4, 0.98, 1.19, 0.0088, 0.0049, 145, 160],
  ["SYN-OH20-ALST50", 0, "Al/St 50/8", 0.59, 0.39, 0.74, 1.17, 0.009, 0.005, 185, 205],
  ["SYN-OH20-ALST95", 0, "Al/St 95/15", 0.31, 0.37, 0.46, 1.11, 0.0095, 0.0052, 300, 330],
  ["SYN-OH20-ALST150", 0, "Al/St 150/25", 0.195, 0.36, 0.345, 1.08, 0.01, 0.0055, 430, 470],
] as const;

export const TYPE_ID = TYPES.map((t) => t[0]);
export const TYPE_R1 = TYPES.map((t) => t[3]);
export const TYPE_X1 = TYPES.map((t) => t[4]);
export const TYPE_AMP = TYPES.map((t) => t[9]);
/** Type indexes per construction, ascending ampacity. */
export const CABLE = 0, OVERHEAD = 1;
export const BY_CONSTRUCTION = [[0, 1, 2, 3, 4], [5, 6, 7, 8]] as const;
export const C_AL150 = 2, C_AL240 = 3, C_AL300 = 4;

/** Expulsion fuse links, A; the smallest with twice the lateral current is chosen. */
export const FUSE_RATINGS = [25, 40, 63, 100] as const;
/** Multiples of the link rating at which the curves are given. */
export const FUSE_MULTIPLES = [2, 2.5, 3, 4, 6, 10, 16, 25, 40] as const;

export const VOLT_VAR_CURVE = "SYN-VV";
export const PF_OF_P_CURVE = "SYN-PFP";

export function staticTables(company: string): FleetChunk[] {
  const types = TYPES.map((t) =>
    `${t[0]},${t[1] ? "cable" : "overhead"},${t[2]},${t[3]},${t[4]},${t[5]},${t[6]},${t[7]},${
      t[8]
    },${t[9]},${t[10]}\n`
  ).join("");
  let fuses = "";
  for (const rating of FUSE_RATINGS) {
    // Invented inverse shape: t = 150 / (M^2.6 − 5.3) s at M times the rating, from about
    // 200 s at twice the rating down to about 0.01 s; clearing adds 10 % and 10 ms.
    for (const kind of ["melt", "clear"] as const) {
      for (const m of FUSE_MULTIPLES) {
        const melt = 150 / (m ** 2.6 - 5.3);
        const t = kind === "melt" ? melt : melt * 1.1 + 0.01;
        fuses += `SYN-EXP-${rating},${kind},${round(rating * m, 1)},${sig3(t)}\n`;
      }
    }
  }
  return [
    {
      file: "settings.csv",
      text: `company,frequency [Hz],earth_resistivity [ohm m]\n${company},50,100\n`,
    },
    {
      file: "line_types.csv",
      text:
        "id,construction,conductor_class,r1 [ohm/km],x1 [ohm/km],r0 [ohm/km],x0 [ohm/km],c1 [uF/km],c0 [uF/km],ampacity [A],ampacity_emergency [A]\n" +
        types,
    },
    { file: "fuse_curves.csv", text: `curve,kind,current [A],time [s]\n${fuses}` },
    {
      file: "reactive_curves.csv",
      text: "curve,kind,point,x,y\n" +
        `${VOLT_VAR_CURVE},volt_var,1,0.93,0.4\n${VOLT_VAR_CURVE},volt_var,2,0.97,0\n` +
        `${VOLT_VAR_CURVE},volt_var,3,1.03,0\n${VOLT_VAR_CURVE},volt_var,4,1.07,-0.4\n` +
        `${PF_OF_P_CURVE},power_factor_of_p,1,0,1\n${PF_OF_P_CURVE},power_factor_of_p,2,0.3,1\n` +
        `${PF_OF_P_CURVE},power_factor_of_p,3,0.7,0.97\n${PF_OF_P_CURVE},power_factor_of_p,4,1,0.93\n`,
    },
  ];
}

/** Streamed tables, in a fixed order, with their headers. */
export const T_BUSES = 0, T_SOURCES = 1, T_TRANSFORMERS = 2, T_LINES = 3, T_SWITCHES = 4;
export const T_LOADS = 5, T_GENERATORS = 6, T_RELAYS = 7;
export const STREAMED = [
  ["buses.csv", "id,nominal_voltage [kV],feeder,name"],
  [
    "grid_sources.csv",
    "id,bus,nominal_voltage [kV],sc_power_max [MVA],sc_power_min [MVA],r_to_x,x0_to_x1,r0_to_x0,voltage_setpoint [pu],earthing",
  ],
  [
    "transformers.csv",
    "id,hv_bus,lv_bus,rated_power [MVA],hv_voltage [kV],lv_voltage [kV],sc_voltage [%],load_losses [kW],no_load_losses [kW],zero_seq_sc_voltage [%],vector_group,tap_side,tap_min,tap_max,tap_neutral,tap_position,tap_step [%],on_load_tap_changer,control_setpoint [pu],control_band [pu],hv_earthing,lv_earthing,lv_neutral_r [ohm]",
  ],
  ["lines.csv", "id,from,to,type,length [km]"],
  [
    "switches.csv",
    "id,from,to,kind,normal_state,heads_feeder,rated_current [A],breaking_current [kA],making_current [kA],fuse_curve,fast_shots,delayed_shots",
  ],
  [
    "loads.csv",
    "id,bus,peak_p [kW],peak_power_factor,min_p [kW],min_power_factor,customers",
  ],
  [
    "generators.csv",
    "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_curve,ride_through,fault_current_limit [pu]",
  ],
  [
    "relay_stages.csv",
    "relay,device,stage,element,characteristic,pickup [A],time_multiplier,delay [s],curve_set",
  ],
] as const;
