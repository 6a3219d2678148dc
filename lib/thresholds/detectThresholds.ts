import type { BreathRow, NumericField } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { formatClock } from "../units";
import { binByTime, linearRegression, PrefixSums, quantile, robustSd, runningMedian, seededRandom } from "../numeric";
import type { ConditionedTest, SetAsideSpan } from "../signal";
import { BAND_CALIBRATION, calibrateBand } from "./bandCalibration";
import { combineEstimates, timeAtLevel, vo2AtTime, type Consensus } from "./consensus";
import { initialStep } from "./initialStep";
import { stageLengthS } from "./stageLength";
import { modifiedVSlope } from "./modifiedVSlope";
import { rcpVentilatoryEquivalents } from "./rcpVentilatoryEquivalents";
import { rcpVeVco2 } from "./rcpVeVco2";
import type {
  MethodEstimate,
  ThresholdEstimate,
  ThresholdOverride,
  ThresholdResult,
  ThresholdSeries,
  ThresholdWhich,
} from "./thresholdTypes";
import { ventilatoryEquivalents } from "./ventilatoryEquivalents";
import { vSlope } from "./vSlope";
import { jointVt1 } from "./jointVt1";
import { jointVt2 } from "./jointVt2";
import { areTimeAveragedRows, medianRowIntervalS } from "./rowSpacing";
import { breathNoiseCarryOver, CARRY_OVER_WARNING } from "./eov";

export interface ThresholdSeriesOptions {
  /** Time-bin length, s (10–20 s keeps curve shape while damping breath noise; 20 s chosen on the synthetic bank). @default 20 */
  binS?: number;
  /** Lead-in of the ramp left out (VO2 lag, CO2-store transients), s (recalled practice). @default 60 */
  excludeRampStartS?: number;
  /** Set aside breaths beyond ±4 SD of a 9-breath running median of VO2, VCO2 or VE. @default true */
  spikeGuard?: boolean;
  /**
   * Rows of exercise whose median spacing is at least this many seconds are time averages exported by the cart, not
   * single breaths (`AVERAGED_ROW_INTERVAL_S`, rowSpacing.ts), and the spike guard is not applied to them. A 9-row
   * running median then spans 90 s or more: at the end of the ramp it lags the steepening VE and VCO2, and with the
   * little scatter left after averaging those last rows, where the respiratory compensation shows, stood out as
   * "spikes" (synthetic tests, invented data, re-averaged to 10 s: 17 of 48 exercise rows set aside in one test, the
   * last 50 s among them).
   * Single-breath artefacts are diluted by the averaging and gross ones are still set aside by the conditioning's
   * local-deviation rule. @default 6
   */
  averagedRowIntervalS?: number;
}

const BIN_FIELDS = ["vo2MlMin", "vco2MlMin", "veLMin", "peto2MmHg", "petco2MmHg"] as const;

/**
 * Build the binned series the threshold methods read: clean breaths of the incremental phase, spikes set
 * aside (beyond ±4 SD of a 9-breath running median; ±4 SD is the most used convention, source `vt-outlier-4sd`,
 * the robust SD from the median absolute deviation is our choice), then 20-s time-bin means (our choice; bins of
 * 10–20 s keep the shape of the curves while damping breath noise). Null when there is no exercise phase.
 */
export function buildThresholdSeries(test: ConditionedTest, options: ThresholdSeriesOptions = {}): ThresholdSeries | null {
  const binS = options.binS ?? 20;
  const lead = options.excludeRampStartS ?? 60;
  const ex = test.exercise;
  if (!ex || !(ex.endS > ex.startS)) return null;
  const rows = test.clean.filter((r) => r.timeS >= ex.startS && r.timeS <= ex.endS);
  const t = rows.map((r) => r.timeS);
  const cols = BIN_FIELDS.map((f) => rows.map((r) => (typeof r[f] === "number" ? (r[f] as number) : NaN)));
  const skip = new Array<boolean>(rows.length).fill(false);
  let spikes = 0;
  const rowIntervalS = medianRowIntervalS(t);
  const averagedRows = areTimeAveragedRows(t, options.averagedRowIntervalS);
  if ((options.spikeGuard ?? true) && !averagedRows) {
    for (let c = 0; c < 3; c++) {
      const med = runningMedian(cols[c], 4);
      const res = cols[c].map((v, i) => v - med[i]);
      const sd = robustSd(res, 0);
      if (!(sd > 0)) continue;
      for (let i = 0; i < res.length; i++) if (Math.abs(res[i]) > 4 * sd) skip[i] = true;
    }
    spikes = skip.filter(Boolean).length;
  }
  const startS = Math.min(ex.startS + lead, ex.endS);
  const bins = binByTime(t, cols, { startS, endS: ex.endS + 1e-9, binS, skip });
  const keep: number[] = [];
  for (let b = 0; b < bins.counts.length; b++) if (bins.counts[b] > 0 && Number.isFinite(bins.means[0][b])) keep.push(b);
  const pick = (a: Float64Array) => Float64Array.from(keep, (b) => a[b]);
  const timeS = Float64Array.from(keep, (b) => {
    // centre of the bin's breaths is closer to the data than the nominal centre at the last bin
    const c = bins.centerS[b];
    return Math.min(c, ex.endS);
  });
  const vo2 = pick(bins.means[0]);
  const vco2 = pick(bins.means[1]);
  return {
    binS,
    timeS,
    vo2MlMin: vo2,
    vco2MlMin: vco2,
    veLMin: pick(bins.means[2]),
    peto2MmHg: pick(bins.means[3]),
    petco2MmHg: pick(bins.means[4]),
    vo2Trend: localTrend(timeS, vo2, 3),
    vco2Trend: localTrend(timeS, vco2, 3),
    span: { startS, endS: ex.endS },
    spikesRemoved: spikes,
    timeAveragedRowsS: averagedRows ? rowIntervalS : null,
    averaging: averagedRows
      ? `${binS}-s time bins of the clean rows from ramp start + ${lead} s to ramp end; the rows are about ${Math.round(rowIntervalS)}-s time averages, not single breaths, so no breath-level spike screen was applied`
      : `${binS}-s time bins of the clean breaths from ramp start + ${lead} s to ramp end; ${spikes} spike breath(s) beyond ±4 SD of a 9-breath running median set aside`,
  };
}

/** Local linear trend (±half bins) evaluated at each point, O(n) with prefix sums. NaN points are bridged. */
function localTrend(t: Float64Array, v: Float64Array, half: number): Float64Array {
  const xs: number[] = [];
  const ys: number[] = [];
  const at: number[] = [];
  for (let i = 0; i < t.length; i++)
    if (Number.isFinite(v[i])) {
      xs.push(t[i] - t[0]);
      ys.push(v[i]);
      at.push(i);
    }
  const out = new Float64Array(t.length).fill(NaN);
  const ps = new PrefixSums(xs, ys);
  for (let k = 0; k < xs.length; k++) {
    const from = Math.max(0, k - half);
    const to = Math.min(xs.length, k + half + 1);
    const f = ps.fit(from, to);
    out[at[k]] = Number.isFinite(f.slope) ? f.intercept + f.slope * xs[k] : ys[k];
  }
  // fill gaps by carrying neighbours
  for (let i = 1; i < out.length; i++) if (!Number.isFinite(out[i])) out[i] = out[i - 1];
  return out;
}

