/**
 * Feeder result files for the Parquet tests (test use only; invented data, never reference
 * values): three hand-made Norvessa-style files with nulls, a case that did not converge and
 * a failed feeder, and the demo fleet studied by studyFeeder and passed through feederJson
 * and JSON.parse exactly as a run writes and reads its feeders/<id>.json.
 */
import type { BranchRow, BusRow, CaseOutcome } from "../pipeline/study_feeder.ts";
import { studyFeeder } from "../pipeline/study_feeder.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { loadPipelineConfig } from "../pipeline/load_pipeline_config.ts";
import { folderSource } from "../ingest/read_network.ts";
import type { FeederSummary } from "../model/summarize_feeder.ts";
import type { FeederFile } from "./feeder_file.ts";
import { CAUTION, feederJson } from "./run_files.ts";
import type { ByteSink } from "./parquet_table_writer.ts";

function summary(feederId: string): FeederSummary {
  return {
    feederId,
    feederIds: [feederId],
    status: "valid",
    sourceId: "GRID-NRV",
    headDeviceIds: [`${feederId}-H`],
    vnKv: 20,
    buses: 3,
    lineKm: 2,
    cableKm: 0,
    overheadKm: 2,
    reachKm: 2,
    peakLoadKw: 400,
    peakLoadKvar: 100,
    minLoadKw: 120,
    customers: 90,
    generators: 1,
    generationKw: 250,
    generationByKindKw: { converter: 250, synchronous: 0, induction: 0 },
    structure: "radial",
    loops: 0,
    openPoints: 0,
    protectiveDevices: 1,
    reasons: [],
  };
}

function outcome(
  caseId: string,
  rows: { buses?: readonly BusRow[]; branches?: readonly BranchRow[] },
  converged = true,
): CaseOutcome {
  return {
    caseId,
    label: null,
    converged,
    iterations: 5,
    residualPu: 1e-9,
    demandKw: 400,
    generationKw: 0,
    generationKvar: 0,
    sourcePKw: 405,
    sourceQKvar: 110,
    lossesKw: 5,
    lossesKvar: 10,
    vMinPu: 0.97,
    vMaxPu: 1.01,
    maxLoadingPercent: 40,
    maxDgChangePercent: null,
    sourceQShiftKvar: null,
    taps: [],
    ...rows,
  };
}

function feederFile(
  feederId: string,
  cases: readonly CaseOutcome[],
  status: FeederFile["status"] = "studied",
): FeederFile {
  return {
    feederId,
    status,
    summary: summary(feederId),
    cases,
    findings: [],
    needs: [],
    headroom: null,
    devices: [],
    diagnostics: [],
    caution: CAUTION,
  };
}

const bus = (
  id: string,
  vPu: number,
  distanceKm: number,
  dg: readonly [number, number, number] | null,
): BusRow => ({
  id,
  vnKv: id.endsWith("-LV") ? 0.4 : 20,
  distanceKm,
  vPu,
  angleDeg: -distanceKm * 0.37,
  dgChangePercent: dg?.[0] ?? null,
  rpPercent: dg?.[1] ?? null,
  xqPercent: dg?.[2] ?? null,
});

const branch = (
  id: string,
  kind: BranchRow["kind"],
  from: string,
  to: string,
  pFromKw: number,
): BranchRow => ({
  id,
  kind,
  from,
  to,
  pFromKw,
  qFromKvar: pFromKw / 4,
  pToKw: pFromKw * 0.99,
  qToKvar: pFromKw / 4.1,
  iA: Math.abs(pFromKw) / 34.6,
  loadingPercent: Math.abs(pFromKw) / 34.6 / 4,
});

/** Three invented feeders, in sorted id order. */
export const HAND_MADE_FEEDERS: readonly FeederFile[] = [
  feederFile("NRV-ÅSEN-F2", [
    outcome("peak-no-dg", {
      buses: [
        bus("ÅSEN-SS", 1.02, 0, null),
        bus("ÅSEN-7", 0.981234, 1.25, null),
        bus("ÅSEN-7-LV", 0.9633, 1.3, null),
      ],
      branches: [
        branch("ÅSEN-CB", "switch", "ÅSEN-SS", "ÅSEN-B1", 400.5),
        branch("ÅSEN-L7", "line", "ÅSEN-B1", "ÅSEN-7", 398.25),
        branch("ÅSEN-T7", "transformer", "ÅSEN-7", "ÅSEN-7-LV", 150),
      ],
    }),
    outcome("min-full-dg", {
      buses: [
        bus("ÅSEN-SS", 1.02, 0, [0, 0, 0]),
        bus("ÅSEN-7", 1.0412, 1.25, [2.0871, 2.31, -0.2229]),
        bus("ÅSEN-7-LV", 1.0577, 1.3, [3.1, 3.4, -0.3]),
      ],
      branches: [
        branch("ÅSEN-CB", "switch", "ÅSEN-SS", "ÅSEN-B1", -130.125),
        branch("ÅSEN-L7", "line", "ÅSEN-B1", "ÅSEN-7", -131),
        branch("ÅSEN-T7", "transformer", "ÅSEN-7", "ÅSEN-7-LV", -0),
      ],
    }),
    // A case that did not converge carries no rows.
    outcome("winter-peak", {}, false),
  ]),
  feederFile("NRV-KELD-F1", [
    outcome("peak-no-dg", {
      buses: [bus("KELD-SS", 1, 0, null), bus("KELD-3", 0.955, 4.125, null)],
      branches: [branch("KELD-L3", "line", "KELD-SS", "KELD-3", 1e-7)],
    }),
  ]),
  feederFile("NRV-VARR-F9", [], "failed"),
];

/** The demo fleet (data-samples/norvessa, pipelines/nightly.json), in sorted id order. */
export async function studyDemoFeederFiles(): Promise<FeederFile[]> {
  const config = (await loadPipelineConfig("pipelines/nightly.json")).value!;
  const fleet = await validateFleet(folderSource("data-samples/norvessa"));
  const summaries = new Map(fleet.value.feeders.map((s) => [s.feederId, s]));
  return fleet.value.forms
    .map((form) => {
      const text = feederJson(summaries.get(form.feederId)!, studyFeeder(form, config));
      return JSON.parse(text) as FeederFile;
    })
    .sort((a, b) => (a.feederId < b.feederId ? -1 : a.feederId > b.feederId ? 1 : 0));
}

/** A sink that keeps every chunk, and the file they make. */
export function collectBytes(): { sink: ByteSink; chunks: Uint8Array[]; bytes(): Uint8Array } {
  const chunks: Uint8Array[] = [];
  return {
    chunks,
    sink: (c) => {
      chunks.push(c);
    },
    bytes() {
      const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
      let at = 0;
      for (const c of chunks) {
        out.set(c, at);
        at += c.length;
      }
      return out;
    },
  };
}
