/**
 * Per-length series impedance and shunt admittance of overhead lines in the phase frame.
 *
 * Series impedance: modified Carson's equations in SI units (per km, GMR and distances in
 * metres), then Kron reduction of the neutral conductors, which are taken as continuously
 * earthed (zero voltage to earth along the line):
 *
 *     z_ii = r_i + π²·f·1e-4 + j·4π·f·1e-4·(ln(1/GMR_i) + ln(658.5·√(ρ/f)))   Ω/km
 *     z_ij =       π²·f·1e-4 + j·4π·f·1e-4·(ln(1/D_ij)  + ln(658.5·√(ρ/f)))   Ω/km
 *
 * (Kersting, Distribution System Modeling and Analysis, 2nd ed., eqs. 4.39–4.40, there in
 * Ω/mile and feet at 60 Hz and 100 Ω·m.)
 *
 * Shunt admittance: Maxwell potential coefficients with the conductors' images in the earth
 * surface, P_ii = ln(S_ii/RD_i)/(2πε₀), P_ij = ln(S_ij/D_ij)/(2πε₀), Kron reduction of the
 * neutrals, C = P⁻¹, y = jωC (Kersting ch. 5). Line conductance is neglected.
 *
 * @module
 */

import { invertComplexMatrix, reduceKron } from "./_complex_matrix.ts";

/** Per-length phase-frame matrix, row-major n×n, ohm/km (impedance) or S/km (admittance). */
export interface PhaseMatrix {
  /** Phases of the rows and columns, in the order A, B, C of those present: "ABC", "AC", "B". */
  readonly phases: string;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/** Positive- and zero-sequence series impedance per km (negative sequence = positive). */
export interface SequenceImpedance {
  r1OhmPerKm: number;
  x1OhmPerKm: number;
  r0OhmPerKm: number;
  x0OhmPerKm: number;
}

/** One conductor of an overhead line: phase, position (yM = height above earth), data. */
export interface ConductorPlacement {
  phase: "A" | "B" | "C" | "N";
  /** Horizontal position, metres. */
  xM: number;
  /** Height above the earth surface, metres. */
  yM: number;
  /** Resistance at operating temperature, ohm/km. */
  rOhmPerKm: number;
  /** Geometric mean radius, metres. */
  gmrM: number;
  /** Outside diameter, metres (used for the shunt admittance and the clearance check). */
  diameterM: number;
}

/** A complex value at the edges of the library (results, tests), not inside kernels. */
export interface ComplexValue {
  readonly re: number;
  readonly im: number;
}

/** Diagonal of the symmetrical-component transform of a three-phase matrix. */
export interface SequenceComponents {
  readonly z0: ComplexValue;
  readonly z1: ComplexValue;
  readonly z2: ComplexValue;
}

/** Equivalent earth-return depth constant of the modified Carson's equations, metres. */
const EARTH_RETURN_DEPTH_CONSTANT_M = 658.5;
/** Permittivity of free space, F/m (CODATA 2018 recommended value [memory]). */
const VACUUM_PERMITTIVITY_F_PER_M = 8.8541878128e-12;
const METRES_PER_KM = 1000;
const PHASE_LETTERS = "ABC";

/**
 * Computes the series phase impedance matrix, ohm/km, of an overhead line by the modified
 * Carson's equations with Kron reduction of every "N" conductor (any number, including none).
 * Rows and columns are the phase conductors present, in the order A, B, C.
 *
 * Throws a RangeError for a malformed input (a programmer error; the ingest stage validates
 * line data): no phase conductor, a phase given twice, a non-positive or non-finite
 * frequency, resistivity, resistance, GMR or diameter, a conductor not above the earth, or two
 * conductors that overlap.
 */
export function computePhaseImpedance(
  conductors: readonly ConductorPlacement[],
  frequencyHz: number,
  earthResistivityOhmM: number,
): PhaseMatrix {
  requirePositive("frequencyHz", frequencyHz);
  requirePositive("earthResistivityOhmM", earthResistivityOhmM);
  const { order, phases } = orderConductors(conductors);
  const n = order.length;
  const earthROhmPerKm = Math.PI * Math.PI * frequencyHz * 1e-4;
  const xCoefficientOhmPerKm = 4 * Math.PI * frequencyHz * 1e-4;
  const earthLog = Math.log(
    EARTH_RETURN_DEPTH_CONSTANT_M * Math.sqrt(earthResistivityOhmM / frequencyHz),
  );
  const fullRe = new Float64Array(n * n);
  const fullIm = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const ci = order[i]!;
    for (let j = 0; j < n; j++) {
      const cj = order[j]!;
      const distanceM = i === j ? ci.gmrM : Math.hypot(ci.xM - cj.xM, ci.yM - cj.yM);
      fullRe[i * n + j] = earthROhmPerKm + (i === j ? ci.rOhmPerKm : 0);
      fullIm[i * n + j] = xCoefficientOhmPerKm * (Math.log(1 / distanceM) + earthLog);
    }
  }
  return reduceNeutrals(n, phases, fullRe, fullIm);
}