export interface ValueAtTimeOptions {
  /** Average the breaths within ±windowS/2 instead of interpolating (0 = interpolate). @default 0 */
  windowS?: number;
}

/**
 * A field's value at a time: linear interpolation between the breaths either side that carry the field
 * (common practice), or the mean within a centred window. NaN when the time lies outside the data.
 * Rows must be in time order.
 */
export function valueAtTime(
  rows: readonly BreathRow[],
  field: NumericField,
  timeS: number,
  options: ValueAtTimeOptions = {},
): number {
  const w = options.windowS ?? 0;
  if (!Number.isFinite(timeS) || rows.length === 0) return NaN;
  if (w > 0) {
    let s = 0;
    let n = 0;
    for (const r of rows) {
      const v = r[field];
      if (r.timeS >= timeS - w / 2 && r.timeS <= timeS + w / 2 && typeof v === "number" && Number.isFinite(v)) {
        s += v;
        n++;
      }
    }
    return n > 0 ? s / n : NaN;
  }
  let lo = 0;
  let hi = rows.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (rows[mid].timeS <= timeS) lo = mid;
    else hi = mid;
  }
  let a = -1;
  for (let i = lo; i >= 0; i--)
    if (rows[i].timeS <= timeS && Number.isFinite(rows[i][field] as number)) {
      a = i;
      break;
    }
  let b = -1;
  for (let i = Math.max(0, lo); i < rows.length; i++)
    if (rows[i].timeS >= timeS && Number.isFinite(rows[i][field] as number)) {
      b = i;
      break;
    }
  if (a < 0 || b < 0) return NaN;
  const va = rows[a][field] as number;
  const vb = rows[b][field] as number;
  if (rows[b].timeS === rows[a].timeS) return vb;
  return va + ((timeS - rows[a].timeS) / (rows[b].timeS - rows[a].timeS)) * (vb - va);
}

export interface DetectThresholdsOptions {
  overrides?: ThresholdOverride[];
  /** Block-bootstrap resamples for the band (0 = none). @default 30 */
  bootstrap?: number;
  /** Seed of the resampling. @default 1 */
  seed?: number;
  series?: ThresholdSeriesOptions;
  /** Agreement tolerance between methods, fraction of VO2 (our choice). @default 0.1 */
  agreementFraction?: number;
  /**
   * VT1: report the median of the resampled consensus values (bagging) instead of the single-pass value when at
   * least half the resamples gave one (our choice: steadier under breath noise on the synthetic banks). VT2
   * always keeps the single-pass value (the resampled median was biased early there). @default true
   */
  bootstrapMedian?: boolean;
  /**
   * Widen the band to its calibration (`BAND_CALIBRATION`, `bandCalibration.ts`): the raw band held the truth in about
   * half to two thirds of invented tests. false = the raw band (the calibration script reads it). @default true
   */
  calibrateBand?: boolean;
  /**
   * The VT1 methods read data up to the VT2 estimate plus this margin, s (our choice: about one localisation width
   * of a single-signal break, ±2 bins of 20 s). An RCP estimate that is early by a bin or two otherwise cuts the
   * segment above VT1 short, and every VT1 fit then drifts early; the few compensation bins let in bend VE and
   * PETO2 far less. 0 = stop at VT2 (Beaver 1986, recalled detail). @default 40
   */
  vt1BeyondVt2S?: number;
  /**
   * Least span of data above the first-pass VT1, s: when VT1 lies closer than this to the end of its window (VT2 +
   * `vt1BeyondVt2S`), the VT1 methods are refitted once with the window reaching VT1 + this span (our choice: the
   * joint profile needs 5 bins above a break, plus one bin; 120 s with 20-s bins). An early VT2 otherwise truncates
   * the segment above a VT1 that lies close to it, and the single-signal fits fail. 0 = no refit. @default 120
   */
  vt1MinSpanAboveS?: number;
  /**
   * Pull the end of the VT1 window back, one bin at a time and never below VT2 − 60 s, while VE/VCO2 over the last
   * four bins before it is already rising (more than 1 % per minute, slope ≥ 2 standard errors). The RCP is where
   * VE/VCO2 starts to rise (source `vt-rcp-criteria-recalled`); when the compensation starts before the RCP's
   * two-line break, the 40-s margin above VT2 would otherwise give VE and PETO2 a second upward bend and pull their
   * VT1 hinge late. Rise, window and test: our choice (README-thresholds.md, round 7: moderate-noise VT1 P90 over six
   * synthetic banks 10.93 → 10.77 %, low 8.13 → 7.75 %, high 15.13 → 15.11 %). @default true
   */
  vt1StopAtVeVco2Rise?: boolean;
  /**
   * Do not report a VT2 that rests on one method ("low" confidence) and lies at or below a VT1 that two methods
   * support: the RCP follows the AT (Wasserman et al., Principles of Exercise Testing and Interpretation — recalled;
   * common practice). VT2 is then "not determinable" with the candidate named in its reason. @default true
   */
  dropLowVt2BelowVt1?: boolean;
  /**
   * Do not report an RCP candidate that respiratory compensation does not follow: past the RCP, VE/VCO2 rises and
   * PETCO2 falls until the end of exercise (RCP definition, clinical reference §5.4 — recalled; Whipp, Davis & Wasserman
   * 1989, Respir Physiol — recalled, not seen). When, from the 20-s bins within ±30 s of the candidate to those of the
   * last 30 s of exercise, PETCO2 falls by less than 0.5 mmHg and VE/VCO2 does not rise by 2 % or more while PETCO2
   * falls at all (`compensationFollows`), VT2 is "not determinable" with that reason (issue
   * `vt2-compensation-not-sustained`). The candidate still bounds the data the VT1 methods read, so VT1 does not move.
   * The rule and cut-offs are our choice, set on synthetic tests (invented data; README-thresholds rounds 14–15): on one
   * moderate 240-test bank of each of six models, RCPs reported on the 204 tests without one fell from 49 to 13
   * ("moderate" or "high" 12 to 1), and 11 of 1 202 calls on tests with an RCP were dropped, 9 of them more than 5 % off.
   * Needs PETCO2; without it nothing is dropped.
   * @default true
   */
  dropUnsustainedVt2?: boolean;
  /**
   * Warn when exercise starts with a step this many times larger than the ramp's own rise over the first 75 s
   * (`initialStep`), and mark a VT1 within 3 minutes of it low confidence. 3 is our choice: ≤ 2.0 in 99 % of the
   * main and variant synthetic tests (ramps after unloaded pedalling), 5–10 on treadmill protocols that jump from
   * walking to running (hold-out model). @default 3
   */
  largeInitialStepRatio?: number;
}

