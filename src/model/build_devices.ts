/** Model-stage helpers for loads, generators and the curve tables they reference. */
import type { NetworkTables } from "../ingest/read_network.ts";
import { type Diagnostic, makeDiagnostic } from "./diagnostic.ts";
import type {
  CurvePoint,
  FuseCurve,
  Generator,
  Load,
  ReactiveCurve,
  ReactiveMode,
} from "./network.ts";

type Row<K extends keyof NetworkTables> = NetworkTables[K]["rows"][number];

/** Reactive power of a demand given P and an inductive power factor. */
export function qFromPowerFactor(pKw: number, powerFactor: number): number {
  return pKw * Math.sqrt(1 - powerFactor * powerFactor) / powerFactor;
}

export function toLoad(row: Row<"loads">, busId: string, file: string): Load {
  const r = row.value;
  const zip = r.voltage_model === "zip"
    ? { z: r.zip_z ?? 0, i: r.zip_i ?? 0, p: r.zip_p ?? 1 }
    : r.voltage_model === "impedance"
    ? { z: 1, i: 0, p: 0 }
    : r.voltage_model === "current"
    ? { z: 0, i: 1, p: 0 }
    : { z: 0, i: 0, p: 1 };
  return {
    id: r.id,
    busId,
    peakPKw: r.peak_p,
    peakQKvar: r.peak_q ?? qFromPowerFactor(r.peak_p, r.peak_power_factor ?? 1),
    minPKw: r.min_p,
    minQKvar: r.min_q ?? qFromPowerFactor(r.min_p, r.min_power_factor ?? 1),
    zip,
    motorShare: r.motor_share / 100,
    ...(r.stall_voltage === undefined ? {} : { stallVoltagePu: r.stall_voltage }),
    ...(r.stall_time === undefined ? {} : { stallTimeS: r.stall_time }),
    customers: r.customers,
    phases: r.phases,
    connection: r.connection,
    at: { file, line: row.line },
  };
}

function reactiveMode(r: Row<"generators">["value"]): ReactiveMode {
  switch (r.reactive_mode) {
    case "fixed_power_factor":
      return {
        mode: "fixed_power_factor",
        powerFactor: r.power_factor ?? 1,
        sense: r.power_factor_sense ?? "absorbing",
      };
    case "fixed_q":
      return { mode: "fixed_q", qKvar: r.reactive_power ?? 0 };
    case "volt_var":
      return { mode: "volt_var", curveId: r.reactive_curve ?? "" };
    case "power_factor_of_p":
      return { mode: "power_factor_of_p", curveId: r.reactive_curve ?? "" };
    case "voltage_control":
      return { mode: "voltage_control", vSetPu: r.voltage_setpoint ?? 1 };
    default:
      return { mode: "unity" };
  }
}

export function toGenerator(row: Row<"generators">, busId: string, file: string): Generator {
  const r = row.value;
  return {
    id: r.id,
    busId,
    kind: r.kind,
    sRatedKva: r.rated_power,
    pKw: r.active_power,
    phases: r.phases,
    connection: r.connection,
    reactive: reactiveMode(r),
    ...(r.ride_through === undefined ? {} : { rideThrough: r.ride_through }),
    ...(r.fault_current_limit === undefined ? {} : { faultCurrentLimitPu: r.fault_current_limit }),
    ...(r.xd_subtransient === undefined ? {} : { xdSubtransientPu: r.xd_subtransient }),
    ...(r.r_to_x === undefined ? {} : { rToX: r.r_to_x }),
    ...(r.locked_rotor_ratio === undefined ? {} : { lockedRotorRatio: r.locked_rotor_ratio }),
    at: { file, line: row.line },
  };
}

/** Groups rows by a key, keeping first-seen order. */
function groupBy<T>(rows: readonly T[], key: (row: T) => string): T[][] {
  const map = new Map<string, T[]>();
  for (const r of rows) {
    const k = key(r).toLowerCase();
    if (!map.has(k)) map.set(k, []);
    map.get(k)!.push(r);
  }
  return [...map.values()];
}

export interface GroupedCurves<T> {
  readonly value: T[];
  /** Lower-case ids of curves that are unusable (rejected rows or failed checks). */
  readonly bad: Set<string>;
}

/** Reactive-power curves: points ordered by point number, x strictly ascending. */
export function groupReactiveCurves(
  tables: NetworkTables,
  diagnostics: Diagnostic[],
): GroupedCurves<ReactiveCurve> {
  const file = tables.reactiveCurves.file;
  const bad = new Set(
    tables.reactiveCurves.rejected.map((r) => (r.cells.curve ?? "").toLowerCase()),
  );
  const value: ReactiveCurve[] = [];
  for (const rows of groupBy(tables.reactiveCurves.rows, (r) => r.value.curve)) {
    const sorted = [...rows].sort((a, b) => a.value.point - b.value.point);
    const first = sorted[0]!;
    const id = first.value.curve;
    const problem = sorted.find((r, i) =>
      r.value.kind !== first.value.kind || (i > 0 && r.value.x <= sorted[i - 1]!.value.x)
    );
    if (problem !== undefined || sorted.length < 2) {
      bad.add(id.toLowerCase());
      diagnostics.push(makeDiagnostic(
        "curve.invalid",
        "error",
        problem === undefined
          ? `Reactive curve "${id}" needs at least two points`
          : `Reactive curve "${id}" on line ${problem.line}: points must share one kind and rise strictly in x`,
        { at: { file, line: (problem ?? first).line } },
      ));
      continue;
    }
    if (bad.has(id.toLowerCase())) continue;
    value.push({
      id,
      kind: first.value.kind,
      points: sorted.map((r) => ({ x: r.value.x, y: r.value.y })),
      at: { file, line: first.line },
    });
  }
  return { value, bad };
}

/** Fuse curves: melt (required) and clear points, current ascending, time not rising. */
export function groupFuseCurves(
  tables: NetworkTables,
  diagnostics: Diagnostic[],
): GroupedCurves<FuseCurve> {
  const file = tables.fuseCurves.file;
  const bad = new Set(tables.fuseCurves.rejected.map((r) => (r.cells.curve ?? "").toLowerCase()));
  const value: FuseCurve[] = [];
  for (const rows of groupBy(tables.fuseCurves.rows, (r) => r.value.curve)) {
    const id = rows[0]!.value.curve;
    const part = (kind: "melt" | "clear") =>
      rows.filter((r) => r.value.kind === kind).sort((a, b) => a.value.current - b.value.current);
    const melt = part("melt"), clear = part("clear");
    const rising = [melt, clear].flatMap((pts) =>
      pts.filter((p, i) =>
        i > 0 && p.value.time > pts[i - 1]!.value.time
      )
    )[0];
    if (melt.length < 2 || rising !== undefined) {
      bad.add(id.toLowerCase());
      diagnostics.push(makeDiagnostic(
        "curve.invalid",
        "error",
        rising === undefined
          ? `Fuse curve "${id}" needs at least two melt points`
          : `Fuse curve "${id}" on line ${rising.line}: time must not rise as current rises`,
        { at: { file, line: (rising ?? rows[0]!).line } },
      ));
      continue;
    }
    if (bad.has(id.toLowerCase())) continue;
    const points = (pts: typeof melt): CurvePoint[] =>
      pts.map((p) => ({ x: p.value.current, y: p.value.time }));
    value.push({
      id,
      melt: points(melt),
      clear: points(clear),
      at: { file, line: rows[0]!.line },
    });
  }
  return { value, bad };
}
