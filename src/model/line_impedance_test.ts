import { equal, ok as assert } from "node:assert/strict";
import fc from "fast-check";
import {
  computePhaseAdmittance,
  computePhaseImpedance,
  type ConductorPlacement,
  type PhaseMatrix,
  phaseMatrixFromSequence,
  sequenceFromPhaseMatrix,
  type SequenceImpedance,
} from "./line_impedance.ts";
import { invertComplexMatrix } from "./_complex_matrix.ts";

// Exact unit definitions (international foot, inch and statute mile, 1959) [memory].
const M_PER_FT = 0.3048;
const M_PER_IN = 0.0254;
const KM_PER_MILE = 1.609344;

/**
 * Tolerance of the published-value checks: 0.1 % of the expected value or 0.0002 in the
 * published unit (Ω/mile, µS/mile, Ω/km, µS/km), whichever is larger, applied to the real
 * and the imaginary part separately. The absolute floor covers values published to four
 * decimals whose magnitude is small.
 */
const REL_TOL = 1e-3;
const ABS_TOL = 2e-4;

function assertNear(actual: number, expected: number, label: string): void {
  const tol = Math.max(REL_TOL * Math.abs(expected), ABS_TOL);
  assert(
    Math.abs(actual - expected) <= tol,
    `${label}: computed ${actual.toFixed(6)}, published ${expected}, tolerance ±${
      tol.toExponential(2)
    }`,
  );
}

/** Runs `run`, asserts that it throws a RangeError and returns it (for the message checks). */
function catchRangeError(run: () => unknown): RangeError {
  try {
    run();
  } catch (error) {
    assert(error instanceof RangeError, `expected a RangeError, got ${String(error)}`);
    return error;
  }
  throw new Error("expected a RangeError, nothing was thrown");
}

/** Conductor data as published in US units (ft, in, Ω/mile), converted to SI. */
function placeUs(
  phase: ConductorPlacement["phase"],
  xFt: number,
  yFt: number,
  conductor: { rOhmPerMile: number; gmrFt: number; diameterIn: number },
): ConductorPlacement {
  return {
    phase,
    xM: xFt * M_PER_FT,
    yM: yFt * M_PER_FT,
    rOhmPerKm: conductor.rOhmPerMile / KM_PER_MILE,
    gmrM: conductor.gmrFt * M_PER_FT,
    diameterM: conductor.diameterIn * M_PER_IN,
  };
}

/** Entry (i, j) of a phase matrix converted from per km to per mile. */
function perMile(values: Float64Array, n: number, i: number, j: number): number {
  return values[i * n + j]! * KM_PER_MILE;
}

function assertSymmetric(m: PhaseMatrix): void {
  const n = m.phases.length;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      for (const part of [m.re, m.im]) {
        const a = part[i * n + j]!;
        const b = part[j * n + i]!;
        assert(Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), 1e-12), `(${i},${j}) ${a} ≠ ${b}`);
      }
    }
  }
}

// REFERENCES.md A1/A2 conductor data (Kersting; IEEE 13-node test feeder).
const ACSR_336_4 = { rOhmPerMile: 0.306, gmrFt: 0.0244, diameterIn: 0.721 };
const ACSR_4_0 = { rOhmPerMile: 0.592, gmrFt: 0.00814, diameterIn: 0.563 };
const ACSR_556_5 = { rOhmPerMile: 0.1859, gmrFt: 0.0313, diameterIn: 0.927 };
// Spacing of A1 and IEEE spacing 500: positions 1, 2, 3 and the neutral, feet.
const SPACING_500_FT = [[0, 28], [2.5, 28], [7, 28], [4, 24]] as const;

function spacing500(
  phasesInPositions: string,
  phaseConductor: typeof ACSR_4_0,
  neutral: typeof ACSR_4_0,
): ConductorPlacement[] {
  const placed = [...phasesInPositions].map((letter, k) => {
    const [x, y] = SPACING_500_FT[k]!;
    return placeUs(letter as "A" | "B" | "C", x, y, phaseConductor);
  });
  const [xn, yn] = SPACING_500_FT[3];
  placed.push(placeUs("N", xn, yn, neutral));
  return placed;
}

/** Kersting Example 4.1 line: a, b, c in positions 1, 2, 3. */
const EXAMPLE_4_1 = spacing500("ABC", ACSR_336_4, ACSR_4_0);