/**
 * End of the VT1 window pulled back while VE/VCO2 over the last `bins` bins before it rises by more than
 * `minRisePctPerMin` with a slope of at least `minT` standard errors; never earlier than `floorS` (our choice, see
 * `DetectThresholdsOptions.vt1StopAtVeVco2Rise`).
 */
export function stopBeforeVeVco2Rise(
  series: ThresholdSeries,
  endS: number,
  floorS: number,
  bins = 4,
  minRisePctPerMin = 1,
  minT = 2,
): number {
  let end = endS;
  for (let guard = 0; guard < 12 && end - series.binS >= floorS; guard++) {
    const x: number[] = [];
    const y: number[] = [];
    for (let i = series.timeS.length - 1; i >= 0 && x.length < bins; i--)
      if (series.timeS[i] <= end && Number.isFinite(series.veLMin[i]) && series.vco2MlMin[i] > 0) {
        x.push(series.timeS[i] / 60);
        y.push((1000 * series.veLMin[i]) / series.vco2MlMin[i]);
      }
    if (x.length < bins) break;
    const fit = linearRegression(x, y);
    const mx = x.reduce((a, b) => a + b, 0) / fit.n;
    const sxx = x.reduce((a, b) => a + (b - mx) ** 2, 0);
    const slopeSe = Math.sqrt(fit.sse / Math.max(1, fit.n - 2) / sxx);
    const meanRatio = fit.intercept + fit.slope * mx;
    if ((100 * fit.slope) / meanRatio > minRisePctPerMin && fit.slope >= minT * slopeSe) end -= series.binS;
    else break;
  }
  return end;
}

const VT1_PREFERENCE = ["vt1-joint-profile", "vt1-v-slope", "vt1-ventilatory-equivalents", "vt1-modified-v-slope"];
/**
 * Weights of the VT1 pooled value (weighted median): the joint profile counts double, triple when its own verdict
 * is "good" (likelihood ratio, signals bending and a narrow profile) — our choice, chosen on the main synthetic bank
 * and checked on the variant model (moderate noise median 5.1 → 4.8 % main, 4.3 → 3.7 % variant; no level worse by
 * more than 0.3 points).
 */
const VT1_WEIGHTS: Record<string, number> = { "vt1-joint-profile": 2, "vt1-joint-profile:good": 3 };
const VT2_PREFERENCE = ["vt2-joint-profile", "vt2-ve-vco2-break", "vt2-ventilatory-equivalents"];
/**
 * Weights of the VT2 pooled value (weighted median): the joint profile's value whenever it is usable and not "poor";
 * a "poor" joint profile (weight halved) and the VE-against-VCO2 break weigh alike, so their mean; the break alone when
 * the joint profile fails. The VE/VCO2-with-PETCO2 method shares the PETCO2 signal with the joint profile, so it counts
 * for agreement and confidence only. Our choice (round 13, README-thresholds): with its exponential departure the joint
 * profile is on time on onset models where the two-line break is 2.5–4.9 % late noise-free; moderate-noise VT2 median
 * hold-out 4.74 → 4.22 %, audit 2.37 → 1.82 %, cross-check 3.86 → 3.32 %, second-opinion 2.06 → 1.75 %, at a cost of
 * 2.77 → 2.88 % on the six main/variant banks.
 */
const VT2_WEIGHTS: Record<string, number> = { "vt2-joint-profile": 2, "vt2-ve-vco2-break": 1, "vt2-ventilatory-equivalents": 0 };

interface Core {
  methods: MethodEstimate[];
  vt1: Consensus;
  vt2: Consensus;
  vt1TimeS: number | null;
  vt2TimeS: number | null;
}

/** How the VT1 window follows VT2 (see the options of the same names in `DetectThresholdsOptions`). */
interface Vt1WindowRules {
  vt1BeyondVt2S: number;
  vt1MinSpanAboveS: number;
  vt1StopAtVeVco2Rise: boolean;
}

/** Smallest VE/VCO2 rise (fraction) and PETCO2 fall (mmHg) from an RCP candidate to the end that count as compensation. */
const SUSTAINED_RATIO_RISE = 0.02;
const SUSTAINED_PETCO2_FALL_MMHG = 0.5;

/**
 * Respiratory compensation follows an RCP candidate when PETCO2 falls clearly (≥ 0.5 mmHg) to the end of exercise, or
 * when VE/VCO2 rises clearly (≥ 2 %) while PETCO2 falls at all: both signs point the same way and one of them clearly
 * (our rule, README-thresholds rounds 14–15; round 14 took either sign alone, and a VE/VCO2 rise with PETCO2 flat or
 * rising let 17 of 22 false RCPs through on six synthetic models).
 */
export function compensationFollows(ratioRise: number, petco2FallMmHg: number): boolean {
  return petco2FallMmHg >= SUSTAINED_PETCO2_FALL_MMHG || (ratioRise >= SUSTAINED_RATIO_RISE && petco2FallMmHg > 0);
}

/**
 * VE/VCO2 (ratio of bin-mean sums) and PETCO2 (mean of bin means) around an RCP candidate (bins within ±30 s) and over
 * the last 30 s of the series: how much the ratio rose (fraction) and PETCO2 fell (mmHg) from one to the other. Null
 * when either window holds no bin with the signals.
 */
export function compensationAfter(
  series: ThresholdSeries,
  timeS: number,
): { ratioRise: number; petco2FallMmHg: number | null } | null {
  const end = series.span.endS;
  const window = (a: number, b: number) => {
    let ve = 0;
    let vco2 = 0;
    let pet = 0;
    let nPet = 0;
    for (let i = 0; i < series.timeS.length; i++) {
      const t = series.timeS[i];
      if (t < a || t > b) continue;
      if (Number.isFinite(series.veLMin[i]) && Number.isFinite(series.vco2MlMin[i])) {
        ve += series.veLMin[i];
        vco2 += series.vco2MlMin[i];
      }
      if (Number.isFinite(series.petco2MmHg[i])) {
        pet += series.petco2MmHg[i];
        nPet++;
      }
    }
    return { ratio: vco2 > 0 ? ve / vco2 : NaN, pet: nPet > 0 ? pet / nPet : NaN };
  };
  const at = window(timeS - 30, timeS + 30);
  const last = window(end - 30, end);
  if (!Number.isFinite(at.ratio) || !Number.isFinite(last.ratio)) return null;
  const fall = at.pet - last.pet;
  return { ratioRise: last.ratio / at.ratio - 1, petco2FallMmHg: Number.isFinite(fall) ? fall : null };
}

/**
 * End of the data the VT1 methods read: VT2 + `vt1BeyondVt2S`, pulled back while VE/VCO2 already rises (never below
 * VT2 − 60 s); a low-confidence VT2 only trims to max(VT2, end − 60 s); no VT2 → the whole span.
 */
