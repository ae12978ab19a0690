/**
 * Turns line-type rows (sequence data, a phase matrix, or conductors and geometry) into
 * LineType records carrying both sequence values and phase-frame matrices per km.
 */
import type { NetworkTables } from "../ingest/read_network.ts";
import { type Diagnostic, makeDiagnostic } from "./diagnostic.ts";
import {
  computePhaseAdmittance,
  computePhaseImpedance,
  type ConductorPlacement,
  type PhaseMatrix,
  phaseMatrixFromSequence,
  sequenceFromPhaseMatrix,
} from "./line_impedance.ts";
import type { LineType } from "./network.ts";

const LETTERS = ["a", "b", "c"] as const;

/** Susceptance per km, µS, of a capacitance per km, nF, at a frequency. */
export function susceptanceUsPerKm(cNfPerKm: number, frequencyHz: number): number {
  return 2 * Math.PI * frequencyHz * cNfPerKm * 1e-3;
}

export interface ResolvedLineTypes {
  readonly value: readonly LineType[];
  /** Ids of types that could not be resolved (their lines are set aside). */
  readonly failed: ReadonlySet<string>;
  readonly diagnostics: readonly Diagnostic[];
}

export function resolveLineTypes(
  tables: NetworkTables,
  frequencyHz: number,
  earthResistivityOhmM: number,
): ResolvedLineTypes {
  const diagnostics: Diagnostic[] = [];
  const failed = new Set<string>();
  const value: LineType[] = [];
  const file = tables.lineTypes.file;
  for (const { value: r, line } of tables.lineTypes.rows) {
    const at = { file, line };
    const fail = (code: string, message: string, detailFile = file, detailLine = line) => {
      failed.add(r.id);
      diagnostics.push(makeDiagnostic(code, "error", message, {
        at: { file: detailFile, line: detailLine },
      }));
    };
    let zPhase: PhaseMatrix;
    let bPhase: PhaseMatrix;
    if (r.model === "sequence") {
      const b1 = r.b1 ?? susceptanceUsPerKm(r.c1 ?? 0, frequencyHz);
      const b0 = r.b0 ?? susceptanceUsPerKm(r.c0 ?? 0, frequencyHz);
      zPhase = phaseMatrixFromSequence({
        r1OhmPerKm: r.r1 ?? 0,
        x1OhmPerKm: r.x1 ?? 0,
        r0OhmPerKm: r.r0 ?? 0,
        x0OhmPerKm: r.x0 ?? 0,
      }, "ABC");
      const bSeq = phaseMatrixFromSequence(
        { r1OhmPerKm: 0, x1OhmPerKm: b1, r0OhmPerKm: 0, x0OhmPerKm: b0 },
        "ABC",
      );
      bPhase = bSeq;
    } else if (r.model === "matrix") {
      const rows = tables.lineTypeMatrix.rows.filter((m) => m.value.type === r.id);
      const present = LETTERS.filter((p) => rows.some((m) => m.value.row === p));
      const n = present.length;
      const re = new Float64Array(n * n), im = new Float64Array(n * n), b = new Float64Array(n * n);
      const got = new Set<string>();
      for (const m of rows) {
        const i = present.indexOf(m.value.row), j = present.indexOf(m.value.col);
        if (j < 0) {
          fail(
            "linetype.matrix",
            `Line type "${r.id}": matrix entry ${m.value.row}${m.value.col} names a column phase with no row`,
            tables.lineTypeMatrix.file,
            m.line,
          );
          continue;
        }
        if (got.has(`${i},${j}`)) {
          const k = i * n + j;
          if (re[k] !== m.value.r || im[k] !== m.value.x || b[k] !== m.value.b) {
            fail(
              "linetype.matrix",
              `Line type "${r.id}": matrix entry ${m.value.row}${m.value.col} disagrees with entry ${m.value.col}${m.value.row}; the matrix must be symmetric`,
              tables.lineTypeMatrix.file,
              m.line,
            );
          }
          continue;
        }
        for (const [a, c] of [[i, j], [j, i]] as const) {
          re[a * n + c] = m.value.r;
          im[a * n + c] = m.value.x;
          b[a * n + c] = m.value.b;
        }
        got.add(`${i},${j}`).add(`${j},${i}`);
      }
      if (failed.has(r.id)) continue;
      if (n === 0 || got.size !== n * n) {
        fail(
          "linetype.matrix",
          `Line type "${r.id}" has model matrix but ${
            n === 0 ? "no rows" : "an incomplete matrix"
          } in ${tables.lineTypeMatrix.file}`,
        );
        continue;
      }
      const phases = present.join("").toUpperCase();
      zPhase = { phases, re, im };
      bPhase = { phases, re: new Float64Array(n * n), im: b };
    } else {
      const placed: ConductorPlacement[] = [];
      for (const g of tables.lineGeometry.rows.filter((g) => g.value.type === r.id)) {
        const c = tables.conductors.rows.find((c) => c.value.id === g.value.conductor);
        if (c === undefined) {
          fail(
            "ref.unknown",
            `Line type "${r.id}": conductor "${g.value.conductor}" is not in ${tables.conductors.file}`,
            tables.lineGeometry.file,
            g.line,
          );
          continue;
        }
        placed.push({
          phase: g.value.position.toUpperCase() as ConductorPlacement["phase"],
          xM: g.value.x,
          yM: g.value.y,
          rOhmPerKm: c.value.resistance,
          gmrM: c.value.gmr / 1000,
          diameterM: c.value.diameter / 1000,
        });
      }
      if (failed.has(r.id)) continue;
      try {
        zPhase = computePhaseImpedance(placed, frequencyHz, earthResistivityOhmM);
        const y = computePhaseAdmittance(placed, frequencyHz);
        bPhase = { phases: y.phases, re: y.re, im: y.im.map((v) => v * 1e6) };
      } catch (e) {
        fail(
          "linetype.geometry",
          `Line type "${r.id}": cannot compute impedances from ${tables.lineGeometry.file}: ${
            e instanceof Error ? e.message : String(e)
          }`,
        );
        continue;
      }
    }
    const seq = sequenceValues(zPhase, bPhase);
    const t: LineType = {
      id: r.id,
      form: r.model,
      construction: r.construction,
      ...(r.conductor_class === undefined ? {} : { conductorClass: r.conductor_class }),
      ...seq,
      zPhase,
      bPhase,
      ampacityA: r.ampacity,
      ...(r.ampacity_emergency === undefined ? {} : { ampacityEmergencyA: r.ampacity_emergency }),
      at,
    };
    value.push(r.model === "sequence" ? { ...t, ...sequenceFromRow(r, frequencyHz) } : t);
  }
  return { value, failed, diagnostics };
}

