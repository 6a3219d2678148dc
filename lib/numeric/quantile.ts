/**
 * Sample quantile by linear interpolation between order statistics (the common "type 7" definition,
 * Hyndman & Fan 1996, Am Stat 50:361 — recalled citation; standard statistics).
 * Non-finite values are skipped. Degenerate cases: no finite value → NaN.
 *
 * @param values any order; not modified
 * @param p probability in [0, 1]
 * @example quantile([1, 2, 3, 4], 0.5) // 2.5
 */
export function quantile(values: ArrayLike<number>, p: number): number {
  if (!(p >= 0 && p <= 1)) throw new Error("quantile requires p in [0, 1]");
  let m = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) m++;
  if (m === 0) return NaN;
  // a typed array sorts numerically without a comparator callback (several times faster on thousands of breaths)
  const sorted = new Float64Array(m);
  for (let i = 0, k = 0; i < values.length; i++) if (Number.isFinite(values[i])) sorted[k++] = values[i];
  sorted.sort();
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Median (quantile 0.5) of the finite values; NaN when there are none. */
export function median(values: ArrayLike<number>): number {
  return quantile(values, 0.5);
}

/**
 * Robust standard deviation: 1.4826 × the median absolute deviation from `centre` (default: the median of the values);
 * 1.4826 = 1/Φ⁻¹(0.75) makes it equal the SD for normal data (standard statistics, Rousseeuw & Croux 1993, JASA
 * 88:1273 — recalled citation). Non-finite values are skipped; NaN when there are none.
 *
 * @example robustSd([1, 2, 3, 4, 5]) // 1.4826 (median 3, absolute deviations 2, 1, 0, 1, 2)
 */
export function robustSd(values: ArrayLike<number>, centre: number = median(values)): number {
  return 1.4826 * median(Array.from(values, (v) => Math.abs(v - centre)));
}
