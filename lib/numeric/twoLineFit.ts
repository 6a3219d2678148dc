import { PrefixSums, type LinearFit } from "./linearRegression";

export interface TwoLineFitOptions {
  /** Fewest points in each segment. @default 4 */
  minPointsEachSide?: number;
  /**
   * Only splits for which this returns true are considered (e.g. acceptance rules on the slopes);
   * receives the two fits and their intersection x. @default every split
   */
  accept?: (lower: LinearFit, upper: LinearFit, intersectionX: number) => boolean;
}

export interface TwoLineFit {
  /** Index (in the given order) of the first point of the upper segment; -1 when not determinable. */
  split: number;
  lower: LinearFit;
  upper: LinearFit;
  /** x where the two fitted lines cross: (b2 − b1)/(m1 − m2); NaN when parallel or not determinable. */
  intersectionX: number;
  /** y of the lines at the intersection. */
  intersectionY: number;
  /** Pooled residual sum of squares of the two lines. */
  sse: number;
  /** Residual sum of squares of one line through all points. */
  sseSingle: number;
  n: number;
}

/**
 * Two independent straight lines fitted to the points before and after a split in the given order
 * (time order for breath data), the split chosen at the minimum pooled residual sum of squares
 * (multisegment regression, Orr, Green, Hughson & Bennett 1982, J Appl Physiol 52:1349 — confirmed abstract),
 * and the intersection of the two lines x = (b2 − b1)/(m1 − m2) (line algebra; secondary source for its use
 * in V-slope). O(n) over all splits thanks to prefix sums.
 * Non-finite points are skipped. Degenerate cases: fewer than 2·minPointsEachSide points → split −1, NaN fields.
 *
 * @example twoLineFit([0,1,2,3,4,5,6,7], [0,1,2,3,5,7,9,11]).intersectionX // 3
 */
export function twoLineFit(x: ArrayLike<number>, y: ArrayLike<number>, options: TwoLineFitOptions = {}): TwoLineFit {
  if (x.length !== y.length) throw new Error("twoLineFit requires x and y of equal length");
  const m = Math.max(2, options.minPointsEachSide ?? 4);
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < x.length; i++) {
    if (Number.isFinite(x[i]) && Number.isFinite(y[i])) {
      xs.push(x[i]);
      ys.push(y[i]);
    }
  }
  const n = xs.length;
  const nan: LinearFit = { slope: NaN, intercept: NaN, r2: NaN, sse: NaN, n: 0 };
  if (n < 2 * m)
    return { split: -1, lower: nan, upper: nan, intersectionX: NaN, intersectionY: NaN, sse: NaN, sseSingle: NaN, n };
  const ps = new PrefixSums(xs, ys);
  const single = ps.fit(0, n);
  let best = -1;
  let bestSse = Infinity;
  for (let k = m; k <= n - m; k++) {
    const a = ps.fit(0, k);
    const b = ps.fit(k, n);
    const sse = a.sse + b.sse;
    if (options.accept && !options.accept(a, b, a.slope !== b.slope ? (b.intercept - a.intercept) / (a.slope - b.slope) : NaN))
      continue;
    if (Number.isFinite(sse) && sse < bestSse) {
      bestSse = sse;
      best = k;
    }
  }
  if (best < 0)
    return { split: -1, lower: nan, upper: nan, intersectionX: NaN, intersectionY: NaN, sse: NaN, sseSingle: single.sse, n };
  const lower = ps.fit(0, best);
  const upper = ps.fit(best, n);
  const ix = lower.slope !== upper.slope ? (upper.intercept - lower.intercept) / (lower.slope - upper.slope) : NaN;
  return {
    split: best,
    lower,
    upper,
    intersectionX: ix,
    intersectionY: lower.intercept + lower.slope * ix,
    sse: bestSse,
    sseSingle: single.sse,
    n,
  };
}
