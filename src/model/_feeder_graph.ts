/**
 * The connectivity graph of a fleet (buses and closed or open edges) and the breadth-first
 * ordering of one feeder over it. Private to the topology stage (splitFeeders).
 */
import type { SourceLocation } from "./diagnostic.ts";
import type { Network } from "./network.ts";
import { PHASES_ABC, phasesWithin } from "./phases.ts";

export type EdgeKind = "line" | "transformer" | "switch" | "placeholder";

export interface EdgeRef {
  readonly kind: EdgeKind;
  readonly id: string;
  /** Index into the network's array of that kind (lines, transformers, switches). */
  readonly index: number;
  /** True when the edge runs from the tree's parent to child in its own from → to sense. */
  readonly forward: boolean;
}

export interface Edge {
  readonly kind: EdgeKind;
  readonly id: string;
  readonly index: number;
  readonly a: number;
  readonly b: number;
  readonly phases: number;
  readonly closed: boolean;
  readonly head: string | undefined;
  readonly at: SourceLocation | undefined;
}

export interface Graph {
  readonly ids: string[];
  readonly edges: Edge[];
  readonly adj: number[][];
  index(id: string): number | undefined;
}

export function buildGraph(network: Network): Graph {
  const ids: string[] = [];
  const byId = new Map<string, number>();
  const add = (id: string) => {
    const k = id.toLowerCase();
    if (!byId.has(k)) {
      byId.set(k, ids.length);
      ids.push(id);
    }
  };
  network.buses.forEach((b) => add(b.id));
  network.placeholderBuses.forEach(add);
  const edges: Edge[] = [];
  const edge = (e: Omit<Edge, "a" | "b">, a: string, b: string) => {
    const ia = byId.get(a.toLowerCase()), ib = byId.get(b.toLowerCase());
    if (ia !== undefined && ib !== undefined) edges.push({ ...e, a: ia, b: ib });
  };
  network.lines.forEach((l, index) =>
    edge(
      {
        kind: "line",
        id: l.id,
        index,
        phases: l.phases,
        closed: l.inService,
        head: undefined,
        at: l.at,
      },
      l.fromBusId,
      l.toBusId,
    )
  );
  network.transformers.forEach((t, index) =>
    edge(
      {
        kind: "transformer",
        id: t.id,
        index,
        phases: PHASES_ABC,
        closed: true,
        head: undefined,
        at: t.at,
      },
      t.hvBusId,
      t.lvBusId,
    )
  );
  network.switches.forEach((s, index) =>
    edge(
      {
        kind: "switch",
        id: s.id,
        index,
        phases: s.phases,
        closed: s.normallyClosed,
        head: s.headsFeeder,
        at: s.at,
      },
      s.fromBusId,
      s.toBusId,
    )
  );
  network.placeholderEdges.forEach((p, index) =>
    edge(
      {
        kind: "placeholder",
        id: p.id,
        index,
        phases: PHASES_ABC,
        closed: true,
        head: undefined,
        at: undefined,
      },
      p.aBusId,
      p.bBusId,
    )
  );
  const adj: number[][] = ids.map(() => []);
  edges.forEach((e, i) => {
    adj[e.a]!.push(i);
    adj[e.b]!.push(i);
  });
  return { ids, edges, adj, index: (id) => byId.get(id.toLowerCase()) };
}

export interface PhaseProblem {
  what: string;
  phases: number;
  available: number;
  busId: string;
  at: SourceLocation | undefined;
}

