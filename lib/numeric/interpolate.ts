/**
 * Linear interpolation in a series sorted by x ascending (standard numerics, common practice).
 * Binary search: O(log n) per call.
 *
 * Degenerate cases: empty series or x outside [x0, xn] → NaN (no extrapolation); one point at x → its y;
 * equal neighbouring x values → the later y.
 *
 * @param xs abscissae, ascending
 * @param ys ordinates, same length
 * @param x where to read
 * @example interpolateLinear([0, 10], [0, 100], 2.5) // 25
 */
export function interpolateLinear(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number): number {
  if (xs.length !== ys.length) throw new Error("interpolateLinear requires xs and ys of equal length");
  const n = xs.length;
  if (n === 0 || !Number.isFinite(x) || x < xs[0] || x > xs[n - 1]) return NaN;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= x) lo = mid;
    else hi = mid;
  }
  if (xs[hi] === x) return ys[hi];
  if (xs[lo] === x || hi === lo) return ys[lo];
  const f = (x - xs[lo]) / (xs[hi] - xs[lo]);
  return ys[lo] + f * (ys[hi] - ys[lo]);
}

/**
 * The x at which a piecewise-linear series first reaches `level` going upwards, starting at index `from`
 * (linear interpolation between the bracketing points; common practice for fixed-level thresholds).
 *
 * Degenerate cases: the point at `from` already at or above `level` → NaN (the crossing lies before the
 * data); the series never reaches `level` → NaN.
 *
 * @example firstUpwardCrossing([100, 200, 300], [2, 3, 5], 4) // 250
 */
export function firstUpwardCrossing(xs: ArrayLike<number>, ys: ArrayLike<number>, level: number, from = 0): number {
  if (xs.length !== ys.length) throw new Error("firstUpwardCrossing requires xs and ys of equal length");
  if (from >= xs.length || ys[from] >= level) return NaN;
  for (let i = from + 1; i < xs.length; i++) {
    if (ys[i] >= level) {
      const f = (level - ys[i - 1]) / (ys[i] - ys[i - 1]);
      return xs[i - 1] + f * (xs[i] - xs[i - 1]);
    }
  }
  return NaN;
}
