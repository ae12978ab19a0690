/**
 * Model stage, planning inputs: the generation queue and the generation forecast. Unlike
 * equipment rows, these never taint buses: an application on an unknown bus is an error
 * on its row and is dropped, and the feeder is studied as if the row were absent. Rows of
 * a table whose header is broken are all dropped (the header error says why).
 */
import type { Application, GenerationForecast } from "./network.ts";
import type { BuildContext } from "./_build_context.ts";

export interface PlanningInputs {
  /** In queue order (position ascending). */
  readonly applications: Application[];
  readonly generationForecasts: GenerationForecast[];
}

export function buildPlanningInputs(ctx: BuildContext): PlanningInputs {
  const { tables, busById, error, cellAt } = ctx;
  const queue = tables.generationQueue;
  const rejectedBuses = new Set([...ctx.placeholderBuses].map((b) => b.toLowerCase()));
  const applications: Application[] = [];
  for (const { value: r, line } of queue.headerBroken ? [] : queue.rows) {
    const bus = busById.get(r.bus_id.toLowerCase());
    if (bus === undefined) {
      // A bus whose own row was rejected is reported there; its feeder is set aside anyway.
      if (!rejectedBuses.has(r.bus_id.toLowerCase()) && tables.buses.present) {
        error(
          "ref.unknown",
          `Application "${r.application_id}" on line ${line}: bus_id "${r.bus_id}" is not a bus of ${tables.buses.file}; the application is left out`,
          cellAt(queue.file, line, "bus_id"),
          [],
        );
      }
      continue;
    }
    applications.push({
      id: r.application_id,
      busId: bus.id,
      pKw: r.size,
      kind: r.unit_kind,
      strategy: r.reactive_strategy ?? null,
      position: r.queue_position,
      at: { file: queue.file, line },
    });
  }
  applications.sort((a, b) => a.position - b.position);

  const forecast = tables.generationForecast;
  const generationForecasts: GenerationForecast[] = (forecast.headerBroken ? [] : forecast.rows)
    .map(({ value: r, line }) => ({
      feederId: r.feeder_id,
      pKw: r.forecast,
      at: { file: forecast.file, line },
    }));
  return { applications, generationForecasts };
}
