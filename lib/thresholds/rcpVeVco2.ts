import { hingeFit } from "../numeric";
import { buildMethodEstimate, seriesWindow, timeAtLevel, vo2AtTime } from "./consensus";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface RcpVeVco2Options {
  /** First time included, s. @default series.span.startS */
  startS?: number;
  /** Fewest bins each side. @default 3 */
  minPointsEachSide?: number;
  /** Least ratio of the VE-vs-VCO2 slopes above/below the break (our choice). @default 1.1 */
  minSlopeRatio?: number;
  /** Least F statistic (our choice). @default 4 */
  minF?: number;
}

/**
 * VT2 (respiratory compensation point) as the breakpoint of VE against VCO2 (Beaver, Wasserman & Whipp
 * 1986, confirmed abstract: RCP found separately on VE vs VCO2), by a continuous two-segment least-squares
 * fit (Orr et al. 1982, confirmed; continuity our choice). Accepted when VE rises ≥ 1.1× faster above the
 * break with F ≥ 4 (our choices). The break's VCO2 is mapped to a time by the VCO2 trend, then to VO2.
 * Units: VE L/min, VCO2 and VO2 mL/min.
 */
export function rcpVeVco2(series: ThresholdSeries, options: RcpVeVco2Options = {}): MethodEstimate {
  const startS = options.startS ?? series.span.startS;
  const m = options.minPointsEachSide ?? 3;
  const minRatio = options.minSlopeRatio ?? 1.1;
  const minF = options.minF ?? 4;
  const idx = seriesWindow(series, startS, series.span.endS).filter(
    (i) => Number.isFinite(series.veLMin[i]) && Number.isFinite(series.vco2MlMin[i]),
  );
  const window = { startS, endS: series.span.endS };
  const base = {
    id: "vt2-ve-vco2-break",
    which: "vt2" as const,
    label: "RCP: breakpoint of VE against VCO2",
    series,
    window,
    sourceIds: ["beaver-1986-v-slope", "vt-rcp-criteria-recalled", "orr-1982-multisegment", "vt-implementation-choice"],
  };
  if (idx.length < 2 * m + 1) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: idx.length },
      quality: "failed",
      reasons: [`not determinable: only ${idx.length} bins of VE and VCO2`],
    });
  }
  const h = hingeFit(
    idx.map((i) => series.vco2MlMin[i]),
    idx.map((i) => series.veLMin[i]),
    { minPointsEachSide: m, hingeSign: "positive" },
  );
  const ratio = h.slopeAbove / h.slopeBelow;
  const fit = {
    breakVco2: h.breakX,
    slopeBelowLPerL: h.slopeBelow * 1000,
    slopeAboveLPerL: h.slopeAbove * 1000,
    fStatistic: h.fStatistic,
    pointsAbove: h.nAbove,
  };
  const reasons: string[] = [];
  let quality: MethodQuality = "good";
  if (!Number.isFinite(h.breakX) || !(h.slopeBelow > 0)) {
    quality = "failed";
    reasons.push("not determinable: the VE-against-VCO2 fit failed");
  } else if (!(ratio >= minRatio) || !(h.fStatistic >= minF)) {
    quality = "failed";
    reasons.push(
      `not determinable: VE does not rise out of proportion to VCO2 (slope ratio ${ratio.toFixed(2)}, F = ${h.fStatistic.toFixed(1)})`,
    );
  } else {
    reasons.push(`VE rises ${ratio.toFixed(2)}× faster against VCO2 above the break (F = ${h.fStatistic.toFixed(1)})`);
    if (h.fStatistic < 10) {
      quality = "fair";
      reasons.push("weak break");
    }
  }
  const timeS = quality === "failed" ? NaN : timeAtLevel(series, series.vco2Trend, h.breakX);
  const vo2 = Number.isFinite(timeS) ? vo2AtTime(series, timeS) : null;
  return buildMethodEstimate({
    ...base,
    vo2MlMin: vo2,
    timeS: Number.isFinite(timeS) ? timeS : null,
    fit: { ...fit, breakS: Number.isFinite(timeS) ? timeS : null },
    quality,
    reasons,
  });
}
