/** Writes one built synthetic feeder as CSV rows of the network format. */
import { pad, round } from "./_number_text.ts";
import {
  type FleetChunk,
  FUSE_RATINGS,
  MV_KV,
  PF_OF_P_CURVE,
  SQRT3,
  T_BUSES,
  T_GENERATORS,
  T_LINES,
  T_LOADS,
  T_RELAYS,
  T_SWITCHES,
  TYPE_AMP,
  TYPE_ID,
  VOLT_VAR_CURVE,
} from "./_synth_catalogue.ts";
import { type Random, uniform } from "./_seeded_random.ts";
import {
  DISCONNECTOR,
  DISCONNECTOR_630,
  EDGE_LATERAL_SWITCH,
  EDGE_LINE,
  type FeederModel,
  MODE_UNITY,
  MODE_VOLT_VAR,
} from "./_build_feeder.ts";

// ---------------------------------------------------------------------------------------
// Rows

/** The per-file text buffers of the stream. */
export interface Writer {
  /** Appends a row (with its newline); true when the buffer should be yielded. */
  put(table: number, row: string): boolean;
  take(table: number): FleetChunk;
}

/** Writes one built feeder's rows, yielding every buffer that fills up. */
export function* writeFeeder(
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