/**
 * Computes the shunt phase admittance matrix, S/km, of an overhead line from potential
 * coefficients with earth images, every "N" conductor Kron-reduced (at earth potential).
 * `re` is all zeros (conductance neglected); `im` holds the susceptance. Same input rules
 * and RangeErrors as {@link computePhaseImpedance}.
 */
export function computePhaseAdmittance(
  conductors: readonly ConductorPlacement[],
  frequencyHz: number,
): PhaseMatrix {
  requirePositive("frequencyHz", frequencyHz);
  const { order, phases } = orderConductors(conductors);
  const n = order.length;
  // Potential coefficients in units of 1/(2πε₀): P_ij·2πε₀ = ln(S_ij / D_ij).
  const logRe = new Float64Array(n * n);
  const zeroIm = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const ci = order[i]!;
    for (let j = 0; j < n; j++) {
      const cj = order[j]!;
      const imageM = Math.hypot(ci.xM - cj.xM, ci.yM + cj.yM);
      const distanceM = i === j ? ci.diameterM / 2 : Math.hypot(ci.xM - cj.xM, ci.yM - cj.yM);
      logRe[i * n + j] = Math.log(imageM / distanceM);
    }
  }
  const p = phases.length;
  const reducedRe = new Float64Array(p * p);
  const reducedIm = new Float64Array(p * p);
  const inverseRe = new Float64Array(p * p);
  const inverseIm = new Float64Array(p * p);
  if (
    !reduceKron(n, p, logRe, zeroIm, reducedRe, reducedIm) ||
    !invertComplexMatrix(p, reducedRe, reducedIm, inverseRe, inverseIm)
  ) {
    throw new RangeError(
      `Cannot compute the shunt admittance of phases "${phases}": the potential coefficient matrix is singular`,
    );
  }
  // C = 2πε₀·1000·(ln matrix)⁻¹ F/km; B = 2πf·C S/km.
  const scaleSPerKm = 2 * Math.PI * frequencyHz * 2 * Math.PI * VACUUM_PERMITTIVITY_F_PER_M *
    METRES_PER_KM;
  const im = new Float64Array(p * p);
  for (let k = 0; k < p * p; k++) im[k] = scaleSPerKm * inverseRe[k]!;
  return { phases, re: new Float64Array(p * p), im };
}

/**
 * Builds the phase impedance matrix, ohm/km, of a transposed (balanced) line from its
 * sequence impedances: self Zs = (Z0 + 2·Z1)/3 on the diagonal, mutual Zm = (Z0 − Z1)/3 off
 * it, restricted to `phases` ("ABC", "AB", "AC", "BC", "A", "B" or "C").
 *
 * Throws a RangeError if `phases` is not a non-empty subset of "ABC" in that order.
 */
export function phaseMatrixFromSequence(seq: SequenceImpedance, phases: string): PhaseMatrix {
  if (!isCanonicalPhases(phases)) {
    throw new RangeError(
      `Cannot build a phase matrix for phases "${phases}": expected a non-empty subset of "ABC" in that order`,
    );
  }
  const n = phases.length;
  const selfRe = (seq.r0OhmPerKm + 2 * seq.r1OhmPerKm) / 3;
  const selfIm = (seq.x0OhmPerKm + 2 * seq.x1OhmPerKm) / 3;
  const mutualRe = (seq.r0OhmPerKm - seq.r1OhmPerKm) / 3;
  const mutualIm = (seq.x0OhmPerKm - seq.x1OhmPerKm) / 3;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      re[i * n + j] = i === j ? selfRe : mutualRe;
      im[i * n + j] = i === j ? selfIm : mutualIm;
    }
  }
  return { phases, re, im };
}

/**
 * Returns the diagonal (z0, z1, z2) of the symmetrical-component transform A⁻¹·Z·A of a
 * three-phase matrix, A = [[1,1,1],[1,a²,a],[1,a,a²]], a = e^{j120°}. For a symmetric matrix
 * this equals the self/mutual averages: z1 = z2 = Zs − Zm, z0 = Zs + 2·Zm. The off-diagonal
 * sequence couplings of an untransposed line are not returned. Works for any 3×3 phase matrix.
 *
 * Shunt admittance: transposition averages the potential coefficients, not the admittance,
 * so the positive-sequence susceptance of a transposed line is 1/p1 from the transform of
 * Y⁻¹, not the z1 of the transform of Y (they differ by 0.8 % for a flat MV layout).
 *
 * Fewer than three phases: throws a RangeError. Symmetrical components are defined for a
 * three-phase set; for one phase z0 and z1 cannot be separated at all, and a "two-phase z0"
 * from averages would describe a third conductor that is not there. Callers keep one- and
 * two-phase sections in the phase frame (a programmer error to ask otherwise).
 */