type Upper = readonly [re: number, im: number];
/** Published upper triangle in the order aa, ab, ac, bb, bc, cc. */
type UpperTriangle = readonly [Upper, Upper, Upper, Upper, Upper, Upper];
const UPPER_INDEX = [[0, 0], [0, 1], [0, 2], [1, 1], [1, 2], [2, 2]] as const;
const UPPER_NAME = ["aa", "ab", "ac", "bb", "bc", "cc"] as const;

function assertUpperTriangleOhmPerMile(m: PhaseMatrix, expected: UpperTriangle, label: string) {
  equal(m.phases, "ABC");
  assertSymmetric(m);
  UPPER_INDEX.forEach(([i, j], k) => {
    const [re, im] = expected[k]!;
    assertNear(perMile(m.re, 3, i, j), re, `${label} z_${UPPER_NAME[k]} real`);
    assertNear(perMile(m.im, 3, i, j), im, `${label} z_${UPPER_NAME[k]} imag`);
  });
}

Deno.test("computePhaseImpedance() matches Kersting Example 4.1 (REFERENCES.md A1)", () => {
  const z = computePhaseImpedance(EXAMPLE_4_1, 60, 100);
  // Kersting, Distribution System Modeling and Analysis, 2nd ed., Example 4.1, Ω/mile.
  assertUpperTriangleOhmPerMile(z, [
    [0.4576, 1.0780],
    [0.1560, 0.5017],
    [0.1535, 0.3849],
    [0.4666, 1.0482],
    [0.1580, 0.4236],
    [0.4615, 1.0651],
  ], "Example 4.1");
});

Deno.test("sequenceFromPhaseMatrix() matches Kersting Example 4.1 z0 and z1 (REFERENCES.md A1)", () => {
  const s = sequenceFromPhaseMatrix(computePhaseImpedance(EXAMPLE_4_1, 60, 100));
  // Kersting Example 4.1: z0 = 0.7735 + j1.9373, z1 = z2 = 0.3061 + j0.6270 Ω/mile.
  const cases = [
    ["z0", s.z0, 0.7735, 1.9373],
    ["z1", s.z1, 0.3061, 0.6270],
    ["z2", s.z2, 0.3061, 0.6270],
  ] as const;
  for (const [name, value, re, im] of cases) {
    assertNear(value.re * KM_PER_MILE, re, `${name} real`);
    assertNear(value.im * KM_PER_MILE, im, `${name} imag`);
  }
});

Deno.test("computePhaseImpedance() agrees with Kersting's 60 Hz Ω/mile form of Carson's equations", () => {
  // Kersting eqs. 4.39–4.40 (REFERENCES.md A), no neutral so no Kron reduction:
  // z_ii = r_i + 0.09530 + j0.12134(ln(1/GMR_ft) + 7.93402), z_ij likewise with D_ij in ft.
  // The SI constant ln(658.5·√(ρ/f)) differs from 7.93402 + ln(0.3048) by 4e-4, i.e.
  // 5e-5 Ω/mile in the reactance: well inside the tolerance.
  const a = placeUs("A", 0, 28, ACSR_336_4);
  const c = placeUs("C", 7, 28, ACSR_336_4);
  const z = computePhaseImpedance([a, c], 60, 100);
  const expected = [
    [0.306 + 0.09530, 0.12134 * (Math.log(1 / 0.0244) + 7.93402)],
    [0.09530, 0.12134 * (Math.log(1 / 7) + 7.93402)],
  ] as const;
  assertNear(perMile(z.re, 2, 0, 0), expected[0][0], "z_aa real");
  assertNear(perMile(z.im, 2, 0, 0), expected[0][1], "z_aa imag");
  assertNear(perMile(z.re, 2, 0, 1), expected[1][0], "z_ac real");
  assertNear(perMile(z.im, 2, 0, 1), expected[1][1], "z_ac imag");
});

