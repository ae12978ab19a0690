/**
 * Topology stage: splits a fleet into feeders, applies switch states, finds de-energised
 * islands and loops, orders each feeder breadth-first from its source and checks phases
 * and the `feeder` column against connectivity.
 *
 * A substation part is everything reachable from a grid source without passing a
 * feeder-head device; a feeder is what lies beyond its head device. Feeders whose heads
 * reach the same buses are studied together as one meshed feeder.
 */
import { type Diagnostic, makeDiagnostic } from "./diagnostic.ts";
import type { Network, Taint } from "./network.ts";
import { locateField } from "./locate.ts";
import { indexNetwork, type NetworkIndex } from "./network_index.ts";
import { phaseLetters, phasesWithin } from "./phases.ts";
import {
  buildGraph,
  type Edge,
  type EdgeRef,
  findSubstationParts,
  labelComponents,
  orderFeeder,
} from "./_feeder_graph.ts";

export type { EdgeKind, EdgeRef } from "./_feeder_graph.ts";

export interface OpenPoint {
  readonly switchId: string;
  /** The bus of this feeder at the open device. */
  readonly busId: string;
  /** What is on the other side: a feeder id, "island", or "substation". */
  readonly otherSide: string;
}

export interface FeederTopology {
  readonly feederId: string;
  /** Ids of all feeders studied together here (more than one when heads share buses). */
  readonly feederIds: readonly string[];
  readonly sourceId: string;
  readonly headDeviceIds: readonly string[];
  /** Bus ids, breadth-first from the source bus; the substation part comes first. */
  readonly busIds: readonly string[];
  readonly substationBusCount: number;
  /** Position of each bus's parent in busIds (−1 for the source bus). */
  readonly parent: Int32Array;
  /** Edge joining each bus to its parent (undefined for the source bus). */
  readonly parentEdge: readonly (EdgeRef | undefined)[];
  /** Closed edges outside the tree: each closes a loop. */
  readonly loopEdges: readonly EdgeRef[];
  /** Phases present at each bus (bitmask). */
  readonly busPhases: Uint8Array;
  readonly openPoints: readonly OpenPoint[];
  readonly meshed: boolean;
  /** Set aside: input problems make the feeder untrustworthy; see reasons. */
  readonly setAside: boolean;
  readonly reasons: readonly Taint[];
}

export interface Island {
  readonly busIds: readonly string[];
  /** Open devices at the island's edge, with the feeder on their other side. */
  readonly nextTo: readonly { readonly switchId: string; readonly feederId: string }[];
}

export interface SplitFeedersResult {
  readonly value: {
    readonly feeders: readonly FeederTopology[];
    readonly islands: readonly Island[];
  };
  readonly diagnostics: readonly Diagnostic[];
}

