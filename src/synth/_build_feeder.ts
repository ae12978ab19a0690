/** Plans and builds one synthetic feeder in reusable typed arrays (never leaves the synth module). */
import { round } from "./_number_text.ts";
import {
  BY_CONSTRUCTION,
  C_AL150,
  C_AL240,
  C_AL300,
  CABLE,
  DESIGN_LOADING,
  DROP_BUDGET_PU,
  FUSE_RATINGS,
  MAX_REACH_KM_PER_KV,
  MV_KV,
  OVERHEAD,
  SQRT3,
  TYPE_AMP,
  TYPE_R1,
  TYPE_X1,
} from "./_synth_catalogue.ts";
import { gaussian, type Random, uniform } from "./_seeded_random.ts";

// ---------------------------------------------------------------------------------------
// Feeder plans and models

export const URBAN = 0, MIXED = 1, RURAL = 2;
export const EDGE_HEAD = 0, EDGE_LINE = 1, EDGE_RECLOSER = 2, EDGE_LATERAL_SWITCH = 3;
export const ROLE_TRUNK = 0, ROLE_LATERAL = 1, ROLE_SPUR = 2;
export const MODE_UNITY = 0, MODE_VOLT_VAR = 1, MODE_PF_OF_P = 2;
export const DISCONNECTOR = 254, DISCONNECTOR_630 = 255;

export interface FeederPlan {
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
export interface FeederModel {
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

export function allocateModel(cap: number): FeederModel {
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

export function planFeeder(index: number, area: number, rnd: Random): FeederPlan {
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
export function targetPeakKw(plan: FeederPlan): number {
  return plan.loading * TYPE_AMP[plan.headType]! * SQRT3 * MV_KV * 0.95;
}

/** The smallest type of a construction that carries minA, never above maxA. */
export function pickType(cons: number, minA: number, maxA: number, fallback: number): number {
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
export function buildFeeder(
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