Deno.test("computePhaseImpedance() matches IEEE 13-node configurations 601 and 602 (REFERENCES.md A2)", () => {
  // Kersting, "Radial Distribution Test Feeders" (IEEE PES DSA Subcommittee), Ω/mile.
  const cases: readonly {
    name: string;
    positions: string;
    phaseConductor: typeof ACSR_4_0;
    expected: UpperTriangle;
  }[] = [
    {
      name: "601",
      positions: "BAC",
      phaseConductor: ACSR_556_5,
      expected: [
        [0.3465, 1.0179],
        [0.1560, 0.5017],
        [0.1580, 0.4236],
        [0.3375, 1.0478],
        [0.1535, 0.3849],
        [0.3414, 1.0348],
      ],
    },
    {
      name: "602",
      positions: "CAB",
      phaseConductor: ACSR_4_0,
      expected: [
        [0.7526, 1.1814],
        [0.1580, 0.4236],
        [0.1560, 0.5017],
        [0.7475, 1.1983],
        [0.1535, 0.3849],
        [0.7436, 1.2112],
      ],
    },
  ];
  for (const c of cases) {
    const z = computePhaseImpedance(spacing500(c.positions, c.phaseConductor, ACSR_4_0), 60, 100);
    assertUpperTriangleOhmPerMile(z, c.expected, `config ${c.name}`);
  }
});

Deno.test("computePhaseAdmittance() matches IEEE 13-node configuration 601 susceptance (REFERENCES.md A2)", () => {
  const y = computePhaseAdmittance(spacing500("BAC", ACSR_556_5, ACSR_4_0), 60);
  equal(y.phases, "ABC");
  assertSymmetric(y);
  assert(y.re.every((g) => g === 0), "conductance is neglected");
  // IEEE 13-node test feeder, configuration 601, µS/mile.
  const expected = [6.2998, -1.9958, -1.2595, 5.9597, -0.7417, 5.6386];
  UPPER_INDEX.forEach(([i, j], k) => {
    const microSiemensPerMile = y.im[i * 3 + j]! * 1e6 * KM_PER_MILE;
    assertNear(microSiemensPerMile, expected[k]!, `b_${UPPER_NAME[k]}`);
  });
});

Deno.test("computePhaseImpedance() and computePhaseAdmittance() match the CIGRE TB 575 MV overhead line (REFERENCES.md A3)", () => {
  // CIGRE Technical Brochure 575 (TF C6.04.02, 2014): flat, 9.5 m high, 1.0 m spacing, no
  // neutral, 63 mm² Al: GMR 0.370 cm, R′ 0.510 Ω/km, diameter 1.02 cm; 50 Hz, 100 Ω·m.
  const conductors = (["A", "B", "C"] as const).map((phase, k): ConductorPlacement => ({
    phase,
    xM: k * 1.0,
    yM: 9.5,
    rOhmPerKm: 0.510,
    gmrM: 0.370e-2,
    diameterM: 1.02e-2,
  }));
  const z = sequenceFromPhaseMatrix(computePhaseImpedance(conductors, 50, 100));
  // B1 of the (transposed) line: transposition averages the potential coefficients, so
  // transform P = Y⁻¹ and invert its positive-sequence term. The diagonal of the transform of
  // Y itself (untransposed flat layout) is 3.199 µS/km, 0.8 % off the published value.
  const yPhase = computePhaseAdmittance(conductors, 50);
  const pRe = new Float64Array(9);
  const pIm = new Float64Array(9);
  assert(invertComplexMatrix(3, yPhase.re, yPhase.im, pRe, pIm));
  const p = sequenceFromPhaseMatrix({ phases: "ABC", re: pRe, im: pIm });
  const b1MicroSiemensPerKm = -1e6 / p.z1.im; // (Y⁻¹)₁ = j·p.z1.im, so B1 = −1/p.z1.im
  const cases = [
    ["R1 Ω/km", z.z1.re, 0.510],
    ["X1 Ω/km", z.z1.im, 0.366],
    ["R0 Ω/km", z.z0.re, 0.658],
    ["X0 Ω/km", z.z0.im, 1.611],
    ["B1 µS/km", b1MicroSiemensPerKm, 3.172],
  ] as const;
  for (const [name, computed, published] of cases) assertNear(computed, published, name);
});

Deno.test("computePhaseImpedance() of a one- or two-phase subset is the sub-matrix of the full line", () => {
  // Invariant: Kron reduction eliminates only the neutral, so removing a phase conductor
  // from the same geometry removes its row and column and changes nothing else.
  const full = computePhaseImpedance(EXAMPLE_4_1, 60, 100);
  for (const subset of ["A", "B", "C", "AB", "AC", "BC"]) {
    const lines = EXAMPLE_4_1.filter((c) => c.phase === "N" || subset.includes(c.phase));
    const part = computePhaseImpedance(lines, 60, 100);
    equal(part.phases, subset);
    const n = subset.length;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const fi = "ABC".indexOf(subset[i]!);
        const fj = "ABC".indexOf(subset[j]!);
        for (const [p, f] of [[part.re, full.re], [part.im, full.im]] as const) {
          const expected = f[fi * 3 + fj]!;
          assert(Math.abs(p[i * n + j]! - expected) <= 1e-12 * Math.abs(expected), subset);
        }
      }
    }
  }
});

