import { hingeFit } from "../numeric";
import { buildMethodEstimate, seriesWindow, vo2AtTime } from "./consensus";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface RcpVentilatoryEquivalentsOptions {
  /** First time included, s. @default series.span.startS */
  startS?: number;
  /** Fewest bins each side. @default 3 */
  minPointsEachSide?: number;
  /** Least F statistic of a break (our choice). @default 4 */
  minF?: number;
  /** Largest gap between the VE/VCO2 and PETCO2 breaks still counted as agreement, s (our choice). @default 90 */
  agreementS?: number;
}

/**
 * VT2 (respiratory compensation point) from VE/VCO2 turning up after its nadir and PETCO2 starting to fall
 * (common practice, recalled: source `vt-rcp-criteria-recalled`). VE/VCO2 against time is fitted as
 * a + b/VCO2 below the break — the shape a linear VE-VCO2 relation with an intercept gives the ratio — plus a
 * rising hinge above it; PETCO2 against time as a line with a falling hinge. Both breaks found and within 90 s:
 * their mean time; one found: that one with lower quality. VO2 at the threshold from the VO2 trend.
 */
export function rcpVentilatoryEquivalents(
  series: ThresholdSeries,
  options: RcpVentilatoryEquivalentsOptions = {},
): MethodEstimate {
  const startS = options.startS ?? series.span.startS;
  const m = options.minPointsEachSide ?? 3;
  const minF = options.minF ?? 4;
  const agree = options.agreementS ?? 90;
  const win = seriesWindow(series, startS, series.span.endS);
  const window = { startS, endS: series.span.endS };
  const base = {
    id: "vt2-ventilatory-equivalents",
    which: "vt2" as const,
    label: "RCP: VE/VCO2 turns up after its nadir and PETCO2 starts to fall",
    series,
    window,
    sourceIds: ["vt-rcp-criteria-recalled", "beaver-1986-v-slope", "orr-1982-multisegment", "vt-implementation-choice"],
  };
  const reasons: string[] = [];
  const fit: Record<string, number | null> = {
    veVco2BreakS: null,
    veVco2FStatistic: null,
    petco2BreakS: null,
    petco2FStatistic: null,
    petco2SlopeAbovePerMin: null,
  };
  let ratioBreak = NaN;
  let ratioF = NaN;
  const rIdx = win.filter(
    (i) => Number.isFinite(series.veLMin[i]) && Number.isFinite(series.vco2MlMin[i]) && series.vco2MlMin[i] > 0,
  );
  if (rIdx.length >= 2 * m + 1) {
    const h = hingeFit(
      rIdx.map((i) => series.timeS[i]),
      rIdx.map((i) => (1000 * series.veLMin[i]) / series.vco2MlMin[i]),
      { below: "flat", extra: [rIdx.map((i) => 1000 / series.vco2MlMin[i])], minPointsEachSide: m, hingeSign: "positive" },
    );
    fit.veVco2BreakS = h.breakX;
    fit.veVco2FStatistic = h.fStatistic;
    const hinge = h.coefficients[h.coefficients.length - 1];
    if (Number.isFinite(h.breakX) && hinge > 0 && h.fStatistic >= minF) {
      ratioBreak = h.breakX;
      ratioF = h.fStatistic;
      reasons.push(`VE/VCO2 turns up at ${Math.round(h.breakX)} s (F = ${h.fStatistic.toFixed(1)})`);
    } else reasons.push("VE/VCO2 shows no clear upturn");
  } else reasons.push("too few VE and VCO2 bins for VE/VCO2");
  let petBreak = NaN;
  let petF = NaN;
  const cIdx = win.filter((i) => Number.isFinite(series.petco2MmHg[i]));
  if (cIdx.length >= 2 * m + 1) {
    const p = hingeFit(
      cIdx.map((i) => series.timeS[i]),
      cIdx.map((i) => series.petco2MmHg[i]),
      { minPointsEachSide: m, hingeSign: "negative" },
    );
    fit.petco2BreakS = p.breakX;
    fit.petco2FStatistic = p.fStatistic;
    fit.petco2SlopeAbovePerMin = p.slopeAbove * 60;
    if (Number.isFinite(p.breakX) && p.slopeAbove < 0 && p.slopeAbove < p.slopeBelow && p.fStatistic >= minF) {
      petBreak = p.breakX;
      petF = p.fStatistic;
      reasons.push(`PETCO2 starts falling at ${Math.round(p.breakX)} s (F = ${p.fStatistic.toFixed(1)})`);
    } else reasons.push("PETCO2 shows no clear fall");
  } else reasons.push("no PETCO2 signal");
  let timeS = NaN;
  let quality: MethodQuality = "failed";
  if (Number.isFinite(ratioBreak) && Number.isFinite(petBreak)) {
    if (Math.abs(ratioBreak - petBreak) <= agree) {
      timeS = (ratioBreak + petBreak) / 2;
      quality = Math.min(ratioF, petF) >= 10 ? "good" : "fair";
      reasons.push("VE/VCO2 and PETCO2 agree");
    } else {
      timeS = ratioF >= petF ? ratioBreak : petBreak;
      quality = "poor";
      reasons.push(`VE/VCO2 and PETCO2 breaks are ${Math.round(Math.abs(ratioBreak - petBreak))} s apart; the stronger is used`);
    }
  } else if (Number.isFinite(ratioBreak)) {
    timeS = ratioBreak;
    quality = ratioF >= 10 ? "fair" : "poor";
  } else if (Number.isFinite(petBreak)) {
    timeS = petBreak;
    quality = "poor";
  } else {
    reasons.unshift("not determinable: neither VE/VCO2 nor PETCO2 shows the respiratory compensation");
  }
  fit.breakS = Number.isFinite(timeS) ? timeS : null;
  const vo2 = Number.isFinite(timeS) ? vo2AtTime(series, timeS) : null;
  return buildMethodEstimate({ ...base, vo2MlMin: vo2, timeS: Number.isFinite(timeS) ? timeS : null, fit, quality, reasons });
}
