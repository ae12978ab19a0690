/**
 * Table declarations of the network format, part 3: planning inputs that describe no
 * equipment in service — the queue of generation applications and a forecast of
 * generation per feeder. Both are optional. Neither names buses for the purpose of
 * setting feeders aside: a bad row is dropped with its diagnostic and the feeder it
 * would concern is still studied. docs/network-format.md describes every column.
 */
import { z } from "zod";
import {
  choice,
  defineTable,
  idText,
  integerText,
  nonNegative,
  optional,
  positive,
  required,
  withDefault,
} from "./table_kit.ts";

export const APPLICATION_UNIT_KINDS = ["converter", "synchronous"] as const;

export const generationQueueTable = defineTable({
  file: "generation_queue.csv",
  required: false,
  key: ["application_id"],
  unique: ["queue_position"],
  busColumns: [],
  units: { size: "kW" },
  row: (q) =>
    z.object({
      application_id: required(idText),
      bus_id: required(idText),
      size: required(positive(q.size)),
      unit_kind: withDefault(choice(APPLICATION_UNIT_KINDS), "converter"),
      reactive_strategy: optional(idText),
      queue_position: required(positive(integerText)),
    }),
});

export const generationForecastTable = defineTable({
  file: "generation_forecast.csv",
  required: false,
  key: ["feeder_id"],
  busColumns: [],
  units: { forecast: "kW" },
  row: (q) =>
    z.object({
      feeder_id: required(idText),
      forecast: required(nonNegative(q.forecast)),
    }),
});