function vt1WindowEnd(
  series: ThresholdSeries,
  vt2TimeS: number | null,
  vt2Confidence: Consensus["confidence"],
  rules: Vt1WindowRules,
): number {
  if (vt2TimeS === null) return series.span.endS;
  if (vt2Confidence === "low") return Math.max(vt2TimeS, series.span.endS - 60);
  const end = vt2TimeS + rules.vt1BeyondVt2S;
  return rules.vt1StopAtVeVco2Rise ? stopBeforeVeVco2Rise(series, end, vt2TimeS - 60) : end;
}

function runMethods(series: ThresholdSeries, agreementFraction: number, rules: Vt1WindowRules): Core {
  const { vt1MinSpanAboveS } = rules;
  const vt2Methods = [rcpVeVco2(series), rcpVentilatoryEquivalents(series), jointVt2(series)];
  const vt2 = combineEstimates(vt2Methods, { agreementFraction, preference: VT2_PREFERENCE, weights: VT2_WEIGHTS });
  const vt2TimeS = vt2.vo2MlMin === null ? null : timeAtLevel(series, series.vo2Trend, vt2.vo2MlMin);
  const upper = vt1WindowEnd(series, vt2TimeS, vt2.confidence, rules);
  const runVt1 = (endS: number) => {
    const ms = [
      vSlope(series, { endS }),
      modifiedVSlope(series, { endS }),
      ventilatoryEquivalents(series, { endS }),
      jointVt1(series, { endS }),
    ];
    return { ms, c: combineEstimates(ms, { agreementFraction, preference: VT1_PREFERENCE, weights: VT1_WEIGHTS }) };
  };
  // An early VT2 (or a VT1 close to VT2) leaves the segment above VT1 too short to fit; when the first-pass VT1 lies
  // within `vt1MinSpanAboveS` of the window's end, refit once with the window reaching VT1 + that span.
  let pass = runVt1(upper);
  let vt1TimeS: number | null = pass.c.vo2MlMin === null ? null : timeAtLevel(series, series.vo2Trend, pass.c.vo2MlMin);
  if (vt1MinSpanAboveS > 0 && vt2TimeS !== null && vt1TimeS !== null && vt1TimeS + vt1MinSpanAboveS > upper) {
    pass = runVt1(Math.min(series.span.endS, vt1TimeS + vt1MinSpanAboveS));
    vt1TimeS = pass.c.vo2MlMin === null ? null : timeAtLevel(series, series.vo2Trend, pass.c.vo2MlMin);
  }
  // An RCP candidate early in the ramp can leave too few bins below it for any VT1 method. Rather than report no VT1,
  // read VT1 over the whole exercise once, with low confidence at most: the RCP follows the AT (common practice), so a
  // VT1 found at or above that VT2 puts both in doubt (warning `vt1-not-below-vt2`) instead of hiding the AT.
  if (pass.c.vo2MlMin === null && vt2TimeS !== null && upper < series.span.endS) {
    const whole = runVt1(series.span.endS);
    if (whole.c.vo2MlMin !== null) {
      pass = {
        ms: whole.ms,
        c: {
          ...whole.c,
          confidence: "low",
          reason: `read over the whole exercise: the data below the RCP candidate (${Math.round(vt2.vo2MlMin as number)} mL/min) were too short for any VT1 method`,
        },
      };
      vt1TimeS = timeAtLevel(series, series.vo2Trend, whole.c.vo2MlMin);
    }
  }
  const { ms: vt1Methods, c: vt1 } = pass;
  return { methods: [...vt1Methods, ...vt2Methods], vt1, vt2, vt1TimeS, vt2TimeS };
}

/** Residual block bootstrap of the binned series (blocks of 4 bins, residuals from a 5-bin centred mean). */
function bootstrapSeries(
  series: ThresholdSeries,
  replicates: number,
  seed: number,
  agreementFraction: number,
  rules: Vt1WindowRules,
): { vt1: (number | null)[]; vt2: (number | null)[] } {
  const rng = seededRandom(seed);
  const n = series.timeS.length;
  const fields = ["vo2MlMin", "vco2MlMin", "veLMin", "peto2MmHg", "petco2MmHg"] as const;
  const smooth = fields.map((f) => centredMean(series[f], 2));
  const resid = fields.map((f, c) => series[f].map((v, i) => v - smooth[c][i]));
  const block = 4;
  const out = { vt1: [] as (number | null)[], vt2: [] as (number | null)[] };
  for (let r = 0; r < replicates; r++) {
    const order = new Int32Array(n);
    for (let i = 0; i < n; i += block) {
      const start = rng.int(Math.max(1, n - block + 1));
      for (let k = 0; k < block && i + k < n; k++) order[i + k] = start + k;
    }
    const s: ThresholdSeries = { ...series };
    fields.forEach((f, c) => {
      s[f] = Float64Array.from(smooth[c], (v, i) => v + resid[c][order[i]]);
    });
    const core = runMethods(s, agreementFraction, rules);
    out.vt1.push(core.vt1.vo2MlMin);
    out.vt2.push(core.vt2.vo2MlMin);
  }
  return out;
}

function centredMean(v: Float64Array, half: number): Float64Array {
  const out = new Float64Array(v.length);
  for (let i = 0; i < v.length; i++) {
    let s = 0;
    let n = 0;
    for (let k = Math.max(0, i - half); k <= Math.min(v.length - 1, i + half); k++)
      if (Number.isFinite(v[k])) {
        s += v[k];
        n++;
      }
    out[i] = n > 0 ? s / n : NaN;
  }
  return out;
}

/**
 * Detect VT1 and VT2 (RCP) by several methods and combine them (method ids `vt1-v-slope`,
 * `vt1-modified-v-slope`, `vt1-ventilatory-equivalents`, `vt1-joint-profile`, `vt2-ve-vco2-break`,
 * `vt2-ventilatory-equivalents`, `vt2-joint-profile`;
 * see README-thresholds.md). Each method reports its estimate, data span, fit and a quality verdict; the
 * consensus needs two agreeing methods for "moderate"/"high" confidence (recalled practice), and the band joins
 * the agreeing methods' spread with a block-bootstrap 10th–90th percentile interval. Reviewer overrides
 * replace the consensus (see `applyThresholdOverrides`). Work rate, HR and speed are read at the threshold time.
 * Deterministic for given inputs and seed. VO2 in mL/min; times in s.
 */
