/**
 * The shape of `feeders/<feeder-id>.json`, the per-feeder result file: what the report,
 * the Parquet writer and the diff read back. Written by feederJson (run_files.ts).
 */
import type { Diagnostic } from "../model/diagnostic.ts";
import type { Finding } from "../checks/finding.ts";
import type { FeederSummary } from "../model/summarize_feeder.ts";
import type { CaseOutcome } from "../pipeline/study_feeder.ts";
import type { DgHeadroom, Need } from "../rank/need.ts";
import type { CurvePoint, RelayStage } from "../model/network.ts";
import type { FeederProvenance } from "./run_files.ts";
import type { FaultStudy } from "../solve/study_faults.ts";
import type { CoordinationRow } from "./coordination_table.ts";
import type { FeederHosting } from "../hosting/host_feeder.ts";
import type { FeederRecovery } from "../recovery/screen_recovery.ts";

/** A switching device with the settings needed to draw its time–current curves. */
export interface DeviceCurves {
  readonly id: string;
  readonly kind: "breaker" | "recloser" | "fuse" | "load_break_switch" | "disconnector";
  /** The branch the device sits on, and the bus on its far side from the source. */
  readonly branchId: string;
  readonly toBus: string;
  readonly isHead: boolean;
  readonly ratedCurrentA: number | null;
  readonly breakingCurrentA: number | null;
  readonly relays: readonly { readonly id: string; readonly stages: readonly RelayStage[] }[];
  readonly fuseCurve: {
    readonly id: string;
    readonly melt: readonly CurvePoint[];
    readonly clear: readonly CurvePoint[];
  } | null;
}

export interface FeederFile {
  readonly feederId: string;
  /** Absent in files written before version 0.2.0. */
  readonly provenance?: FeederProvenance;
  readonly status: "studied" | "failed" | "valid" | "set_aside";
  readonly failure?: string;
  readonly summary: FeederSummary;
  readonly cases: readonly CaseOutcome[];
  readonly findings: readonly Finding[];
  /** The short-circuit study (absent in files written before it, null when off). */
  readonly faults?: FaultStudy | null;
  /** The protection's response to every fault simulated (absent in older files, null when off). */
  readonly coordination?: readonly CoordinationRow[] | null;
  readonly needs: readonly Need[];
  readonly headroom: DgHeadroom | null;
  readonly devices: readonly DeviceCurves[];
  /** Hosting capacity per bus and strategy (absent in older files, null when off). */
  readonly hosting?: FeederHosting | null;
  /** Recovery after faults (absent in older files, null when off or not screened). */
  readonly recovery?: FeederRecovery | null;
  readonly diagnostics: readonly Diagnostic[];
  readonly caution: string;
}
