/**
 * Operating time of overcurrent protection at a given current: relay stages (inverse-time
 * curves of IEC 60255-151 and IEEE C37.112, definite time, instantaneous) and fuse links
 * (time–current points interpolated on log–log axes). Pure functions of plain data, for
 * time–current plots and, later, the protection coordination study.
 *
 * Conventions:
 * - A current at or below the stage's pickup never operates it: Infinity.
 * - IEC 60255-151: t = TMS·k / ((I/Is)^α − 1). IEEE C37.112: t = TD·(A / (M^p − 1) + B).
 *   Constants in INVERSE_CURVES (REFERENCES.md section C).
 * - Definite time: the stage's delay above pickup. Instantaneous: 0 s above pickup, or its
 *   delay when one is given.
 * - Fuses: log–log interpolation between the points; below the first point's current,
 *   Infinity (the first point is the long-time end, near the minimum melting current).
 *   Beyond the last point the last segment is extended on log–log axes, so times keep
 *   falling as the current grows. Holding the last point's time instead would make the
 *   fuse look slower than it is at high currents, which flatters the coordination of an
 *   upstream device against it.
 */
import type { CurvePoint, RelayCharacteristic, RelayStage } from "../model/network.ts";

type InverseCharacteristic = Exclude<RelayCharacteristic, "definite_time" | "instantaneous">;

/** Constants of the inverse-time curves: t = m·(a / (M^p − 1) + b), m the multiplier. */
export const INVERSE_CURVES: Readonly<
  Record<InverseCharacteristic, { readonly a: number; readonly p: number; readonly b: number }>
> = {
  iec_standard_inverse: { a: 0.14, p: 0.02, b: 0 },
  iec_very_inverse: { a: 13.5, p: 1, b: 0 },
  iec_extremely_inverse: { a: 80, p: 2, b: 0 },
  iec_long_time_inverse: { a: 120, p: 1, b: 0 },
  ieee_moderately_inverse: { a: 0.0515, p: 0.02, b: 0.114 },
  ieee_very_inverse: { a: 19.61, p: 2, b: 0.491 },
  ieee_extremely_inverse: { a: 28.2, p: 2, b: 0.1217 },
};

/**
 * Operating time of one relay stage at a current, s (Infinity when it does not operate).
 * Throws for a stage the model would have refused: an inverse curve without a time
 * multiplier, or a definite-time stage without a delay.
 */
export function stageOperatingTimeS(stage: RelayStage, iA: number): number {
  if (!(iA > stage.pickupA)) return Infinity;
  switch (stage.characteristic) {
    case "instantaneous":
      return stage.delayS ?? 0;
    case "definite_time":
      if (stage.delayS === undefined) {
        throw new Error(`Definite-time stage ${stage.stage} has no delay`);
      }
      return stage.delayS;
    default: {
      const c = INVERSE_CURVES[stage.characteristic];
      if (stage.timeMultiplier === undefined) {
        throw new Error(`Stage ${stage.stage} (${stage.characteristic}) has no time multiplier`);
      }
      return stage.timeMultiplier * (c.a / (Math.pow(iA / stage.pickupA, c.p) - 1) + c.b);
    }
  }
}

/**
 * Time of a fuse curve (melt or clear points, ascending current) at a current, s, by
 * log–log interpolation; Infinity below the first point and for an empty curve. A curve
 * of a single point gives that point's time at and above its current.
 */
export function fuseTimeS(points: readonly CurvePoint[], iA: number): number {
  const first = points[0];
  if (first === undefined || !(iA >= first.x)) return Infinity;
  if (points.length === 1) return first.y;
  let k = 1;
  while (k < points.length - 1 && iA > points[k]!.x) k++;
  const p = points[k - 1]!, q = points[k]!;
  const slope = Math.log(q.y / p.y) / Math.log(q.x / p.x);
  return p.y * Math.pow(iA / p.x, slope);
}
