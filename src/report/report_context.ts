/**
 * What the HTML report needs besides the feeder files: the run's provenance, the fleet
 * ranking, one small row per feeder for the fleet overview, the limits the charts draw and
 * the cost table's currency. Filled by the CLI; small enough to hold for a whole fleet
 * (the feeder files themselves are rendered one at a time).
 */
import type { VoltageRange } from "../checks/check_options.ts";
import type { NeedClass, RankedNeed } from "../rank/need.ts";
import type { FeederFile } from "./feeder_file.ts";
import type { RunRecord } from "./run_files.ts";

/** One feeder in the fleet table; null where the feeder file does not hold the value. */
export interface FleetFeederRow {
  readonly feederId: string;
  readonly status: FeederFile["status"];
  readonly vnKv: number | null;
  readonly buses: number;
  readonly customers: number;
  readonly generationKw: number;
  /** Lowest and highest bus voltage over every converged case, pu. */
  readonly vMinPu: number | null;
  readonly vMaxPu: number | null;
  readonly maxLoadingPercent: number | null;
  /** DgHeadroom.headroomMw of the feeder file. */
  readonly headroomMw: number | null;
  /** Number of needs of the feeder. */
  readonly needs: number;
  /** The most urgent class among its needs. */
  readonly worstClass: NeedClass | null;
}

/**
 * The run as the report shows it: a RunRecord, or the same without its times (then the
 * report of two identical runs is byte-identical). The timing block is never shown.
 */
export type ReportRun =
  & Omit<RunRecord, "startedAt" | "finishedAt" | "timing">
  & { readonly startedAt?: string; readonly finishedAt?: string };

export interface ReportContext {
  readonly run: ReportRun;
  /** Every need of the fleet, in rank order. */
  readonly ranking: readonly RankedNeed[];
  readonly feeders: readonly FleetFeederRow[];
  /** Limits the voltage charts and the schematic's colours refer to. */
  readonly limits: {
    readonly voltageBand: { readonly mv: VoltageRange; readonly lv: VoltageRange };
    /** Buses at or below this nominal voltage count as LV, kV. */
    readonly lvMaxKv: number;
  };
  /** The cost table's currency (e.g. "NVC") and where its prices come from. */
  readonly costs: { readonly currency: string; readonly source: string };
}
