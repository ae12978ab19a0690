/**
 * Compiles one feeder (its topology plus the network data) into the solver form.
 * Called once per feeder; kernels never touch the network model.
 */
import {
  BRANCH_LINE,
  BRANCH_SWITCH,
  BRANCH_TRANSFORMER,
  type FeederForm,
  type FormDevice,
  type FormTransformer,
  GENERATOR_CONVERTER,
  GENERATOR_INDUCTION,
  GENERATOR_SYNCHRONOUS,
} from "./feeder_form.ts";
import type { PhaseMatrix } from "./line_impedance.ts";
import type { Network, Transformer } from "./network.ts";
import { phaseLetters } from "./phases.ts";
import { transformerRatio } from "./transformer_ratio.ts";
import { elementsOn, indexNetwork, type NetworkIndex } from "./network_index.ts";
import type { EdgeRef, FeederTopology } from "./split_feeders.ts";
import { feederApplications, feederForecastMw } from "./_feeder_planning.ts";

const SQRT3 = Math.sqrt(3);

/** Series impedance of a transformer in ohm referred to a winding voltage (IEC 60909-0 eq. 7–9 form). */
export function transformerImpedanceOhm(
  t: Pick<Transformer, "ukPercent" | "loadLossKw" | "sRatedMva">,
  referredKv: number,
): { rOhm: number; xOhm: number } {
  const z = (t.ukPercent / 100) * referredKv * referredKv / t.sRatedMva;
  const r = (t.loadLossKw / 1000) * referredKv * referredKv / (t.sRatedMva * t.sRatedMva);
  return { rOhm: r, xOhm: Math.sqrt(Math.max(z * z - r * r, 0)) };
}