export function sequenceFromPhaseMatrix(m: PhaseMatrix): SequenceComponents {
  if (m.phases !== PHASE_LETTERS || m.re.length !== 9 || m.im.length !== 9) {
    throw new RangeError(
      `Cannot compute sequence components of phases "${m.phases}": symmetrical components need the three phases "ABC" (a 3×3 matrix)`,
    );
  }
  return {
    z0: transformDiagonal(m, 0),
    z1: transformDiagonal(m, 1),
    z2: transformDiagonal(m, 2),
  };
}

/** (1/3)·Σ_ij u_i·Z_ij·v_j with u = row k of 3·A⁻¹ and v = column k of A. */
function transformDiagonal(m: PhaseMatrix, k: 0 | 1 | 2): ComplexValue {
  // Powers of a for the row of A⁻¹ (u_i = a^{k·i}) and the column of A (v_j = a^{−k·j}).
  let sumRe = 0;
  let sumIm = 0;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      const angle = (2 * Math.PI / 3) * k * (i - j);
      const cos = Math.cos(angle);
      const sin = Math.sin(angle);
      const zRe = m.re[i * 3 + j]!;
      const zIm = m.im[i * 3 + j]!;
      sumRe += zRe * cos - zIm * sin;
      sumIm += zRe * sin + zIm * cos;
    }
  }
  return { re: sumRe / 3, im: sumIm / 3 };
}

function reduceNeutrals(
  n: number,
  phases: string,
  fullRe: Float64Array,
  fullIm: Float64Array,
): PhaseMatrix {
  const p = phases.length;
  const re = new Float64Array(p * p);
  const im = new Float64Array(p * p);
  if (!reduceKron(n, p, fullRe, fullIm, re, im)) {
    throw new RangeError(
      `Cannot compute the impedance of phases "${phases}": the neutral impedance matrix is singular`,
    );
  }
  return { phases, re, im };
}

/** Validates the conductors; returns them phases first (A, B, C present), then neutrals. */
function orderConductors(
  conductors: readonly ConductorPlacement[],
): { order: ConductorPlacement[]; phases: string } {
  conductors.forEach((c, k) => {
    const where = `conductor ${k + 1} (phase "${c.phase}")`;
    if (c.phase !== "N" && !PHASE_LETTERS.includes(c.phase)) {
      throw new RangeError(`Cannot place ${where}: expected phase "A", "B", "C" or "N"`);
    }
    requireFinite(`${where} xM`, c.xM);
    requirePositive(`${where} rOhmPerKm`, c.rOhmPerKm);
    requirePositive(`${where} gmrM`, c.gmrM);
    requirePositive(`${where} diameterM`, c.diameterM);
    if (!(c.yM > c.diameterM / 2) || !Number.isFinite(c.yM)) {
      throw new RangeError(
        `Cannot place ${where}: yM "${c.yM}" must be finite and above the earth (more than the radius)`,
      );
    }
    for (let j = 0; j < k; j++) {
      const o = conductors[j]!;
      if (c.phase !== "N" && c.phase === o.phase) {
        throw new RangeError(`Cannot place ${where}: phase "${c.phase}" is given twice`);
      }
      const clearanceM = Math.hypot(c.xM - o.xM, c.yM - o.yM) - (c.diameterM + o.diameterM) / 2;
      if (!(clearanceM > 0)) {
        throw new RangeError(`Cannot place ${where}: it overlaps conductor ${j + 1}`);
      }
    }
  });
  const order: ConductorPlacement[] = [];
  let phases = "";
  for (const letter of PHASE_LETTERS) {
    const found = conductors.find((c) => c.phase === letter);
    if (found !== undefined) {
      order.push(found);
      phases += letter;
    }
  }
  if (phases.length === 0) {
    throw new RangeError("Cannot compute a line matrix: no phase conductor (A, B or C) given");
  }
  for (const c of conductors) if (c.phase === "N") order.push(c);
  return { order, phases };
}

function isCanonicalPhases(phases: string): boolean {
  if (phases.length === 0) return false;
  let last = -1;
  for (const letter of phases) {
    const index = PHASE_LETTERS.indexOf(letter);
    if (index <= last) return false;
    last = index;
  }
  return true;
}

function requireFinite(name: string, value: number): void {
  if (!Number.isFinite(value)) {
    throw new RangeError(`Cannot compute a line matrix: ${name} "${value}" must be finite`);
  }
}

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(
      `Cannot compute a line matrix: ${name} "${value}" must be a positive finite number`,
    );
  }
}