Deno.test("computePhaseAdmittance() of a subset keeps the full line's potential coefficients", () => {
  // Invariant: the admittance is the inverse of the (Kron-reduced) potential coefficient
  // matrix, so it is the inverse of the subset that is a sub-matrix, not the admittance:
  // 1/y of a single phase equals the diagonal entry of the full Y⁻¹, for instance.
  const full = computePhaseAdmittance(EXAMPLE_4_1, 60);
  const fullP = invertReal3(full.im);
  for (const subset of ["A", "B", "C", "AB", "AC", "BC"]) {
    const lines = EXAMPLE_4_1.filter((c) => c.phase === "N" || subset.includes(c.phase));
    const part = computePhaseAdmittance(lines, 60);
    const n = subset.length;
    const partP = n === 1 ? [1 / part.im[0]!] : invertReal2(part.im);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const expected = fullP[3 * "ABC".indexOf(subset[i]!) + "ABC".indexOf(subset[j]!)]!;
        const got = partP[i * n + j]!;
        assert(Math.abs(got - expected) <= 1e-9 * Math.abs(expected), `${subset} ${got}`);
      }
    }
  }
});

function invertReal2(a: Float64Array): number[] {
  const det = a[0]! * a[3]! - a[1]! * a[2]!;
  return [a[3]! / det, -a[1]! / det, -a[2]! / det, a[0]! / det];
}

function invertReal3(a: Float64Array): number[] {
  const m = (i: number, j: number) => a[i * 3 + j]!;
  const cof = (i: number, j: number) => {
    const r = [0, 1, 2].filter((k) => k !== i);
    const c = [0, 1, 2].filter((k) => k !== j);
    const minor = m(r[0]!, c[0]!) * m(r[1]!, c[1]!) - m(r[0]!, c[1]!) * m(r[1]!, c[0]!);
    return (i + j) % 2 === 0 ? minor : -minor;
  };
  const det = m(0, 0) * cof(0, 0) + m(0, 1) * cof(0, 1) + m(0, 2) * cof(0, 2);
  const out: number[] = [];
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out.push(cof(j, i) / det);
  return out;
}

Deno.test("computePhaseImpedance() does not depend on the order of the conductors", () => {
  const reference = computePhaseImpedance(EXAMPLE_4_1, 60, 100);
  const orders = [[3, 2, 1, 0], [1, 3, 0, 2], [2, 0, 3, 1]];
  for (const order of orders) {
    const z = computePhaseImpedance(order.map((k) => EXAMPLE_4_1[k]!), 60, 100);
    equal(z.phases, "ABC");
    for (let k = 0; k < 9; k++) {
      assert(Math.abs(z.re[k]! - reference.re[k]!) <= 1e-12 * Math.abs(reference.re[k]!));
      assert(Math.abs(z.im[k]! - reference.im[k]!) <= 1e-12 * Math.abs(reference.im[k]!));
    }
  }
});

