import { twoLineFit } from "../numeric";
import { buildMethodEstimate, seriesWindow, timeAtLevel } from "./consensus";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface VSlopeOptions {
  /** Last time included, s (data above the RCP are excluded). @default series.span.endS */
  endS?: number;
  /** Fewest bins in each segment. @default 5 (our choice) */
  minPointsEachSide?: number;
  /** Lowest acceptable S1 (recalled rule). @default 0.6 */
  minS1?: number;
  /** Smallest acceptable S2 − S1 (recalled rule). @default 0.1 */
  minSlopeRise?: number;
}

/**
 * VT1 by the V-slope method (Beaver, Wasserman & Whipp 1986, J Appl Physiol 60:2020 — confirmed abstract):
 * VCO2 (y) against VO2 (x) over the incremental phase, first minute of the ramp excluded and data above the
 * RCP excluded (recalled details, implemented as stated choices). Two straight lines are fitted before and
 * after every split in time order; the split with the least pooled residual sum of squares is kept
 * (Orr et al. 1982, confirmed); the threshold is the intersection VO2 = (b2 − b1)/(m1 − m2) (secondary).
 * Only splits meeting S1 ≥ 0.6 and S2 − S1 ≥ 0.1 (recalled rules) with the intersection inside the measured
 * VO2 range are candidates (searching within the acceptance rules is our choice); none → not determinable.
 * O(n) on the binned series. Units: VO2 and VCO2 mL/min; slopes dimensionless.
 */
export function vSlope(series: ThresholdSeries, options: VSlopeOptions = {}): MethodEstimate {
  const endS = options.endS ?? series.span.endS;
  const m = options.minPointsEachSide ?? 5;
  const minS1 = options.minS1 ?? 0.6;
  const minRise = options.minSlopeRise ?? 0.1;
  const idx = seriesWindow(series, series.span.startS, endS).filter(
    (i) => Number.isFinite(series.vo2MlMin[i]) && Number.isFinite(series.vco2MlMin[i]),
  );
  const window = { startS: series.span.startS, endS };
  const x = idx.map((i) => series.vo2MlMin[i]);
  const y = idx.map((i) => series.vco2MlMin[i]);
  const base = {
    id: "vt1-v-slope",
    which: "vt1" as const,
    label: "V-slope: intersection of two lines of VCO2 against VO2",
    series,
    window,
    sourceIds: [
      "beaver-1986-v-slope",
      "vt-v-slope-acceptance-recalled",
      "orr-1982-multisegment",
      "vt-line-intersection",
      "vt-implementation-choice",
    ],
  };
  if (idx.length < 2 * m + 1) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: idx.length },
      quality: "failed",
      reasons: [`not determinable: only ${idx.length} bins of VO2 and VCO2 below the upper limit (need ${2 * m + 1})`],
    });
  }
  const xMin = Math.min(...x);
  const xMax = Math.max(...x);
  // the lines must cross near the split (within 10 % of the VO2 range of the last lower / first upper points)
  const nearSplit = 0.1 * (xMax - xMin);
  const meanX = (lo: { n: number }, _up: unknown) => (x[lo.n - 1] + x[lo.n]) / 2;
  // among the splits that meet the acceptance rules, the least pooled residual sum of squares
  const constrained = twoLineFit(x, y, {
    minPointsEachSide: m,
    accept: (lo, up, ix) =>
      lo.slope >= minS1 &&
      up.slope - lo.slope >= minRise &&
      ix >= xMin &&
      ix <= xMax &&
      Math.abs(ix - meanX(lo, up)) <= nearSplit,
  });
  const f = constrained.split > 0 ? constrained : twoLineFit(x, y, { minPointsEachSide: m });
  const s1 = f.lower.slope;
  const s2 = f.upper.slope;
  const splitX = f.split > 0 ? (x[f.split - 1] + x[f.split]) / 2 : NaN;
  const fStat = f.sse > 0 ? (f.sseSingle - f.sse) / 2 / (f.sse / Math.max(1, f.n - 4)) : NaN;
  const fit = {
    s1,
    s2,
    intercept1: f.lower.intercept,
    intercept2: f.upper.intercept,
    intersectionVo2: f.intersectionX,
    splitVo2: splitX,
    pointsBelow: f.split,
    pointsAbove: f.n - f.split,
    fStatistic: fStat,
  };
  const reasons: string[] = [];
  let quality: MethodQuality = "good";
  if (!(s1 >= minS1)) {
    reasons.push(`not determinable: lower slope S1 = ${s1.toFixed(2)} is below ${minS1} (recalled acceptance rule)`);
    quality = "failed";
  } else reasons.push(`S1 = ${s1.toFixed(2)} (≥ ${minS1})`);
  if (!(s2 - s1 >= minRise)) {
    reasons.push(
      `not determinable: S2 − S1 = ${(s2 - s1).toFixed(2)} is below ${minRise} (recalled acceptance rule): no clear excess CO2`,
    );
    quality = "failed";
  } else reasons.push(`S2 − S1 = ${(s2 - s1).toFixed(2)} (≥ ${minRise})`);
  const ix = f.intersectionX;
  if (quality !== "failed" && !(ix >= xMin && ix <= xMax)) {
    reasons.push("not determinable: the two lines cross outside the measured VO2 range");
    quality = "failed";
  }
  // quality grading (our choice, no published source): S1 within 0.8–1.15 of a lower slope near 1, and a breakpoint
  // F ≥ 10, count towards "good"; the acceptance rules above (S1 ≥ 0.6, S2 − S1 ≥ 0.1) are Beaver 1986's (recalled)
  if (quality !== "failed") {
    if (s1 < 0.8 || s1 > 1.15) {
      quality = "fair";
      reasons.push("S1 is away from 1: check the lower segment");
    }
    if (!(fStat >= 10)) {
      quality = quality === "good" ? "fair" : "poor";
      reasons.push(`weak breakpoint (F = ${fStat.toFixed(1)})`);
    }
  }
  const vo2 = quality === "failed" ? null : ix;
  const timeS = vo2 === null ? null : timeAtLevel(series, series.vo2Trend, vo2);
  return buildMethodEstimate({ ...base, vo2MlMin: vo2, timeS, fit, quality, reasons });
}
