/**
 * Deterministic synthetic fleets for benchmarks and large tests, written in the CSV network
 * format (docs/network-format.md). Every name is invented and marked `SYN-`; the fleet
 * describes no real network.
 *
 * Shape of the fleet (rules of the trade are marked "common practice"):
 * - Substations of 6–10 feeders (8 on average; the last one of a fleet may have 4 or 5, and
 *   a fleet of fewer than 6 feeders is one substation): a 110 kV grid source, one 40 MVA
 *   110/20 kV YNyn0 transformer with an on-load tap changer holding a set-point of
 *   1.00–1.03 pu and its 20 kV star point earthed through 15–40 Ω (resistance-earthed MV,
 *   common practice), and a 20 kV busbar. YNd11 is not used: the format has no earthing transformer, so a delta
 *   MV winding would leave the 20 kV network unearthed, at odds with the earth stages.
 * - Each feeder is a radial 20 kV tree behind a head breaker with a relay (IEC standard
 *   inverse phase and earth stages and a definite-time or instantaneous high-set stage):
 *   a trunk of about √n sections, laterals of about √n buses hung off the trunk (most behind
 *   a fuse, the largest behind a disconnector), each lateral a spine of about 1.5·√L
 *   sections with short spurs, so the depth stays near 2·√n.
 * - Feeder kinds: urban (85–100 % cable), mixed (30–65 %) and rural (3–20 %, overhead
 *   beyond a cable exit from the substation, common practice). Conductors are sized for the
 *   downstream load or generation at ≤ 75 % of rating and never grow downstream: the trunk
 *   keeps the head size to mid-trunk and steps down twice towards its end. A feeder planned
 *   for much generation gets a larger head cable, and generation that even the largest could
 *   not carry back at 85 % of its rating is left out (a connection study would refuse it).
 * - Reach is 3–22 km by kind and never above 1.2 km per kV (24 km at 20 kV; common practice:
 *   a feeder's reach in km stays near its nominal kV).
 * - Peak loading of the head section is 30–70 % of its rating (a few in 100 feeders 85–100 %,
 *   so thermal findings are rare but possible), lowered where the linear voltage-drop
 *   estimate Σ (R·P + X·Q)/U² would exceed 6 % (long rural lines are voltage-limited,
 *   common practice). Loads sit at most line-fed buses, with peak and minimum demand and
 *   power factors.
 * - Converter PV at 8–20 % of the load buses (25–40 % on one feeder per substation, which
 *   also gets 2.2–3× the average share so generation-caused voltage change shows), scaled
 *   per substation so that total generation is `dgPenetration` × total peak demand.
 * - A recloser (one fast and two delayed trips) at mid-trunk of longer non-urban feeders,
 *   normally-open load-break switches between neighbouring feeders of one substation.
 *
 * Sizes: every feeder has exactly `busesPerFeeder` buses whose `feeder` cell names it (the
 * head bus at the substation, the fuse, disconnector and recloser buses and all tree buses);
 * each substation adds two buses of its own (110 kV and 20 kV busbar) with an empty
 * `feeder` cell.
 *
 * The fleet is streamed: the generator yields CSV text chunk by chunk, so a fleet of
 * 10 million buses never sits in memory. Chunks of different files interleave; the chunks of
 * one file come in order, its first chunk starts with the header, and every chunk is at most
 * CHUNK_CHARS characters plus a few rows, far below 1 MB (ASCII, so characters are bytes).
 */

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

const MV_KV = 20;
const SQRT3 = Math.sqrt(3);
/** Largest reach, km per kV of nominal voltage. */
const MAX_REACH_KM_PER_KV = 1.2;
/** Largest linear voltage-drop estimate at peak, pu. */
const DROP_BUDGET_PU = 0.06;
/** Design loading of a conductor by the downstream load or generation. */
const DESIGN_LOADING = 0.75;

// ---------------------------------------------------------------------------------------
// Static tables