export function detectThresholds(test: ConditionedTest, options: DetectThresholdsOptions = {}): ThresholdResult {
  const issues: Issue[] = [];
  const series = buildThresholdSeries(test, options.series);
  const agreementFraction = options.agreementFraction ?? 0.1;
  // a recording without VCO2 (a VO2-only export, stage tables of VO2 and lactate): say that, not "0 bins"; without VE
  // alone, the V-slope methods still run (`thresholds-missing-signal`)
  const noVco2 = !test.clean.some((r) => r.vco2MlMin !== undefined);
  if (!series || series.timeS.length < 9 || noVco2) {
    const perKgOnly = !test.clean.some((r) => r.vo2MlMin !== undefined) && test.clean.some((r) => r.vo2MlKgMin !== undefined);
    const noVe = !test.clean.some((r) => r.veLMin !== undefined);
    const reason = !series
      ? "no incremental exercise phase was found"
      : noVco2
        ? `the recording has no VCO2${noVe ? " and no VE" : ""}; every ventilatory-threshold method needs VCO2 beside VO2`
        : perKgOnly
          ? "VO2 is given per kg and the body mass is not known (VO2 in mL/min is needed beside VCO2); enter the weight"
          : `only ${series.timeS.length} time bins of exercise data`;
    issues.push(makeIssue("warning", "thresholds-no-exercise-data", `Ventilatory thresholds cannot be determined: ${reason}.`));
    const empty = (which: ThresholdWhich) => emptyEstimate(which, reason);
    return applyThresholdOverrides(
      test,
      {
        vt1: empty("vt1"),
        vt2: empty("vt2"),
        methods: [],
        issues,
        series: {
          binS: options.series?.binS ?? 20,
          span: null,
          averaging: series?.averaging ?? "none",
          bins: series?.timeS.length ?? 0,
        },
      },
      options.overrides ?? [],
    );
  }
  if (series.timeAveragedRowsS !== null)
    issues.push(
      makeIssue(
        "info",
        "thresholds-time-averaged-rows",
        `The exercise rows are about ${Math.round(series.timeAveragedRowsS)} s apart: time averages exported by the cart, not single breaths. The thresholds are read from them as they are; no breath-level spike screen was applied. A breath-by-breath export gives the methods more to work with.`,
      ),
    );
  for (const f of ["vco2MlMin", "veLMin"] as const) {
    if (!series[f].some(Number.isFinite))
      issues.push(
        makeIssue(
          "warning",
          "thresholds-missing-signal",
          f === "vco2MlMin"
            ? "No VCO2 data in the exercise phase: the gas-exchange thresholds need it."
            : "No VE data in the exercise phase: only the V-slope methods (VCO2 against VO2) can place VT1, and VT2 (read from ventilation) cannot be found.",
          { field: f },
        ),
      );
  }
  const rules: Vt1WindowRules = {
    vt1BeyondVt2S: options.vt1BeyondVt2S ?? 40,
    vt1MinSpanAboveS: options.vt1MinSpanAboveS ?? 120,
    vt1StopAtVeVco2Rise: options.vt1StopAtVeVco2Rise ?? true,
  };
  const core = runMethods(series, agreementFraction, rules);
  const reps = Math.max(0, Math.floor(options.bootstrap ?? 30));
  const boot = reps > 0 ? bootstrapSeries(series, reps, options.seed ?? 1, agreementFraction, rules) : null;
  const bag = options.bootstrapMedian ?? true;
  const cal = options.calibrateBand ?? true;
  const vt1 = toEstimate("vt1", core.vt1, core.vt1TimeS, series, test, boot?.vt1 ?? null, bag, cal);
  // VT2 keeps the single-pass value: resampling around a 5-bin smoothed series rounds the compensation corner
  // near the end of the record and pulled the resampled median early (about −2 % on both synthetic models)
  let vt2 = toEstimate("vt2", core.vt2, core.vt2TimeS, series, test, boot?.vt2 ?? null, false, cal);
  // past the RCP PETCO2 falls and VE/VCO2 rises to the end of exercise: a candidate not followed by both signs, one of
  // them clearly, is not reported (it still bounded the data the VT1 methods read, as any RCP candidate does)
  const after =
    (options.dropUnsustainedVt2 ?? true) && vt2.vo2MlMin.value !== null && core.vt2TimeS !== null
      ? compensationAfter(series, core.vt2TimeS)
      : null;
  if (
    after &&
    vt2.vo2MlMin.value !== null &&
    after.petco2FallMmHg !== null &&
    !compensationFollows(after.ratioRise, after.petco2FallMmHg)
  ) {
    const at = Math.round(vt2.vo2MlMin.value);
    vt2 = emptyEstimate(
      "vt2",
      `no respiratory compensation follows the RCP candidate (${at} mL/min): from there to the last 30 s of exercise PETCO2 changes by ${signed(-after.petco2FallMmHg)} mmHg and VE/VCO2 by ${signed(100 * after.ratioRise)} %, while past an RCP PETCO2 falls (here by ${SUSTAINED_PETCO2_FALL_MMHG} mmHg or more, or at all with VE/VCO2 rising by ${100 * SUSTAINED_RATIO_RISE} % or more)`,
    );
    issues.push(
      makeIssue(
        "info",
        "vt2-compensation-not-sustained",
        `An RCP candidate at ${at} mL/min is not reported: PETCO2 does not fall clearly from there to the end of exercise, nor VE/VCO2 rise while PETCO2 falls, as past a respiratory compensation point. Set VT2 by review if the test shows one.`,
      ),
    );
  }
  if (
    (options.dropLowVt2BelowVt1 ?? true) &&
    vt1.vo2MlMin.value !== null &&
    vt2.vo2MlMin.value !== null &&
    core.vt2.confidence === "low" &&
    vt1.confidence !== "low" &&
    vt2.vo2MlMin.value <= vt1.vo2MlMin.value
  ) {
    // an RCP follows the AT: a lone, low-confidence RCP candidate at or below a supported VT1 is not an RCP
    const at = Math.round(vt2.vo2MlMin.value);
    vt2 = emptyEstimate(
      "vt2",
      `the only RCP candidate (${at} mL/min, one method) lies at or below VT1 (${Math.round(vt1.vo2MlMin.value)} mL/min); the respiratory compensation point follows the anaerobic threshold`,
    );
    issues.push(
      makeIssue(
        "info",
        "vt2-candidate-below-vt1",
        `An RCP candidate at ${at} mL/min rested on one method and lay at or below VT1; it is not reported. Set VT2 by review if the test shows one.`,
      ),
    );
  }
  issues.push(...protocolCautions(test, vt1, vt2, options.largeInitialStepRatio ?? 3));
  issues.push(...smoothedRowsCaution(test, series, vt1, vt2));
  if (vt1.vo2MlMin.value !== null && vt2.vo2MlMin.value !== null && vt1.vo2MlMin.value < vt2.vo2MlMin.value)
    clipBandsToOrder(series, vt1, vt2);
  if (vt1.vo2MlMin.value !== null && vt2.vo2MlMin.value !== null && vt1.vo2MlMin.value >= vt2.vo2MlMin.value) {
    issues.push(makeIssue("warning", "vt1-not-below-vt2", "VT1 does not lie below VT2; review both thresholds."));
    vt1.confidence = "low";
    vt2.confidence = "low";
    addReason(vt1, "VT1 does not lie below VT2");
    addReason(vt2, "VT2 does not lie above VT1");
  }
  for (const e of [vt1, vt2]) {
    const name = e.which === "vt1" ? "VT1 (anaerobic threshold)" : "VT2 (respiratory compensation point)";
    if (e.confidence === "not-determinable")
      issues.push(
        makeIssue(
          "info",
          `${e.which}-not-determinable`,
          `${name} could not be determined: ${e.reason ?? "no method succeeded"}.`,
        ),
      );
    else if (e.confidence === "low")
      issues.push(
        makeIssue(
          "warning",
          `${e.which}-low-confidence`,
          `${name} is uncertain (${(e.reason && withoutReviewAdvice(e.reason)) || "methods disagree"}); confirm or set it by review.`,
          { timeS: e.timeS ?? undefined },
        ),
      );
  }
  const result: ThresholdResult = {
    vt1,
    vt2,
    methods: core.methods,
    issues,
    series: { binS: series.binS, span: series.span, averaging: series.averaging, bins: series.timeS.length },
  };
  const final = applyThresholdOverrides(test, result, options.overrides ?? [], series);
  final.issues.push(...besideSetAside(final, test.settings?.setAside ?? []));
  return final;
}

