/**
 * Thin a dense point cloud to at most `maxPoints` by keeping evenly spaced indices (always the first
 * and the last point). Deterministic; order kept; the input is not mutated. Used to keep a PDF small
 * (a breath-by-breath test has 500-2000 breaths per series).
 *
 * Degenerate cases: `maxPoints` < 2 keeps the first point only; fewer points than `maxPoints` returns a copy.
 */
export function thinPoints<T>(points: readonly T[], maxPoints: number): T[] {
  if (points.length <= maxPoints) return points.slice();
  if (maxPoints < 2) return points.slice(0, 1);
  const out: T[] = [];
  const step = (points.length - 1) / (maxPoints - 1);
  for (let k = 0; k < maxPoints; k++) out.push(points[Math.round(k * step)]);
  return out;
}
