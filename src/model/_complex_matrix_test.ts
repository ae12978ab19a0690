import { ok as assert } from "node:assert/strict";
import fc from "fast-check";
import { invertComplexMatrix, reduceKron } from "./_complex_matrix.ts";

/** Tolerance of these algebraic checks: 1e-10 relative to the largest entry involved. */
const REL_TOL = 1e-10;

function multiply(
  n: number,
  aRe: Float64Array,
  aIm: Float64Array,
  bRe: Float64Array,
  bIm: Float64Array,
): { re: Float64Array; im: Float64Array } {
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let sRe = 0;
      let sIm = 0;
      for (let k = 0; k < n; k++) {
        const ar = aRe[i * n + k]!;
        const ai = aIm[i * n + k]!;
        const br = bRe[k * n + j]!;
        const bi = bIm[k * n + j]!;
        sRe += ar * br - ai * bi;
        sIm += ar * bi + ai * br;
      }
      re[i * n + j] = sRe;
      im[i * n + j] = sIm;
    }
  }
  return { re, im };
}

function assertIdentity(n: number, re: Float64Array, im: Float64Array, label: string): void {
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const expected = i === j ? 1 : 0;
      assert(Math.abs(re[i * n + j]! - expected) <= REL_TOL, `${label} re(${i},${j})`);
      assert(Math.abs(im[i * n + j]!) <= REL_TOL, `${label} im(${i},${j})`);
    }
  }
}

Deno.test("invertComplexMatrix() matches the closed-form inverse of 1×1 and 2×2 matrices", () => {
  // Closed forms: 1/(a + jb) = (a − jb)/(a² + b²); [[p, q], [r, s]]⁻¹ = [[s, −q], [−r, p]]/det.
  const cases = [
    { n: 1, re: [3], im: [4], invRe: [3 / 25], invIm: [-4 / 25] },
    // [[2, j], [j, 2]]: det = 4 − j² = 5, inverse [[2, −j], [−j, 2]]/5.
    {
      n: 2,
      re: [2, 0, 0, 2],
      im: [0, 1, 1, 0],
      invRe: [0.4, 0, 0, 0.4],
      invIm: [0, -0.2, -0.2, 0],
    },
    // [[0, 1], [1, 0]] needs a row swap: it is its own inverse.
    { n: 2, re: [0, 1, 1, 0], im: [0, 0, 0, 0], invRe: [0, 1, 1, 0], invIm: [0, 0, 0, 0] },
  ];
  for (const c of cases) {
    const outRe = new Float64Array(c.n * c.n);
    const outIm = new Float64Array(c.n * c.n);
    assert(
      invertComplexMatrix(c.n, Float64Array.from(c.re), Float64Array.from(c.im), outRe, outIm),
    );
    c.invRe.forEach((v, k) => assert(Math.abs(outRe[k]! - v) <= REL_TOL, `n=${c.n} re ${k}`));
    c.invIm.forEach((v, k) => assert(Math.abs(outIm[k]! - v) <= REL_TOL, `n=${c.n} im ${k}`));
  }
});

Deno.test("invertComplexMatrix() reports a singular matrix instead of returning numbers", () => {
  const cases = [
    { name: "rank-one real", n: 2, re: [1, 2, 2, 4], im: [0, 0, 0, 0], regular: false },
    // [[1+j, j], [j, 1+j]]: det = (1+j)² − j² = 1 + 2j, regular.
    { name: "regular complex", n: 2, re: [1, 0, 0, 1], im: [1, 1, 1, 1], regular: true },
    // [[1, j], [j, −1]]: det = −1 − j² = 0.
    { name: "singular complex", n: 2, re: [1, 0, 0, -1], im: [0, 1, 1, 0], regular: false },
    { name: "zero", n: 1, re: [0], im: [0], regular: false },
  ];
  cases.forEach((c) => {
    const out = new Float64Array(c.n * c.n);
    const ok = invertComplexMatrix(
      c.n,
      Float64Array.from(c.re),
      Float64Array.from(c.im),
      out,
      new Float64Array(c.n * c.n),
    );
    assert(ok === c.regular, c.name);
  });
});