/**
 * How near a span of breaths set aside by review an automatic threshold may lie before it is said, s (our choice: three
 * 20-s bins, about the reach of the corner each method fits).
 */
export const THRESHOLD_BESIDE_SPAN_S = 60;

/**
 * An automatic threshold placed inside or within `THRESHOLD_BESIDE_SPAN_S` of a span of gas values set aside by review:
 * its corner was fitted across the gap, so it is said (a warning per threshold) for the reviewer to check on the charts.
 * A reviewer's own threshold is not flagged; heart-rate spans leave the gas values, and so the thresholds, as they were.
 */
function besideSetAside(result: ThresholdResult, spans: readonly SetAsideSpan[]): Issue[] {
  const gas = spans.filter((s) => s.channel !== "heart-rate");
  const out: Issue[] = [];
  for (const e of [result.vt1, result.vt2]) {
    if (e.overridden || e.timeS === null || e.vo2MlMin.value === null) continue;
    const t = e.timeS;
    const near = gas.find((s) => t >= s.startS - THRESHOLD_BESIDE_SPAN_S && t <= s.endS + THRESHOLD_BESIDE_SPAN_S);
    if (!near) continue;
    const name = e.which === "vt1" ? "VT1" : "VT2";
    const where = t >= near.startS && t <= near.endS ? "inside" : "next to";
    out.push(
      makeIssue(
        "warning",
        `${e.which}-beside-set-aside`,
        `${name} (${formatClock(t)}) lies ${where} breaths set aside by review (${formatClock(near.startS)}–${formatClock(near.endS)}: ${near.reason}): its turning point was fitted across the gap. Check it on the charts, and set it by review if the breaths either side do not show it.`,
        { field: e.which, timeS: t },
      ),
    );
  }
  return out;
}

/** A reason without its advice to review ("…; confirm by review"): for messages that give that advice themselves. */
function withoutReviewAdvice(reason: string): string {
  return reason.replace(/;?\s*(confirm|set)\b[^;]*\bby review\b/gi, "").trim();
}

/** A change with its sign, one decimal ("+1.2", "−0.4"). */
function signed(x: number): string {
  return `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(1)}`;
}

/** Append a reason to an estimate's reason list. */
function addReason(e: ThresholdEstimate, why: string): void {
  e.reason = e.reason ? `${e.reason}; ${why}` : why;
}

/** Issue code of the cap on confidence for rows exported averaged or smoothed. */
export const SMOOTHED_ROWS_CODE = "thresholds-smoothed-rows";

/**
 * Rows exported as time averages, or breaths exported smoothed (their departures from a 9-breath running median of VE
 * carry over with a lag-1 correlation above `CARRY_OVER_WARNING`, as a rolling mean makes them): at most moderate
 * confidence, in place, with a note. The methods' agreement and the resampling read the breath noise such an export has
 * averaged away, so they look surer than the data are (an invented pre-operative case exported as a 5-breath rolling
 * mean read "high" with a band that missed the value built into it; README-thresholds.md round 20). Averaging hides
 * information, it adds none (common practice).
 */
function smoothedRowsCaution(
  test: ConditionedTest,
  series: ThresholdSeries,
  vt1: ThresholdEstimate,
  vt2: ThresholdEstimate,
): Issue[] {
  const span = series.span;
  const rows = test.clean.filter((r) => r.timeS >= span.startS && r.timeS <= span.endS && typeof r.veLMin === "number");
  const carry =
    series.timeAveragedRowsS === null
      ? breathNoiseCarryOver(
          rows.map((r) => r.timeS),
          rows.map((r) => r.veLMin as number),
        )
      : NaN;
  const why =
    series.timeAveragedRowsS !== null
      ? `the rows are about ${Math.round(series.timeAveragedRowsS)}-s time averages`
      : carry > CARRY_OVER_WARNING
        ? `the breaths look exported smoothed (breath-to-breath noise carries over: lag-1 correlation ${carry.toFixed(2)})`
        : null;
  if (!why) return [];
  const capped = [vt1, vt2].filter((e) => e.confidence === "high");
  for (const e of capped) {
    e.confidence = "moderate";
    addReason(e, `at most moderate: ${why}`);
  }
  return [
    makeIssue(
      "info",
      SMOOTHED_ROWS_CODE,
      `${why[0].toUpperCase()}${why.slice(1)}: the methods' agreement and the resampling read less breath noise than the test had, so threshold confidence is at most moderate${capped.length ? ` (${capped.map((e) => e.which.toUpperCase()).join(" and ")} lowered from high)` : ""}. A breath-by-breath export without smoothing gives the methods more to work with.`,
    ),
  ];
}

/**
 * The respiratory compensation point follows the anaerobic threshold (common practice): VT2's band does not reach below
 * the VT1 value, nor VT1's above the VT2 value (a band from the methods' spread once reached resting VO2 for VT2 when a
 * poor method placed it below VT1; invented pre-operative demo, README-thresholds.md round 20). In place.
 */
function clipBandsToOrder(series: ThresholdSeries, vt1: ThresholdEstimate, vt2: ThresholdEstimate): void {
  const v1 = vt1.vo2MlMin.value as number;
  const v2 = vt2.vo2MlMin.value as number;
  // the band's times move with its ends (`bandTimes`: when the VO2 trend reached them)
  const at = (level: number) => timeAtLevel(series, series.vo2Trend, level);
  if (vt2.band && vt2.band.lowMlMin < v1) {
    vt2.band = { ...vt2.band, lowMlMin: v1 };
    if (vt2.bandTimes && vt2.timeS !== null) vt2.bandTimes = { ...vt2.bandTimes, lowS: Math.min(vt2.timeS, at(v1)) };
    addReason(vt2, `band cut at VT1 (${Math.round(v1)} mL/min): the RCP lies above the AT`);
  }
  if (vt1.band && vt1.band.highMlMin > v2) {
    vt1.band = { ...vt1.band, highMlMin: v2 };
    if (vt1.bandTimes && vt1.timeS !== null) vt1.bandTimes = { ...vt1.bandTimes, highS: Math.max(vt1.timeS, at(v2)) };
    addReason(vt1, `band cut at VT2 (${Math.round(v2)} mL/min): the AT lies below the RCP`);
  }
}

