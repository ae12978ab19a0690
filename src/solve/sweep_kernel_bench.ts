/**
 * The sweep kernel beside the least a backward/forward sweep can do over the same typed
 * arrays (a real-ratio-free, change-free loop: the "speed of light" of the method). Ratios
 * in one run are what count. Inputs are built outside the timed functions.
 *
 *   deno bench --allow-read src/solve/sweep_kernel_bench.ts
 */
import { sweepBalanced } from "./sweep_kernel.ts";

const N = 2000;
const parent = new Int32Array(N);
const rand = (() => {
  let s = 12345;
  return () => ((s = (s * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff);
})();
for (let k = 1; k < N; k++) parent[k] = Math.max(0, k - 1 - Math.floor(rand() * 4));
const zRe = Float64Array.from({ length: N }, () => 1e-4 + 1e-4 * rand());
const zIm = Float64Array.from({ length: N }, () => 1e-4 + 1e-4 * rand());
const gRe = new Float64Array(N).fill(1), gIm = new Float64Array(N);
// One branch in twenty has a ratio (a transformer), as on feeders with LV sections.
const hasRatio = Uint8Array.from({ length: N }, (_, b) => (b % 20 === 0 ? 1 : 0));
for (let b = 0; b < N; b += 20) gRe[b] = 1 / 1.025;
const drawRe = Float64Array.from({ length: N }, () => 1e-4 * rand());
const drawIm = Float64Array.from({ length: N }, () => -5e-5 * rand());
const vRe = new Float64Array(N).fill(1), vIm = new Float64Array(N);
const jRe = new Float64Array(N), jIm = new Float64Array(N);
const accRe = new Float64Array(N), accIm = new Float64Array(N);

/** The minimal sweep: no ratios, no convergence measure. */
function minimalSweep(): void {
  accRe.set(drawRe);
  accIm.set(drawIm);
  for (let k = N - 1; k > 0; k--) {
    const p = parent[k]!;
    jRe[k - 1] = accRe[k]!;
    jIm[k - 1] = accIm[k]!;
    accRe[p] = accRe[p]! + accRe[k]!;
    accIm[p] = accIm[p]! + accIm[k]!;
  }
  for (let k = 1; k < N; k++) {
    const p = parent[k]!, b = k - 1;
    const jr = jRe[b]!, ji = jIm[b]!, zr = zRe[b]!, zi = zIm[b]!;
    vRe[k] = vRe[p]! - (zr * jr - zi * ji);
    vIm[k] = vIm[p]! - (zr * ji + zi * jr);
  }
}

Deno.bench("minimal hand-written sweep, 2000 buses", { group: "sweep", baseline: true }, () => {
  minimalSweep();
});

Deno.bench("sweepBalanced(), 2000 buses", { group: "sweep" }, () => {
  sweepBalanced(
    N,
    parent,
    zRe,
    zIm,
    gRe,
    gIm,
    hasRatio,
    drawRe,
    drawIm,
    vRe,
    vIm,
    jRe,
    jIm,
    accRe,
    accIm,
  );
});
