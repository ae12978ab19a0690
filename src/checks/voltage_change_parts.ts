/**
 * The two parts of the voltage-change formula dU ≈ (R·P + X·Q)/U at every bus, summed
 * along the path from the source (Bollen & Hassan, Integration of Distributed Generation
 * in the Power System, 2011): each branch on the path contributes its R times the active
 * power of the generation beyond it, and its X times the reactive power. One backward
 * pass sums generation below each branch, one forward pass accumulates; O(n).
 *
 * U is taken as 1 pu (nominal). On a meshed feeder the parts follow the breadth-first
 * tree and are indicative only; the exact change comes from the load flows.
 */
import type { FeederForm } from "../model/feeder_form.ts";

export interface VoltageChangeParts {
  /** Σ R·P along the path, pu (P in pu of 1 MVA, positive = injection). */
  readonly rpPu: Float64Array;
  /** Σ X·Q along the path, pu (negative when the generation absorbs reactive power). */
  readonly xqPu: Float64Array;
}

export function computeVoltageChangeParts(
  form: FeederForm,
  zRePu: Float64Array,
  zImPu: Float64Array,
  genPKw: Float64Array,
  genQKvar: Float64Array,
): VoltageChangeParts {
  const n = form.nBus;
  const downP = new Float64Array(n), downQ = new Float64Array(n);
  for (let g = 0; g < form.generators.n; g++) {
    const k = form.generators.bus[g]!;
    downP[k] = downP[k]! + genPKw[g]! / 1000;
    downQ[k] = downQ[k]! + genQKvar[g]! / 1000;
  }
  for (let k = n - 1; k > 0; k--) {
    const p = form.parent[k]!;
    downP[p] = downP[p]! + downP[k]!;
    downQ[p] = downQ[p]! + downQ[k]!;
  }
  const rpPu = new Float64Array(n), xqPu = new Float64Array(n);
  for (let k = 1; k < n; k++) {
    const p = form.parent[k]!;
    rpPu[k] = rpPu[p]! + zRePu[k - 1]! * downP[k]!;
    xqPu[k] = xqPu[p]! + zImPu[k - 1]! * downQ[k]!;
  }
  return { rpPu, xqPu };
}