Deno.test("phaseMatrixFromSequence() round-trips through sequenceFromPhaseMatrix()", () => {
  // Invariant of the symmetrical-component transform; relative tolerance 1e-12.
  const cases: readonly SequenceImpedance[] = [
    // CIGRE TB 575 MV overhead line (REFERENCES.md A3).
    { r1OhmPerKm: 0.510, x1OhmPerKm: 0.366, r0OhmPerKm: 0.658, x0OhmPerKm: 1.611 },
    // Kersting Example 4.1 sequence impedances converted to Ω/km (REFERENCES.md A1).
    {
      r1OhmPerKm: 0.3061 / KM_PER_MILE,
      x1OhmPerKm: 0.6270 / KM_PER_MILE,
      r0OhmPerKm: 0.7735 / KM_PER_MILE,
      x0OhmPerKm: 1.9373 / KM_PER_MILE,
    },
    // Z0 = Z1: no mutual coupling.
    { r1OhmPerKm: 0.2, x1OhmPerKm: 0.1, r0OhmPerKm: 0.2, x0OhmPerKm: 0.1 },
    // Z0 < Z1 (unusual but valid input): negative mutual terms.
    { r1OhmPerKm: 1.0, x1OhmPerKm: 0.4, r0OhmPerKm: 0.5, x0OhmPerKm: 0.1 },
  ];
  for (const seq of cases) {
    const m = phaseMatrixFromSequence(seq, "ABC");
    assertSymmetric(m);
    const s = sequenceFromPhaseMatrix(m);
    const expected = [
      [s.z0, seq.r0OhmPerKm, seq.x0OhmPerKm],
      [s.z1, seq.r1OhmPerKm, seq.x1OhmPerKm],
      [s.z2, seq.r1OhmPerKm, seq.x1OhmPerKm],
    ] as const;
    for (const [value, re, im] of expected) {
      assert(Math.abs(value.re - re) <= 1e-12 * Math.abs(re), `${value.re} vs ${re}`);
      assert(Math.abs(value.im - im) <= 1e-12 * Math.abs(im), `${value.im} vs ${im}`);
    }
  }
});

Deno.test("phaseMatrixFromSequence() restricted to fewer phases keeps the self and mutual terms", () => {
  const seq = { r1OhmPerKm: 0.3, x1OhmPerKm: 0.6, r0OhmPerKm: 0.9, x0OhmPerKm: 1.8 };
  // Zs = (Z0 + 2Z1)/3 = 0.5 + j1.0, Zm = (Z0 − Z1)/3 = 0.2 + j0.4 (closed form).
  const cases = [
    { phases: "AC", re: [0.5, 0.2, 0.2, 0.5], im: [1.0, 0.4, 0.4, 1.0] },
    { phases: "BC", re: [0.5, 0.2, 0.2, 0.5], im: [1.0, 0.4, 0.4, 1.0] },
    { phases: "B", re: [0.5], im: [1.0] },
  ];
  for (const c of cases) {
    const m = phaseMatrixFromSequence(seq, c.phases);
    equal(m.phases, c.phases);
    c.re.forEach((v, k) => assert(Math.abs(m.re[k]! - v) <= 1e-12 * v, `${c.phases} re ${k}`));
    c.im.forEach((v, k) => assert(Math.abs(m.im[k]! - v) <= 1e-12 * v, `${c.phases} im ${k}`));
  }
});

Deno.test("phaseMatrixFromSequence() rejects phases that are not a subset of A, B, C in order", () => {
  const seq = { r1OhmPerKm: 0.3, x1OhmPerKm: 0.6, r0OhmPerKm: 0.9, x0OhmPerKm: 1.8 };
  for (const phases of ["", "CA", "AA", "ABCN", "X", "abc"]) {
    const error = catchRangeError(() => phaseMatrixFromSequence(seq, phases));
    assert(error.message.includes(`phases "${phases}"`), error.message);
  }
});

Deno.test("sequenceFromPhaseMatrix() throws for fewer than three phases", () => {
  const seq = { r1OhmPerKm: 0.3, x1OhmPerKm: 0.6, r0OhmPerKm: 0.9, x0OhmPerKm: 1.8 };
  for (const phases of ["AC", "B"]) {
    const error = catchRangeError(() =>
      sequenceFromPhaseMatrix(phaseMatrixFromSequence(seq, phases))
    );
    assert(error.message.startsWith(`Cannot compute sequence components of phases "${phases}"`));
  }
});

Deno.test("computePhaseImpedance() rejects malformed conductors with a located message", () => {
  const [a, b, c, n] = EXAMPLE_4_1 as [
    ConductorPlacement,
    ConductorPlacement,
    ConductorPlacement,
    ConductorPlacement,
  ];
  const cases: readonly [string, () => unknown, string][] = [
    ["no phase", () => computePhaseImpedance([n], 60, 100), "no phase conductor"],
    ["phase twice", () => computePhaseImpedance([a, b, { ...a, xM: 5 }], 60, 100), "given twice"],
    [
      "zero GMR",
      () => computePhaseImpedance([a, { ...b, gmrM: 0 }], 60, 100),
      'conductor 2 (phase "B") gmrM "0"',
    ],
    [
      "negative resistance",
      () => computePhaseImpedance([{ ...a, rOhmPerKm: -1 }], 60, 100),
      'rOhmPerKm "-1"',
    ],
    ["below earth", () => computePhaseImpedance([{ ...c, yM: 0 }], 60, 100), 'yM "0"'],
    [
      "overlapping",
      () => computePhaseImpedance([a, { ...b, xM: a.xM + 0.001 }], 60, 100),
      "overlaps conductor 1",
    ],
    ["zero frequency", () => computePhaseImpedance([a], 0, 100), 'frequencyHz "0"'],
    ["NaN resistivity", () => computePhaseImpedance([a], 60, NaN), 'earthResistivityOhmM "NaN"'],
    ["admittance, no phase", () => computePhaseAdmittance([n], 60), "no phase conductor"],
  ];
  for (const [name, run, message] of cases) {
    const error = catchRangeError(run);
    assert(error.message.includes(message), `${name}: "${error.message}"`);
  }
});

