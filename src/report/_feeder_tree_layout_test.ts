import { deepStrictEqual as assertEquals, strictEqual } from "node:assert/strict";
import type { BranchRow, BusRow } from "../pipeline/study_feeder.ts";
import { layoutFeederTree } from "./_feeder_tree_layout.ts";

const bus = (id: string, distanceKm: number): BusRow => ({
  id,
  vnKv: 20,
  distanceKm,
  vPu: 1,
  angleDeg: 0,
  dgChangePercent: null,
  rpPercent: null,
  xqPercent: null,
});
const branch = (from: string, to: string): BranchRow => ({
  id: `${from}-${to}`,
  kind: "line",
  from,
  to,
  pFromKw: 0,
  qFromKvar: 0,
  pToKw: 0,
  qToKvar: 0,
  iA: 0,
  loadingPercent: 0,
});

Deno.test("layoutFeederTree() keeps the farthest-reaching path on the source's row", () => {
  // S ─ A ─ B(short spur end)      A has two children: B (1 km) and C → D (3 km).
  //          └ C ─ D
  const buses = [bus("S", 0), bus("A", 0.5), bus("B", 1), bus("C", 1.5), bus("D", 3)];
  const branches = [branch("S", "A"), branch("A", "B"), branch("A", "C"), branch("C", "D")];
  const t = layoutFeederTree(buses, branches);
  const row = Object.fromEntries(t.nodes.map((n) => [n.id, n.row]));
  assertEquals(row, { S: 0, A: 0, C: 0, D: 0, B: 1 });
  strictEqual(t.rows, 2);
  strictEqual(t.maxDistanceKm, 3);
  assertEquals(t.loops, []);
  // Parents point into nodes.
  for (const n of t.nodes.slice(1)) strictEqual(t.nodes[n.parent]!.row <= n.row, true);
});

Deno.test("layoutFeederTree() gives each branch-off its own row, depth first", () => {
  const buses = [
    bus("S", 0),
    bus("A", 1),
    bus("A1", 2),
    bus("A2", 2.5),
    bus("B", 4),
    bus("B1", 4.5),
  ];
  // Trunk S-A-B; spurs A-A1 and A-A2 (A2 longer), B-B1... B1 shorter than nothing else.
  const branches = [
    branch("S", "A"),
    branch("A", "A1"),
    branch("A", "A2"),
    branch("A", "B"),
    branch("B", "B1"),
  ];
  const t = layoutFeederTree(buses, branches);
  const row = Object.fromEntries(t.nodes.map((n) => [n.id, n.row]));
  assertEquals(row, { S: 0, A: 0, B: 0, B1: 0, A2: 1, A1: 2 });
});

Deno.test("layoutFeederTree() keeps loop-closing branches apart and ignores unknown buses", () => {
  const buses = [bus("S", 0), bus("A", 1), bus("B", 2), bus("C", 2.5)];
  const branches = [
    branch("S", "A"),
    branch("A", "B"),
    branch("A", "C"),
    branch("B", "C"),
    branch("C", "X"),
  ];
  const t = layoutFeederTree(buses, branches);
  strictEqual(t.nodes.length, 4);
  assertEquals(t.loops.map((l) => [t.nodes[l.from]!.id, t.nodes[l.to]!.id, l.id]), [[
    "B",
    "C",
    "B-C",
  ]]);
});

Deno.test("layoutFeederTree() lays out a 20,000-bus chain without deep recursion", () => {
  const n = 20_000;
  const buses = Array.from({ length: n }, (_, k) => bus(`B${k}`, k * 0.01));
  const branches = buses.slice(1).map((b, k) => branch(`B${k}`, b.id));
  const t = layoutFeederTree(buses, branches);
  strictEqual(t.rows, 1);
  strictEqual(t.nodes.length, n);
});
