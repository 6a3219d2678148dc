/**
 * Centred running median over `halfWidth` neighbours on each side (window 2·halfWidth + 1, shrinking at
 * the ends). Non-finite values are skipped inside each window; a window with none gives NaN.
 * A centred running median is a common spike-resistant local reference for breath data (common practice;
 * e.g. 15-breath running median for sigh detection, Sci Rep 2025 s41598-025-20654-x — confirmed figure legend).
 * O(n·w log w) with w the window length: fine for the small windows used on breath data.
 *
 * @example runningMedian([1, 100, 3, 4, 5], 1) // [50.5, 3, 4, 4, 4.5]
 */
export function runningMedian(values: ArrayLike<number>, halfWidth: number): Float64Array {
  if (!Number.isInteger(halfWidth) || halfWidth < 0) throw new Error("runningMedian requires a non-negative integer halfWidth");
  const n = values.length;
  const out = new Float64Array(n);
  const window = new Float64Array(2 * halfWidth + 1);
  for (let i = 0; i < n; i++) {
    let len = 0;
    const from = Math.max(0, i - halfWidth);
    const to = Math.min(n - 1, i + halfWidth);
    for (let j = from; j <= to; j++) {
      const v = values[j];
      if (!Number.isFinite(v)) continue;
      // insertion into the sorted window
      let k = len++;
      while (k > 0 && window[k - 1] > v) {
        window[k] = window[k - 1];
        k--;
      }
      window[k] = v;
    }
    if (len === 0) {
      out[i] = NaN;
      continue;
    }
    const m = len >> 1;
    out[i] = len % 2 === 1 ? window[m] : (window[m - 1] + window[m]) / 2;
  }
  return out;
}