// ---- Property test ---------------------------------------------------------------------

const conductorArbitrary = fc.record({
  xM: fc.double({ min: -3, max: 3, noNaN: true }),
  yM: fc.double({ min: 4, max: 20, noNaN: true }),
  rOhmPerKm: fc.double({ min: 0.02, max: 3, noNaN: true }),
  radiusM: fc.double({ min: 0.002, max: 0.02, noNaN: true }),
  gmrRatio: fc.double({ min: 0.6, max: 0.9, noNaN: true }),
});

const geometryArbitrary = fc.record({
  phases: fc.subarray(["A", "B", "C"] as const, { minLength: 1 }),
  neutralCount: fc.integer({ min: 0, max: 2 }),
  raw: fc.array(conductorArbitrary, { minLength: 5, maxLength: 5 }),
  frequencyHz: fc.constantFrom(50, 60),
  earthResistivityOhmM: fc.double({ min: 1, max: 10000, noNaN: true }),
}).map((g) => {
  const letters = [...g.phases, ...Array<"N">(g.neutralCount).fill("N")];
  const conductors = letters.map((phase, k): ConductorPlacement => {
    const r = g.raw[k]!;
    return {
      phase,
      xM: r.xM,
      yM: r.yM,
      rOhmPerKm: r.rOhmPerKm,
      gmrM: r.radiusM * r.gmrRatio,
      diameterM: 2 * r.radiusM,
    };
  });
  return { ...g, conductors };
}).filter((g) =>
  // Keep physically separate conductors (at least 10 cm between surfaces).
  g.conductors.every((c, i) =>
    g.conductors.every((o, j) =>
      j >= i || Math.hypot(c.xM - o.xM, c.yM - o.yM) - (c.diameterM + o.diameterM) / 2 > 0.1
    )
  )
);

/** Cholesky test for a symmetric real matrix: true if positive definite. */
function isPositiveDefinite(n: number, a: Float64Array): boolean {
  const l = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j]!;
    for (let k = 0; k < j; k++) d -= l[j * n + k]! ** 2;
    if (!(d > 1e-14 * Math.abs(a[j * n + j]!))) return false;
    l[j * n + j] = Math.sqrt(d);
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j]!;
      for (let k = 0; k < j; k++) s -= l[i * n + k]! * l[j * n + k]!;
      l[i * n + j] = s / l[j * n + j]!;
    }
  }
  return true;
}

Deno.test("computePhaseImpedance() and computePhaseAdmittance() give symmetric, finite, passive matrices for random geometries", () => {
  fc.assert(
    fc.property(geometryArbitrary, (g) => {
      const z = computePhaseImpedance(g.conductors, g.frequencyHz, g.earthResistivityOhmM);
      const y = computePhaseAdmittance(g.conductors, g.frequencyHz);
      const n = g.phases.length;
      for (const m of [z, y]) {
        equal(m.phases, g.phases.join(""));
        equal(m.re.length, n * n);
        assert([...m.re, ...m.im].every(Number.isFinite), "no NaN or infinity");
        assertSymmetric(m);
      }
      // Passive series impedance: positive diagonal resistance, positive-definite R matrix.
      for (let i = 0; i < n; i++) assert(z.re[i * n + i]! > 0 && z.im[i * n + i]! > 0);
      assert(isPositiveDefinite(n, z.re), "R is positive definite");
      // Capacitive shunt: positive-definite susceptance matrix.
      assert(isPositiveDefinite(n, y.im), "B is positive definite");
    }),
    { numRuns: 500 },
  );
});