export function splitFeeders(
  network: Network,
  index: NetworkIndex = indexNetwork(network),
): SplitFeedersResult {
  const diagnostics: Diagnostic[] = [];
  const g = buildGraph(network);
  const { ids, edges, adj } = g;
  const n = ids.length;
  const other = (e: Edge, v: number) => (e.a === v ? e.b : e.a);

  // 1. Substation parts.
  const { subOf, conflicts: sourceConflict } = findSubstationParts(
    g,
    network.sources.map((src) => g.index(src.busId)),
  );
  for (const s of [...sourceConflict].sort((a, b) => a - b)) {
    const src = network.sources[s]!;
    diagnostics.push(makeDiagnostic(
      "topology.multisource",
      "error",
      `Grid source "${src.id}" is connected to another grid source through closed devices; ` +
        "networks fed from two sources are not supported",
      { at: src.at },
    ));
  }

  // 2. Components of the non-substation buses (closed edges, heads excluded).
  const { comp, count: nComp } = labelComponents(g, subOf);

  const membersOf: number[][] = Array.from({ length: nComp }, () => []);
  for (let v = 0; v < n; v++) if (comp[v]! >= 0) membersOf[comp[v]!]!.push(v);

  // 3. Heads per component.
  const unfedHeads: { edge: Edge; reason: Taint }[] = [];
  const headsOf: { edge: Edge; source: number }[][] = Array.from({ length: nComp }, () => []);
  for (const e of edges) {
    if (e.head === undefined) continue;
    const aSub = subOf[e.a]!, bSub = subOf[e.b]!;
    if (aSub >= 0 && bSub >= 0 && aSub !== bSub) {
      const [s1, s2] = [network.sources[aSub]!, network.sources[bSub]!];
      const d = makeDiagnostic(
        "topology.multisource",
        "error",
        `Feeder "${e.head}" (head device "${e.id}") is fed from grid source "${s1.id}" and also, ` +
          `without a head device, from grid source "${s2.id}"; networks fed from two sources are not supported`,
        { feederId: e.head, ...(e.at === undefined ? {} : { at: e.at }) },
      );
      diagnostics.push(d);
      unfedHeads.push({
        edge: e,
        reason: { code: d.code, file: e.at?.file ?? "", line: e.at?.line ?? 0 },
      });
      continue;
    }
    if ((aSub >= 0) === (bSub >= 0)) {
      diagnostics.push(makeDiagnostic(
        "topology.head",
        "error",
        aSub >= 0
          ? `Feeder-head device "${e.id}" of feeder "${e.head}" joins two substation buses; it heads nothing`
          : `Feeder-head device "${e.id}" of feeder "${e.head}" is not connected to any grid source`,
        e.at === undefined ? {} : { at: locateField(network.headers, e.at, "heads_feeder") },
      ));
      if (aSub < 0) headsOf[comp[e.a]!]!.push({ edge: e, source: -1 });
      continue;
    }
    const down = aSub >= 0 ? e.b : e.a;
    headsOf[comp[down]!]!.push({ edge: e, source: aSub >= 0 ? aSub : bSub });
  }

  // 4. Feeders and islands.
  const feederOfComp: (string | undefined)[] = new Array(nComp).fill(undefined);
  const feeders: FeederTopology[] = [];
  const islandComps: number[] = [];
  for (let c = 0; c < nComp; c++) {
    const heads = headsOf[c]!;
    if (heads.length === 0) {
      islandComps.push(c);
      continue;
    }
    const feederIds = [...new Set(heads.map((h) => h.edge.head!))].sort();
    feederOfComp[c] = feederIds.join("+");
  }
  const seenFeeder = new Map<string, number>();
  for (let c = 0; c < nComp; c++) {
    const heads = headsOf[c]!;
    if (heads.length === 0) continue;
    const feederIds = feederOfComp[c]!.split("+");
    const feederId = feederOfComp[c]!;
    const reasons: Taint[] = [];
    const flag = (d: Diagnostic) => {
      diagnostics.push({ ...d, feederId });
      if (d.severity === "error") {
        reasons.push({ code: d.code, file: d.at?.file ?? "", line: d.at?.line ?? 0 });
      }
    };
    for (const id of feederIds) {
      if (seenFeeder.has(id.toLowerCase())) {
        flag(makeDiagnostic(
          "feeder.duplicate",
          "error",
          `Feeder id "${id}" heads two separate networks`,
          { at: heads.find((h) => h.edge.head === id)?.edge.at },
        ));
      }
      seenFeeder.set(id.toLowerCase(), c);
    }
    if (feederIds.length > 1) {
      flag(makeDiagnostic(
        "topology.merged",
        "warning",
        `Feeders ${feederIds.map((f) => `"${f}"`).join(", ")} are joined through closed devices; ` +
          `studied together as meshed feeder "${feederId}"`,
        { at: heads[0]!.edge.at },
      ));
    }
    const sources = [...new Set(heads.map((h) => h.source))];
    if (sources.length !== 1 || sources[0]! < 0 || sourceConflict.has(sources[0]!)) {
      if (sources.length > 1) {
        flag(makeDiagnostic(
          "topology.multisource",
          "error",
          `Feeder "${feederId}" is fed from more than one grid source through closed devices`,
          { at: heads[0]!.edge.at },
        ));
      }
      reasons.push({ code: "topology.unfed", file: "", line: 0 });
      feeders.push(
        unorderedFeeder(
          feederId,
          feederIds,
          heads.map((h) => h.edge.id),
          membersOf[c]!.map((v) => ids[v]!),
          reasons,
        ),
      );
      continue;
    }
    const s = sources[0]!;
    const headSet = new Set(heads.map((h) => h.edge));
    const root = g.index(network.sources[s]!.busId)!;
    const ordered = orderFeeder(g, root, s, c, subOf, comp, headSet);
    // Phases and loads/generators on buses with those phases.
    for (const bad of ordered.phaseProblems) {
      flag(makeDiagnostic(
        "phase.upstream",
        "error",
        `${bad.what} has phases "${
          phaseLetters(bad.phases)
        }" but bus "${bad.busId}" upstream of it has only "${phaseLetters(bad.available)}"`,
        { at: bad.at === undefined ? undefined : locateField(network.headers, bad.at, "phases") },
      ));
    }
    ordered.busIds.forEach((busId, i) => {
      const available = ordered.busPhases[i]!;
      const at = index.atBus.get(busId.toLowerCase());
      if (at === undefined) return;
      for (
        const [kind, els] of [["Load", at.loads], ["Generator", at.generators], [
          "Shunt",
          at.shunts,
        ]] as const
      ) {
        for (const el of els) {
          if (phasesWithin(el.phases, available)) continue;
          flag(makeDiagnostic(
            "phase.upstream",
            "error",
            `${kind} "${el.id}" has phases "${
              phaseLetters(el.phases)
            }" but bus "${el.busId}" has only "${phaseLetters(available)}"`,
            { at: locateField(network.headers, el.at, "phases") },
          ));
        }
      }
    });
    // The feeder column against connectivity.
    for (let i = ordered.substationBusCount; i < ordered.busIds.length; i++) {
      const bus = index.busById.get(ordered.busIds[i]!.toLowerCase());
      const hint = bus?.feederHint;
      if (bus === undefined || hint === undefined) continue;
      if (!feederIds.some((f) => f.toLowerCase() === hint.toLowerCase())) {
        flag(makeDiagnostic(
          "feeder.mismatch",
          "warning",
          `Bus "${bus.id}" names feeder "${hint}" but is fed through feeder "${feederId}"`,
          { at: locateField(network.headers, bus.at, "feeder"), found: hint, expected: feederId },
        ));
      }
    }
    for (const id of ordered.busIds) {
      reasons.push(...(network.taintedBuses[id.toLowerCase()] ?? []));
    }
    const openPoints = ordered.openEdges.map(({ edge, bus }) => {
      const far = other(edge, bus);
      const side = subOf[far]! >= 0 ? "substation" : feederOfComp[comp[far]!] ?? "island";
      return { switchId: edge.id, busId: ids[bus]!, otherSide: side };
    });
    feeders.push({
      feederId,
      feederIds,
      sourceId: network.sources[s]!.id,
      headDeviceIds: heads.map((h) => h.edge.id),
      ...ordered,
      openPoints,
      meshed: ordered.loopEdges.length > 0,
      setAside: reasons.length > 0,
      reasons: dedupeReasons(reasons),
    });
  }

  for (const { edge, reason } of unfedHeads) {
    feeders.push(unorderedFeeder(edge.head!, [edge.head!], [edge.id], [], [reason]));
  }
  // Loads, generators and shunts that no feeder reaches are never studied: say so.
  for (
    const [kind, els] of [["Load", network.loads], ["Generator", network.generators], [
      "Shunt",
      network.shunts,
    ]] as const
  ) {
    for (const el of els) {
      const v = g.index(el.busId);
      if (v === undefined || subOf[v]! < 0) continue;
      diagnostics.push(makeDiagnostic(
        "topology.no_feeder",
        "warning",
        `${kind} "${el.id}" at bus "${el.busId}" is reached from a grid source without passing a ` +
          "feeder-head device; it belongs to no feeder and is not studied",
        { at: locateField(network.headers, el.at, "bus") },
      ));
    }
  }
  for (const a of network.applications) {
    const v = g.index(a.busId);
    if (v === undefined || subOf[v]! < 0) continue;
    diagnostics.push(makeDiagnostic(
      "topology.no_feeder",
      "warning",
      `Application "${a.id}" at bus "${a.busId}" is reached from a grid source without passing a ` +
        "feeder-head device; it belongs to no feeder and is not studied",
      { at: locateField(network.headers, a.at, "bus_id") },
    ));
  }
  // Forecast rows are matched to feeders by id, as feeder ids are compared everywhere.
  const feederIdSet = new Set(feeders.flatMap((f) => f.feederIds.map((id) => id.toLowerCase())));
  for (const f of network.generationForecasts) {
    if (feederIdSet.has(f.feederId.toLowerCase())) continue;
    diagnostics.push(makeDiagnostic(
      "feeder.unknown",
      "warning",
      `Generation forecast for feeder "${f.feederId}" is not used: no feeder-head device heads a feeder of that id`,
      {
        at: locateField(network.headers, f.at, "feeder_id"),
        found: f.feederId,
        expected: "the id of a feeder (heads_feeder of switches.csv)",
      },
    ));
  }

  const islands: Island[] = islandComps.map((c) => {
    const members: string[] = [];
    const nextTo: { switchId: string; feederId: string }[] = [];
    for (const v of membersOf[c]!) {
      members.push(ids[v]!);
      for (const ei of adj[v]!) {
        const e = edges[ei]!;
        const w = other(e, v);
        if (!e.closed && comp[w] !== c) {
          nextTo.push({
            switchId: e.id,
            feederId: subOf[w]! >= 0 ? "substation" : feederOfComp[comp[w]!] ?? "island",
          });
        }
      }
    }
    const real = members.map((m) => index.busById.get(m.toLowerCase())).filter((b) =>
      b !== undefined
    );
    const first = real[0];
    // Buses whose own rows were rejected are already reported; an island of only those
    // would repeat the row errors.
    if (first === undefined) return { busIds: members, nextTo };
    const beside = nextTo.length > 0
      ? ` (next to open ${nextTo.map((t) => `"${t.switchId}" of ${t.feederId}`).join(", ")})`
      : "";
    diagnostics.push(makeDiagnostic(
      "topology.island",
      "warning",
      `${members.length} bus(es) are not fed from any grid source with the switches in their normal state: ${
        members.slice(0, 8).map((m) => `"${m}"`).join(", ")
      }${members.length > 8 ? ", …" : ""}${beside}`,
      { at: first.at },
    ));
    return { busIds: members, nextTo };
  });
  feeders.sort((a, b) => (a.feederId < b.feederId ? -1 : a.feederId > b.feederId ? 1 : 0));
  return { value: { feeders, islands }, diagnostics };
}

function dedupeReasons(reasons: readonly Taint[]): Taint[] {
  const m = new Map<string, Taint>();
  for (const r of reasons) m.set(`${r.code}@${r.file}:${r.line}`, r);
  return [...m.values()].sort((a, b) =>
    a.file < b.file ? -1 : a.file > b.file ? 1 : a.line - b.line || (a.code < b.code ? -1 : 1)
  );
}

function unorderedFeeder(
  feederId: string,
  feederIds: string[],
  headDeviceIds: string[],
  busIds: string[],
  reasons: Taint[],
): FeederTopology {
  return {
    feederId,
    feederIds,
    sourceId: "",
    headDeviceIds,
    busIds,
    substationBusCount: 0,
    parent: new Int32Array(busIds.length).fill(-1),
    parentEdge: busIds.map(() => undefined),
    loopEdges: [],
    busPhases: new Uint8Array(busIds.length),
    openPoints: [],
    meshed: false,
    setAside: true,
    reasons: dedupeReasons(reasons),
  };
}
