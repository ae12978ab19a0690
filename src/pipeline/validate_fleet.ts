/**
 * The validation pipeline: ingest → model → topology → compile → summary. Each stage
 * returns new data and its diagnostics; feeders with errors are set aside, the rest go on.
 */
import { compareDiagnostics, type Diagnostic } from "../model/diagnostic.ts";
import { readNetworkTables, type TableSource } from "../ingest/read_network.ts";
import { buildNetwork } from "../model/build_network.ts";
import { type Island, splitFeeders } from "../model/split_feeders.ts";
import { compileFeeder } from "../model/compile_feeder.ts";
import { indexNetwork } from "../model/network_index.ts";
import type { FeederForm } from "../model/feeder_form.ts";
import { type FeederSummary, summarizeFeeder } from "../model/summarize_feeder.ts";

export interface ValidatedFleet {
  readonly company: string | null;
  readonly feeders: readonly FeederSummary[];
  readonly islands: readonly Island[];
  /** Solver forms of the valid feeders, in feeder order. */
  readonly forms: readonly FeederForm[];
}

export async function validateFleet(
  source: TableSource,
): Promise<{ value: ValidatedFleet; diagnostics: Diagnostic[] }> {
  // The validated rows are dropped as soon as the model is built: they and the solver forms
  // are never held at once (the largest two parts of the memory a fleet takes).
  const { network, ingestDiagnostics } = await readAndBuild(source);
  const index = indexNetwork(network.value);
  const topology = splitFeeders(network.value, index);
  const forms: FeederForm[] = [];
  const feeders: FeederSummary[] = [];
  const later: Diagnostic[] = [];
  for (const topo of topology.value.feeders) {
    const form = topo.setAside ? undefined : compileFeeder(network.value, topo, index);
    if (form) forms.push(form);
    const summary = summarizeFeeder(index, topo, form);
    feeders.push(summary.value);
    later.push(...summary.diagnostics);
  }
  const diagnostics = attributeToFeeders(
    [...ingestDiagnostics, ...network.diagnostics, ...topology.diagnostics, ...later],
    feeders,
  ).sort(compareDiagnostics);
  return {
    value: {
      company: network.value.settings.company ?? null,
      feeders,
      islands: topology.value.islands,
      forms,
    },
    diagnostics,
  };
}

/** Tags row diagnostics with the feeder they set aside (matched by file and line). */
function attributeToFeeders(
  diagnostics: Diagnostic[],
  feeders: readonly FeederSummary[],
): Diagnostic[] {
  const byRow = new Map<string, Set<string>>();
  for (const f of feeders) {
    for (const r of f.reasons) {
      const k = `${r.file}:${r.line}`;
      if (!byRow.has(k)) byRow.set(k, new Set());
      byRow.get(k)!.add(f.feederId);
    }
  }
  return diagnostics.map((d) => {
    if (d.feederId !== undefined || d.at?.line === undefined) return d;
    const ids = byRow.get(`${d.at.file}:${d.at.line}`);
    return ids === undefined ? d : { ...d, feederId: [...ids].sort().join(",") };
  });
}

async function readAndBuild(source: TableSource) {
  const tables = await readNetworkTables(source);
  return { network: buildNetwork(tables.value), ingestDiagnostics: tables.diagnostics };
}