export function compileFeeder(
  network: Network,
  topo: FeederTopology,
  index: NetworkIndex = indexNetwork(network),
): FeederForm {
  const nBus = topo.busIds.length;
  const busIndex = new Map(topo.busIds.map((b, i) => [b.toLowerCase(), i]));
  const { busById, typeById, fuseById, relaysByDevice } = index;
  const vnKv = new Float64Array(nBus);
  const customers = new Int32Array(nBus);
  topo.busIds.forEach((id, i) => {
    const b = busById.get(id.toLowerCase());
    vnKv[i] = b?.vnKv ?? NaN;
    customers[i] = b?.customers ?? 0;
  });

  // Branch list: tree branches (bus k's parent edge is branch k − 1), then loops.
  const refs: { ref: EdgeRef; from: number; to: number }[] = [];
  for (let k = 1; k < nBus; k++) {
    refs.push({ ref: topo.parentEdge[k]!, from: topo.parent[k]!, to: k });
  }
  for (const ref of topo.loopEdges) {
    const [a, b] = edgeEnds(network, ref);
    const ia = busIndex.get(a.toLowerCase())!, ib = busIndex.get(b.toLowerCase())!;
    refs.push({ ref, from: ref.forward ? ia : ib, to: ref.forward ? ib : ia });
  }
  const nBranch = refs.length;
  const f64 = () => new Float64Array(nBranch);
  const branchKind = new Uint8Array(nBranch), branchPhases = new Uint8Array(nBranch);
  const branchFrom = new Int32Array(nBranch), branchTo = new Int32Array(nBranch);
  const lengthKm = f64(), r1Ohm = f64(), x1Ohm = f64(), r0Ohm = f64(), x0Ohm = f64();
  const b1S = f64(), b0S = f64(), ratingA = f64(), ratio = f64().fill(1), shiftDeg = f64();
  const zRe = new Float64Array(9 * nBranch), zIm = new Float64Array(9 * nBranch);
  const bPh = new Float64Array(9 * nBranch);
  const cable = new Uint8Array(nBranch).fill(255);
  const conductorClass: (string | null)[] = new Array(nBranch).fill(null);
  const transformers: FormTransformer[] = [];
  const devices: FormDevice[] = [];
  const heads = new Set(topo.headDeviceIds.map((h) => h.toLowerCase()));

  refs.forEach(({ ref, from, to }, k) => {
    branchFrom[k] = from;
    branchTo[k] = to;
    if (ref.kind === "line") {
      const line = network.lines[ref.index]!;
      const type = typeById.get(line.typeId.toLowerCase())!;
      branchKind[k] = BRANCH_LINE;
      branchPhases[k] = line.phases;
      lengthKm[k] = line.lengthKm;
      r1Ohm[k] = type.r1OhmPerKm * line.lengthKm;
      x1Ohm[k] = type.x1OhmPerKm * line.lengthKm;
      r0Ohm[k] = type.r0OhmPerKm * line.lengthKm;
      x0Ohm[k] = type.x0OhmPerKm * line.lengthKm;
      b1S[k] = type.b1UsPerKm * line.lengthKm * 1e-6;
      b0S[k] = type.b0UsPerKm * line.lengthKm * 1e-6;
      ratingA[k] = type.ampacityA;
      cable[k] = type.construction === "cable" ? 1 : 0;
      conductorClass[k] = type.conductorClass ?? null;
      placePhaseMatrix(type.zPhase, line.phases, line.lengthKm, k, zRe, zIm);
      placePhaseMatrix(type.bPhase, line.phases, line.lengthKm * 1e-6, k, undefined, bPh);
    } else if (ref.kind === "transformer") {
      const t = network.transformers[ref.index]!;
      const hvIsFrom = ref.forward;
      const toKv = hvIsFrom ? t.lvKv : t.hvKv;
      const z = transformerImpedanceOhm(t, toKv);
      const nominal = transformerRatio({ ...t, hvIsFrom }, t.tap.position, vnKv[from]!, vnKv[to]!);
      branchKind[k] = BRANCH_TRANSFORMER;
      branchPhases[k] = 7;
      r1Ohm[k] = z.rOhm;
      x1Ohm[k] = z.xOhm;
      const z0 = transformerImpedanceOhm({ ...t, ukPercent: t.uk0Percent }, toKv);
      r0Ohm[k] = z0.rOhm;
      x0Ohm[k] = z0.xOhm;
      ratingA[k] = t.sRatedMva * 1000 / (SQRT3 * toKv);
      ratio[k] = nominal;
      shiftDeg[k] = (hvIsFrom ? 1 : -1) * t.vectorGroup.clock * 30;
      for (let p = 0; p < 3; p++) {
        zRe[9 * k + 4 * p] = z.rOhm;
        zIm[9 * k + 4 * p] = z.xOhm;
      }
      transformers.push({
        id: t.id,
        branch: k,
        hvIsFrom,
        sRatedMva: t.sRatedMva,
        hvKv: t.hvKv,
        lvKv: t.lvKv,
        ukPercent: t.ukPercent,
        uk0Percent: t.uk0Percent,
        loadLossKw: t.loadLossKw,
        noLoadLossKw: t.noLoadLossKw,
        vectorGroup: { hv: t.vectorGroup.hv, lv: t.vectorGroup.lv, clock: t.vectorGroup.clock },
        tap: t.tap,
        hvEarthing: t.hvEarthing,
        lvEarthing: t.lvEarthing,
      });
    } else {
      const s = network.switches[ref.index]!;
      branchKind[k] = BRANCH_SWITCH;
      branchPhases[k] = s.phases;
      ratingA[k] = s.ratedCurrentA ?? Infinity;
      const fuse = s.fuseCurveId === undefined
        ? undefined
        : fuseById.get(s.fuseCurveId.toLowerCase());
      devices.push({
        id: s.id,
        kind: s.kind,
        branch: k,
        isHead: heads.has(s.id.toLowerCase()),
        ...(s.ratedCurrentA === undefined ? {} : { ratedCurrentA: s.ratedCurrentA }),
        ...(s.breakingCurrentA === undefined ? {} : { breakingCurrentA: s.breakingCurrentA }),
        ...(s.makingCurrentA === undefined ? {} : { makingCurrentA: s.makingCurrentA }),
        ...(fuse === undefined ? {} : { fuseCurve: fuse }),
        relays: [...(relaysByDevice.get(s.id.toLowerCase()) ?? [])],
        fastShots: s.fastShots,
        delayedShots: s.delayedShots,
      });
    }
  });

  // Tree helpers: children (CSR) and distance along the path.
  const childStart = new Int32Array(nBus + 1);
  for (let k = 1; k < nBus; k++) childStart[topo.parent[k]! + 1]!++;
  for (let k = 0; k < nBus; k++) childStart[k + 1]! += childStart[k]!;
  const fill = childStart.slice(0, nBus);
  const children = new Int32Array(Math.max(nBus - 1, 0));
  const distanceKm = new Float64Array(nBus);
  for (let k = 1; k < nBus; k++) {
    const p = topo.parent[k]!;
    children[fill[p]!++] = k;
    distanceKm[k] = distanceKm[p]! + lengthKm[k - 1]!;
  }

  const src = index.sourceById.get(topo.sourceId.toLowerCase())!;
  const { loads, generators: gens, shunts } = elementsOn(index, topo.busIds);
  const curveIds = new Set(
    gens.flatMap((g) => ("curveId" in g.reactive ? [g.reactive.curveId.toLowerCase()] : [])),
  );
  const bus = (id: string) => busIndex.get(id.toLowerCase())!;
  const num = (v: number | undefined) => v ?? NaN;
  return {
    feederId: topo.feederId,
    feederIds: topo.feederIds,
    frequencyHz: network.settings.frequencyHz,
    source: {
      id: src.id,
      vnKv: src.vnKv,
      skMaxMva: src.skMaxMva,
      skMinMva: src.skMinMva,
      rToX: src.rToX,
      x0ToX1: src.x0ToX1,
      r0ToX0: src.r0ToX0,
      vSetPu: src.vSetPu,
      angleDeg: src.angleDeg,
      earthing: src.earthing,
    },
    meshed: topo.meshed,
    nBus,
    busIds: topo.busIds,
    substationBusCount: topo.substationBusCount,
    vnKv,
    busPhases: Uint8Array.from(topo.busPhases),
    customers,
    parent: Int32Array.from(topo.parent),
    childStart,
    children,
    distanceKm,
    nBranch,
    branchIds: refs.map((r) => r.ref.id),
    branchKind,
    branchFrom,
    branchTo,
    branchPhases,
    lengthKm,
    r1Ohm,
    x1Ohm,
    r0Ohm,
    x0Ohm,
    b1S,
    b0S,
    zPhaseReOhm: zRe,
    zPhaseImOhm: zIm,
    bPhaseS: bPh,
    ratingA,
    ratio,
    shiftDeg,
    cable,
    conductorClass,
    transformers,
    devices,
    loads: {
      n: loads.length,
      ids: loads.map((l) => l.id),
      bus: Int32Array.from(loads, (l) => bus(l.busId)),
      peakPKw: Float64Array.from(loads, (l) => l.peakPKw),
      peakQKvar: Float64Array.from(loads, (l) => l.peakQKvar),
      minPKw: Float64Array.from(loads, (l) => l.minPKw),
      minQKvar: Float64Array.from(loads, (l) => l.minQKvar),
      zipZ: Float64Array.from(loads, (l) => l.zip.z),
      zipI: Float64Array.from(loads, (l) => l.zip.i),
      zipP: Float64Array.from(loads, (l) => l.zip.p),
      motorShare: Float64Array.from(loads, (l) => l.motorShare),
      stallVoltagePu: Float64Array.from(loads, (l) => num(l.stallVoltagePu)),
      stallTimeS: Float64Array.from(loads, (l) => num(l.stallTimeS)),
      phases: Uint8Array.from(loads, (l) => l.phases),
      delta: Uint8Array.from(loads, (l) => (l.connection === "delta" ? 1 : 0)),
      customers: Int32Array.from(loads, (l) => l.customers),
    },
    shunts: {
      n: shunts.length,
      ids: shunts.map((x) => x.id),
      bus: Int32Array.from(shunts, (x) => bus(x.busId)),
      qRatedKvar: Float64Array.from(shunts, (x) => x.qRatedKvar),
    },
    generators: {
      n: gens.length,
      ids: gens.map((g) => g.id),
      bus: Int32Array.from(gens, (g) => bus(g.busId)),
      kind: Uint8Array.from(
        gens,
        (g) =>
          g.kind === "synchronous"
            ? GENERATOR_SYNCHRONOUS
            : g.kind === "induction"
            ? GENERATOR_INDUCTION
            : GENERATOR_CONVERTER,
      ),
      sRatedKva: Float64Array.from(gens, (g) => g.sRatedKva),
      pKw: Float64Array.from(gens, (g) => g.pKw),
      phases: Uint8Array.from(gens, (g) => g.phases),
      delta: Uint8Array.from(gens, (g) => (g.connection === "delta" ? 1 : 0)),
      reactive: gens.map((g) => g.reactive),
      faultCurrentLimitPu: Float64Array.from(gens, (g) => num(g.faultCurrentLimitPu)),
      xdSubtransientPu: Float64Array.from(gens, (g) => num(g.xdSubtransientPu)),
      rToX: Float64Array.from(gens, (g) => num(g.rToX)),
      lockedRotorRatio: Float64Array.from(gens, (g) => num(g.lockedRotorRatio)),
      rideThrough: gens.map((g) => g.rideThrough ?? null),
    },
    reactiveCurves: network.reactiveCurves.filter((c) => curveIds.has(c.id.toLowerCase())),
    openPoints: topo.openPoints,
    applications: feederApplications(index, topo.busIds, topo.substationBusCount),
    forecastGenerationMw: feederForecastMw(index, topo.feederIds),
  };
}

