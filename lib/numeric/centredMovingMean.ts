/**
 * Centred moving mean over `halfWidth` neighbours on each side (window 2·halfWidth + 1), the window shrinking
 * symmetrically at the ends (the first and last values stay as they are). Non-finite values are skipped inside a
 * window; a window with none gives NaN. The weights of every window sum to one, so two series related by a straight
 * line (y = a + b·x) keep exactly that relation after both are smoothed: smoothing VE and VCO2 alike changes the
 * noise, not the line. Rolling time averages of breath data are common practice (Robergs, Dwyer & Astorino 2010,
 * Sports Med 40:95 — confirmed survey). O(n·w).
 *
 * @example centredMovingMean([1, 2, 6, 4, 5], 1) // [1, 3, 4, 5, 5]
 */
export function centredMovingMean(values: ArrayLike<number>, halfWidth: number): Float64Array {
  if (!Number.isInteger(halfWidth) || halfWidth < 0)
    throw new Error("centredMovingMean requires a non-negative integer halfWidth");
  const n = values.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const h = Math.min(halfWidth, i, n - 1 - i);
    let sum = 0;
    let count = 0;
    for (let j = i - h; j <= i + h; j++)
      if (Number.isFinite(values[j])) {
        sum += values[j];
        count++;
      }
    out[i] = count > 0 ? sum / count : NaN;
  }
  return out;
}
