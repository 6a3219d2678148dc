/**
 * Ordinary least squares, y = slope·x + intercept (standard statistics, common practice).
 * Degenerate cases: fewer than 2 points or no spread in x → slope NaN (caller turns it into an issue).
 */
export interface LinearFit {
  slope: number;
  intercept: number;
  /** Coefficient of determination (1 when the points lie on the line; NaN when y has no spread). */
  r2: number;
  /** Residual sum of squares. */
  sse: number;
  n: number;
}

export function linearRegression(x: ArrayLike<number>, y: ArrayLike<number>): LinearFit {
  const s = new PrefixSums(x, y);
  return s.fit(0, x.length);
}

/**
 * Prefix sums of x, y, x², y², xy so that the OLS fit of any contiguous range [from, to) costs O(1).
 * This is what makes two-segment breakpoint searches O(n) instead of O(n²).
 */
export class PrefixSums {
  private readonly sx: Float64Array;
  private readonly sy: Float64Array;
  private readonly sxx: Float64Array;
  private readonly syy: Float64Array;
  private readonly sxy: Float64Array;
  readonly length: number;

  constructor(x: ArrayLike<number>, y: ArrayLike<number>) {
    if (x.length !== y.length) throw new Error("PrefixSums requires x and y of equal length");
    const n = x.length;
    this.length = n;
    this.sx = new Float64Array(n + 1);
    this.sy = new Float64Array(n + 1);
    this.sxx = new Float64Array(n + 1);
    this.syy = new Float64Array(n + 1);
    this.sxy = new Float64Array(n + 1);
    for (let i = 0; i < n; i++) {
      const xi = x[i];
      const yi = y[i];
      this.sx[i + 1] = this.sx[i] + xi;
      this.sy[i + 1] = this.sy[i] + yi;
      this.sxx[i + 1] = this.sxx[i] + xi * xi;
      this.syy[i + 1] = this.syy[i] + yi * yi;
      this.sxy[i + 1] = this.sxy[i] + xi * yi;
    }
  }

  /** OLS fit over indices [from, to). */
  fit(from: number, to: number): LinearFit {
    const n = to - from;
    const sx = this.sx[to] - this.sx[from];
    const sy = this.sy[to] - this.sy[from];
    const sxx = this.sxx[to] - this.sxx[from];
    const syy = this.syy[to] - this.syy[from];
    const sxy = this.sxy[to] - this.sxy[from];
    const cxx = sxx - (sx * sx) / n;
    const cyy = syy - (sy * sy) / n;
    const cxy = sxy - (sx * sy) / n;
    if (n < 2 || !(cxx > 0)) return { slope: NaN, intercept: NaN, r2: NaN, sse: NaN, n };
    const slope = cxy / cxx;
    const intercept = (sy - slope * sx) / n;
    const sse = Math.max(0, cyy - slope * cxy);
    const r2 = cyy > 0 ? 1 - sse / cyy : NaN;
    return { slope, intercept, r2, sse, n };
  }
}