/** Invented 20 kV line types with the usual magnitudes of XLPE Al cables and Al/St lines. */
const TYPES = [
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

const TYPE_ID = TYPES.map((t) => t[0]);
const TYPE_R1 = TYPES.map((t) => t[3]);
const TYPE_X1 = TYPES.map((t) => t[4]);
const TYPE_AMP = TYPES.map((t) => t[9]);
/** Type indexes per construction, ascending ampacity. */
const CABLE = 0, OVERHEAD = 1;
const BY_CONSTRUCTION = [[0, 1, 2, 3, 4], [5, 6, 7, 8]] as const;
const C_AL150 = 2, C_AL240 = 3, C_AL300 = 4;

/** Expulsion fuse links, A; the smallest with twice the lateral current is chosen. */
const FUSE_RATINGS = [25, 40, 63, 100] as const;
/** Multiples of the link rating at which the curves are given. */
const FUSE_MULTIPLES = [2, 2.5, 3, 4, 6, 10, 16, 25, 40] as const;

const VOLT_VAR_CURVE = "SYN-VV";
const PF_OF_P_CURVE = "SYN-PFP";

function staticTables(company: string): FleetChunk[] {
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
const T_BUSES = 0, T_SOURCES = 1, T_TRANSFORMERS = 2, T_LINES = 3, T_SWITCHES = 4;
const T_LOADS = 5, T_GENERATORS = 6, T_RELAYS = 7;
const STREAMED = [
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

// ---------------------------------------------------------------------------------------
// Seeded random numbers

/** Mixes two 32-bit words into one (a multiply–xorshift finaliser). */
function hash32(a: number, b: number): number {
  let h = Math.imul(a ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(b + 0x7f4a7c15, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x7feb352d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x846ca68b);
  h ^= h >>> 16;
  return h >>> 0;
}

type Random = () => number;

/** A small 32-bit generator (mulberry32 style), uniform in [0, 1). */
function makeRandom(seed32: number): Random {
  let s = seed32 >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = Math.imul(s ^ (s >>> 15), 1 | s);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const uniform = (rnd: Random, lo: number, hi: number) => lo + (hi - lo) * rnd();

function gaussian(rnd: Random): number {
  const u = 1 - rnd();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rnd());
}

// ---------------------------------------------------------------------------------------
// Feeder plans and models

const URBAN = 0, MIXED = 1, RURAL = 2;
const EDGE_HEAD = 0, EDGE_LINE = 1, EDGE_RECLOSER = 2, EDGE_LATERAL_SWITCH = 3;
const ROLE_TRUNK = 0, ROLE_LATERAL = 1, ROLE_SPUR = 2;
const MODE_UNITY = 0, MODE_VOLT_VAR = 1, MODE_PF_OF_P = 2;
const DISCONNECTOR = 254, DISCONNECTOR_630 = 255;

interface FeederPlan {
  readonly index: number;
  readonly kind: number;
  readonly headType: number;
  readonly loading: number;
  readonly reachKm: number;
  readonly cableShare: number;
  readonly lateralShare: number;
  readonly trunkFactor: number;
  readonly pfLo: number;
  readonly pfHi: number;
  readonly minShareLo: number;
  readonly kwPerCustomer: number;
  /** Share of the substation's average DG share this feeder gets (normalised later). */
  dgFactor: number;
  highShare: boolean;
}

/** Per-feeder scratch arrays, reused across substations. Bus k is `B{k + 1}`. */
interface FeederModel {
  cap: number;
  nBus: number;
  parent: Int32Array;
  edge: Uint8Array;
  role: Uint8Array;
  pos: Float64Array;
  lenKm: Float64Array;
  cons: Uint8Array;
  type: Int8Array;
  upAmp: Float64Array;
  loadPKw: Float64Array;
  loadQKvar: Float64Array;
  pfPeak: Float64Array;
  minShare: Float64Array;
  customers: Int32Array;
  dgPKw: Float64Array;
  dgMode: Uint8Array;
  dgPark: Uint8Array;
  fuse: Uint8Array;
  pDown: Float64Array;
  qDown: Float64Array;
  gDown: Float64Array;
  acc: Float64Array;
  scratch: Int32Array;
  scratch2: Int32Array;
  // results
  headType: number;
  peakKw: number;
  peakKvar: number;
  dgKw: number;
  trunkEnd: number;
  lateralEnd: number;
  recloserBus: number;
}

function allocateModel(cap: number): FeederModel {
  return {
    cap,
    nBus: 0,
    parent: new Int32Array(cap),
    edge: new Uint8Array(cap),
    role: new Uint8Array(cap),
    pos: new Float64Array(cap),
    lenKm: new Float64Array(cap),
    cons: new Uint8Array(cap),
    type: new Int8Array(cap),
    upAmp: new Float64Array(cap),
    loadPKw: new Float64Array(cap),
    loadQKvar: new Float64Array(cap),
    pfPeak: new Float64Array(cap),
    minShare: new Float64Array(cap),
    customers: new Int32Array(cap),
    dgPKw: new Float64Array(cap),
    dgMode: new Uint8Array(cap),
    dgPark: new Uint8Array(cap),
    fuse: new Uint8Array(cap),
    pDown: new Float64Array(cap),
    qDown: new Float64Array(cap),
    gDown: new Float64Array(cap),
    acc: new Float64Array(cap),
    scratch: new Int32Array(cap),
    scratch2: new Int32Array(cap),
    headType: C_AL240,
    peakKw: 0,
    peakKvar: 0,
    dgKw: 0,
    trunkEnd: 0,
    lateralEnd: 0,
    recloserBus: -1,
  };
}

function planFeeder(index: number, area: number, rnd: Random): FeederPlan {
  const draw = rnd();
  const kind = area === URBAN
    ? (draw < 0.7 ? URBAN : MIXED)
    : area === MIXED
    ? (draw < 0.2 ? URBAN : draw < 0.7 ? MIXED : RURAL)
    : (draw < 0.3 ? MIXED : RURAL);
  const heavy = rnd() < 0.03;
  const headType = kind === URBAN
    ? (rnd() < 0.35 ? C_AL300 : C_AL240)
    : kind === MIXED
    ? (rnd() < 0.5 ? C_AL240 : C_AL150)
    : (rnd() < 0.6 ? C_AL300 : C_AL150); // cable exit matched to an Al/St 150 or 95 trunk
  const [lo, hi] = heavy
    ? [0.85, 1.0]
    : kind === URBAN
    ? [0.4, 0.7]
    : kind === MIXED
    ? [0.35, 0.65]
    : [0.3, 0.55];
  return {
    index,
    kind,
    headType,
    loading: uniform(rnd, lo, hi),
    reachKm: kind === URBAN
      ? uniform(rnd, 3, 8)
      : kind === MIXED
      ? uniform(rnd, 7, 14)
      : uniform(rnd, 12, 22),
    cableShare: kind === URBAN
      ? uniform(rnd, 0.85, 1)
      : kind === MIXED
      ? uniform(rnd, 0.3, 0.65)
      : uniform(rnd, 0.03, 0.2),
    lateralShare: uniform(rnd, 0.2, 0.35),
    trunkFactor: uniform(rnd, 0.8, 1.25),
    pfLo: kind === URBAN ? 0.94 : kind === MIXED ? 0.93 : 0.92,
    pfHi: kind === URBAN ? 0.98 : 0.97,
    minShareLo: kind === URBAN ? 0.3 : kind === MIXED ? 0.25 : 0.2,
    kwPerCustomer: kind === URBAN
      ? uniform(rnd, 1.5, 2.5)
      : kind === MIXED
      ? uniform(rnd, 2, 3.5)
      : uniform(rnd, 2.5, 5),
    dgFactor: uniform(rnd, 0.4, 1.2),
    highShare: false,
  };
}

/** Peak demand the plan aims at, kW (before the voltage-drop limit). */
function targetPeakKw(plan: FeederPlan): number {
  return plan.loading * TYPE_AMP[plan.headType]! * SQRT3 * MV_KV * 0.95;
}

/** The smallest type of a construction that carries minA, never above maxA. */
function pickType(cons: number, minA: number, maxA: number, fallback: number): number {
  const list = BY_CONSTRUCTION[cons]!;
  let t: number = list[list.length - 1]!;
  for (const i of list) {
    if (TYPE_AMP[i]! >= minA) {
      t = i;
      break;
    }
  }
  if (TYPE_AMP[t]! > maxA) {
    t = fallback;
    for (const i of list) if (TYPE_AMP[i]! <= maxA) t = i;
  }
  return t;
}

/** Builds one feeder: tree, loads, generation, conductors, lengths; fills the model. */
function buildFeeder(
  m: FeederModel,
  plan: FeederPlan,
  n: number,
  dgTargetKw: number,
  rnd: Random,
): void {
  let nb = 0;
  const add = (par: number, edge: number, role: number, pos: number, len: number, cons: number) => {
    const k = nb++;
    m.parent[k] = par;
    m.edge[k] = edge;
    m.role[k] = role;
    m.pos[k] = pos;
    m.lenKm[k] = len;
    m.cons[k] = cons;
    m.loadPKw[k] = 0;
    m.loadQKvar[k] = 0;
    m.dgPKw[k] = 0;
    return k;
  };
  const jitter = () => 0.6 + 0.8 * rnd();

  // Trunk, with a recloser bus at mid-trunk on longer non-urban feeders.
  add(-1, EDGE_HEAD, ROLE_TRUNK, 0, 0, CABLE);
  const rest = n - 1;
  const trunk = Math.max(1, Math.min(rest, Math.round(Math.sqrt(rest) * plan.trunkFactor)));
  const recloser = plan.kind !== URBAN && trunk >= 4 && plan.reachKm >= 9 && rest - trunk >= 1;
  const trunkSectionKm = plan.reachKm * (1 - plan.lateralShare) / trunk;
  const trunkBuses = m.scratch;
  let prev = 0;
  m.recloserBus = -1;
  for (let i = 0; i < trunk; i++) {
    const x = i / trunk;
    if (recloser && i === trunk >> 1) {
      prev = m.recloserBus = add(prev, EDGE_RECLOSER, ROLE_TRUNK, x, 0, CABLE);
    }
    const cons = i === 0 || x < plan.cableShare ? CABLE : OVERHEAD;
    prev = trunkBuses[i] = add(prev, EDGE_LINE, ROLE_TRUNK, x, trunkSectionKm * jitter(), cons);
  }
  m.trunkEnd = prev;
  m.lateralEnd = prev;

  // Laterals of about √n buses, spread evenly along the trunk (not at its end).
  const remaining = n - nb;
  if (remaining > 0) {
    const target = Math.max(1, Math.round(Math.sqrt(rest) * uniform(rnd, 0.8, 1.2)));
    const count = Math.ceil(remaining / target);
    const sizes = m.scratch2;
    const w = m.acc;
    let wSum = 0;
    for (let j = 0; j < count; j++) wSum += w[j] = 0.6 + 0.8 * rnd();
    let given = 0;
    for (let j = 0; j < count; j++) {
      sizes[j] = 1 + Math.floor((remaining - count) * w[j]! / wSum);
      given += sizes[j]!;
    }
    for (let j = 0; given < remaining; j = (j + 1) % count, given++) sizes[j]!++;
    const candidates = trunk >= 2 ? trunk - 1 : 1;
    for (let j = 0; j < count; j++) {
      const at = trunkBuses[Math.floor((j + 0.5) * candidates / count)]!;
      const size = sizes[j]!;
      const cable = m.pos[at]! < plan.cableShare ? rnd() < 0.85 : rnd() < plan.cableShare * 0.3;
      const cons = cable ? CABLE : OVERHEAD;
      let start = at, units = size;
      if (size >= 3 && rnd() < 0.85) {
        start = add(at, EDGE_LATERAL_SWITCH, ROLE_LATERAL, 0, 0, cons);
        units--;
      }
      const spine = Math.max(1, Math.min(units, Math.round(Math.sqrt(units) * 1.5)));
      const spurs = units - spine;
      const spurTarget = Math.max(1, Math.round(Math.sqrt(units) / 1.5));
      const sectionKm = plan.reachKm * plan.lateralShare / (spine + spurTarget);
      // The spine is written now; its buses are remembered in the tail of scratch.
      const spineAt = m.cap - spine;
      let p = start;
      for (let s = 0; s < spine; s++) {
        p = trunkBuses[spineAt + s] = add(
          p,
          EDGE_LINE,
          ROLE_LATERAL,
          0,
          sectionKm * jitter(),
          cons,
        );
      }
      m.lateralEnd = p;
      if (spurs > 0) {
        const q = Math.ceil(spurs / spurTarget);
        const base = Math.floor(spurs / q), extra = spurs % q;
        for (let i = 0; i < q; i++) {
          let b = trunkBuses[spineAt + Math.floor((i + 0.5) * spine / q)]!;
          for (let s = 0; s < base + (i < extra ? 1 : 0); s++) {
            b = add(b, EDGE_LINE, ROLE_SPUR, 0, 0.8 * sectionKm * jitter(), cons);
          }
        }
      }
    }
  }
  m.nBus = nb;

  // Loads at most line-fed buses, lognormal sizes with a few large customers.
  const loadBuses = m.scratch2;
  let nLoads = 0, wSum = 0;
  for (let k = 1; k < nb; k++) {
    if (m.edge[k] !== EDGE_LINE || rnd() < 0.08) continue;
    loadBuses[nLoads++] = k;
  }
  if (nLoads === 0) loadBuses[nLoads++] = nb - 1;
  const pTarget = targetPeakKw(plan);
  for (let i = 0; i < nLoads; i++) {
    const k = loadBuses[i]!;
    const big = rnd() < 0.03;
    const w = Math.exp(0.6 * gaussian(rnd)) * (big ? 5 : 1);
    m.loadPKw[k] = w;
    m.customers[k] = big ? -1 : 0;
    wSum += w;
  }
  for (let i = 0; i < nLoads; i++) {
    const k = loadBuses[i]!;
    const p = pTarget * m.loadPKw[k]! / wSum;
    const pf = round(uniform(rnd, plan.pfLo, plan.pfHi), 2);
    m.loadPKw[k] = p;
    m.pfPeak[k] = pf;
    m.loadQKvar[k] = p * Math.tan(Math.acos(pf));
    m.minShare[k] = uniform(rnd, plan.minShareLo, plan.minShareLo + 0.1);
    m.customers[k] = m.customers[k] === -1
      ? 1 + Math.floor(rnd() * 3)
      : Math.max(1, Math.round(p / plan.kwPerCustomer));
  }

  // A feeder planned for much generation gets a larger head cable; what even the largest
  // cannot carry back at 85 % of its rating (net of the minimum demand) is not installed.
  m.headType = plan.headType;
  let dgKw = dgTargetKw;
  if (dgKw > 0) {
    let minKw = 0;
    for (let i = 0; i < nLoads; i++) {
      const k = loadBuses[i]!;
      minKw += m.loadPKw[k]! * m.minShare[k]!;
    }
    const needA = (dgKw - minKw) / (SQRT3 * MV_KV) / 0.85;
    while (TYPE_AMP[m.headType]! < needA && m.headType < C_AL300) m.headType++;
    dgKw = Math.min(dgKw, 0.85 * TYPE_AMP[m.headType]! * SQRT3 * MV_KV + minKw);
  }

  // PV at a share of the load buses (partial shuffle), parks among rooftop systems.
  if (dgKw > 0) {
    const share = plan.highShare ? uniform(rnd, 0.25, 0.4) : uniform(rnd, 0.08, 0.2);
    const sites = Math.max(1, Math.min(nLoads, Math.round(share * nLoads)));
    let gSum = 0;
    for (let i = 0; i < sites; i++) {
      const j = i + Math.floor(rnd() * (nLoads - i));
      const k = loadBuses[j]!;
      loadBuses[j] = loadBuses[i]!;
      loadBuses[i] = k;
      const park = (plan.highShare && i === 0) || rnd() < 0.1;
      const w = park ? uniform(rnd, 6, 15) : uniform(rnd, 0.5, 1.5);
      m.dgPKw[k] = w;
      m.dgPark[k] = park ? 1 : 0;
      const r = rnd();
      m.dgMode[k] = park
        ? (r < (plan.highShare ? 0.6 : 0.3) ? MODE_UNITY : r < 0.75 ? MODE_VOLT_VAR : MODE_PF_OF_P)
        : (r < 0.7 ? MODE_UNITY : MODE_PF_OF_P);
      gSum += w;
    }
    for (let i = 0; i < sites; i++) {
      const k = loadBuses[i]!;
      m.dgPKw[k] = dgKw * m.dgPKw[k]! / gSum;
    }
  }

  // Downstream sums (children have larger indexes than their parents).
  const { parent, pDown, qDown, gDown } = m;
  for (let k = 0; k < nb; k++) {
    pDown[k] = m.loadPKw[k]!;
    qDown[k] = m.loadQKvar[k]!;
    gDown[k] = m.dgPKw[k]!;
  }
  for (let k = nb - 1; k > 0; k--) {
    const p = parent[k]!;
    pDown[p]! += pDown[k]!;
    qDown[p]! += qDown[k]!;
    gDown[p]! += gDown[k]!;
  }

  // Conductors: sized for the downstream load or generation, trunk floors, never larger
  // than the section upstream (the taper).
  const headAmp = TYPE_AMP[m.headType]!;
  m.upAmp[0] = Infinity;
  m.type[0] = m.headType;
  for (let k = 1; k < nb; k++) {
    const p = parent[k]!;
    if (m.edge[k] !== EDGE_LINE) {
      m.upAmp[k] = m.upAmp[p]!;
      m.type[k] = m.type[p]!;
      continue;
    }
    let t: number;
    if (p === 0) {
      t = m.headType;
    } else {
      const iA = Math.max(Math.hypot(pDown[k]!, qDown[k]!), gDown[k]!) / (SQRT3 * MV_KV);
      const role = m.role[k]!, x = m.pos[k]!;
      const list = BY_CONSTRUCTION[m.cons[k]!]!;
      const floorA = role === ROLE_TRUNK
        ? headAmp * (x < 0.5 ? 1 : x < 0.8 ? 0.7 : 0.45)
        : role === ROLE_LATERAL
        ? TYPE_AMP[list[1]!]!
        : 0;
      t = pickType(m.cons[k]!, Math.max(floorA, iA / DESIGN_LOADING), m.upAmp[p]!, m.type[p]!);
    }
    m.type[k] = t;
    m.upAmp[k] = TYPE_AMP[t]!;
  }

  // Reach: at most MAX_REACH_KM_PER_KV per kV.
  const dist = m.acc;
  let reach = 0;
  dist[0] = 0;
  for (let k = 1; k < nb; k++) {
    dist[k] = dist[parent[k]!]! + m.lenKm[k]!;
    if (dist[k]! > reach) reach = dist[k]!;
  }
  const maxReach = MAX_REACH_KM_PER_KV * MV_KV;
  if (reach > maxReach) {
    const f = maxReach / reach;
    for (let k = 1; k < nb; k++) m.lenKm[k] = m.lenKm[k]! * f;
  }
  for (let k = 1; k < nb; k++) {
    if (m.edge[k] === EDGE_LINE) m.lenKm[k] = Math.max(0.01, round(m.lenKm[k]!, 3));
  }

  // Linear voltage-drop estimate at peak; scale demand and generation to the budget.
  const dv = m.acc;
  let maxDv = 0;
  dv[0] = 0;
  for (let k = 1; k < nb; k++) {
    const t = m.type[k]!;
    dv[k] = dv[parent[k]!]! +
      (m.edge[k] === EDGE_LINE
        ? m.lenKm[k]! * (TYPE_R1[t]! * pDown[k]! + TYPE_X1[t]! * qDown[k]!) /
          (MV_KV * MV_KV * 1000)
        : 0);
    if (dv[k]! > maxDv) maxDv = dv[k]!;
  }
  const f = maxDv > DROP_BUDGET_PU ? DROP_BUDGET_PU / maxDv : 1;
  m.peakKw = m.peakKvar = m.dgKw = 0;
  for (let k = 0; k < nb; k++) {
    m.loadPKw[k] = m.loadPKw[k]! * f;
    m.loadQKvar[k] = m.loadQKvar[k]! * f;
    m.dgPKw[k] = m.dgPKw[k]! * f;
    pDown[k] = pDown[k]! * f;
    qDown[k] = qDown[k]! * f;
    gDown[k] = gDown[k]! * f;
    m.peakKw += m.loadPKw[k]!;
    m.peakKvar += m.loadQKvar[k]!;
    m.dgKw += m.dgPKw[k]!;
  }

  // Lateral protection: the smallest fuse link with twice the lateral's current, or a
  // disconnector where even the largest link is too small (common practice).
  for (let k = 1; k < nb; k++) {
    if (m.edge[k] !== EDGE_LATERAL_SWITCH) continue;
    const iA = Math.max(Math.hypot(pDown[k]!, qDown[k]!), gDown[k]!) / (SQRT3 * MV_KV);
    let r = 1.5 * iA > 400 ? DISCONNECTOR_630 : DISCONNECTOR;
    for (let i = FUSE_RATINGS.length - 1; i >= 0; i--) if (FUSE_RATINGS[i]! >= 2 * iA) r = i;
    m.fuse[k] = r;
  }
}

// ---------------------------------------------------------------------------------------
// Rows

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** Three significant digits. */
function sig3(x: number): number {
  return Number(x.toPrecision(3));
}

const pad = (k: number, width: number) => String(k).padStart(width, "0");

/** The per-file text buffers of the stream. */
interface Writer {
  /** Appends a row (with its newline); true when the buffer should be yielded. */
  put(table: number, row: string): boolean;
  take(table: number): FleetChunk;
}

/** Writes one built feeder's rows, yielding every buffer that fills up. */
function* writeFeeder(
  out: Writer,
  m: FeederModel,
  feederId: string,
  mvBus: string,
  busWidth: number,
  dgScale: number,
  rnd: Random,
): Generator<FleetChunk> {
  const ids: string[] = new Array(m.nBus);
  const pre = `${feederId}-`;
  for (let k = 0; k < m.nBus; k++) ids[k] = `${pre}B${pad(k + 1, busWidth)}`;
  const headAmp = TYPE_AMP[m.headType]!;

  // Head breaker and its relay.
  const iPeakA = Math.hypot(m.peakKw, m.peakKvar) / (SQRT3 * MV_KV);
  const pickupA = 10 *
    Math.round(Math.min(1.1 * headAmp, Math.max(0.6 * headAmp, 1.8 * iPeakA)) / 10);
  const tms = round(uniform(rnd, 0.15, 0.3) / 0.05, 0) * 0.05;
  const highSetA = 100 * Math.round(Math.min(5000, Math.max(2000, 8 * pickupA)) / 100);
  const instantaneous = rnd() < 0.25;
  const delayS = [0.05, 0.1, 0.15][Math.floor(rnd() * 3)]!;
  const earthA = [40, 50, 60][Math.floor(rnd() * 3)]!;
  const earthTms = round(uniform(rnd, 0.2, 0.35) / 0.05, 0) * 0.05;
  const relay = `${pre}RH`, head = `${pre}CB`;
  if (out.put(T_SWITCHES, `${head},${mvBus},${ids[0]},breaker,closed,${feederId},630,16,40,,,\n`)) {
    yield out.take(T_SWITCHES);
  }
  out.put(
    T_RELAYS,
    `${relay},${head},1,phase,iec_standard_inverse,${pickupA},${round(tms, 2)},,\n` +
      (instantaneous
        ? `${relay},${head},2,phase,instantaneous,${highSetA},,,\n`
        : `${relay},${head},2,phase,definite_time,${highSetA},,${delayS},\n`) +
      `${relay},${head},3,earth,iec_standard_inverse,${earthA},${round(earthTms, 2)},,\n`,
  );

  // Recloser with fast and delayed curves.
  if (m.recloserBus >= 0) {
    const r = m.recloserBus;
    const iA = Math.hypot(m.pDown[r]!, m.qDown[r]!) / (SQRT3 * MV_KV);
    const pick = 10 * Math.round(Math.min(0.7 * pickupA, Math.max(80, 2 * iA)) / 10);
    const rr = `${pre}RR`, dev = `${pre}RC`;
    out.put(
      T_SWITCHES,
      `${dev},${ids[m.parent[r]!]},${ids[r]},recloser,closed,,630,12.5,31.5,,1,2\n`,
    );
    out.put(
      T_RELAYS,
      `${rr},${dev},1,phase,iec_very_inverse,${pick},0.05,,fast\n` +
        `${rr},${dev},2,phase,iec_standard_inverse,${pick},${tms <= 0.15 ? 0.1 : 0.15},,delayed\n` +
        `${rr},${dev},3,earth,iec_standard_inverse,${earthA >= 50 ? 30 : 20},0.05,,fast\n` +
        `${rr},${dev},4,earth,iec_standard_inverse,${earthA >= 50 ? 30 : 20},0.15,,delayed\n`,
    );
  }

  for (let k = 0; k < m.nBus; k++) {
    const id = ids[k]!;
    const num = pad(k + 1, busWidth);
    if (out.put(T_BUSES, `${id},20,${feederId},\n`)) yield out.take(T_BUSES);
    const edge = m.edge[k]!;
    if (edge === EDGE_LINE) {
      const row = `${pre}L${num},${ids[m.parent[k]!]},${id},${TYPE_ID[m.type[k]!]},${m.lenKm[k]}\n`;
      if (out.put(T_LINES, row)) yield out.take(T_LINES);
    } else if (edge === EDGE_LATERAL_SWITCH) {
      const r = m.fuse[k]!;
      const row = r === DISCONNECTOR
        ? `${pre}DS${num},${ids[m.parent[k]!]},${id},disconnector,closed,,400,,,,,\n`
        : r === DISCONNECTOR_630
        ? `${pre}DS${num},${ids[m.parent[k]!]},${id},disconnector,closed,,630,,,,,\n`
        : `${pre}FU${num},${ids[m.parent[k]!]},${id},fuse,closed,,${FUSE_RATINGS[r]},8,,SYN-EXP-${
          FUSE_RATINGS[r]
        },,\n`;
      if (out.put(T_SWITCHES, row)) yield out.take(T_SWITCHES);
    }
    const p = m.loadPKw[k]!;
    if (p > 0) {
      const pf = m.pfPeak[k]!;
      const row = `${pre}LD${num},${id},${round(p, 1)},${pf},${round(p * m.minShare[k]!, 1)},${
        Math.min(0.99, round(pf + 0.02, 2))
      },${m.customers[k]}\n`;
      if (out.put(T_LOADS, row)) yield out.take(T_LOADS);
    }
    const g = m.dgPKw[k]! * dgScale;
    if (g > 0) {
      const pKw = Math.max(0.1, round(g, 1));
      const park = m.dgPark[k] === 1;
      const mode = m.dgMode[k]!;
      const row = `${pre}PV${num},${id},converter,${round(pKw * 1.1, 1)},${pKw},${
        mode === MODE_UNITY
          ? "unity,"
          : mode === MODE_VOLT_VAR
          ? `volt_var,${VOLT_VAR_CURVE}`
          : `power_factor_of_p,${PF_OF_P_CURVE}`
      },${park ? "III,1.2" : "II,1.1"}\n`;
      if (out.put(T_GENERATORS, row)) yield out.take(T_GENERATORS);
    }
  }
  if (out.put(T_RELAYS, "")) yield out.take(T_RELAYS);
}

// ---------------------------------------------------------------------------------------
// The fleet

function checkOptions(o: SynthOptions): number {
  const p = o.dgPenetration ?? 0.6;
  if (!Number.isInteger(o.feeders) || o.feeders < 1) {
    throw new RangeError(`feeders must be a whole number ≥ 1, not ${o.feeders}`);
  }
  if (!Number.isInteger(o.busesPerFeeder) || o.busesPerFeeder < 2) {
    throw new RangeError(`busesPerFeeder must be a whole number ≥ 2, not ${o.busesPerFeeder}`);
  }
  if (!Number.isSafeInteger(o.seed)) {
    throw new RangeError(`seed must be a safe integer, not ${o.seed}`);
  }
  if (!Number.isFinite(p) || p < 0) {
    throw new RangeError(`dgPenetration must be a number ≥ 0, not ${p}`);
  }
  return p;
}

/**
 * Streams a synthetic fleet as CSV text, table by table, in chunks of bounded size, so a
 * 10,000 × 1,000 fleet never sits in memory. Append each chunk to its file.
 */
export function* synthesizeFleet(o: SynthOptions): Generator<FleetChunk> {
  const penetration = checkOptions(o);
  const n = o.busesPerFeeder;
  const root = hash32(o.seed | 0, Math.floor(o.seed / 4294967296) | 0);
  const feederWidth = Math.max(6, String(o.feeders).length);
  const busWidth = Math.max(4, String(n).length);
  const stationWidth = Math.max(4, String(Math.ceil(o.feeders / 6)).length);
  yield* staticTables(`SYN synthetic fleet (seed ${o.seed})`);

  const bufs: string[] = STREAMED.map(([, header]) => `${header}\n`);
  const out: Writer = {
    put(t, row) {
      return (bufs[t] += row).length >= CHUNK_CHARS;
    },
    take(t) {
      const chunk = { file: STREAMED[t]![0], text: bufs[t]! };
      bufs[t] = "";
      return chunk;
    },
  };
  const pool: FeederModel[] = [];
  const plans: FeederPlan[] = [];

  for (let f = 0, s = 1; f < o.feeders; s++) {
    const rs = makeRandom(hash32(root, 0x51a7 + 2 * s));
    const left = o.feeders - f;
    let k = Math.min(left, 6 + Math.floor(rs() * 5));
    if (left - k > 0 && left - k < 4) k = left <= 10 ? left : left - 4; // no tiny last station
    const area = rs() < 0.3 ? URBAN : rs() < 0.5 ? MIXED : RURAL;

    // Plans; one feeder (a non-urban one where there is any) gets the large DG share.
    plans.length = 0;
    for (let j = 0; j < k; j++) {
      plans.push(planFeeder(f + j, area, makeRandom(hash32(root, 2 * (f + j) + 1))));
    }
    const nonUrban = plans.filter((p) => p.kind !== URBAN);
    const pickFrom = nonUrban.length > 0 ? nonUrban : plans;
    const high = pickFrom[Math.floor(rs() * pickFrom.length)]!;
    high.highShare = true;
    high.dgFactor = uniform(rs, 2.2, 3);
    let wP = 0, wD = 0;
    for (const p of plans) {
      wP += targetPeakKw(p);
      wD += targetPeakKw(p) * p.dgFactor;
    }
    for (const p of plans) p.dgFactor *= wP / wD;

    // Build the models, then scale generation so the substation meets the penetration.
    let peak = 0, dg = 0;
    const rnds: Random[] = [];
    for (let j = 0; j < k; j++) {
      if (pool.length <= j) pool.push(allocateModel(n));
      const plan = plans[j]!;
      const rnd = makeRandom(hash32(root, 2 * plan.index + 2 ** 30));
      buildFeeder(pool[j]!, plan, n, penetration * plan.dgFactor * targetPeakKw(plan), rnd);
      rnds.push(rnd);
      peak += pool[j]!.peakKw;
      dg += pool[j]!.dgKw;
    }
    const dgScale = dg > 0 ? penetration * peak / dg : 0;

    // Substation: 110 kV source, 110/20 kV transformer, 20 kV busbar.
    const st = `SYN-S${pad(s, stationWidth)}`, hv = `${st}-HV`, mv = `${st}-MV`;
    const skMax = 50 * Math.round(uniform(rs, 1500, 5000) / 50);
    const skMin = 50 * Math.round(skMax * uniform(rs, 0.55, 0.75) / 50);
    const vSource = round(1 + 0.005 * Math.floor(rs() * 5), 3);
    const setpoint = round(1 + 0.005 * Math.floor(rs() * 7), 3);
    const uk = [11.5, 12, 12.5][Math.floor(rs() * 3)]!;
    const earthR = [15, 20, 25, 40][Math.floor(rs() * 4)]!;
    out.put(
      T_BUSES,
      `${hv},110,,Synthetic substation ${s} 110 kV bay\n${mv},20,,Synthetic substation ${s} 20 kV busbar\n`,
    );
    out.put(
      T_SOURCES,
      `${st}-GRID,${hv},110,${skMax},${skMin},0.1,${
        round(uniform(rs, 1.2, 1.6), 2)
      },0.15,${vSource},solid\n`,
    );
    out.put(
      T_TRANSFORMERS,
      `${st}-T1,${hv},${mv},40,110,20,${uk},${160 + 5 * Math.floor(rs() * 5)},24,${
        round(uk * 0.9, 2)
      },YNyn0,hv,-9,9,0,0,1.5,yes,${setpoint},0.02,solid,impedance,${earthR}\n`,
    );

    const feederIds = plans.map((p) => `SYN-${pad(p.index + 1, feederWidth)}`);
    for (let j = 0; j < k; j++) {
      yield* writeFeeder(out, pool[j]!, feederIds[j]!, mv, busWidth, dgScale, rnds[j]!);
    }

    // Normally-open ties between neighbours: a lateral end of one, the trunk end of the next.
    let ties = 0;
    for (let j = 1; j < k; j++) {
      if (rs() >= 0.5 && !(j === k - 1 && ties === 0)) continue;
      ties++;
      const a = `${feederIds[j - 1]}-B${pad(pool[j - 1]!.lateralEnd + 1, busWidth)}`;
      const b = `${feederIds[j]}-B${pad(pool[j]!.trunkEnd + 1, busWidth)}`;
      out.put(T_SWITCHES, `${feederIds[j]}-NOP,${a},${b},load_break_switch,open,,630,0.63,40,,,\n`);
    }
    for (let t = 0; t < bufs.length; t++) {
      if (bufs[t]!.length >= CHUNK_CHARS) yield out.take(t);
    }
    f += k;
  }
  for (let t = 0; t < bufs.length; t++) if (bufs[t]!.length > 0) yield out.take(t);
}

/** The whole fleet as file name → CSV text; for small fleets (tests, demos). */
export function synthesizeFleetFiles(o: SynthOptions): Record<string, string> {
  const parts: Record<string, string[]> = {};
  for (const { file, text } of synthesizeFleet(o)) (parts[file] ??= []).push(text);
  return Object.fromEntries(Object.entries(parts).map(([file, p]) => [file, p.join("")]));
}