const matrixArbitrary = (n: number) =>
  fc.record({
    re: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), {
      minLength: n * n,
      maxLength: n * n,
    }),
    im: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), {
      minLength: n * n,
      maxLength: n * n,
    }),
  }).map(({ re, im }) => {
    // Diagonally dominant real part: regular and well conditioned.
    const r = Float64Array.from(re);
    for (let i = 0; i < n; i++) r[i * n + i] = r[i * n + i]! + 2 * n;
    return { re: r, im: Float64Array.from(im) };
  });

Deno.test("invertComplexMatrix() gives A·A⁻¹ = I for random regular matrices", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 6 }).chain((n) => matrixArbitrary(n).map((m) => ({ n, m }))),
      ({ n, m }) => {
        const invRe = new Float64Array(n * n);
        const invIm = new Float64Array(n * n);
        assert(invertComplexMatrix(n, m.re, m.im, invRe, invIm));
        const p = multiply(n, m.re, m.im, invRe, invIm);
        assertIdentity(n, p.re, p.im, `n=${n}`);
      },
    ),
    { numRuns: 300 },
  );
});

Deno.test("reduceKron() equals Z_kk − Z_ke·Z_ee⁻¹·Z_ek computed with an explicit inverse", () => {
  // Definition of the Kron reduction (Schur complement), for random sizes and splits.
  const sizes = fc.integer({ min: 1, max: 6 }).chain((n) =>
    fc.record({ n: fc.constant(n), keep: fc.integer({ min: 1, max: n }), m: matrixArbitrary(n) })
  );
  fc.assert(
    fc.property(sizes, ({ n, keep, m }) => {
      const e = n - keep;
      const block = (r0: number, c0: number, rows: number, cols: number) => {
        const re = new Float64Array(rows * cols);
        const im = new Float64Array(rows * cols);
        for (let i = 0; i < rows; i++) {
          for (let j = 0; j < cols; j++) {
            re[i * cols + j] = m.re[(r0 + i) * n + c0 + j]!;
            im[i * cols + j] = m.im[(r0 + i) * n + c0 + j]!;
          }
        }
        return { re, im };
      };
      const kk = block(0, 0, keep, keep);
      const outRe = new Float64Array(keep * keep);
      const outIm = new Float64Array(keep * keep);
      assert(reduceKron(n, keep, m.re, m.im, outRe, outIm));
      if (e === 0) {
        kk.re.forEach((v, k) => assert(v === outRe[k]));
        return;
      }
      const ee = block(keep, keep, e, e);
      const eeInvRe = new Float64Array(e * e);
      const eeInvIm = new Float64Array(e * e);
      assert(invertComplexMatrix(e, ee.re, ee.im, eeInvRe, eeInvIm));
      const ke = block(0, keep, keep, e);
      const ek = block(keep, 0, e, keep);
      for (let i = 0; i < keep; i++) {
        for (let j = 0; j < keep; j++) {
          let sRe = kk.re[i * keep + j]!;
          let sIm = kk.im[i * keep + j]!;
          for (let a = 0; a < e; a++) {
            for (let b = 0; b < e; b++) {
              // Z_ke[i,a] · inv[a,b] · Z_ek[b,j]
              const xr = ke.re[i * e + a]!;
              const xi = ke.im[i * e + a]!;
              const yr = eeInvRe[a * e + b]!;
              const yi = eeInvIm[a * e + b]!;
              const tr = xr * yr - xi * yi;
              const ti = xr * yi + xi * yr;
              const zr = ek.re[b * keep + j]!;
              const zi = ek.im[b * keep + j]!;
              sRe -= tr * zr - ti * zi;
              sIm -= tr * zi + ti * zr;
            }
          }
          const scale = Math.max(1, Math.abs(sRe), Math.abs(sIm));
          assert(Math.abs(outRe[i * keep + j]! - sRe) <= REL_TOL * scale, `re(${i},${j})`);
          assert(Math.abs(outIm[i * keep + j]! - sIm) <= REL_TOL * scale, `im(${i},${j})`);
        }
      }
    }),
    { numRuns: 300 },
  );
});

Deno.test("reduceKron() leaves its inputs unchanged", () => {
  const re = Float64Array.from([4, 1, 1, 3]);
  const im = Float64Array.from([1, 0.5, 0.5, 2]);
  const before = [...re, ...im];
  const outRe = new Float64Array(1);
  const outIm = new Float64Array(1);
  assert(reduceKron(2, 1, re, im, outRe, outIm));
  assert([...re, ...im].every((v, k) => v === before[k]));
});
