/**
 * Key figures of a feeder for the validation summary, and the plausibility screen
 * (REFERENCES.md F, common practice: a feeder's reach in km and its load in MVA stay
 * roughly at or below its nominal voltage in kV; far above that suggests a unit error).
 */
import { type Diagnostic, makeDiagnostic } from "./diagnostic.ts";
import type { SwitchDevice, Taint } from "./network.ts";
import { elementsOn, type NetworkIndex } from "./network_index.ts";
import type { FeederForm } from "./feeder_form.ts";
import { arrayMax } from "./array_extremes.ts";
import type { FeederTopology } from "./split_feeders.ts";

/** How far above the nominal kV a feeder's reach (km) or load (MVA) may go before a warning. */
export const PLAUSIBILITY_FACTOR = 2;

export interface FeederSummary {
  readonly feederId: string;
  readonly feederIds: readonly string[];
  readonly status: "valid" | "set_aside";
  readonly sourceId: string;
  readonly headDeviceIds: readonly string[];
  readonly vnKv: number | null;
  readonly buses: number;
  readonly lineKm: number;
  readonly cableKm: number;
  readonly overheadKm: number;
  /** Longest path from the source bus, km (null when the feeder could not be ordered). */
  readonly reachKm: number | null;
  readonly peakLoadKw: number;
  readonly peakLoadKvar: number;
  readonly minLoadKw: number;
  readonly customers: number;
  readonly generators: number;
  readonly generationKw: number;
  readonly generationByKindKw: Readonly<Record<"converter" | "synchronous" | "induction", number>>;
  readonly structure: "radial" | "meshed";
  readonly loops: number;
  readonly openPoints: number;
  readonly protectiveDevices: number;
  readonly reasons: readonly Taint[];
}

export function summarizeFeeder(
  index: NetworkIndex,
  topo: FeederTopology,
  form: FeederForm | undefined,
): { value: FeederSummary; diagnostics: Diagnostic[] } {
  const own = new Set(topo.busIds.slice(topo.substationBusCount).map((b) => b.toLowerCase()));
  const on = (id: string) => own.has(id.toLowerCase());
  const { busById, typeById } = index;
  let lineKm = 0, cableKm = 0;
  const switches: SwitchDevice[] = [];
  for (const b of topo.busIds) {
    const at = index.atBus.get(b.toLowerCase());
    if (at === undefined) continue;
    for (const l of at.linesFrom) {
      if (!l.inService || !on(l.fromBusId) || !on(l.toBusId)) continue;
      lineKm += l.lengthKm;
      if (typeById.get(l.typeId.toLowerCase())?.construction === "cable") cableKm += l.lengthKm;
    }
    for (const sw of at.switchesFrom) if (on(sw.toBusId)) switches.push(sw);
  }
  const { loads, generators: gens } = elementsOn(index, [...own]);
  const byKind = { converter: 0, synchronous: 0, induction: 0 };
  for (const g of gens) byKind[g.kind] += g.pKw;
  const firstFeederBus = topo.busIds[topo.substationBusCount];
  const vnKv = firstFeederBus === undefined
    ? null
    : busById.get(firstFeederBus.toLowerCase())?.vnKv ?? null;
  const reachKm = form === undefined ? null : arrayMax(form.distanceKm, 0);
  const customers = [...own].reduce((s, b) => s + (busById.get(b)?.customers ?? 0), 0) +
    loads.reduce((s, l) => s + l.customers, 0);
  const peakLoadKw = sum(loads.map((l) => l.peakPKw));
  const peakLoadKvar = sum(loads.map((l) => l.peakQKvar));
  const value: FeederSummary = {
    feederId: topo.feederId,
    feederIds: topo.feederIds,
    status: topo.setAside ? "set_aside" : "valid",
    sourceId: topo.sourceId,
    headDeviceIds: topo.headDeviceIds,
    vnKv,
    buses: own.size,
    lineKm,
    cableKm,
    overheadKm: lineKm - cableKm,
    reachKm,
    peakLoadKw,
    peakLoadKvar,
    minLoadKw: sum(loads.map((l) => l.minPKw)),
    customers,
    generators: gens.length,
    generationKw: sum(gens.map((g) => g.pKw)),
    generationByKindKw: byKind,
    structure: topo.meshed ? "meshed" : "radial",
    loops: topo.loopEdges.length,
    openPoints: topo.openPoints.length,
    protectiveDevices:
      switches.filter((s) =>
        (s.kind === "breaker" || s.kind === "recloser" || s.kind === "fuse") && s.normallyClosed
      ).length,
    reasons: topo.reasons,
  };
  const diagnostics: Diagnostic[] = [];
  if (vnKv !== null && !topo.setAside) {
    const sMva = Math.hypot(peakLoadKw, peakLoadKvar) / 1000;
    const head = index.switchById.get((topo.headDeviceIds[0] ?? "").toLowerCase());
    const at = head?.at;
    if (reachKm !== null && reachKm > PLAUSIBILITY_FACTOR * vnKv) {
      diagnostics.push(makeDiagnostic(
        "plausibility.length",
        "warning",
        `Feeder "${topo.feederId}" reaches ${
          reachKm.toFixed(1)
        } km from its source at ${vnKv} kV; ` +
          `more than ${PLAUSIBILITY_FACTOR}× the nominal kV is unusual (check length units)`,
        {
          at,
          feederId: topo.feederId,
          found: `${reachKm.toFixed(1)} km`,
          expected: `≤ ${PLAUSIBILITY_FACTOR * vnKv} km`,
        },
      ));
    }
    if (sMva > PLAUSIBILITY_FACTOR * vnKv) {
      diagnostics.push(makeDiagnostic(
        "plausibility.load",
        "warning",
        `Feeder "${topo.feederId}" carries ${sMva.toFixed(2)} MVA peak load at ${vnKv} kV; ` +
          `more than ${PLAUSIBILITY_FACTOR}× the nominal kV in MVA is unusual (check power units)`,
        {
          at,
          feederId: topo.feederId,
          found: `${sMva.toFixed(2)} MVA`,
          expected: `≤ ${PLAUSIBILITY_FACTOR * vnKv} MVA`,
        },
      ));
    }
  }
  return { value, diagnostics };
}

function sum(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s;
}