/** Breadth-first order of one feeder from its source bus through its head devices. */
export function orderFeeder(
  g: Graph,
  rootBus: number,
  source: number,
  component: number,
  subOf: Int32Array,
  comp: Int32Array,
  heads: ReadonlySet<Edge>,
) {
  const { ids, edges, adj } = g;
  const pos = new Map<number, number>();
  const order: number[] = [];
  const parent: number[] = [];
  const parentEdge: (EdgeRef | undefined)[] = [];
  const phases: number[] = [];
  const loopEdges: EdgeRef[] = [];
  const openEdges: { edge: Edge; bus: number }[] = [];
  const phaseProblems: PhaseProblem[] = [];
  const usedEdge = new Set<number>();
  const inFeeder = (v: number) => subOf[v] === source || comp[v] === component;
  pos.set(rootBus, 0);
  order.push(rootBus);
  parent.push(-1);
  parentEdge.push(undefined);
  phases.push(PHASES_ABC);
  let substationBusCount = 0;
  // Two passes: substation part first, then the feeder beyond its heads.
  for (const pass of [0, 1]) {
    const queue = pass === 0 ? [rootBus] : order.filter((v) => subOf[v] === source);
    let head = 0;
    while (head < queue.length) {
      const v = queue[head++]!;
      for (const ei of adj[v]!) {
        const e = edges[ei]!;
        const w = e.a === v ? e.b : e.a;
        if (!e.closed) {
          if (comp[v] === component && e.kind === "switch") openEdges.push({ edge: e, bus: v });
          continue;
        }
        if (!inFeeder(w)) continue;
        if (e.head !== undefined && !heads.has(e)) continue;
        if (pass === 0 && (e.head !== undefined || subOf[w] !== source)) continue;
        if (usedEdge.has(ei)) continue;
        usedEdge.add(ei);
        const ref: EdgeRef = { kind: e.kind, id: e.id, index: e.index, forward: e.a === v };
        if (pos.has(w)) {
          loopEdges.push(ref);
          continue;
        }
        const pv = phases[pos.get(v)!]!;
        if (!phasesWithin(e.phases, pv)) {
          phaseProblems.push({
            what: `${
              e.kind === "line" ? "Line" : e.kind === "switch" ? "Switch" : "Transformer"
            } "${e.id}"`,
            phases: e.phases,
            available: pv,
            busId: ids[v]!,
            at: e.at,
          });
        }
        pos.set(w, order.length);
        order.push(w);
        parent.push(pos.get(v)!);
        parentEdge.push(ref);
        phases.push(e.phases & pv);
        queue.push(w);
      }
    }
    if (pass === 0) substationBusCount = order.length;
  }
  return {
    busIds: order.map((v) => ids[v]!),
    substationBusCount,
    parent: Int32Array.from(parent),
    parentEdge,
    loopEdges,
    busPhases: Uint8Array.from(phases),
    openEdges,
    phaseProblems,
  };
}

/**
 * Marks the substation part of each source: the buses reachable from its bus through closed
 * edges without passing a feeder-head device. `conflicts` holds sources whose parts meet.
 */
export function findSubstationParts(
  g: Graph,
  roots: readonly (number | undefined)[],
): { subOf: Int32Array; conflicts: Set<number> } {
  const { edges, adj } = g;
  const subOf = new Int32Array(g.ids.length).fill(-1);
  const conflicts = new Set<number>();
  roots.forEach((root, s) => {
    if (root === undefined) return;
    if (subOf[root]! >= 0) {
      conflicts.add(s).add(subOf[root]!);
      return;
    }
    const queue = [root];
    subOf[root] = s;
    for (let head = 0; head < queue.length; head++) {
      const v = queue[head]!;
      for (const ei of adj[v]!) {
        const e = edges[ei]!;
        if (!e.closed || e.head !== undefined) continue;
        const w = e.a === v ? e.b : e.a;
        if (subOf[w] === -1) {
          subOf[w] = s;
          queue.push(w);
        } else if (subOf[w] !== s) conflicts.add(s).add(subOf[w]!);
      }
    }
  });
  return { subOf, conflicts };
}

/** Connected components of the buses outside substation parts (closed edges, heads excluded). */
export function labelComponents(g: Graph, subOf: Int32Array): { comp: Int32Array; count: number } {
  const { edges, adj } = g;
  const n = g.ids.length;
  const comp = new Int32Array(n).fill(-1);
  let count = 0;
  for (let v = 0; v < n; v++) {
    if (subOf[v]! >= 0 || comp[v]! >= 0) continue;
    const queue = [v];
    comp[v] = count;
    for (let head = 0; head < queue.length; head++) {
      const u = queue[head]!;
      for (const ei of adj[u]!) {
        const e = edges[ei]!;
        if (!e.closed || e.head !== undefined) continue;
        const w = e.a === u ? e.b : e.a;
        if (subOf[w]! < 0 && comp[w] === -1) {
          comp[w] = count;
          queue.push(w);
        }
      }
    }
    count++;
  }
  return { comp, count };
}
