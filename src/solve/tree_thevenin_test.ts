/**
 * The O(n) tree Thevenin pass against the matrix method: the diagonal of the inverse of the
 * full bus admittance matrix (Gauss–Jordan, src/model/_complex_matrix.ts), on random trees
 * with random series impedances and shunts, tolerance 1e-9 relative.
 */
import { ok as assert } from "node:assert/strict";
import fc from "fast-check";
import { invertComplexMatrix } from "../model/_complex_matrix.ts";
import { solveTreeThevenin } from "./tree_thevenin.ts";

/** Dense admittance matrix of the tree; open branches left out. */
function denseZ(
  n: number,
  parent: Int32Array,
  zRe: Float64Array,
  zIm: Float64Array,
  yShRe: Float64Array,
  yShIm: Float64Array,
) {
  const yRe = new Float64Array(n * n), yIm = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    yRe[k * n + k] = yRe[k * n + k]! + yShRe[k]!;
    yIm[k * n + k] = yIm[k * n + k]! + yShIm[k]!;
  }
  for (let k = 1; k < n; k++) {
    const zr = zRe[k - 1]!, zi = zIm[k - 1]!;
    if (!Number.isFinite(zr)) continue;
    const d = zr * zr + zi * zi, gr = zr / d, gi = -zi / d, p = parent[k]!;
    for (const [i, j, s] of [[k, k, 1], [p, p, 1], [k, p, -1], [p, k, -1]] as const) {
      yRe[i * n + j] = yRe[i * n + j]! + s * gr;
      yIm[i * n + j] = yIm[i * n + j]! + s * gi;
    }
  }
  const outRe = new Float64Array(n * n), outIm = new Float64Array(n * n);
  assert(invertComplexMatrix(n, yRe, yIm, outRe, outIm));
  return { outRe, outIm };
}

Deno.test("solveTreeThevenin() equals the diagonal of the inverse admittance matrix on random trees", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 2, max: 40 }),
      fc.integer({ min: 0, max: 2 ** 31 - 1 }),
      (n, seed) => {
        let s = seed;
        const rnd = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648);
        const parent = new Int32Array(n);
        for (let k = 1; k < n; k++) parent[k] = Math.floor(rnd() * k);
        const zRe = Float64Array.from({ length: n - 1 }, () => 0.001 + 0.05 * rnd());
        const zIm = Float64Array.from({ length: n - 1 }, () => 0.001 + 0.08 * rnd());
        const yShRe = new Float64Array(n), yShIm = new Float64Array(n);
        yShRe[0] = 5 + 20 * rnd(); // the source
        yShIm[0] = -(50 + 100 * rnd());
        for (let k = 1; k < n; k++) {
          if (rnd() < 0.2) { // a machine at this bus
            yShRe[k] = 0.1 * rnd();
            yShIm[k] = -(0.5 + 5 * rnd());
          }
        }
        const t = solveTreeThevenin(n, parent, zRe, zIm, yShRe, yShIm);
        const { outRe, outIm } = denseZ(n, parent, zRe, zIm, yShRe, yShIm);
        for (let k = 0; k < n; k++) {
          const dr = t.zthRe[k]! - outRe[k * n + k]!, di = t.zthIm[k]! - outIm[k * n + k]!;
          const scale = Math.hypot(outRe[k * n + k]!, outIm[k * n + k]!);
          assert(Math.hypot(dr, di) <= 1e-9 * scale, `bus ${k}: ${Math.hypot(dr, di) / scale}`);
        }
      },
    ),
    { numRuns: 200 },
  );
});

Deno.test("solveTreeThevenin() gives no path to earth behind an open branch", () => {
  // Source at bus 0, bus 1 behind an open branch (a winding that blocks zero sequence),
  // bus 2 hangs off bus 1 with an earthed shunt of 2 pu.
  const parent = Int32Array.from([0, 0, 1, 1]);
  const zRe = Float64Array.from([Infinity, 0.1, 0.1]);
  const zIm = Float64Array.from([Infinity, 0.1, 0.1]);
  const yShRe = Float64Array.from([10, 0, 0.5, 0]);
  const yShIm = Float64Array.from([-10, 0, 0, 0]);
  const t = solveTreeThevenin(4, parent, zRe, zIm, yShRe, yShIm);
  // Bus 1 sees only bus 2's shunt: z = 0.1 + j0.1 + 2; bus 3 adds its own branch.
  assert(Math.abs(t.zthRe[1]! - 2.1) < 1e-12 && Math.abs(t.zthIm[1]! - 0.1) < 1e-12);
  assert(Math.abs(t.zthRe[3]! - 2.2) < 1e-12 && Math.abs(t.zthIm[3]! - 0.2) < 1e-12);
  // Without bus 2's shunt nothing behind the open branch reaches earth.
  yShRe[2] = 0;
  const u = solveTreeThevenin(4, parent, zRe, zIm, yShRe, yShIm);
  assert(!Number.isFinite(u.zthRe[1]!) && !Number.isFinite(u.zthRe[3]!));
  assert(Number.isFinite(u.zthRe[0]!));
});
