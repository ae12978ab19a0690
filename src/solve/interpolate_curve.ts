/** Piecewise-linear curve lookup that holds its end values outside the points. */
import type { CurvePoint } from "../model/network.ts";

export function interpolateCurve(points: readonly CurvePoint[], x: number): number {
  const first = points[0];
  if (first === undefined) return 0;
  if (x <= first.x) return first.y;
  for (let i = 1; i < points.length; i++) {
    const p = points[i]!, q = points[i - 1]!;
    if (x <= p.x) return q.y + (p.y - q.y) * (x - q.x) / (p.x - q.x);
  }
  return points[points.length - 1]!.y;
}
