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
export { CHUNK_CHARS } from "./_synth_catalogue.ts";
export type { FleetChunk, SynthOptions } from "./_synth_catalogue.ts";
import { pad, round } from "./_number_text.ts";
import {
  CHUNK_CHARS,
  type FleetChunk,
  staticTables,
  STREAMED,
  type SynthOptions,
  T_BUSES,
  T_SOURCES,
  T_SWITCHES,
  T_TRANSFORMERS,
} from "./_synth_catalogue.ts";
import { hash32, makeRandom, type Random, uniform } from "./_seeded_random.ts";
import {
  allocateModel,
  buildFeeder,
  type FeederModel,
  type FeederPlan,
  MIXED,
  planFeeder,
  RURAL,
  targetPeakKw,
  URBAN,
} from "./_build_feeder.ts";
import { writeFeeder, type Writer } from "./_write_feeder.ts";

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
