import { hingeFit, linearRegression } from "../numeric";
import { buildMethodEstimate, seriesWindow, timeAtLevel, vo2AtTime } from "./consensus";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface VentilatoryEquivalentsOptions {
  /** Last time included, s (stay below the RCP). @default series.span.endS */
  endS?: number;
  /** Fewest bins each side. @default 4 */
  minPointsEachSide?: number;
  /** Least ratio of VE-vs-VO2 slopes above/below the break (our choice). @default 1.1 */
  minSlopeRatio?: number;
  /** Least F statistic of the break (our choice). @default 4 */
  minF?: number;
  /** Largest rise of VE/VCO2 after the break still called "flat", per minute (our choice). @default 0.4 */
  maxVeVco2RisePerMin?: number;
  /** Largest gap between the VE and PETO2 breaks still counted as agreement, s (our choice). @default 60 */
  petAgreementS?: number;
}

/**
 * VT1 by ventilatory equivalents and end-tidal gases (common practice; criteria secondary, source
 * `vt-equivalents-criteria`): VE/VO2 and PETO2 begin a systematic rise while VE/VCO2 and PETCO2 stay flat.
 * The start of the VE/VO2 rise is located as the break of VE against VO2 (continuous two-segment fit; the
 * ratio's trend changes exactly where VE starts rising faster than VO2 — our formulation, which avoids the
 * curvature of the ratio itself). Confirmations: PETO2 break (two-segment fit against time) within 60 s,
 * VE/VCO2 not rising and PETCO2 not falling after the break. Units: VO2 mL/min, VE L/min, pressures mmHg.
 */
export function ventilatoryEquivalents(series: ThresholdSeries, options: VentilatoryEquivalentsOptions = {}): MethodEstimate {
  const endS = options.endS ?? series.span.endS;
  const m = options.minPointsEachSide ?? 5;
  const minRatio = options.minSlopeRatio ?? 1.1;
  const minF = options.minF ?? 4;
  const maxRise = options.maxVeVco2RisePerMin ?? 0.4;
  const petGap = options.petAgreementS ?? 60;
  const win = seriesWindow(series, series.span.startS, endS);
  const idx = win.filter((i) => Number.isFinite(series.vo2MlMin[i]) && Number.isFinite(series.veLMin[i]));
  const window = { startS: series.span.startS, endS };
  const base = {
    id: "vt1-ventilatory-equivalents",
    which: "vt1" as const,
    label: "Ventilatory equivalents: VE/VO2 starts rising (break of VE against VO2), confirmed by PETO2, flat VE/VCO2 and PETCO2",
    series,
    window,
    sourceIds: ["vt-equivalents-criteria", "dolezal-2017-multi-plot", "orr-1982-multisegment", "vt-implementation-choice"],
  };
  if (idx.length < 2 * m + 1) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: idx.length },
      quality: "failed",
      reasons: [`not determinable: only ${idx.length} bins of VE and VO2 below the upper limit`],
    });
  }
  const h = hingeFit(
    idx.map((i) => series.vo2MlMin[i]),
    idx.map((i) => series.veLMin[i]),
    { minPointsEachSide: m, hingeSign: "positive" },
  );
  const ratio = h.slopeAbove / h.slopeBelow;
  const reasons: string[] = [];
  let quality: MethodQuality = "good";
  const fit: Record<string, number | null> = {
    breakVo2: h.breakX,
    veSlopeBelow: h.slopeBelow,
    veSlopeAbove: h.slopeAbove,
    fStatistic: h.fStatistic,
    peto2BreakS: null,
    veVco2RisePerMin: null,
    petco2SlopePerMin: null,
  };
  if (!Number.isFinite(h.breakX) || !(h.slopeBelow > 0)) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit,
      quality: "failed",
      reasons: ["not determinable: the VE-against-VO2 fit failed"],
    });
  }
  if (!(ratio >= minRatio) || !(h.fStatistic >= minF)) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit,
      quality: "failed",
      reasons: [
        `not determinable: VE/VO2 shows no systematic rise (slope ratio ${ratio.toFixed(2)}, F = ${h.fStatistic.toFixed(1)})`,
      ],
    });
  }
  reasons.push(`VE rises ${ratio.toFixed(2)}× faster against VO2 after the break (F = ${h.fStatistic.toFixed(1)})`);
  const breakS = timeAtLevel(series, series.vo2Trend, h.breakX);
  let confirmations = 0;
  // VE/VCO2 flat after the break (up to the upper limit)
  const after = win.filter(
    (i) => series.timeS[i] >= breakS && Number.isFinite(series.veLMin[i]) && Number.isFinite(series.vco2MlMin[i]),
  );
  if (after.length >= 3) {
    const rise = linearRegression(
      after.map((i) => series.timeS[i] / 60),
      after.map((i) => (1000 * series.veLMin[i]) / series.vco2MlMin[i]),
    ).slope;
    fit.veVco2RisePerMin = rise;
    if (rise <= maxRise) {
      confirmations++;
      reasons.push(`VE/VCO2 stays flat after the break (${rise.toFixed(2)} per min)`);
    } else reasons.push(`VE/VCO2 rises after the break (${rise.toFixed(2)} per min): the break may be the RCP`);
  }
  // PETO2 rise
  const pIdx = win.filter((i) => Number.isFinite(series.peto2MmHg[i]));
  if (pIdx.length >= 2 * m + 1) {
    const p = hingeFit(
      pIdx.map((i) => series.timeS[i]),
      pIdx.map((i) => series.peto2MmHg[i]),
      { minPointsEachSide: m, hingeSign: "positive" },
    );
    fit.peto2BreakS = p.breakX;
    if (p.slopeAbove > 0 && p.slopeAbove > p.slopeBelow && Math.abs(p.breakX - breakS) <= petGap) {
      confirmations++;
      reasons.push(`PETO2 starts rising ${Math.round(p.breakX - breakS)} s from the VE break`);
    } else reasons.push("PETO2 does not confirm the break");
  } else reasons.push("no PETO2 signal to confirm");
  // PETCO2 not falling after the break
  const cIdx = after.filter((i) => Number.isFinite(series.petco2MmHg[i]));
  if (cIdx.length >= 3) {
    const s = linearRegression(
      cIdx.map((i) => series.timeS[i] / 60),
      cIdx.map((i) => series.petco2MmHg[i]),
    ).slope;
    fit.petco2SlopePerMin = s;
    if (s >= -0.5) confirmations++;
    else reasons.push(`PETCO2 falls after the break (${s.toFixed(2)} mmHg/min)`);
  }
  if (confirmations <= 1) quality = "poor";
  else if (confirmations === 2) quality = "fair";
  if (h.fStatistic < 10 && quality === "good") quality = "fair";
  const vo2 = vo2AtTime(series, breakS);
  fit.breakS = breakS;
  return buildMethodEstimate({
    ...base,
    vo2MlMin: Number.isFinite(h.breakX) ? h.breakX : vo2,
    timeS: breakS,
    fit,
    quality,
    reasons,
  });
}
