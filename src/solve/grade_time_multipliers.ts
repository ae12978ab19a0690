/**
 * Time multipliers of a set of relays, by linear programming (Urdaneta, Nadira and Pérez
 * Jiménez, IEEE Trans. Power Delivery 3(3), 1988): with pickups fixed, a relay's operating
 * time at a current is its multiplier times a factor of the current alone,
 * t = TMS·(a/((I/Is)^p − 1) + b), so grading is linear in the multipliers. Minimise the sum
 * of the primaries' operating times (and, a thousand times less, the backups') subject to t_backup − t_primary ≥ the coordination
 * interval for every primary–backup pair and fault, within each relay's multiplier range.
 * An infeasible programme means settings alone cannot coordinate the devices. Solved with
 * HiGHS (the `highs` package, WebAssembly).
 */
import highsModule, { type Highs } from "highs";

/** The package's default export is its loader; its type declarations reach Deno as a namespace. */
const highsLoader = highsModule as unknown as () => Promise<Highs>;

export interface GradedRelay {
  readonly id: string;
  readonly minTms: number;
  readonly maxTms: number;
}

/** One fault seen by a primary and its backup: their curve factors at the currents they see. */
export interface GradingPair {
  readonly primary: string;
  readonly backup: string;
  /** Operating time per unit multiplier at the fault current each sees, s. */
  readonly primaryFactorS: number;
  readonly backupFactorS: number;
}

export interface GradingProblem {
  readonly relays: readonly GradedRelay[];
  readonly pairs: readonly GradingPair[];
  readonly intervalS: number;
}

export type GradingResult =
  | {
    readonly status: "optimal";
    readonly tms: Readonly<Record<string, number>>;
    readonly objectiveS: number;
  }
  | { readonly status: "infeasible"; readonly reason: string };

/** Loaded once per isolate (about 0.1 s), so solving is synchronous wherever it is needed. */
const solver: Highs = await highsLoader();

/** The curve factor k of an inverse-time stage at a current (t = TMS·k). */
export function curveFactorS(
  curve: { readonly a: number; readonly p: number; readonly b: number },
  iA: number,
  pickupA: number,
): number {
  const m = iA / pickupA;
  return m > 1 ? curve.a / (m ** curve.p - 1) + curve.b : Infinity;
}

export function gradeTimeMultipliers(problem: GradingProblem): GradingResult {
  const index = new Map(problem.relays.map((r, i) => [r.id, i]));
  const pairs = problem.pairs.filter((p) =>
    Number.isFinite(p.primaryFactorS) && Number.isFinite(p.backupFactorS) &&
    index.has(p.primary) && index.has(p.backup)
  );
  const v = (id: string) => `x${index.get(id)}`;
  const num = (x: number) => x.toPrecision(12);
  // Objective: the primaries' operating times, summed over the faults; then, a thousand
  // times less, the backups' times, so a relay that is only ever a backup is set no slower
  // than its grading needs (without it, any multiplier of such a relay would be optimal).
  const weight = new Map<string, number>();
  for (const p of pairs) {
    weight.set(p.primary, (weight.get(p.primary) ?? 0) + p.primaryFactorS);
    weight.set(p.backup, (weight.get(p.backup) ?? 0) + 1e-3 * p.backupFactorS);
  }
  const objective = problem.relays.map((r) => `${num(weight.get(r.id) ?? 0)} ${v(r.id)}`).join(
    " + ",
  );
  const rows = pairs.map((p, i) =>
    ` g${i}: ${num(p.backupFactorS)} ${v(p.backup)} - ${num(p.primaryFactorS)} ${v(p.primary)} >= ${
      num(problem.intervalS)
    }`
  );
  const bounds = problem.relays.map((r) => ` ${num(r.minTms)} <= ${v(r.id)} <= ${num(r.maxTms)}`);
  const lp = [
    "Minimize",
    ` obj: ${objective}`,
    ...(rows.length > 0 ? ["Subject To", ...rows] : []),
    "Bounds",
    ...bounds,
    "End",
  ].join("\n");
  const result = solver.solve(lp);
  if (result.Status !== "Optimal") {
    return {
      status: "infeasible",
      reason: `the grading programme is ${
        String(result.Status).toLowerCase()
      }: multipliers alone cannot keep every backup ${problem.intervalS} s behind its primary`,
    };
  }
  const tms: Record<string, number> = {};
  for (const r of problem.relays) {
    const col = (result.Columns as Record<string, { Primal: number }>)[v(r.id)];
    tms[r.id] = col?.Primal ?? r.minTms;
  }
  return { status: "optimal", tms, objectiveS: result.ObjectiveValue };
}
