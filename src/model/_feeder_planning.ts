/**
 * The planning inputs of one feeder for its solver form: the generation applications on
 * its buses and its forecast generation. Private to compileFeeder.
 */
import type { FormApplication } from "./feeder_form.ts";
import type { NetworkIndex } from "./network_index.ts";

/**
 * Applications on the feeder's own buses (substation buses are shared by its feeders, so
 * an application there belongs to none), in queue order, with their bus index in the form.
 */
export function feederApplications(
  index: NetworkIndex,
  busIds: readonly string[],
  substationBusCount: number,
): FormApplication[] {
  const out: FormApplication[] = [];
  for (let k = substationBusCount; k < busIds.length; k++) {
    const at = index.atBus.get(busIds[k]!.toLowerCase());
    for (const a of at?.applications ?? []) {
      out.push({
        id: a.id,
        bus: k,
        pKw: a.pKw,
        kind: a.kind,
        strategy: a.strategy,
        position: a.position,
      });
    }
  }
  return out.sort((a, b) => a.position - b.position);
}

/**
 * Forecast generation in MW, matched by feeder id case-insensitively. A meshed feeder
 * studied as several feeders together gets the sum of their rows; null when none has one.
 */
export function feederForecastMw(
  index: NetworkIndex,
  feederIds: readonly string[],
): number | null {
  let sumKw = 0, found = false;
  for (const id of feederIds) {
    const f = index.forecastByFeeder.get(id.toLowerCase());
    if (f === undefined) continue;
    sumKw += f.pKw;
    found = true;
  }
  return found ? sumKw / 1000 : null;
}
