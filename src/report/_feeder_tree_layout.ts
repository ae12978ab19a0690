/**
 * Layout of a feeder for its schematic: each bus at its distance from the source (x) and
 * on a row (y). The tree is found breadth-first from the source bus over the branches;
 * at each bus the child whose subtree reaches farthest continues the parent's row, so the
 * trunk is one straight line, and every other child opens a new row below, in depth-first
 * order. Branches that close a loop are kept apart. Iterative, linear in the buses.
 */
import type { BranchRow, BusRow } from "../pipeline/study_feeder.ts";

export interface TreeNode {
  readonly id: string;
  readonly distanceKm: number;
  readonly row: number;
  /** Index of the parent in `nodes` (-1 for a root). */
  readonly parent: number;
}

export interface TreeLayout {
  /** In depth-first order; nodes[0] is the source bus. */
  readonly nodes: readonly TreeNode[];
  /** Branches that close a loop: indexes into `nodes`. */
  readonly loops: readonly { readonly from: number; readonly to: number; readonly id: string }[];
  readonly rows: number;
  readonly maxDistanceKm: number;
}

export function layoutFeederTree(
  buses: readonly BusRow[],
  branches: readonly BranchRow[],
): TreeLayout {
  const n = buses.length;
  const index = new Map<string, number>();
  buses.forEach((b, k) => index.set(b.id, k));
  const adj: number[][] = buses.map(() => []);
  const ends: [number, number][] = [];
  for (const br of branches) {
    const f = index.get(br.from), t = index.get(br.to);
    if (f === undefined || t === undefined || f === t) {
      ends.push([-1, -1]);
      continue;
    }
    adj[f]!.push(ends.length);
    adj[t]!.push(ends.length);
    ends.push([f, t]);
  }
  // Breadth-first tree from bus 0, then from any bus not reached (islands, if any).
  const parent = new Int32Array(n).fill(-2);
  const order: number[] = [];
  const treeBranch = new Uint8Array(branches.length);
  for (let root = 0; root < n; root++) {
    if (parent[root] !== -2) continue;
    parent[root] = -1;
    order.push(root);
    for (let q = order.length - 1; q < order.length; q++) {
      const u = order[q]!;
      for (const e of adj[u]!) {
        const [f, t] = ends[e]!;
        const v = f === u ? t : f;
        if (parent[v] !== -2) continue;
        parent[v] = u;
        treeBranch[e] = 1;
        order.push(v);
      }
    }
  }
  const children: number[][] = buses.map(() => []);
  for (const v of order) if (parent[v]! >= 0) children[parent[v]!]!.push(v);
  const reach = Float64Array.from(buses, (b) => b.distanceKm);
  for (let q = order.length - 1; q >= 0; q--) {
    const v = order[q]!, p = parent[v]!;
    if (p >= 0 && reach[v]! > reach[p]!) reach[p] = reach[v]!;
  }
  for (const c of children) {
    const ranked = c.map((v, k) => ({ v, k })).sort((a, b) =>
      reach[b.v]! - reach[a.v]! || a.k - b.k
    );
    c.splice(0, c.length, ...ranked.map((x) => x.v));
  }
  // Depth-first: the first child keeps its parent's row, the others open new rows.
  const nodes: TreeNode[] = [];
  const at = new Int32Array(n).fill(-1);
  let rows = 0, maxDistanceKm = 0;
  for (const root of order.filter((v) => parent[v] === -1)) {
    const stack: { v: number; row: number }[] = [{ v: root, row: rows++ }];
    while (stack.length > 0) {
      const top = stack.pop()!;
      const v = top.v, row = top.row >= 0 ? top.row : rows++;
      at[v] = nodes.length;
      const p = parent[v]!;
      nodes.push({
        id: buses[v]!.id,
        distanceKm: buses[v]!.distanceKm,
        row,
        parent: p < 0 ? -1 : at[p]!,
      });
      maxDistanceKm = Math.max(maxDistanceKm, buses[v]!.distanceKm);
      // The first child keeps this row; the others get theirs when popped (depth-first).
      const c = children[v]!;
      for (let k = c.length - 1; k >= 0; k--) stack.push({ v: c[k]!, row: k === 0 ? row : -1 });
    }
  }
  const loops = branches.flatMap((br, e) => {
    const [f, t] = ends[e]!;
    return f < 0 || treeBranch[e] ? [] : [{ from: at[f]!, to: at[t]!, id: br.id }];
  });
  return { nodes, loops, rows, maxDistanceKm };
}