/**
 * Protocol shapes that limit breath-by-breath thresholds, as issues; lowers the estimates' confidence in place.
 * - A large step at the start of exercise (`initialStep` ratio above `stepLimit`): the CO2 stores fill for minutes
 *   after it, so a VT1 within the first 180 s of exercise is marked low (180 s: our choice, about three CO2-store time
 *   constants).
 * - A stepped protocol (`stageLengthS`): a note; with stages of 90 s or more (our choice: VO2 levels off within such
 *   stages, README-thresholds.md round 8) a warning and at most moderate confidence. Ramp or 1-min-increment protocols
 *   are the recommended ones for gas-exchange thresholds (ATS/ACCP 2003 statement — recalled; ERS statement, Radtke et
 *   al. 2019 — confirmed, protocol recommendations).
 */
function protocolCautions(test: ConditionedTest, vt1: ThresholdEstimate, vt2: ThresholdEstimate, stepLimit: number): Issue[] {
  const issues: Issue[] = [];
  const step = initialStep(test);
  if (step && step.ratio > stepLimit && test.exercise) {
    const early = vt1.timeS !== null && vt1.timeS - test.exercise.startS < 180;
    issues.push(
      makeIssue(
        "warning",
        "thresholds-large-initial-step",
        `Exercise starts with a large step: VO2 rose ${Math.round(step.jumpMlMin)} mL/min over the first 75 s, ${step.ratio.toFixed(1)} times what the ramp adds in that time (from rest, no unloaded phase, or a jump in load). The CO2 stores fill for minutes after such a step, so gas-exchange thresholds in the first 3 minutes cannot be read reliably${early ? "; VT1 lies there and is marked low confidence" : ""}.`,
        { timeS: test.exercise.startS },
      ),
    );
    if (early && vt1.confidence !== "not-determinable") {
      vt1.confidence = "low";
      addReason(vt1, "within 3 minutes of a large step at the start of exercise");
    }
  }
  const stageS = stageLengthS(test);
  if (stageS !== null) {
    const long = stageS >= 90;
    issues.push(
      makeIssue(
        long ? "warning" : "info",
        "thresholds-stepped-protocol",
        `The load rises in stages of about ${Math.round(stageS)} s, not as a ramp. Gas exchange lags every step${long ? " and levels off within each stage" : ""}, so breath-by-breath thresholds are less precise than on a ramp${long ? " and tend to read late; VT1 and VT2 are given at most moderate confidence" : ""}. Ramp protocols are preferred for gas-exchange thresholds.`,
      ),
    );
    if (long)
      for (const e of [vt1, vt2])
        if (e.confidence === "high") {
          e.confidence = "moderate";
          addReason(e, `stages of ${Math.round(stageS)} s`);
        }
  }
  return issues;
}

function emptyEstimate(which: ThresholdWhich, reason: string): ThresholdEstimate {
  const prov: Provenance = {
    method: `${which}-consensus`,
    label: "consensus of ventilatory-threshold methods",
    sourceIds: ["vt-two-methods-agree-recalled"],
  };
  const nd = (unit: string) => notDetermined(unit, prov, reason);
  return {
    which,
    timeS: null,
    vo2MlMin: nd("mL/min"),
    workW: nd("W"),
    hrBpm: nd("1/min"),
    speedKmh: nd("km/h"),
    confidence: "not-determinable",
    band: null,
    methodIds: [],
    reason,
    bootstrap: null,
  };
}

function readAt(
  test: ConditionedTest,
  field: NumericField,
  unit: string,
  timeS: number | null,
  windowS: number,
  label: string,
): Measured {
  const prov: Provenance = {
    method: "value-at-threshold-time",
    label,
    sourceIds: ["vt-implementation-choice"],
    ...(timeS !== null ? { window: { startS: timeS - windowS / 2, endS: timeS + windowS / 2 } } : {}),
  };
  if (timeS === null) return notDetermined(unit, prov, "no threshold time");
  const v = valueAtTime(test.clean, field, timeS, { windowS });
  return Number.isFinite(v) ? measured(v, unit, prov) : notDetermined(unit, prov, `no ${field} data at the threshold time`);
}

function toEstimate(
  which: ThresholdWhich,
  c: Consensus,
  timeS: number | null,
  series: ThresholdSeries,
  test: ConditionedTest,
  boot: (number | null)[] | null,
  bag: boolean,
  calibrate: boolean,
): ThresholdEstimate {
  const prov: Provenance = {
    method: `${which}-consensus`,
    label:
      which === "vt1"
        ? "VT1: consensus of V-slope, modified V-slope and ventilatory equivalents"
        : "VT2: consensus of the joint profile (VE against VCO2 with PETCO2), VE-vs-VCO2 break and VE/VCO2 with PETCO2",
    sourceIds: ["vt-two-methods-agree-recalled", "vt-implementation-choice"],
    window: series.span,
    inputs: { methods: c.methodIds.join(", "), confidence: c.confidence },
    averaging: series.averaging,
  };
  let bootstrap: ThresholdEstimate["bootstrap"] = null;
  let band = c.band;
  if (boot) {
    const vals = boot.filter((v): v is number => v !== null);
    const lo = vals.length >= 3 ? quantile(vals, 0.1) : null;
    const hi = vals.length >= 3 ? quantile(vals, 0.9) : null;
    bootstrap = {
      replicates: boot.length,
      lowMlMin: lo,
      medianMlMin: vals.length >= 3 ? quantile(vals, 0.5) : null,
      highMlMin: hi,
      noCallFraction: 1 - vals.length / boot.length,
    };
    if (band && lo !== null && hi !== null)
      band = { lowMlMin: Math.min(band.lowMlMin, lo), highMlMin: Math.max(band.highMlMin, hi) };
  }
  let confidence = c.confidence;
  let reason = c.reason;
  if (bag && bootstrap && bootstrap.medianMlMin !== null && bootstrap.noCallFraction <= 0.5 && c.vo2MlMin !== null) {
    c = { ...c, vo2MlMin: bootstrap.medianMlMin };
    timeS = timeAtLevel(series, series.vo2Trend, c.vo2MlMin as number);
    prov.inputs = { ...prov.inputs, value: "median of the resampled consensus values" };
  } else if (outsideAgreeingMethods(c)) {
    // the pooled value (weighted median of every usable method) lies outside the range of the methods that agree: no
    // agreeing pair supports it (round 15: such VT2 values err about twice as much as other "moderate" ones)
    confidence = "low";
    reason = `the pooled value lies outside the range of the methods that agree (${Math.round(c.band.lowMlMin)}–${Math.round(c.band.highMlMin)} mL/min); confirm by review`;
  }
  // the band always holds the reported value
  if (band && c.vo2MlMin !== null)
    band = { lowMlMin: Math.min(band.lowMlMin, c.vo2MlMin), highMlMin: Math.max(band.highMlMin, c.vo2MlMin) };
  if (confidence === "high" && band && c.vo2MlMin !== null && (band.highMlMin - band.lowMlMin) / c.vo2MlMin > 0.2) {
    confidence = "moderate";
    reason = "resampling band wider than 20 % of the value";
  }
  // confidence reads the raw band (above); the band reported is widened to its calibration on invented tests
  if (calibrate && band && c.vo2MlMin !== null) {
    const k = BAND_CALIBRATION[which];
    band = calibrateBand(band, c.vo2MlMin, k);
    prov.inputs = {
      ...prov.inputs,
      band: `methods' spread and resampling 10–90 %, each side widened ×${k.factor} from at least ${100 * k.floorFraction} % of the value (calibrated on invented tests to hold the true value in 8 of 10)`,
    };
  }
  const vo2 =
    c.vo2MlMin === null ? notDetermined("mL/min", prov, c.reason ?? "no method succeeded") : measured(c.vo2MlMin, "mL/min", prov);
  const reported = c.vo2MlMin === null ? null : band;
  // when the VO2 trend reached the band's ends (values read there show what the band means for them), kept around the time
  const bandTimes =
    reported && timeS !== null
      ? {
          lowS: Math.min(timeS, timeAtLevel(series, series.vo2Trend, reported.lowMlMin)),
          highS: Math.max(timeS, timeAtLevel(series, series.vo2Trend, reported.highMlMin)),
        }
      : null;
  return {
    which,
    timeS,
    vo2MlMin: vo2,
    workW: readAt(test, "workW", "W", timeS, 0, "work rate at the threshold time (linear interpolation)"),
    hrBpm: readAt(test, "hrBpm", "1/min", timeS, 10, "heart rate at the threshold time (10-s centred mean)"),
    speedKmh: readAt(test, "speedKmh", "km/h", timeS, 0, "treadmill speed at the threshold time (linear interpolation)"),
    confidence,
    band: reported,
    bandTimes: bandTimes && Number.isFinite(bandTimes.lowS) && Number.isFinite(bandTimes.highS) ? bandTimes : null,
    methodIds: c.methodIds,
    ...(reason ? { reason } : {}),
    bootstrap,
  };
}

