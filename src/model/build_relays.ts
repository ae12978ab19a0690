/** Model-stage builder of relays: stages grouped by relay, each tied to one switching device. */
import type { NetworkTables } from "../ingest/read_network.ts";
import type { BuildContext } from "./_build_context.ts";
import type { Relay, SwitchDevice } from "./network.ts";
import { rejectedIds } from "./_levels.ts";

type Row<K extends keyof NetworkTables> = NetworkTables[K]["rows"][number];

export function buildRelays(ctx: BuildContext, switches: readonly SwitchDevice[]): Relay[] {
  const { tables, error, taintBus, cellAt } = ctx;
  const switchById = new Map(switches.map((sw) => [sw.id.toLowerCase(), sw]));
  const relays: Relay[] = [];
  const byRelay = new Map<string, Row<"relayStages">[]>();
  for (const row of tables.relayStages.rows) {
    const k = row.value.relay.toLowerCase();
    if (!byRelay.has(k)) byRelay.set(k, []);
    byRelay.get(k)!.push(row);
  }
  const rejectedSwitches = new Set(
    rejectedIds(tables.switches.rejected, "id").map((x) => x.toLowerCase()),
  );
  for (const rows of byRelay.values()) {
    const first = rows[0]!;
    const file = tables.relayStages.file;
    const device = switchById.get(first.value.device.toLowerCase());
    const mixed = rows.find((r) =>
      r.value.device.toLowerCase() !== first.value.device.toLowerCase()
    );
    if (mixed !== undefined) {
      error(
        "relay.device",
        `Relay "${first.value.relay}" on line ${mixed.line}: device "${mixed.value.device}" differs from "${first.value.device}" on line ${first.line}`,
        cellAt(file, mixed.line, "device"),
        device === undefined ? [] : [device.fromBusId, device.toBusId],
      );
    }
    if (device === undefined) {
      if (!rejectedSwitches.has(first.value.device.toLowerCase())) {
        error(
          "ref.unknown",
          `Relay "${first.value.relay}" on line ${first.line}: device "${first.value.device}" is not a switch of ${tables.switches.file}`,
          cellAt(file, first.line, "device"),
          [],
        );
      }
      continue;
    }
    relays.push({
      id: first.value.relay,
      deviceId: device.id,
      stages: rows.map((r) => ({
        stage: r.value.stage,
        element: r.value.element,
        characteristic: r.value.characteristic,
        pickupA: r.value.pickup,
        ...(r.value.time_multiplier === undefined
          ? {}
          : { timeMultiplier: r.value.time_multiplier }),
        ...(r.value.delay === undefined ? {} : { delayS: r.value.delay }),
        direction: r.value.direction,
        curveSet: r.value.curve_set,
      })).sort((a, b) => a.stage - b.stage),
      at: { file, line: first.line },
    });
  }
  for (const r of tables.relayStages.rejected) {
    const sw = switchById.get((r.cells.device ?? "").toLowerCase());
    if (sw !== undefined) {
      const file = tables.relayStages.file;
      [sw.fromBusId, sw.toBusId].forEach((b) => taintBus(b, "row.rejected", file, r.line));
    }
  }

  return relays;
}
