import { solveLinearSystem } from "./solveLinearSystem";

export interface HingeFitOptions {
  /**
   * Model below the breakpoint: "line" = intercept + slope·x; "flat" = intercept only (slope 0 below).
   * @default "line"
   */
  below?: "line" | "flat";
  /** Further regressors shared by both segments (e.g. 1/VCO2), each the length of x. @default [] */
  extra?: ArrayLike<number>[];
  /** Fewest points on each side of the breakpoint. @default 4 */
  minPointsEachSide?: number;
  /** Sub-steps per interval when refining the breakpoint between data points. @default 8 */
  refineSteps?: number;
  /** Keep only breakpoints whose hinge coefficient (slope change) has this sign. @default "any" */
  hingeSign?: "positive" | "negative" | "any";
}

export interface HingeFit {
  /** Breakpoint on the x axis (same unit as x); NaN when not determinable. */
  breakX: number;
  /** Slope of the fitted line below the breakpoint (0 for `below: "flat"`). */
  slopeBelow: number;
  /** Slope above the breakpoint (slopeBelow + hinge coefficient). */
  slopeAbove: number;
  /** Fitted value at the breakpoint (extra regressors at their mean). */
  yAtBreak: number;
  /** Coefficients: intercept (in centred x), [slope], extras…, hinge coefficient. */
  coefficients: number[];
  /** Residual sum of squares of the two-segment model. */
  sse: number;
  /** Residual sum of squares without the hinge (one segment). */
  sseSingle: number;
  /** F statistic of the hinge against one segment, 2 numerator degrees of freedom (breakpoint + slope). */
  fStatistic: number;
  n: number;
  nBelow: number;
  nAbove: number;
}

const EMPTY = (n: number): HingeFit => ({
  breakX: NaN,
  slopeBelow: NaN,
  slopeAbove: NaN,
  yAtBreak: NaN,
  coefficients: [],
  sse: NaN,
  sseSingle: NaN,
  fStatistic: NaN,
  n,
  nBelow: 0,
  nAbove: 0,
});

/**
 * Continuous two-segment ("hinge", broken-stick) least-squares regression:
 * y = a + b·x + Σ c_j·z_j + d·max(0, x − x0), searching the breakpoint x0 over every gap between
 * sorted x values and refining it inside the best gaps. Multisegment regression with the breakpoint at
 * the minimum pooled residual sum of squares follows Orr, Green, Hughson & Bennett 1982
 * (J Appl Physiol 52:1349, confirmed abstract); the continuous (joined) form is our implementation choice.
 *
 * Cost: O(n log n) for the sort, then O(1) per candidate breakpoint thanks to suffix sums.
 * Non-finite points are skipped. Degenerate cases: fewer than 2·minPointsEachSide points or no spread → NaN fields.
 *
 * @param x abscissae (any order; sorted internally)
 * @param y ordinates
 * @example hingeFit([0,1,2,3,4,5,6,7], [0,0,0,0,1,2,3,4], { below: "flat" }).breakX // 3
 */