function edgeEnds(network: Network, ref: EdgeRef): [string, string] {
  if (ref.kind === "line") {
    const l = network.lines[ref.index]!;
    return [l.fromBusId, l.toBusId];
  }
  if (ref.kind === "transformer") {
    const t = network.transformers[ref.index]!;
    return [t.hvBusId, t.lvBusId];
  }
  if (ref.kind === "switch") {
    const s = network.switches[ref.index]!;
    return [s.fromBusId, s.toBusId];
  }
  throw new Error(`placeholder edge "${ref.id}" in a feeder that is compiled`);
}

/**
 * Writes a per-km type matrix, scaled by `scale`, into the 3×3 slot of branch k for the
 * line's phases. A three-phase type serves any subset of its phases; a type with fewer
 * conductors maps its conductors, in order, onto the line's phases.
 */
function placePhaseMatrix(
  m: PhaseMatrix,
  linePhases: number,
  scale: number,
  k: number,
  outRe: Float64Array | undefined,
  outIm: Float64Array,
): void {
  const lineLetters = phaseLetters(linePhases);
  const n = m.phases.length;
  for (let i = 0; i < lineLetters.length; i++) {
    for (let j = 0; j < lineLetters.length; j++) {
      const pi = "ABC".indexOf(lineLetters[i]!), pj = "ABC".indexOf(lineLetters[j]!);
      const si = n === 3 ? pi : i, sj = n === 3 ? pj : j;
      if (si >= n || sj >= n) continue;
      if (outRe) outRe[9 * k + 3 * pi + pj] = m.re[si * n + sj]! * scale;
      outIm[9 * k + 3 * pi + pj] = m.im[si * n + sj]! * scale;
    }
  }
}
