/**
 * Least-squares polynomial fit y ≈ Σ c_k·u^k with u = (x − center)/scale (standard statistics, common practice).
 * Centring and scaling keep the normal equations well conditioned (x in watts would otherwise reach 10^15 in a
 * cubic fit's sums). Solved by Gaussian elimination with partial pivoting; O(n·d + d³).
 */
export interface PolynomialFit {
  degree: number;
  /** Mean of x. */
  center: number;
  /** Half the range of x (1 when x has no spread). */
  scale: number;
  /** Coefficients in u = (x − center)/scale, ascending powers; NaN when the fit is not determinable. */
  coefficients: number[];
  /** Residual sum of squares. */
  sse: number;
  /** Coefficient of determination (NaN when y has no spread). */
  r2: number;
  n: number;
}

/**
 * Fit a polynomial of `degree` to (x, y) by ordinary least squares.
 *
 * Degenerate cases: fewer than degree + 1 points, or fewer than degree + 1 distinct x values → every
 * coefficient NaN (the caller turns this into "not determinable").
 *
 * @example polynomialFit([0, 1, 2, 3], [1, 2, 9, 28], 3) // y = x³ + 1 → evaluatePolynomialFit(fit, 4) ≈ 65
 */
export function polynomialFit(x: ArrayLike<number>, y: ArrayLike<number>, degree: number): PolynomialFit {
  if (x.length !== y.length) throw new Error("polynomialFit requires x and y of equal length");
  if (!Number.isInteger(degree) || degree < 0) throw new Error("polynomialFit requires a non-negative integer degree");
  const n = x.length;
  const m = degree + 1;
  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    sum += x[i];
    if (x[i] < min) min = x[i];
    if (x[i] > max) max = x[i];
  }
  const center = n > 0 ? sum / n : 0;
  const scale = max > min ? (max - min) / 2 : 1;
  const fail: PolynomialFit = { degree, center, scale, coefficients: new Array(m).fill(NaN), sse: NaN, r2: NaN, n };
  if (n < m || new Set(Array.from(x)).size < m) return fail;

  // normal equations A c = b with A[j][k] = Σ u^(j+k), b[j] = Σ y·u^j
  const powerSums = new Array(2 * degree + 1).fill(0);
  const b = new Array(m).fill(0);
  let sy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const u = (x[i] - center) / scale;
    let p = 1;
    for (let k = 0; k <= 2 * degree; k++) {
      powerSums[k] += p;
      if (k < m) b[k] += y[i] * p;
      p *= u;
    }
    sy += y[i];
    syy += y[i] * y[i];
  }
  const a: number[][] = [];
  for (let j = 0; j < m; j++) {
    a.push([]);
    for (let k = 0; k < m; k++) a[j].push(powerSums[j + k]);
    a[j].push(b[j]);
  }
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    if (!(Math.abs(a[pivot][col]) > 1e-12)) return fail;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = 0; r < m; r++) {
      if (r === col) continue;
      const f = a[r][col] / a[col][col];
      for (let k = col; k <= m; k++) a[r][k] -= f * a[col][k];
    }
  }
  const coefficients = a.map((row, j) => row[m] / row[j]);
  const fit: PolynomialFit = { degree, center, scale, coefficients, sse: 0, r2: NaN, n };
  let sse = 0;
  for (let i = 0; i < n; i++) {
    const e = y[i] - evaluatePolynomialFit(fit, x[i]);
    sse += e * e;
  }
  const cyy = syy - (sy * sy) / n;
  return { ...fit, sse, r2: cyy > 0 ? 1 - sse / cyy : NaN };
}

/** Value of a fitted polynomial at x (Horner's rule). */
export function evaluatePolynomialFit(fit: PolynomialFit, x: number): number {
  const u = (x - fit.center) / fit.scale;
  let v = 0;
  for (let k = fit.coefficients.length - 1; k >= 0; k--) v = v * u + fit.coefficients[k];
  return v;
}

/** First derivative dy/dx of a fitted polynomial at x. */
export function polynomialFitSlope(fit: PolynomialFit, x: number): number {
  const u = (x - fit.center) / fit.scale;
  let v = 0;
  for (let k = fit.coefficients.length - 1; k >= 1; k--) v = v * u + k * fit.coefficients[k];
  return v / fit.scale;
}