function sequenceFromRow(
  r: NetworkTables["lineTypes"]["rows"][number]["value"],
  frequencyHz: number,
) {
  return {
    r1OhmPerKm: r.r1 ?? 0,
    x1OhmPerKm: r.x1 ?? 0,
    r0OhmPerKm: r.r0 ?? 0,
    x0OhmPerKm: r.x0 ?? 0,
    b1UsPerKm: r.b1 ?? susceptanceUsPerKm(r.c1 ?? 0, frequencyHz),
    b0UsPerKm: r.b0 ?? susceptanceUsPerKm(r.c0 ?? 0, frequencyHz),
  };
}

/**
 * Sequence values of a phase-frame type. Three phases: the symmetrical-component diagonal
 * (the transposed-line equivalent). Fewer phases: sequence components are not defined, so
 * the balanced study uses the self impedance of a phase for both sequences (documented in
 * docs/network-format.md); the phase-frame study uses the matrices.
 */
function sequenceValues(z: PhaseMatrix, b: PhaseMatrix) {
  if (z.phases === "ABC") {
    const s = sequenceFromPhaseMatrix(z);
    const sb = sequenceFromPhaseMatrix(b);
    return {
      r1OhmPerKm: s.z1.re,
      x1OhmPerKm: s.z1.im,
      r0OhmPerKm: s.z0.re,
      x0OhmPerKm: s.z0.im,
      b1UsPerKm: sb.z1.im,
      b0UsPerKm: sb.z0.im,
    };
  }
  return {
    r1OhmPerKm: z.re[0] ?? 0,
    x1OhmPerKm: z.im[0] ?? 0,
    r0OhmPerKm: z.re[0] ?? 0,
    x0OhmPerKm: z.im[0] ?? 0,
    b1UsPerKm: b.im[0] ?? 0,
    b0UsPerKm: b.im[0] ?? 0,
  };
}