/**
 * True when a consensus of two or more agreeing methods reports a value outside their range: the pooled value is the
 * weighted median of every usable method (`combineEstimates`), so a heavy method that disagrees can carry it outside.
 */
export function outsideAgreeingMethods(
  c: Consensus,
): c is Consensus & { vo2MlMin: number; band: NonNullable<Consensus["band"]> } {
  return (
    c.vo2MlMin !== null &&
    c.band !== null &&
    (c.confidence === "moderate" || c.confidence === "high") &&
    (c.vo2MlMin < c.band.lowMlMin || c.vo2MlMin > c.band.highMlMin)
  );
}

/**
 * Replace automatic thresholds by reviewers' overrides (pure; returns a new result). An override gives a time
 * (VO2 then read from the VO2 trend) or a VO2 (time from the first crossing of the trend); work rate, HR and speed
 * are re-read at that time. Provenance says "set by reviewer" with the reason; `overridden.automatic` keeps the
 * engine's value. The last override for a threshold wins. Call it again whenever overrides change; everything
 * that depends on VT1/VT2 should be recomputed from the returned result.
 */
export function applyThresholdOverrides(
  test: ConditionedTest,
  result: ThresholdResult,
  overrides: readonly ThresholdOverride[],
  series?: ThresholdSeries | null,
): ThresholdResult {
  if (overrides.length === 0) return result;
  const s = series === undefined ? buildThresholdSeries(test) : series;
  const out: ThresholdResult = { ...result, issues: [...result.issues] };
  for (const o of overrides) {
    const prev = out[o.which];
    let timeS: number | null = o.timeS ?? null;
    let vo2: number | null = o.vo2MlMin ?? null;
    if (vo2 === null && timeS !== null)
      vo2 = s ? vo2AtTime(s, timeS) : valueAtTime(test.clean, "vo2MlMin", timeS, { windowS: 20 });
    if (timeS === null && vo2 !== null && s) timeS = timeAtLevel(s, s.vo2Trend, vo2);
    if (vo2 === null || !Number.isFinite(vo2)) {
      out.issues.push(
        makeIssue(
          "warning",
          "threshold-override-unusable",
          `The reviewer's ${o.which.toUpperCase()} override gives neither a usable time nor VO2; the automatic value is kept.`,
        ),
      );
      continue;
    }
    const prov: Provenance = {
      method: `${o.which}-reviewer-override`,
      label: `set by reviewer (${o.by}): ${o.reason}`,
      sourceIds: [],
      inputs: { by: o.by, reason: o.reason, timeS: timeS ?? null, automaticVo2MlMin: prev.vo2MlMin.value },
    };
    const t = timeS !== null && Number.isFinite(timeS) ? timeS : null;
    out[o.which] = {
      which: o.which,
      timeS: t,
      vo2MlMin: measured(vo2, "mL/min", prov),
      workW: readAt(test, "workW", "W", t, 0, "work rate at the threshold time (linear interpolation)"),
      hrBpm: readAt(test, "hrBpm", "1/min", t, 10, "heart rate at the threshold time (10-s centred mean)"),
      speedKmh: readAt(test, "speedKmh", "km/h", t, 0, "treadmill speed at the threshold time (linear interpolation)"),
      confidence: "high",
      band: null,
      methodIds: [`${o.which}-reviewer-override`],
      reason: `set by reviewer: ${o.reason}`,
      bootstrap: null,
      overridden: {
        by: o.by,
        reason: o.reason,
        ...(o.atIso ? { atIso: o.atIso } : {}),
        automatic: {
          timeS: prev.overridden?.automatic.timeS ?? prev.timeS,
          vo2MlMin: prev.overridden?.automatic.vo2MlMin ?? prev.vo2MlMin.value,
          confidence: prev.overridden?.automatic.confidence ?? prev.confidence,
        },
      },
    };
    out.issues = settleAutomaticDoubts(out.issues, o.which, prev.overridden ? null : (prev.reason ?? null));
  }
  return out;
}

/**
 * Once a reviewer has set a threshold, the engine's doubt about its automatic value is history, not a current
 * warning: the `<which>-low-confidence` warning and the `<which>-not-determinable` note become one info line
 * that says what the automatic value was and that the reviewer set the threshold (code `<which>-set-by-review`).
 * Other issues are kept as they are.
 */
function settleAutomaticDoubts(issues: readonly Issue[], which: ThresholdWhich, automaticReason: string | null): Issue[] {
  const name = which === "vt1" ? "VT1 (anaerobic threshold)" : "VT2 (respiratory compensation point)";
  const short = which.toUpperCase();
  return issues.map((i) => {
    if (i.code !== `${which}-low-confidence` && i.code !== `${which}-not-determinable`) return i;
    // the automatic reason's advice ("confirm by review") has been followed: keep only the finding
    const found = automaticReason ? withoutReviewAdvice(automaticReason) : "";
    const why = found || (i.code.endsWith("low-confidence") ? "the methods disagree" : "no method succeeded");
    const was = i.code.endsWith("low-confidence") ? `was uncertain (${why})` : `could not be determined (${why})`;
    return makeIssue(
      "info",
      `${which}-set-by-review`,
      `The automatic ${name} ${was}; ${short} was set by the reviewer.`,
      i.where,
    );
  });
}