export function hingeFit(x: ArrayLike<number>, y: ArrayLike<number>, options: HingeFitOptions = {}): HingeFit {
  if (x.length !== y.length) throw new Error("hingeFit requires x and y of equal length");
  const extra = options.extra ?? [];
  for (const z of extra) if (z.length !== x.length) throw new Error("hingeFit requires extra regressors the length of x");
  const flat = (options.below ?? "line") === "flat";
  const m = Math.max(2, options.minPointsEachSide ?? 4);
  const refineSteps = Math.max(1, options.refineSteps ?? 8);
  const sign = options.hingeSign ?? "any";

  const idx: number[] = [];
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) continue;
    if (extra.some((z) => !Number.isFinite(z[i]))) continue;
    idx.push(i);
  }
  const n = idx.length;
  if (n < 2 * m) return EMPTY(n);
  // the sort is stable, so x already in order (time, or a rising VO2) keeps its order without a comparator pass
  let ordered = true;
  for (let k = 1; k < n && ordered; k++) ordered = x[idx[k]] >= x[idx[k - 1]];
  if (!ordered) idx.sort((a, b) => x[a] - x[b]);
  let xm = 0;
  let ym = 0;
  for (const i of idx) {
    xm += x[i];
    ym += y[i];
  }
  xm /= n;
  ym /= n;
  const zm = extra.map((z) => idx.reduce((s, i) => s + z[i], 0) / n);
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    xs[k] = x[idx[k]] - xm;
    ys[k] = y[idx[k]] - ym;
  }
  if (!(xs[n - 1] > xs[0])) return EMPTY(n);
  // base columns: 1, [x], extras (centred)
  const cols: Float64Array[] = [new Float64Array(n).fill(1)];
  if (!flat) cols.push(xs);
  for (let j = 0; j < extra.length; j++) {
    const c = new Float64Array(n);
    for (let k = 0; k < n; k++) c[k] = extra[j][idx[k]] - zm[j];
    cols.push(c);
  }
  const p = cols.length;
  // global sums for the base block
  const gram: number[][] = [];
  const xty: number[] = [];
  for (let a = 0; a < p; a++) {
    gram.push([]);
    for (let b = 0; b < p; b++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += cols[a][k] * cols[b][k];
      gram[a].push(s);
    }
    let s = 0;
    for (let k = 0; k < n; k++) s += cols[a][k] * ys[k];
    xty.push(s);
  }
  let syy = 0;
  for (let k = 0; k < n; k++) syy += ys[k] * ys[k];
  // suffix sums over sorted points k..n-1
  const suf = (f: (k: number) => number): Float64Array => {
    const s = new Float64Array(n + 1);
    for (let k = n - 1; k >= 0; k--) s[k] = s[k + 1] + f(k);
    return s;
  };
  const sufC = cols.map((c) => suf((k) => c[k]));
  const sufCX = cols.map((c) => suf((k) => c[k] * xs[k]));
  const sufX = suf((k) => xs[k]);
  const sufXX = suf((k) => xs[k] * xs[k]);
  const sufY = suf((k) => ys[k]);
  const sufXY = suf((k) => xs[k] * ys[k]);

  const baseBeta = solveLinearSystem(gram, xty);
  const sseSingle = baseBeta ? Math.max(0, syy - baseBeta.reduce((s, b, i) => s + b * xty[i], 0)) : NaN;

  /** SSE and coefficients with the hinge at x0, points k..n-1 above (in-place elimination, no allocation). */
  const q = p + 1;
  const aug = new Float64Array(q * (q + 1));
  const rhs = new Float64Array(q);
  let scale = 0;
  for (const row of gram) for (const v of row) scale = Math.max(scale, Math.abs(v));
  const tiny = (scale || 1) * 1e-12;
  const evaluate = (k: number, x0: number): { sse: number; beta: number[] } | null => {
    const nu = n - k;
    const w = q + 1;
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < p; j++) aug[i * w + j] = gram[i][j];
      const v = sufCX[i][k] - x0 * sufC[i][k];
      aug[i * w + p] = v;
      aug[p * w + i] = v;
      aug[i * w + q] = xty[i];
      rhs[i] = xty[i];
    }
    aug[p * w + p] = sufXX[k] - 2 * x0 * sufX[k] + nu * x0 * x0;
    rhs[p] = sufXY[k] - x0 * sufY[k];
    aug[p * w + q] = rhs[p];
    for (let col = 0; col < q; col++) {
      let piv = col;
      for (let r = col + 1; r < q; r++) if (Math.abs(aug[r * w + col]) > Math.abs(aug[piv * w + col])) piv = r;
      if (!(Math.abs(aug[piv * w + col]) > tiny)) return null;
      if (piv !== col) for (let c = 0; c < w; c++) [aug[piv * w + c], aug[col * w + c]] = [aug[col * w + c], aug[piv * w + c]];
      for (let r = col + 1; r < q; r++) {
        const f = aug[r * w + col] / aug[col * w + col];
        if (f !== 0) for (let c = col; c < w; c++) aug[r * w + c] -= f * aug[col * w + c];
      }
    }
    const beta = new Array<number>(q).fill(0);
    for (let r = q - 1; r >= 0; r--) {
      let acc = aug[r * w + q];
      for (let c = r + 1; c < q; c++) acc -= aug[r * w + c] * beta[c];
      beta[r] = acc / aug[r * w + r];
    }
    if (!beta.every(Number.isFinite)) return null;
    if ((sign === "positive" && !(beta[p] > 0)) || (sign === "negative" && !(beta[p] < 0))) return null;
    let fitted = 0;
    for (let i = 0; i < q; i++) fitted += beta[i] * rhs[i];
    return { sse: Math.max(0, syy - fitted), beta };
  };

  // Screening of candidates by the partial-regression (Schur complement) identity with (X'X)⁻¹ and the one-segment
  // fit computed once: SSE(x0) = SSE_single − (h'My)² / h'Mh, hinge coefficient h'My / h'Mh (M = I − X(X'X)⁻¹X') —
  // the same least squares as the full (p+1)² solve, O(p²) per candidate and no allocation; the full solve runs
  // once, for the best candidate's coefficients. Without an invertible base block every candidate takes the full solve.
  const ginv: number[][] = [];
  if (baseBeta)
    for (let c = 0; c < p; c++) {
      const e = new Array<number>(p).fill(0);
      e[c] = 1;
      const col = solveLinearSystem(gram, e);
      if (!col) break;
      ginv.push(col);
    }
  const screened = baseBeta !== null && ginv.length === p;
  const hx = new Float64Array(p);
  const screen = (k: number, x0: number): number => {
    if (!screened) return evaluate(k, x0)?.sse ?? NaN;
    const nu = n - k;
    for (let i = 0; i < p; i++) hx[i] = sufCX[i][k] - x0 * sufC[i][k];
    const hh = sufXX[k] - 2 * x0 * sufX[k] + nu * x0 * x0;
    let hMh = hh;
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) hMh -= hx[a] * ginv[a][b] * hx[b];
    if (!(hMh > 1e-12 * hh) || !(hMh > tiny * 1e-6)) return NaN;
    let hMy = sufXY[k] - x0 * sufY[k];
    for (let i = 0; i < p; i++) hMy -= hx[i] * (baseBeta as number[])[i];
    const d = hMy / hMh;
    if ((sign === "positive" && !(d > 0)) || (sign === "negative" && !(d < 0))) return NaN;
    return Math.max(0, sseSingle - (hMy * hMy) / hMh);
  };

  let best: { k: number; x0: number; sse: number } | null = null;
  for (let k = m; k <= n - m; k++) {
    const x0 = (xs[k - 1] + xs[k]) / 2;
    const sse = screen(k, x0);
    if (Number.isFinite(sse) && (!best || sse < best.sse)) best = { k, x0, sse };
  }
  if (!best) return EMPTY(n);
  const kb = best.k;
  for (let k = Math.max(m, kb - 1); k <= Math.min(n - m, kb + 1); k++) {
    for (let s = 0; s <= refineSteps; s++) {
      const x0 = xs[k - 1] + (s / refineSteps) * (xs[k] - xs[k - 1]);
      const sse = screen(k, x0);
      if (Number.isFinite(sse) && sse < best.sse) best = { k, x0, sse };
    }
  }
  const full = evaluate(best.k, best.x0);
  if (!full) return EMPTY(n);
  const beta = full.beta;
  const slopeBelow = flat ? 0 : beta[1];
  const hinge = beta[p];
  const dof = n - p - 2;
  const fStatistic = dof > 0 && full.sse > 0 ? (sseSingle - full.sse) / 2 / (full.sse / dof) : full.sse === 0 ? Infinity : NaN;
  return {
    breakX: best.x0 + xm,
    slopeBelow,
    slopeAbove: slopeBelow + hinge,
    yAtBreak: beta[0] + slopeBelow * best.x0 + ym,
    coefficients: beta,
    sse: full.sse,
    sseSingle,
    fStatistic,
    n,
    nBelow: best.k,
    nAbove: n - best.k,
  };
}
