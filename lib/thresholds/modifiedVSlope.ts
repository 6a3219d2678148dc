import { hingeFit } from "../numeric";
import { buildMethodEstimate, seriesWindow, timeAtLevel } from "./consensus";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface ModifiedVSlopeOptions {
  /** Last time included, s. @default series.span.endS */
  endS?: number;
  /** Fewest bins each side. @default 4 */
  minPointsEachSide?: number;
  /** Least rise of excess CO2 per unit VO2 above the departure (our choice, mirrors S2 − S1 ≥ 0.1). @default 0.1 */
  minRiseSlope?: number;
  /** Least F statistic of the departure against a flat line (our choice). @default 4 */
  minF?: number;
  /** Largest lower-segment slope of excess CO2 still treated as flat (our choice). @default 0.05 */
  maxLowerTilt?: number;
}

/**
 * VT1 by the modified V-slope (Sue et al. 1988, Chest 94:931 — confirmed): excess CO2 = VCO2 − VO2 (mL/min)
 * against VO2; a flat lower segment (the 45° line of slope 1 through the lower points) joined to a rising
 * upper segment, fitted by least squares over every departure point (continuous two-segment fit, our
 * choice after Orr et al. 1982). The threshold is the VO2 of the departure. O(n log n).
 */
export function modifiedVSlope(series: ThresholdSeries, options: ModifiedVSlopeOptions = {}): MethodEstimate {
  const endS = options.endS ?? series.span.endS;
  const m = options.minPointsEachSide ?? 5;
  const minRise = options.minRiseSlope ?? 0.1;
  const minF = options.minF ?? 4;
  const maxTilt = options.maxLowerTilt ?? 0.05;
  const idx = seriesWindow(series, series.span.startS, endS).filter(
    (i) => Number.isFinite(series.vo2MlMin[i]) && Number.isFinite(series.vco2MlMin[i]),
  );
  const window = { startS: series.span.startS, endS };
  const base = {
    id: "vt1-modified-v-slope",
    which: "vt1" as const,
    label: "Modified V-slope: departure of excess CO2 (VCO2 − VO2) from a flat line",
    series,
    window,
    sourceIds: ["sue-1988-modified-v-slope", "orr-1982-multisegment", "vt-implementation-choice"],
  };
  if (idx.length < 2 * m + 1) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: idx.length },
      quality: "failed",
      reasons: [`not determinable: only ${idx.length} bins below the upper limit`],
    });
  }
  const x = idx.map((i) => series.vo2MlMin[i]);
  const e = idx.map((i) => series.vco2MlMin[i] - series.vo2MlMin[i]);
  // Sue's 45° line assumes S1 ≈ 1; when the lower points clearly tilt (|slope| > maxLowerTilt) the lower
  // segment follows them instead (our choice), and the verdict says so.
  const free = hingeFit(x, e, { minPointsEachSide: m, hingeSign: "positive" });
  const tilted = Number.isFinite(free.slopeBelow) && Math.abs(free.slopeBelow) > maxTilt;
  const h = tilted ? free : hingeFit(x, e, { below: "flat", minPointsEachSide: m, hingeSign: "positive" });
  const fit = {
    departureVo2: h.breakX,
    excessAtDeparture: h.yAtBreak,
    riseSlope: h.slopeAbove,
    fStatistic: h.fStatistic,
    pointsBelow: h.nBelow,
    pointsAbove: h.nAbove,
  };
  const reasons: string[] = [];
  let quality: MethodQuality = "good";
  if (!Number.isFinite(h.breakX)) {
    quality = "failed";
    reasons.push("not determinable: the two-segment fit failed");
  } else if (!(h.slopeAbove >= minRise)) {
    quality = "failed";
    reasons.push(
      `not determinable: excess CO2 rises by only ${h.slopeAbove.toFixed(2)} per unit VO2 above the departure (need ≥ ${minRise})`,
    );
  } else if (!(h.fStatistic >= minF)) {
    quality = "failed";
    reasons.push(`not determinable: no clear departure (F = ${h.fStatistic.toFixed(1)} < ${minF})`);
  } else {
    reasons.push(`excess CO2 rises ${h.slopeAbove.toFixed(2)} per unit VO2 after the departure; F = ${h.fStatistic.toFixed(1)}`);
    if (tilted) {
      quality = "fair";
      reasons.push(
        `lower points tilt (${free.slopeBelow.toFixed(2)} per unit VO2, S1 ≠ 1): departure taken from the fitted lower line`,
      );
    }
    if (h.fStatistic < 10) {
      quality = quality === "good" ? "fair" : "poor";
      reasons.push("weak departure");
    }
  }
  const vo2 = quality === "failed" ? null : h.breakX;
  return buildMethodEstimate({
    ...base,
    vo2MlMin: vo2,
    timeS: vo2 === null ? null : timeAtLevel(series, series.vo2Trend, vo2),
    fit,
    quality,
    reasons,
  });
}
