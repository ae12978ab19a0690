/**
 * Lookups over a network built once and shared by the per-feeder stages, so that work per
 * feeder depends on the feeder's size, not the fleet's. Keys are lower-case ids.
 */
import type {
  Application,
  Bus,
  FuseCurve,
  GenerationForecast,
  Generator,
  GridSource,
  Line,
  LineType,
  Load,
  Network,
  Relay,
  Shunt,
  SwitchDevice,
} from "./network.ts";

export interface BusElements {
  readonly loads: Load[];
  readonly generators: Generator[];
  readonly shunts: Shunt[];
  /** Generation applications, in queue order. */
  readonly applications: Application[];
  /** Lines and switches with this bus as their `from` end. */
  readonly linesFrom: Line[];
  readonly switchesFrom: SwitchDevice[];
}

export interface NetworkIndex {
  readonly busById: ReadonlyMap<string, Bus>;
  readonly sourceById: ReadonlyMap<string, GridSource>;
  readonly typeById: ReadonlyMap<string, LineType>;
  readonly fuseById: ReadonlyMap<string, FuseCurve>;
  readonly switchById: ReadonlyMap<string, SwitchDevice>;
  readonly relaysByDevice: ReadonlyMap<string, readonly Relay[]>;
  /** What hangs on each bus; undefined for a bus with nothing. */
  readonly atBus: ReadonlyMap<string, BusElements>;
  /** Forecast generation by feeder id. */
  readonly forecastByFeeder: ReadonlyMap<string, GenerationForecast>;
}

const lower = (s: string) => s.toLowerCase();

export function indexNetwork(network: Network): NetworkIndex {
  const atBus = new Map<string, BusElements>();
  const at = (busId: string): BusElements => {
    const k = lower(busId);
    let e = atBus.get(k);
    if (e === undefined) {
      e = {
        loads: [],
        generators: [],
        shunts: [],
        applications: [],
        linesFrom: [],
        switchesFrom: [],
      };
      atBus.set(k, e);
    }
    return e;
  };
  for (const x of network.loads) at(x.busId).loads.push(x);
  for (const x of network.generators) at(x.busId).generators.push(x);
  for (const x of network.shunts) at(x.busId).shunts.push(x);
  for (const x of network.applications) at(x.busId).applications.push(x);
  for (const x of network.lines) at(x.fromBusId).linesFrom.push(x);
  for (const x of network.switches) at(x.fromBusId).switchesFrom.push(x);
  const relaysByDevice = new Map<string, Relay[]>();
  for (const r of network.relays) {
    const k = lower(r.deviceId);
    if (!relaysByDevice.has(k)) relaysByDevice.set(k, []);
    relaysByDevice.get(k)!.push(r);
  }
  return {
    busById: new Map(network.buses.map((b) => [lower(b.id), b])),
    sourceById: new Map(network.sources.map((s) => [lower(s.id), s])),
    typeById: new Map(network.lineTypes.map((t) => [lower(t.id), t])),
    fuseById: new Map(network.fuseCurves.map((f) => [lower(f.id), f])),
    switchById: new Map(network.switches.map((s) => [lower(s.id), s])),
    relaysByDevice,
    atBus,
    forecastByFeeder: new Map(network.generationForecasts.map((f) => [lower(f.feederId), f])),
  };
}

/** The loads, generators and shunts on a set of buses, in input-file order. */
export function elementsOn(index: NetworkIndex, busIds: readonly string[]) {
  const loads: Load[] = [], generators: Generator[] = [], shunts: Shunt[] = [];
  for (const b of busIds) {
    const e = index.atBus.get(lower(b));
    if (e === undefined) continue;
    loads.push(...e.loads);
    generators.push(...e.generators);
    shunts.push(...e.shunts);
  }
  const byLine = (a: { at: { line?: number } }, b: { at: { line?: number } }) =>
    (a.at.line ?? 0) - (b.at.line ?? 0);
  return {
    loads: loads.sort(byLine),
    generators: generators.sort(byLine),
    shunts: shunts.sort(byLine),
  };
}
