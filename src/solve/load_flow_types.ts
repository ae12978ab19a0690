/**
 * Inputs and outputs of the balanced (positive-sequence) load flow.
 *
 * Per-unit system: base power 1 MVA for every feeder; each bus's base voltage is its
 * nominal voltage (FeederForm.vnKv), so base impedance is vnKv² ohm and base current
 * 1000/(√3·vnKv) A. A branch's series impedance is taken per unit on its `to` bus's base;
 * a transformer is an ideal complex ratio a = ratio·e^{j·shiftDeg} on its `from` side
 * (V' = V_from / a, I_from = I / conj(a)) followed by its series impedance; a line's
 * charging is split half to each end (π model); a switch is a zero-impedance branch.
 * Loads draw S = S₀·(z·|V|² + i·|V| + p); generators inject P and the Q their reactive mode
 * gives; shunt capacitors inject Q = Q_rated·|V|². The source bus (bus 0) is the slack at
 * the grid source's set-point.
 *
 * Generation scale: 0 takes every generator out of service — no P, no Q, no voltage
 * control (the "without generation" case). Above 0, P = pKw·scale (at most the rating);
 * fixed power factor gives ∓P·tan φ, fixed Q its set-point unscaled, cos φ(P) its curve at
 * P/S_rated; volt-var and voltage control are solved, limited to ±√(S_rated² − P²).
 */

/** One study case: which demand, scaled, and how much of the generation. */
export interface LoadFlowCase {
  readonly id: string;
  readonly demand: "peak" | "min";
  readonly demandScale: number;
  readonly generationScale: number;
}

export interface LoadFlowOptions {
  /** Convergence: largest change of any bus voltage between sweeps, pu. */
  readonly tolerancePu: number;
  readonly maxIterations: number;
  /** Outer tap-changer iterations at most. */
  readonly maxTapSteps: number;
  /** Damping of the volt-var and power-factor fixed points, 0 < α ≤ 1. */
  readonly reactiveDamping: number;
  /** A bus voltage below this is taken as voltage collapse, pu. */
  readonly collapseVoltagePu: number;
  /** Tap changers move (true) or stay where the input puts them (false). */
  readonly tapControl: boolean;
}

export const DEFAULT_LOAD_FLOW_OPTIONS: LoadFlowOptions = {
  tolerancePu: 1e-9,
  maxIterations: 100,
  maxTapSteps: 30,
  reactiveDamping: 0.5,
  collapseVoltagePu: 0.3,
  tapControl: true,
};

export type LoadFlowFailure = "not_converged" | "collapse" | "tap_hunting";

export interface LoadFlowResult {
  readonly caseId: string;
  readonly converged: boolean;
  readonly failure: LoadFlowFailure | null;
  /** Sweeps done in all (over every tap-changer step). */
  readonly iterations: number;
  /** Largest voltage change of the last sweep, pu (and breakpoint mismatch where meshed). */
  readonly residualPu: number;
  /** Per bus, pu on the bus's nominal voltage. */
  readonly vRePu: Float64Array;
  readonly vImPu: Float64Array;
  readonly vMagPu: Float64Array;
  /** Per branch: series current at the `to` side, pu of the `to` bus's base. */
  readonly iRePu: Float64Array;
  readonly iImPu: Float64Array;
  /** Per branch: series current magnitude in A at the `to` side. */
  readonly iA: Float64Array;
  /** Per branch: power entering at the `from` end (positive away from the source), kW/kvar. */
  readonly pFromKw: Float64Array;
  readonly qFromKvar: Float64Array;
  /** Per branch: power leaving at the `to` end, kW/kvar. */
  readonly pToKw: Float64Array;
  readonly qToKvar: Float64Array;
  /** Power the source bus delivers into the feeder (its own loads included), kW/kvar. */
  readonly sourcePKw: number;
  readonly sourceQKvar: number;
  readonly lossesKw: number;
  readonly lossesKvar: number;
  /** Per load and per generator: what they draw / inject at the solution. */
  readonly loadPKw: Float64Array;
  readonly loadQKvar: Float64Array;
  readonly genPKw: Float64Array;
  /** Positive = injection into the network. */
  readonly genQKvar: Float64Array;
  /** Per transformer (FeederForm.transformers order): final tap position. */
  readonly tapPositions: Int32Array;
}
