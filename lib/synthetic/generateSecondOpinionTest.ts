import type { BreathRow, BreathTable, NumericField, Phase } from "../breath/types";
import { PrefixSums, linearRegression } from "../numeric/linearRegression";
import { seededRandom, type SeededRandom } from "../numeric/seededRandom";
import type { NoiseLevel, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Second-opinion synthetic CPET model: an independent whole-body model of an exercise test built from
 * physiology (oxygen-uptake kinetics, lactate accumulation and bicarbonate buffering, CO2 stores, ventilatory
 * control, acidosis compensation, dead space, alveolar gas). ALL OUTPUT IS INVENTED DATA for checking the
 * threshold engine; every parameter range below is invented unless a source id from
 * `SECOND_OPINION_SOURCES` (lib/synthetic/sources.ts) stands beside it.
 *
 * Truth conventions (known by construction):
 * - VT1: the moment the excess CO2 released by bicarbonate buffering of lactic acid starts to appear at the
 *   mouth. Metabolic (muscle) VO2 crosses the lactate-threshold level at `vt1MetabolicTimeS`; every metabolic
 *   event reaches the mouth after the same muscle-to-lung transit delay, so VT1 time = metabolic time + delay
 *   and the mouth VO2 at VT1 equals the lactate-threshold VO2. Values are the noise-free mouth values then.
 * - VT2/RCP: the moment the compensatory extra ventilation for the lactic acidosis starts at the mouth (drive
 *   ∝ rise of lactate above its value when metabolic VO2 crossed the RCP level, seen after the same delay).
 *   VE at VT2 still lies on the isocapnic VE–VCO2 line. Null when exercise stops before the RCP is reached.
 * - VE/VCO2 slope: OLS of noise-free VE (L/min) on noise-free VCO2 (L/min) over the breaths from the start of
 *   the incremental phase to VT2 (to the end of exercise without VT2).
 * - On a treadmill the truth points' `workW`, `rampWPerMin` and `deltaVo2DeltaWrMlMinW` are 0 (no work-rate
 *   column); the load at the thresholds is in `secondOpinion.vt1Load` / `vt2Load`.
 */

/** Clinical groups of the second-opinion bank (invented archetypes). */
export type SecondOpinionGroup =
  "athlete" | "healthy" | "sedentary" | "older" | "heart-failure" | "heart-failure-eov" | "copd" | "interstitial";

/** Protocol families: cycle ramp or 1–3-min steps; treadmill ramp or 2–3-min stages. */
export type SecondOpinionProtocol = "cycle-ramp" | "cycle-steps" | "treadmill-ramp" | "treadmill-stages";

/** Every parameter of one second-opinion test. Units in the names; all values invented (see file header). */
export interface SecondOpinionSpec {
  label: string;
  group: SecondOpinionGroup;
  protocol: SecondOpinionProtocol;
  noise: NoiseLevel;
  sex: "male" | "female";
  ageY: number;
  weightKg: number;
  // protocol
  restS: number;
  /** Warm-up length, s; 0 = the incremental phase starts straight from rest. */
  warmupS: number;
  /** Cycle warm-up load, W (also the base of the ramp or steps). */
  warmupW: number;
  /** Treadmill warm-up walking speed, km/h (0 % grade). */
  warmupSpeedKmh: number;
  /** Cycle: mean rise of load, W/min (steps rise by rampWPerMin·stepS/60 every stepS; first step at the start). */
  rampWPerMin: number;
  /** Step/stage length, s; null = continuous ramp. */
  stepS: number | null;
  startSpeedKmh: number;
  speedKmhPerMin: number;
  startGradePct: number;
  gradePctPerMin: number;
  recoveryS: number;
  /** Cycle recovery load, W; null = stops pedalling. */
  recoveryW: number | null;
  /** Treadmill recovery walking speed, km/h; null = stands still. */
  recoverySpeedKmh: number | null;
  /** Exercise continues this long after VO2 reaches capacity (0 = symptom-limited at capacity, no plateau). */
  plateauS: number;
  /** Stop early when metabolic VO2 reaches VT1 + f·(VT2 − VT1) (or f of VT1→capacity); null = to the limit. */
  earlyStopFraction: number | null;
  /** Stop when VE demand reaches this fraction of MVV (ventilatory limitation); null = no ventilatory stop. */
  ventilatoryStopFraction: number | null;
  // oxygen uptake
  vo2RestMlMin: number;
  /** Cycle: steady VO2 when pedalling at 0 W, mL/min. */
  vo2UnloadedMlMin: number;
  /** Cycle: steady-state ΔVO2/ΔWR, mL/min/W. */
  gainMlMinPerW: number;
  /** Treadmill: factor on the walking/running cost equations. */
  treadmillEconomy: number;
  /** Maximal VO2 the body can reach, mL/min. */
  vo2CapacityMlMin: number;
  /** Phase-2 time constant of muscle VO2, s. */
  tauVo2S: number;
  /** Muscle-to-mouth transit delay of every metabolic event, s (integer). */
  transitDelayS: number;
  /** Slow component: extra VO2 per mL/min of primary VO2 above the lactate threshold. */
  slowComponentGain: number;
  tauSlowComponentS: number;
  /** Lactate-threshold VO2 as a fraction of capacity. */
  vt1FractionOfCapacity: number;
  /** RCP VO2 as a fraction of capacity; null = no respiratory compensation (it would lie beyond the test). */
  vt2FractionOfCapacity: number | null;
  // CO2 and lactate
  rqRest: number;
  /** Slope of aerobic VCO2 on VO2 (metabolic, below the lactate threshold). */
  s1: number;
  /** Extra first-order lag of aerobic CO2 output at the lungs (body CO2 stores), s. */
  tauCo2StoresS: number;
  lactateRestMmolL: number;
  lactateAtCapacityMmolL: number;
  /** Steady-state lactate rises as ((VO2 − VO2LT)/(capacity − VO2LT))^exponent. */
  lactateExponent: number;
  tauLactateRiseS: number;
  tauLactateClearS: number;
  /** Effective bicarbonate-buffered lactate pool, L (mmol of CO2 released per mmol/L of lactate rise). */
  bufferVolumeL: number;
  /** Smoothing of the buffering CO2 on its way to the lungs, s. */
  tauExcessCo2S: number;
  // ventilation
  veInterceptLMin: number;
  /** Slope of the isocapnic VE–VCO2 line (L/min per L/min). */
  veVco2Slope: number;
  /** Fractional VE rise per mmol/L of lactate above its value at the RCP. */
  compensationPerMmolL: number;
  tauChemoreflexS: number;
  mvvLMin: number;
  vtRestL: number;
  vtMaxL: number;
  /** Anatomic plus apparatus dead space at rest, L. */
  anatomicDeadSpaceL: number;
  /** Fraction of alveolar tidal volume going to unperfused alveoli. */
  alveolarDeadSpaceFraction: number;
  barometricMmHg: number;
  // heart rate and saturation
  hrRestBpm: number;
  /** HR when VO2 reaches capacity, bpm. */
  hrAtCapacityBpm: number;
  /** HR rises as (VO2 fraction)^exponent (> 1: O2 pulse flattens late). */
  hrExponent: number;
  tauHrS: number;
  tauHrRecoveryS: number;
  spo2RestPct: number;
  spo2DropPct: number;
  /** Whether the cart records SpO2. */
  spo2Recorded: boolean;
  /** Exercise oscillatory ventilation, or null. */
  eov: { periodS: number; amplitudeFraction: number; phaseRad: number } | null;
}

type ArtefactKind = "cough" | "sigh" | "post-sigh" | "swallow" | "leak";

/** Breath-noise settings of one level (invented magnitudes). */
export interface SecondOpinionNoiseSettings {
  /** SD of ln(tidal volume) breath-to-breath. */
  tidalVolumeLogSd: number;
  /** SD of ln(breath duration). */
  durationLogSd: number;
  /** Correlation of the duration and tidal-volume deviations. */
  durationVolumeCorrelation: number;
  /** AR(1) coefficient of both. */
  autocorrelation: number;
  /** Fraction of the breath's ventilatory deviation ln(VE/VE0) carried into VO2 and VCO2. */
  vo2Coupling: number;
  vco2Coupling: number;
  /** Independent analyser/lung-store noise, mL/min. */
  vo2SdMlMin: number;
  vco2SdMlMin: number;
  endTidalSdMmHg: number;
  hrSdBpm: number;
  artefactRate: number;
  /** Expected SD of ln(VE/VE0) on clean breaths (= SD of the tidal volume minus duration deviation). */
  expectedLogVeSd: number;
}

export interface SecondOpinionTest {
  table: BreathTable;
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  spec: SecondOpinionSpec;
  seed: number;
  secondOpinion: {
    noise: NoiseLevel;
    group: SecondOpinionGroup;
    protocol: SecondOpinionProtocol;
    ergometer: "cycle" | "treadmill";
    /** Time metabolic VO2 crossed the lactate threshold; VT1 time = this + transitDelayS. */
    vt1MetabolicTimeS: number;
    vt2MetabolicTimeS: number | null;
    transitDelayS: number;
    endReason: "capacity" | "plateau" | "ventilatory-limit" | "stopped-early" | "time-limit";
    /** Load at the truth moments (cycle: workW; treadmill: speed and grade). */
    vt1Load: { workW?: number; speedKmh?: number; gradePct?: number };
    vt2Load: { workW?: number; speedKmh?: number; gradePct?: number } | null;
    /**
     * Where a least-squares two-line fit on the NOISE-FREE breaths puts the corners (VCO2 vs VO2 from incremental
     * start + 60 s to VT2/end: VO2 at the intersection; VE vs VCO2 from VT1 to end: VCO2 at the intersection).
     * Not truth: shows how far the gradual physiological onsets lie from a two-line corner.
     */
    twoLineVt1Vo2MlMin: number;
    twoLineVt2Vco2MlMin: number | null;
    peakLactateMmolL: number;
    artefacts: { index: number; kind: ArtefactKind }[];
    noiseSettings: SecondOpinionNoiseSettings;
  };
}

// ---------------------------------------------------------------------------------------------------------
// Noise levels (invented). Breath-to-breath VT and breath-time variability make VE, VO2 and VCO2 per breath move
// together; ventilation noise is autocorrelated (liang-1996-breath-autocorrelation) and gas-exchange noise
// roughly Gaussian with an SD largely independent of metabolic rate (lamarra-1987-breath-fluctuations), hence an
// additive analyser term beside the coupled part.
const NOISE: Record<NoiseLevel, Omit<SecondOpinionNoiseSettings, "expectedLogVeSd">> = {
  none: { tidalVolumeLogSd: 0, durationLogSd: 0, durationVolumeCorrelation: 0, autocorrelation: 0, vo2Coupling: 0, vco2Coupling: 0, vo2SdMlMin: 0, vco2SdMlMin: 0, endTidalSdMmHg: 0, hrSdBpm: 0, artefactRate: 0 }, // prettier-ignore
  low: { tidalVolumeLogSd: 0.08, durationLogSd: 0.08, durationVolumeCorrelation: 0.5, autocorrelation: 0.3, vo2Coupling: 0.5, vco2Coupling: 0.6, vo2SdMlMin: 35, vco2SdMlMin: 25, endTidalSdMmHg: 0.4, hrSdBpm: 0.8, artefactRate: 0.003 }, // prettier-ignore
  moderate: { tidalVolumeLogSd: 0.14, durationLogSd: 0.14, durationVolumeCorrelation: 0.5, autocorrelation: 0.3, vo2Coupling: 0.5, vco2Coupling: 0.6, vo2SdMlMin: 70, vco2SdMlMin: 50, endTidalSdMmHg: 0.7, hrSdBpm: 1.5, artefactRate: 0.01 }, // prettier-ignore
  high: { tidalVolumeLogSd: 0.22, durationLogSd: 0.2, durationVolumeCorrelation: 0.5, autocorrelation: 0.35, vo2Coupling: 0.5, vco2Coupling: 0.6, vo2SdMlMin: 130, vco2SdMlMin: 90, endTidalSdMmHg: 1.2, hrSdBpm: 2.5, artefactRate: 0.025 }, // prettier-ignore
};

function noiseSettings(level: NoiseLevel): SecondOpinionNoiseSettings {
  const n = NOISE[level];
  const v = n.tidalVolumeLogSd;
  const d = n.durationLogSd;
  // Var(zV − zT) = sV² + sT² − 2ρ·sV·sT (standard statistics).
  const expectedLogVeSd = Math.sqrt(v * v + d * d - 2 * n.durationVolumeCorrelation * v * d);
  return { ...n, expectedLogVeSd };
}

// ---------------------------------------------------------------------------------------------------------
// Small helpers

const clamp = (x: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, x));
const round = (x: number, step: number): number => Number((Math.round(x / step) * step).toFixed(6));
/** Smooth minimum of a and b with width w (log-sum-exp; common practice). */
function softMin(a: number, b: number, w: number): number {
  const m = Math.min(a, b);
  return m - w * Math.log1p(Math.exp(-Math.abs(a - b) / w));
}
/** First-order update factor for a 1-s step (exact exponential; common practice). */
const alpha = (tauS: number): number => (tauS > 0 ? 1 - Math.exp(-1 / tauS) : 1);
/** Linear interpolation on a 1-s grid (t clamped to the grid). */
function gridAt(a: Float64Array, t: number): number {
  if (t <= 0) return a[0];
  const k = Math.floor(t);
  if (k >= a.length - 1) return a[a.length - 1];
  const f = t - k;
  return a[k] + f * (a[k + 1] - a[k]);
}

/**
 * Treadmill oxygen cost, mL/kg/min: walking 3.5 + 0.1·S + 1.8·S·G, running 3.5 + 0.2·S + 0.9·S·G with S in m/min
 * and G as a fraction (acsm-walking-running-cost, recalled); blended linearly between 6.5 and 8 km/h (invented).
 */
function treadmillCostMlKgMin(speedKmh: number, gradePct: number): number {
  const s = (speedKmh * 1000) / 60;
  const g = gradePct / 100;
  const walk = 3.5 + 0.1 * s + 1.8 * s * g;
  const run = 3.5 + 0.2 * s + 0.9 * s * g;
  const w = clamp((speedKmh - 6.5) / 1.5, 0, 1);
  return (1 - w) * walk + w * run;
}

// ---------------------------------------------------------------------------------------------------------
// Spec bank

/** Group order of the bank: 21 entries (coprime with the usual 2–4 noise levels, so groups and levels mix). */
const GROUP_PATTERN: SecondOpinionGroup[] = [
  "healthy", "heart-failure", "older", "sedentary", "copd", "athlete", "heart-failure",
  "healthy", "older", "heart-failure-eov", "sedentary", "interstitial", "healthy", "heart-failure",
  "copd", "older", "athlete", "sedentary", "heart-failure-eov", "healthy", "heart-failure",
]; // prettier-ignore

const CYCLE_RATES = [5, 8, 10, 12, 15, 20, 25, 30, 35, 40, 50];

interface GroupRanges {
  age: [number, number];
  vo2KgMale: [number, number];
  vo2KgFemale: [number, number];
  lt: [number, number];
  rcp: [number, number];
  noRcpProbability: number;
  slope: [number, number];
  intercept: [number, number];
  tau: [number, number];
  delay: [number, number];
  gain: [number, number];
  slow: [number, number];
  vtMax: [number, number];
  vtRest: [number, number];
  hrRest: [number, number];
  /** HR at capacity as a fraction of 208 − 0.7·age (tanaka-2001-age-hrmax). */
  hrFraction: [number, number];
  hrExponent: [number, number];
  hrRecoveryTau: [number, number];
  lactateCap: [number, number];
  alveolarDs: [number, number];
  spo2Rest: [number, number];
  spo2Drop: [number, number];
  treadmillProbability: number;
  plateauProbability: number;
  earlyStopProbability: number;
  running: boolean;
}

/*
 * Group ranges, all invented, anchored where a source is named:
 * - peak VO2 bands of heart failure follow the Weber–Janicki classes B–D (janicki-1988-weber-classes);
 * - lactate-threshold fractions scatter around VO2 at VT ≈ 48 ± 11 % of peak (lewthwaite-2021-normal-vt);
 * - VE/VCO2 slopes: healthy 27–34 by age (friend-ve-vco2-slope-reference), heart failure across the ventilatory
 *   classes II–IV (arena-2007-slope-classes);
 * - ΔVO2/ΔWR 10.3 ± 1 in health, ≈ 8.3 ± 1.2 with circulatory disease (hansen-1987-vo2-work-rate,
 *   ozyener-2011-ramp-slope);
 * - VO2 time constants longer with age and heart failure (whipp-1982-vo2-kinetics, recalled);
 * - lung disease: ventilatory limitation VE/MVV ≥ 85 % and often no RCP (radtke-2019-ers-cpet), desaturation
 *   ≥ 4 points in interstitial disease (hadeli-2001-desaturation).
 */
const GROUPS: Record<SecondOpinionGroup, GroupRanges> = {
  athlete: { age: [19, 40], vo2KgMale: [50, 66], vo2KgFemale: [44, 57], lt: [0.6, 0.76], rcp: [0.84, 0.92], noRcpProbability: 0, slope: [22.5, 27.5], intercept: [0.8, 2.5], tau: [18, 30], delay: [10, 14], gain: [9.8, 11.2], slow: [0.04, 0.1], vtMax: [3.0, 4.2], vtRest: [0.7, 1.0], hrRest: [46, 64], hrFraction: [0.96, 1.03], hrExponent: [0.9, 1.05], hrRecoveryTau: [40, 70], lactateCap: [9, 13], alveolarDs: [0.02, 0.05], spo2Rest: [96, 99], spo2Drop: [0, 2], treadmillProbability: 0.45, plateauProbability: 0.5, earlyStopProbability: 0.05, running: true }, // prettier-ignore
  healthy: { age: [22, 58], vo2KgMale: [34, 47], vo2KgFemale: [29, 40], lt: [0.48, 0.64], rcp: [0.78, 0.9], noRcpProbability: 0.03, slope: [23, 29.5], intercept: [0.8, 2.8], tau: [26, 42], delay: [11, 16], gain: [9.3, 11.1], slow: [0.06, 0.14], vtMax: [2.4, 3.4], vtRest: [0.6, 0.9], hrRest: [56, 80], hrFraction: [0.94, 1.03], hrExponent: [0.9, 1.1], hrRecoveryTau: [45, 85], lactateCap: [8, 12], alveolarDs: [0.03, 0.06], spo2Rest: [96, 99], spo2Drop: [0, 2], treadmillProbability: 0.35, plateauProbability: 0.45, earlyStopProbability: 0.1, running: true }, // prettier-ignore
  sedentary: { age: [28, 62], vo2KgMale: [24, 33], vo2KgFemale: [20, 28], lt: [0.45, 0.6], rcp: [0.76, 0.88], noRcpProbability: 0.05, slope: [24, 30.5], intercept: [0.8, 2.8], tau: [34, 50], delay: [12, 17], gain: [9.0, 10.8], slow: [0.08, 0.16], vtMax: [2.0, 3.0], vtRest: [0.55, 0.85], hrRest: [64, 88], hrFraction: [0.93, 1.03], hrExponent: [0.9, 1.1], hrRecoveryTau: [55, 100], lactateCap: [7, 11], alveolarDs: [0.03, 0.07], spo2Rest: [96, 99], spo2Drop: [0, 2], treadmillProbability: 0.3, plateauProbability: 0.25, earlyStopProbability: 0.12, running: false }, // prettier-ignore
  older: { age: [65, 84], vo2KgMale: [17, 27], vo2KgFemale: [15, 22], lt: [0.5, 0.66], rcp: [0.8, 0.91], noRcpProbability: 0.15, slope: [27, 34], intercept: [0.8, 2.8], tau: [40, 62], delay: [12, 18], gain: [8.8, 10.6], slow: [0.06, 0.14], vtMax: [1.6, 2.4], vtRest: [0.5, 0.8], hrRest: [58, 82], hrFraction: [0.88, 1.0], hrExponent: [0.95, 1.15], hrRecoveryTau: [80, 160], lactateCap: [5, 9], alveolarDs: [0.05, 0.09], spo2Rest: [95, 98], spo2Drop: [0, 3], treadmillProbability: 0.25, plateauProbability: 0.15, earlyStopProbability: 0.12, running: false }, // prettier-ignore
  "heart-failure": { age: [42, 78], vo2KgMale: [10.5, 19.5], vo2KgFemale: [10, 18], lt: [0.55, 0.72], rcp: [0.83, 0.93], noRcpProbability: 0.3, slope: [31, 48], intercept: [0.8, 3], tau: [55, 90], delay: [15, 23], gain: [7.0, 9.5], slow: [0.1, 0.22], vtMax: [1.8, 2.6], vtRest: [0.45, 0.75], hrRest: [58, 86], hrFraction: [0.65, 0.85], hrExponent: [1.15, 1.5], hrRecoveryTau: [140, 260], lactateCap: [4, 8], alveolarDs: [0.08, 0.14], spo2Rest: [95, 98], spo2Drop: [0, 2], treadmillProbability: 0.25, plateauProbability: 0.1, earlyStopProbability: 0.12, running: false }, // prettier-ignore
  "heart-failure-eov": { age: [45, 80], vo2KgMale: [10, 17], vo2KgFemale: [10, 16], lt: [0.55, 0.72], rcp: [0.83, 0.93], noRcpProbability: 0.35, slope: [36, 52], intercept: [0.8, 3], tau: [60, 95], delay: [16, 24], gain: [7.0, 9.2], slow: [0.1, 0.22], vtMax: [1.7, 2.4], vtRest: [0.45, 0.7], hrRest: [60, 86], hrFraction: [0.62, 0.82], hrExponent: [1.15, 1.5], hrRecoveryTau: [150, 280], lactateCap: [4, 7], alveolarDs: [0.09, 0.15], spo2Rest: [94, 98], spo2Drop: [0, 3], treadmillProbability: 0.2, plateauProbability: 0.05, earlyStopProbability: 0.1, running: false }, // prettier-ignore
  copd: { age: [52, 80], vo2KgMale: [12, 21], vo2KgFemale: [11, 19], lt: [0.5, 0.64], rcp: [0.84, 0.92], noRcpProbability: 0.75, slope: [28, 37], intercept: [0.8, 3], tau: [48, 75], delay: [13, 20], gain: [8.6, 10.6], slow: [0.08, 0.16], vtMax: [1.1, 1.8], vtRest: [0.5, 0.8], hrRest: [66, 92], hrFraction: [0.8, 0.95], hrExponent: [0.95, 1.15], hrRecoveryTau: [90, 170], lactateCap: [3, 6], alveolarDs: [0.1, 0.18], spo2Rest: [92, 97], spo2Drop: [0, 6], treadmillProbability: 0.2, plateauProbability: 0, earlyStopProbability: 0, running: false }, // prettier-ignore
  interstitial: { age: [50, 80], vo2KgMale: [12, 20], vo2KgFemale: [11, 18], lt: [0.5, 0.64], rcp: [0.83, 0.92], noRcpProbability: 0.5, slope: [33, 45], intercept: [0.8, 3], tau: [45, 66], delay: [13, 19], gain: [8.6, 10.4], slow: [0.08, 0.16], vtMax: [0.9, 1.5], vtRest: [0.4, 0.6], hrRest: [66, 92], hrFraction: [0.8, 0.95], hrExponent: [0.95, 1.15], hrRecoveryTau: [90, 170], lactateCap: [3.5, 7], alveolarDs: [0.08, 0.15], spo2Rest: [91, 96], spo2Drop: [4, 12], treadmillProbability: 0.2, plateauProbability: 0, earlyStopProbability: 0.05, running: false }, // prettier-ignore
};

/** Mix a bank seed and an index into one 32-bit seed (integer hashing, common practice). */
function mixSeed(seed: number, i: number): number {
  let h = (Math.floor(seed) ^ Math.imul(i + 1, 0x9e3779b1)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b) >>> 0;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) >>> 0;
  return (h ^ (h >>> 16)) >>> 0;
}

/** Steady-state demand (mL/min) of the load at incremental-phase time s (s ≥ 0) for a given spec. */
function incrementalLoad(spec: SecondOpinionSpec, s: number): { workW: number; speedKmh: number; gradePct: number } {
  const steps = spec.stepS !== null ? Math.floor(s / spec.stepS) + 1 : 0;
  const elapsedMin = spec.stepS !== null ? (steps * spec.stepS) / 60 : s / 60;
  if (spec.protocol === "cycle-ramp" || spec.protocol === "cycle-steps") {
    return { workW: spec.warmupW + spec.rampWPerMin * elapsedMin, speedKmh: 0, gradePct: 0 };
  }
  const stageMin = spec.stepS !== null ? ((steps - 1) * spec.stepS) / 60 : s / 60;
  return {
    workW: 0,
    speedKmh: Math.min(22, spec.startSpeedKmh + spec.speedKmhPerMin * stageMin),
    gradePct: Math.min(25, spec.startGradePct + spec.gradePctPerMin * stageMin),
  };
}

function demandOfLoad(spec: SecondOpinionSpec, load: { workW: number; speedKmh: number; gradePct: number }): number {
  if (spec.protocol === "cycle-ramp" || spec.protocol === "cycle-steps") {
    return spec.vo2UnloadedMlMin + spec.gainMlMinPerW * load.workW;
  }
  if (load.speedKmh <= 0) return spec.vo2RestMlMin;
  return Math.max(spec.vo2RestMlMin, treadmillCostMlKgMin(load.speedKmh, load.gradePct) * spec.weightKg * spec.treadmillEconomy);
}

/**
 * The i-th spec of a second-opinion bank (deterministic for (i, seed)): a varied mix of groups, protocols,
 * warm-ups, step lengths, early stops and noise levels. All values invented (see file header).
 *
 * @param i index in the bank (integer ≥ 0)
 * @param seed bank seed
 * @param noiseLevels noise levels cycled through by index (non-empty)
 */
export function secondOpinionSpec(i: number, seed: number, noiseLevels: NoiseLevel[]): SecondOpinionSpec {
  if (!Number.isInteger(i) || i < 0) throw new Error("secondOpinionSpec requires an integer index ≥ 0");
  if (noiseLevels.length === 0) throw new Error("secondOpinionSpec requires at least one noise level");
  const r = seededRandom(mixSeed(seed, i));
  const u = (lo: number, hi: number): number => lo + (hi - lo) * r.uniform();
  const pick = <T>(xs: readonly T[]): T => xs[r.int(xs.length)];
  const range = (x: [number, number]): number => u(x[0], x[1]);

  const group = GROUP_PATTERN[i % GROUP_PATTERN.length];
  const g = GROUPS[group];
  const noise = noiseLevels[i % noiseLevels.length];
  const sex: "male" | "female" = r.uniform() < (group === "heart-failure" || group === "heart-failure-eov" ? 0.75 : 0.55) ? "male" : "female"; // prettier-ignore
  const ageY = Math.round(range(g.age));
  const weightKg = round(sex === "male" ? u(62, group === "sedentary" ? 115 : 98) : u(50, group === "sedentary" ? 100 : 84), 0.1);
  const treadmill = r.uniform() < g.treadmillProbability;
  const stepped = r.uniform() < (treadmill ? 0.45 : 0.3);
  const protocol: SecondOpinionProtocol = treadmill ? (stepped ? "treadmill-stages" : "treadmill-ramp") : stepped ? "cycle-steps" : "cycle-ramp"; // prettier-ignore

  const vo2Kg = range(sex === "male" ? g.vo2KgMale : g.vo2KgFemale);
  let vo2CapacityMlMin = Math.round(vo2Kg * weightKg);
  // Resting VO2 ≈ 1 MET = 3.5 mL/kg/min (common practice), scattered ±15 % (invented).
  const vo2RestMlMin = Math.round(weightKg * u(3.0, 4.0));
  // Unloaded pedalling ≈ 150 + 5.8·weight mL/min (wasserman-unloaded-cost, recalled), ±8 % (invented).
  const vo2UnloadedMlMin = Math.max(vo2RestMlMin + 120, Math.round((150 + 5.8 * weightKg) * u(0.92, 1.08)));
  const tauVo2S = range(g.tau);

  // Protocol. Target duration of the incremental phase 6–13 min (ERS advises 8–12 min, radtke-2019-ers-cpet;
  // wider on purpose), reached through the VO2 lag of about tau.
  let targetS = u(360, 780);
  const warm = r.uniform() < 0.65;
  const stepS = stepped ? (treadmill ? pick([60, 120, 120, 180]) : pick([60, 60, 120, 180])) : null;
  if (stepS !== null) targetS = Math.max(targetS, 4 * stepS); // at least four steps (invented)
  const spec: SecondOpinionSpec = {
    label: "",
    group,
    protocol,
    noise,
    sex,
    ageY,
    weightKg,
    restS: Math.round(u(120, 300)),
    warmupS: warm ? Math.round(u(120, 240)) : 0,
    warmupW: !treadmill && warm ? pick([0, 0, 10, 20]) : 0,
    warmupSpeedKmh: treadmill && warm ? round(u(2, 3.5), 0.1) : 0,
    rampWPerMin: 0,
    stepS,
    startSpeedKmh: 0,
    speedKmhPerMin: 0,
    startGradePct: 0,
    gradePctPerMin: 0,
    recoveryS: Math.round(u(120, 300)),
    recoveryW: treadmill ? null : r.uniform() < 0.6 ? pick([0, 10, 20]) : null,
    recoverySpeedKmh: treadmill && r.uniform() < 0.7 ? round(u(1.5, 3), 0.1) : null,
    plateauS: r.uniform() < g.plateauProbability ? Math.round(u(20, 60)) : 0,
    earlyStopFraction: r.uniform() < g.earlyStopProbability ? u(0.25, 0.85) : null,
    ventilatoryStopFraction: null,
    vo2RestMlMin,
    vo2UnloadedMlMin,
    gainMlMinPerW: range(g.gain),
    treadmillEconomy: u(0.92, group === "athlete" || group === "healthy" ? 1.05 : 1.15),
    vo2CapacityMlMin,
    tauVo2S,
    transitDelayS: Math.round(range(g.delay)),
    slowComponentGain: range(g.slow),
    tauSlowComponentS: u(100, 180),
    vt1FractionOfCapacity: 0,
    vt2FractionOfCapacity: null,
    // Lower VCO2–VO2 slope near 1 in fed subjects (sue-1988-lower-slope); resting RQ 0.78–0.88 (invented).
    rqRest: u(0.78, 0.88),
    s1: u(0.88, 1.0),
    tauCo2StoresS: group.startsWith("heart") ? u(18, 30) : u(12, 25),
    lactateRestMmolL: u(0.7, 1.3),
    lactateAtCapacityMmolL: range(g.lactateCap),
    lactateExponent: u(1.9, 2.2),
    tauLactateRiseS: u(10, 25),
    tauLactateClearS: u(600, 1000),
    // ≈22 mL CO2 per mEq of lactic acid buffered by bicarbonate (beaver-1986-excess-co2); the effective pool
    // 0.10–0.15 L/kg is invented, chosen so that peak RER lands near 1.05–1.3 in health.
    bufferVolumeL: weightKg * u(0.1, 0.15),
    tauExcessCo2S: u(3, 8),
    veInterceptLMin: range(g.intercept),
    veVco2Slope: range(g.slope),
    compensationPerMmolL: u(0.04, 0.08),
    tauChemoreflexS: u(10, 20),
    mvvLMin: 0,
    vtRestL: range(g.vtRest),
    vtMaxL: range(g.vtMax),
    anatomicDeadSpaceL: u(0.17, 0.24),
    alveolarDeadSpaceFraction: range(g.alveolarDs),
    barometricMmHg: Math.round(u(735, 765)),
    hrRestBpm: Math.round(range(g.hrRest)),
    hrAtCapacityBpm: 0,
    hrExponent: range(g.hrExponent),
    tauHrS: group.startsWith("heart") ? u(30, 50) : u(20, 40),
    tauHrRecoveryS: range(g.hrRecoveryTau),
    spo2RestPct: round(range(g.spo2Rest), 0.1),
    spo2DropPct: range(g.spo2Drop),
    spo2Recorded: group === "athlete" || group === "healthy" || group === "sedentary" ? r.uniform() < 0.3 : true,
    eov:
      group === "heart-failure-eov"
        ? { periodS: u(45, 90), amplitudeFraction: u(0.18, 0.32), phaseRad: u(0, 2 * Math.PI) } // eov-definitions-review
        : null,
  };
  // Predicted HRmax 208 − 0.7·age (tanaka-2001-age-hrmax), scaled by the group's chronotropic fraction (invented).
  spec.hrAtCapacityBpm = Math.max(spec.hrRestBpm + 30, Math.round((208 - 0.7 * ageY) * range(g.hrFraction)));

  // Protocol rates.
  if (!treadmill) {
    const wAtCapacity = (vo2CapacityMlMin - vo2UnloadedMlMin) / spec.gainMlMinPerW;
    const rate = (60 * Math.max(10, wAtCapacity - spec.warmupW)) / Math.max(240, targetS - tauVo2S);
    spec.rampWPerMin = CYCLE_RATES.reduce((best, x) => (Math.abs(x - rate) < Math.abs(best - rate) ? x : best));
    if (spec.stepS !== null) {
      // Step height a multiple of 5 W; the mean rate follows from it.
      const stepW = Math.max(5, round((spec.rampWPerMin * spec.stepS) / 60, 5));
      spec.rampWPerMin = (stepW * 60) / spec.stepS;
    }
  } else {
    const running = g.running && vo2Kg > 42 && (r.uniform() < 0.5 || vo2Kg > 50); // walking grades top out near 60
    if (running) {
      // Running starts after a walking warm-up, at a speed costing at most ~45 % of capacity (invented).
      const maxStart = (0.45 * vo2Kg - 3.5) / 0.2 / (1000 / 60);
      spec.startSpeedKmh = round(clamp(u(8, 10), 8, Math.max(8, maxStart)), 0.5);
      spec.startGradePct = 1;
      if (spec.warmupS === 0) spec.warmupS = Math.round(u(120, 180));
      spec.warmupSpeedKmh = round(u(4.5, 6), 0.1);
    } else {
      spec.startSpeedKmh = round(group === "athlete" || group === "healthy" ? u(4.5, 6.5) : u(2.5, 4.5), 0.1);
      spec.startGradePct = pick([0, 0, 1, 2]);
      spec.speedKmhPerMin = r.uniform() < 0.5 ? round(u(0.05, 0.2), 0.05) : 0;
    }
    // Solve the free rate (speed for running, grade for walking) so that the demand reaches capacity at the
    // target time (bisection; common practice).
    const at = (rate: number): number => {
      const trial = { ...spec, stepS: null, speedKmhPerMin: running ? rate : spec.speedKmhPerMin, gradePctPerMin: running ? 0 : rate }; // prettier-ignore
      return demandOfLoad(trial, incrementalLoad(trial, Math.max(240, targetS - tauVo2S)));
    };
    let lo = 0;
    let hi = running ? 3 : 6;
    for (let k = 0; k < 40; k++) {
      const mid = (lo + hi) / 2;
      if (at(mid) < vo2CapacityMlMin) lo = mid;
      else hi = mid;
    }
    const rate = round((lo + hi) / 2, 0.05);
    if (running) spec.speedKmhPerMin = Math.max(0.1, rate);
    else spec.gradePctPerMin = Math.max(0.25, rate);
  }

  // Threshold levels: fractions of capacity, kept inside the incremental range (invented guards). Capacity at
  // least 300 mL/min above the demand at the start of the incremental phase (invented floor).
  const startDemand = demandOfLoad(spec, incrementalLoad(spec, 0));
  if (vo2CapacityMlMin < startDemand + 300) {
    vo2CapacityMlMin = Math.round(startDemand + 300);
    spec.vo2CapacityMlMin = vo2CapacityMlMin;
  }
  const span = vo2CapacityMlMin - startDemand;
  let vo2Lt = range(g.lt) * vo2CapacityMlMin;
  vo2Lt = clamp(vo2Lt, startDemand + 0.25 * span, startDemand + 0.7 * span);
  spec.vt1FractionOfCapacity = vo2Lt / vo2CapacityMlMin;
  if (r.uniform() >= g.noRcpProbability) {
    let vo2Rcp = range(g.rcp) * vo2CapacityMlMin;
    vo2Rcp = clamp(vo2Rcp, vo2Lt + 0.35 * (vo2CapacityMlMin - vo2Lt), 0.94 * vo2CapacityMlMin);
    spec.vt2FractionOfCapacity = vo2Rcp / vo2CapacityMlMin;
  }

  // Ventilation ceiling: MVV well above the demand in health; in lung disease MVV sits near or below the VE the
  // capacity would need, so ventilation limits the test (VE/MVV ≥ 85 %, radtke-2019-ers-cpet).
  const vco2AtCapacity = spec.rqRest * vo2RestMlMin + spec.s1 * (vo2CapacityMlMin - vo2RestMlMin) + 0.12 * vo2CapacityMlMin;
  const veAtCapacity = spec.veInterceptLMin + (spec.veVco2Slope * vco2AtCapacity) / 1000;
  if (group === "copd") {
    spec.mvvLMin = round(veAtCapacity * u(0.72, 0.95), 0.1);
    spec.ventilatoryStopFraction = u(0.92, 1.02);
  } else if (group === "interstitial") {
    spec.mvvLMin = round(veAtCapacity * u(0.85, 1.3), 0.1);
    spec.ventilatoryStopFraction = r.uniform() < 0.5 ? u(0.85, 0.95) : null;
  } else {
    // Peak VE ≈ 1.25 × the isocapnic estimate once compensation is added (invented).
    spec.mvvLMin = round(Math.max(1.3 * veAtCapacity * u(1.25, 1.7), group === "older" ? 70 : 90), 0.1);
  }
  spec.label = `${group} ${sex} ${ageY} y, ${protocol} #${i} (invented)`;
  return spec;
}

// ---------------------------------------------------------------------------------------------------------
// Simulation on a 1-s grid

interface Grid {
  /** Mouth signals at t = k s. */
  vo2: Float64Array;
  vco2: Float64Array;
  /** VE demand before ceiling and oscillation (isocapnic line × compensation), L/min. */
  ve: Float64Array;
  hr: Float64Array;
  lactate: Float64Array;
  workW: Float64Array;
  speedKmh: Float64Array;
  gradePct: Float64Array;
  incStartS: number;
  exEndS: number;
  endS: number;
  tLt: number;
  tRcp: number | null;
  endReason: SecondOpinionTest["secondOpinion"]["endReason"];
  vo2Lt: number;
  vo2Rcp: number | null;
}

const HARD_LIMIT_S = 1800;

function simulate(spec: SecondOpinionSpec): Grid {
  const cycle = spec.protocol === "cycle-ramp" || spec.protocol === "cycle-steps";
  const d = spec.transitDelayS;
  const C = spec.vo2CapacityMlMin;
  const incStart = spec.restS + spec.warmupS;
  const vo2Lt = spec.vt1FractionOfCapacity * C;
  const vo2Rcp = spec.vt2FractionOfCapacity === null ? null : spec.vt2FractionOfCapacity * C;
  const cap = incStart + HARD_LIMIT_S + 200 + spec.recoveryS + 5;
  const met = new Float64Array(cap);
  const la = new Float64Array(cap);
  const lung = new Float64Array(cap);
  const vo2 = new Float64Array(cap);
  const vco2 = new Float64Array(cap);
  const ve = new Float64Array(cap);
  const hr = new Float64Array(cap);
  const workW = new Float64Array(cap);
  const speedKmh = new Float64Array(cap);
  const gradePct = new Float64Array(cap);

  const aP = alpha(spec.tauVo2S);
  const aSc = alpha(spec.tauSlowComponentS);
  const aCo2 = alpha(spec.tauCo2StoresS);
  const aLaUp = alpha(spec.tauLactateRiseS);
  const aLaDown = alpha(spec.tauLactateClearS);
  const aEx = alpha(spec.tauExcessCo2S);
  const aChemo = alpha(spec.tauChemoreflexS);
  const aHr = alpha(spec.tauHrS);
  const aHrRec = alpha(spec.tauHrRecoveryS);
  const laAmp = spec.lactateAtCapacityMmolL - spec.lactateRestMmolL;
  const aerobicCo2 = (v: number): number => spec.rqRest * spec.vo2RestMlMin + spec.s1 * (v - spec.vo2RestMlMin);

  let p = spec.vo2RestMlMin;
  let sc = 0;
  let laNow = spec.lactateRestMmolL;
  let co2 = aerobicCo2(spec.vo2RestMlMin);
  let ex = 0;
  let comp = 0;
  let hrNow = spec.hrRestBpm;
  let tLt: number | null = null;
  let tRcp: number | null = null;
  let laRcp = 0;
  let endCandidate: number | null = null;
  let exEnd: number | null = null;
  let endReason: Grid["endReason"] = "capacity";
  let k = 0;
  for (; k < cap; k++) {
    if (exEnd === null && endCandidate !== null && k >= endCandidate) exEnd = endCandidate;
    if (exEnd !== null && k > exEnd + spec.recoveryS + 2) break;
    // Load and demand at time k.
    let demand = spec.vo2RestMlMin;
    if (k >= spec.restS && k < incStart) {
      if (cycle) {
        workW[k] = spec.warmupW;
        demand = demandOfLoad(spec, { workW: spec.warmupW, speedKmh: 0, gradePct: 0 });
      } else {
        speedKmh[k] = spec.warmupSpeedKmh;
        demand = demandOfLoad(spec, { workW: 0, speedKmh: spec.warmupSpeedKmh, gradePct: 0 });
      }
    } else if (k >= incStart && (exEnd === null || k < exEnd)) {
      const load = incrementalLoad(spec, k - incStart);
      workW[k] = load.workW;
      speedKmh[k] = load.speedKmh;
      gradePct[k] = load.gradePct;
      demand = demandOfLoad(spec, load);
    } else if (exEnd !== null && k >= exEnd) {
      if (cycle && spec.recoveryW !== null) {
        workW[k] = spec.recoveryW;
        demand = demandOfLoad(spec, { workW: spec.recoveryW, speedKmh: 0, gradePct: 0 });
      } else if (!cycle && spec.recoverySpeedKmh !== null) {
        speedKmh[k] = spec.recoverySpeedKmh;
        demand = demandOfLoad(spec, { workW: 0, speedKmh: spec.recoverySpeedKmh, gradePct: 0 });
      }
    }
    // Muscle VO2: first-order primary component plus a slow component above the lactate threshold
    // (whipp-1982-vo2-kinetics, poole-1994-slow-component; both recalled), limited softly at capacity.
    if (k > 0) {
      p += (demand - p) * aP;
      sc += (spec.slowComponentGain * Math.max(0, p - vo2Lt) - sc) * aSc;
    }
    met[k] = softMin(p + sc, C, 0.012 * C);
    // Lactate: steady state rises as a power of the metabolic rate above the threshold (invented shape).
    const x = Math.max(0, met[k] - vo2Lt) / (C - vo2Lt);
    const laSs = spec.lactateRestMmolL + laAmp * Math.pow(x, spec.lactateExponent);
    const laPrev = laNow;
    if (k > 0) laNow += (laSs - laNow) * (laSs >= laNow ? aLaUp : aLaDown);
    la[k] = laNow;
    // Excess CO2 from bicarbonate buffering: 22.4 mL per mmol (beaver-1986-excess-co2), only while lactate
    // accumulates (CO2 retention during clearance is left out). It is released in blood and reaches the lungs
    // without the tissue CO2 stores that slow the aerobic CO2 (modelling choice).
    const exRaw = 22.4 * spec.bufferVolumeL * Math.max(0, laNow - laPrev) * 60;
    ex += (exRaw - ex) * aEx;
    co2 += (aerobicCo2(met[k]) - co2) * (k > 0 ? aCo2 : 1);
    lung[k] = co2 + ex;
    // Threshold crossings of metabolic VO2 (linear interpolation within the 1-s step), during exercise only.
    const inExercise = k > incStart && (exEnd === null || k <= exEnd);
    if (inExercise && tLt === null && met[k - 1] < vo2Lt && met[k] >= vo2Lt) {
      tLt = k - 1 + (vo2Lt - met[k - 1]) / (met[k] - met[k - 1]);
    }
    if (inExercise && vo2Rcp !== null && tRcp === null && met[k - 1] < vo2Rcp && met[k] >= vo2Rcp) {
      const f = (vo2Rcp - met[k - 1]) / (met[k] - met[k - 1]);
      tRcp = k - 1 + f;
      laRcp = la[k - 1] + f * (la[k] - la[k - 1]);
    }
    // Mouth signals: every metabolic signal arrives after the transit delay d.
    const km = Math.max(0, k - d);
    vo2[k] = met[km];
    vco2[k] = lung[km];
    // Ventilation: isocapnic VE–VCO2 line (ward-2021-ve-vco2) times the acidosis compensation drive.
    const drive = tRcp !== null && km >= tRcp ? spec.compensationPerMmolL * Math.max(0, la[km] - laRcp) : 0;
    comp += (drive - comp) * aChemo;
    ve[k] = (spec.veInterceptLMin + (spec.veVco2Slope * vco2[k]) / 1000) * (1 + comp);
    // Heart rate: power of the VO2 fraction, first-order on and (slower) off kinetics (invented shapes).
    const frac = clamp((vo2[k] - spec.vo2RestMlMin) / (C - spec.vo2RestMlMin), 0, 1.05);
    const hrTarget = spec.hrRestBpm + (spec.hrAtCapacityBpm - spec.hrRestBpm) * Math.pow(frac, spec.hrExponent);
    hrNow += (hrTarget - hrNow) * (exEnd !== null && k >= exEnd ? aHrRec : aHr);
    hr[k] = hrNow;

    // End of exercise.
    if (inExercise && exEnd === null) {
      let candidate: number | null = null;
      let reason: Grid["endReason"] = "capacity";
      if (p + sc >= 0.995 * C) {
        candidate = k + spec.plateauS;
        reason = spec.plateauS > 0 ? "plateau" : "capacity";
      }
      if (spec.ventilatoryStopFraction !== null && ve[k] >= spec.ventilatoryStopFraction * spec.mvvLMin) {
        candidate = k + 15; // invented: 15 s more at the ventilatory limit
        reason = "ventilatory-limit";
      }
      if (spec.earlyStopFraction !== null && tLt !== null) {
        const upper = vo2Rcp ?? C;
        if (met[k] >= vo2Lt + spec.earlyStopFraction * (upper - vo2Lt)) {
          candidate = k;
          reason = "stopped-early";
        }
      }
      if (k - incStart >= HARD_LIMIT_S) {
        if (tLt === null) throw new Error("second-opinion spec never reaches its lactate threshold");
        candidate = k;
        reason = "time-limit";
      }
      if (candidate !== null && tLt !== null && endCandidate === null) {
        endCandidate = Math.max(candidate, Math.ceil(tLt + d + 90)); // VT1 at least 90 s before the end (invented)
        endReason = reason;
      }
      // The RCP, once reached, shows for at least 45 s before the end (invented).
      if (endCandidate !== null && tRcp !== null) endCandidate = Math.max(endCandidate, Math.ceil(tRcp + d + 45));
      if (endCandidate !== null && endCandidate - incStart > HARD_LIMIT_S + 150) endCandidate = incStart + HARD_LIMIT_S + 150;
    }
  }
  if (exEnd === null || tLt === null) throw new Error("second-opinion simulation did not finish its exercise phase");
  const n = k;
  const cut = (a: Float64Array): Float64Array => a.slice(0, n);
  return {
    vo2: cut(vo2),
    vco2: cut(vco2),
    ve: cut(ve),
    hr: cut(hr),
    lactate: cut(la),
    workW: cut(workW),
    speedKmh: cut(speedKmh),
    gradePct: cut(gradePct),
    incStartS: incStart,
    exEndS: exEnd,
    endS: exEnd + spec.recoveryS,
    tLt,
    tRcp,
    endReason,
    vo2Lt,
    vo2Rcp,
  };
}

// ---------------------------------------------------------------------------------------------------------
// Noise-free values at any time

interface MouthValues {
  vo2MlMin: number;
  vco2MlMin: number;
  veLMin: number;
  hrBpm: number;
  rrBrMin: number;
  vtL: number;
  petco2MmHg: number;
  peto2MmHg: number;
  spo2Pct: number;
}

function mouthAt(spec: SecondOpinionSpec, grid: Grid, t: number): MouthValues {
  const vo2 = gridAt(grid.vo2, t);
  const vco2Base = gridAt(grid.vco2, t);
  const frac = clamp((vo2 - spec.vo2RestMlMin) / (spec.vo2CapacityMlMin - spec.vo2RestMlMin), 0, 1.05);
  const veRest = spec.veInterceptLMin + (spec.veVco2Slope * spec.rqRest * spec.vo2RestMlMin) / 1000;
  const kVt = veRest * Math.max(0.2, spec.vtMaxL / spec.vtRestL - 1);
  // Ventilatory ceiling near MVV (soft; invented width 3 % of MVV).
  const cap = (v: number): number => softMin(v, 0.97 * spec.mvvLMin, 0.03 * spec.mvvLMin);
  // Breathing pattern: VT = VTmax·VE/(VE + k), k set so that VT = VTrest at resting VE (invented hyperbola);
  // breathing frequency kept ≤ 62 /min by deepening the breath instead (invented ceiling).
  const tidal = (v: number): number => Math.max((spec.vtMaxL * v) / (v + kVt), v / 62);
  const veBase = cap(gridAt(grid.ve, t));
  const vtBase = tidal(veBase);
  // Dead space and alveolar gases: alveolar ventilation equation PaCO2 = 0.863·VCO2/VA and alveolar gas equation
  // (alveolar-gas-equations, common practice); anatomic dead space grows with VT (invented 0.06 L/L).
  const vdAnat = spec.anatomicDeadSpaceL + 0.06 * vtBase;
  const fAlv = spec.alveolarDeadSpaceFraction;
  const vdPhys = vdAnat + fAlv * Math.max(0, vtBase - vdAnat);
  const va = Math.max(0.5, (veBase / vtBase) * (vtBase - vdPhys));
  const paco2 = clamp((0.863 * vco2Base) / va, 15, 75);
  // End-tidal CO2: perfused alveolar gas diluted by alveolar dead-space gas, plus the tidal rise of exercise
  // (PETCO2 above PaCO2 at high CO2 output, jones-1979-petco2, recalled; size invented).
  let petco2 = paco2 * (1 - fAlv) + Math.min(4, (1.2 * vco2Base) / 1000) * Math.max(0, 1 - 4 * fAlv);
  let ve = veBase;
  let vco2 = vco2Base;
  if (spec.eov !== null) {
    // Oscillation of ventilation fading with intensity to 40 % of its size at capacity (invented); CO2 output at the
    // mouth follows at a third of the amplitude a sixth of a cycle later, PETCO2 swings against VE (invented sizes).
    const a = spec.eov.amplitudeFraction * (frac <= 0.5 ? 1 : 1 - 1.2 * (Math.min(frac, 1) - 0.5));
    const w = (2 * Math.PI) / spec.eov.periodS;
    ve = cap(gridAt(grid.ve, t) * (1 + a * Math.sin(w * t + spec.eov.phaseRad)));
    vco2 = vco2Base * (1 + (a / 3) * Math.sin(w * (t - spec.eov.periodS / 6) + spec.eov.phaseRad));
    petco2 *= 1 - 0.4 * a * Math.sin(w * (t - spec.eov.periodS / 8) + spec.eov.phaseRad);
  }
  const vt = tidal(ve);
  const rr = ve / vt;
  const fio2 = 0.2093;
  const pio2 = fio2 * (spec.barometricMmHg - 47);
  const peto2 = pio2 - petco2 * (fio2 + (1 - fio2) / (vco2 / vo2));
  const spo2 = spec.spo2RestPct - spec.spo2DropPct * Math.pow(Math.min(frac, 1), 1.5);
  return {
    vo2MlMin: vo2,
    vco2MlMin: vco2,
    veLMin: ve,
    hrBpm: gridAt(grid.hr, t),
    rrBrMin: rr,
    vtL: vt,
    petco2MmHg: petco2,
    peto2MmHg: peto2,
    spo2Pct: spo2,
  };
}

// ---------------------------------------------------------------------------------------------------------
// Breaths

function phaseAt(grid: Grid, spec: SecondOpinionSpec, t: number): Phase {
  if (t < spec.restS) return "rest";
  if (t < grid.incStartS) return "warmup";
  if (t < grid.exEndS) return "exercise";
  return "recovery";
}

/** One artefact's multipliers (invented sizes). */
interface ArtefactEffect {
  kind: ArtefactKind;
  duration: number;
  vt: number;
  gas: number;
  petco2: number;
}

function drawArtefact(r: SeededRandom): ArtefactEffect {
  const x = r.uniform();
  const u = (lo: number, hi: number): number => lo + (hi - lo) * r.uniform();
  if (x < 0.3) return { kind: "cough", duration: u(0.35, 0.6), vt: u(1.4, 2.4), gas: u(1.5, 2.5), petco2: -u(3, 8) };
  if (x < 0.55) return { kind: "sigh", duration: u(1.2, 1.6), vt: u(2, 3), gas: u(1.5, 2.1), petco2: -u(0, 2) };
  if (x < 0.8) return { kind: "swallow", duration: u(2, 3), vt: u(0.4, 0.7), gas: u(0.3, 0.55), petco2: u(0, 3) };
  return { kind: "leak", duration: 1, vt: u(0.6, 0.85), gas: 1, petco2: -u(1, 3) };
}

/**
 * Generate one second-opinion test (deterministic for (spec, seed)): breath table with breath-to-breath noise,
 * artefacts and phase markers, the same breaths noise-free, and the truth by construction. Invented data.
 *
 * Noise: per breath, ln VT and ln(breath duration) deviate (correlated, AR(1)); VE = VT·60/duration; VO2 and VCO2
 * carry a share of the breath's ln(VE) deviation plus independent analyser noise; artefacts (cough, sigh with the
 * small breath after it, swallow, runs of mask leak) at the level's rate. Noise "none": table = noise-free.
 *
 * @param spec from `secondOpinionSpec` (or hand-made)
 * @param seed noise seed
 */
export function generateSecondOpinionTest(spec: SecondOpinionSpec, seed: number): SecondOpinionTest {
  const grid = simulate(spec);
  const cycle = spec.protocol === "cycle-ramp" || spec.protocol === "cycle-steps";
  const ns = noiseSettings(spec.noise);
  const noisy = spec.noise !== "none";
  const r = seededRandom(mixSeed(seed, 7919));

  const rows: BreathRow[] = [];
  const free: BreathRow[] = [];
  const artefacts: { index: number; kind: ArtefactKind }[] = [];
  let zV = 0;
  let zT = 0;
  const a = ns.autocorrelation;
  const innov = Math.sqrt(1 - a * a);
  let t = 0;
  let leakLeft = 0;
  let leakVt = 1;
  let postSigh = false;
  for (;;) {
    const now = mouthAt(spec, grid, t);
    const n1 = r.normal();
    const n2 = r.normal();
    const rho = ns.durationVolumeCorrelation;
    zV = a * zV + innov * ns.tidalVolumeLogSd * n1;
    zT = a * zT + innov * ns.durationLogSd * (rho * n1 + Math.sqrt(1 - rho * rho) * n2);
    let art: ArtefactEffect | null = null;
    if (postSigh) {
      art = { kind: "post-sigh", duration: 1.3, vt: 0.6, gas: 0.6, petco2: 1 };
      postSigh = false;
    } else if (leakLeft > 0) {
      art = { kind: "leak", duration: 1, vt: leakVt, gas: 1, petco2: -1 };
      leakLeft--;
    } else if (noisy && t > 20 && r.uniform() < ns.artefactRate) {
      art = drawArtefact(r);
      if (art.kind === "sigh") postSigh = true;
      if (art.kind === "leak") {
        leakLeft = 2 + r.int(10);
        leakVt = art.vt;
      }
    }
    const dur = (60 / now.rrBrMin) * (noisy ? Math.exp(zT) : 1) * (art?.duration ?? 1);
    const tb = Math.round((t + dur) * 100) / 100;
    if (tb > grid.endS) break;
    t = tb;
    const nf = mouthAt(spec, grid, tb);
    const phase = phaseAt(grid, spec, tb);
    const loadAt = Math.min(grid.workW.length - 1, Math.floor(tb));
    const freeRow: BreathRow = {
      timeS: tb,
      vo2MlMin: nf.vo2MlMin,
      vco2MlMin: nf.vco2MlMin,
      veLMin: nf.veLMin,
      hrBpm: nf.hrBpm,
      rrBrMin: nf.rrBrMin,
      vtL: nf.vtL,
      petco2MmHg: nf.petco2MmHg,
      peto2MmHg: nf.peto2MmHg,
      phase,
    };
    if (cycle) freeRow.workW = grid.workW[loadAt];
    else {
      freeRow.speedKmh = grid.speedKmh[loadAt];
      freeRow.gradePct = grid.gradePct[loadAt];
    }
    if (spec.spo2Recorded) freeRow.spo2Pct = nf.spo2Pct;
    free.push(freeRow);
    if (!noisy) {
      rows.push({ ...freeRow });
      continue;
    }
    if (art !== null) artefacts.push({ index: free.length - 1, kind: art.kind });
    // Noisy breath. Flow-sensor noise of 1 % on VT (invented).
    const vt = nf.vtL * Math.exp(zV + 0.01 * r.normal()) * (art?.vt ?? 1);
    const rr = 60 / dur;
    const ve = vt * rr;
    const u = Math.log(ve / nf.veLMin);
    const gasFactor = art === null ? 1 : art.kind === "leak" ? art.vt : art.gas;
    const uGas = art === null || art.kind === "leak" ? u - Math.log(gasFactor) : 0;
    const vo2 = nf.vo2MlMin * Math.exp(ns.vo2Coupling * uGas) * gasFactor + ns.vo2SdMlMin * r.normal();
    const vco2 = nf.vco2MlMin * Math.exp(ns.vco2Coupling * uGas) * gasFactor + ns.vco2SdMlMin * r.normal();
    // Deeper breaths wash out a little more CO2 (invented 3 mmHg per unit of ln VE deviation).
    const petco2 = nf.petco2MmHg - 3 * (art === null ? u : 0) + (art?.petco2 ?? 0) + ns.endTidalSdMmHg * r.normal();
    const peto2 = nf.peto2MmHg + 4 * (art === null ? u : 0) - 1.2 * (art?.petco2 ?? 0) + 1.3 * ns.endTidalSdMmHg * r.normal();
    const row: BreathRow = {
      timeS: tb,
      vo2MlMin: Math.round(Math.max(20, vo2)),
      vco2MlMin: Math.round(Math.max(20, vco2)),
      veLMin: round(ve, 0.1),
      hrBpm: Math.round(nf.hrBpm + ns.hrSdBpm * r.normal()),
      rrBrMin: round(rr, 0.1),
      vtL: round(vt, 0.001),
      petco2MmHg: round(Math.max(5, petco2), 0.1),
      peto2MmHg: round(peto2, 0.1),
      phase,
    };
    if (cycle) row.workW = freeRow.workW;
    else {
      row.speedKmh = round(freeRow.speedKmh ?? 0, 0.1);
      row.gradePct = round(freeRow.gradePct ?? 0, 0.1);
    }
    if (spec.spo2Recorded) row.spo2Pct = Math.min(100, Math.round(nf.spo2Pct + 0.6 * r.normal()));
    rows.push(row);
  }

  const fields: (NumericField | "phase")[] = ["timeS", "vo2MlMin", "vco2MlMin", "veLMin", "hrBpm"];
  if (cycle) fields.push("workW");
  else fields.push("speedKmh", "gradePct");
  fields.push("rrBrMin", "vtL", "peto2MmHg", "petco2MmHg");
  if (spec.spo2Recorded) fields.push("spo2Pct");
  fields.push("phase");

  // Truth.
  const d = spec.transitDelayS;
  const loadOf = (time: number): { workW?: number; speedKmh?: number; gradePct?: number } => {
    const kk = Math.min(grid.workW.length - 1, Math.floor(time));
    return cycle ? { workW: grid.workW[kk] } : { speedKmh: grid.speedKmh[kk], gradePct: grid.gradePct[kk] };
  };
  const point = (time: number): TruthPoint => {
    const m = mouthAt(spec, grid, time);
    return { timeS: time, vo2MlMin: m.vo2MlMin, vco2MlMin: m.vco2MlMin, veLMin: m.veLMin, workW: loadOf(time).workW ?? 0, hrBpm: m.hrBpm }; // prettier-ignore
  };
  const tVt1 = grid.tLt + d;
  const tVt2 = grid.tRcp === null ? null : grid.tRcp + d;
  const exEnd = grid.exEndS;
  const inc = grid.incStartS;
  const olsOver = (from: number, to: number, xs: (b: BreathRow) => number, ys: (b: BreathRow) => number): number => {
    const sel = free.filter((b) => b.timeS >= from && b.timeS <= to);
    return linearRegression(sel.map(xs), sel.map(ys)).slope;
  };
  const vo2L = (b: BreathRow): number => (b.vo2MlMin ?? NaN) / 1000;
  const vco2L = (b: BreathRow): number => (b.vco2MlMin ?? NaN) / 1000;
  const veOf = (b: BreathRow): number => b.veLMin ?? NaN;
  const slopeEnd = tVt2 ?? exEnd;
  const s1From = tVt1 - (inc + 60) >= 60 ? inc + 60 : inc;

  // Peak: highest 30-s mean of noise-free VO2 in the incremental phase (window inside it; common practice).
  const ex = free.filter((b) => b.timeS >= inc && b.timeS <= exEnd);
  let best = { vo2: -Infinity, vco2: 0, ve: 0, hr: 0, t: exEnd };
  let lo = 0;
  const sums = { vo2: 0, vco2: 0, ve: 0, hr: 0 };
  for (let hi = 0; hi < ex.length; hi++) {
    sums.vo2 += ex[hi].vo2MlMin ?? 0;
    sums.vco2 += ex[hi].vco2MlMin ?? 0;
    sums.ve += ex[hi].veLMin ?? 0;
    sums.hr += ex[hi].hrBpm ?? 0;
    while (ex[hi].timeS - ex[lo].timeS > 30) {
      sums.vo2 -= ex[lo].vo2MlMin ?? 0;
      sums.vco2 -= ex[lo].vco2MlMin ?? 0;
      sums.ve -= ex[lo].veLMin ?? 0;
      sums.hr -= ex[lo].hrBpm ?? 0;
      lo++;
    }
    const m = hi - lo + 1;
    if (ex[hi].timeS - inc >= 30 && sums.vo2 / m > best.vo2) {
      best = { vo2: sums.vo2 / m, vco2: sums.vco2 / m, ve: sums.ve / m, hr: sums.hr / m, t: (ex[hi].timeS + ex[lo].timeS) / 2 };
    }
  }
  const peakWork = cycle ? Math.max(...ex.map((b) => b.workW ?? 0)) : 0;

  const truth: SyntheticTruth = {
    invented: true,
    vt1: point(tVt1),
    vt2: tVt2 === null ? null : point(tVt2),
    peak: { vo2MlMin: best.vo2, vco2MlMin: best.vco2, veLMin: best.ve, hrBpm: best.hr, workW: peakWork, rer: best.vco2 / best.vo2, timeS: best.t }, // prettier-ignore
    vco2Vo2SlopeBelowVt1: olsOver(s1From, tVt1, vo2L, vco2L),
    vco2Vo2SlopeAboveVt1: olsOver(tVt1, slopeEnd, vo2L, vco2L),
    veVco2SlopeToVt2: olsOver(inc, slopeEnd, vco2L, veOf),
    veVco2SlopeToPeak: olsOver(inc, exEnd, vco2L, veOf),
    deltaVo2DeltaWrMlMinW: cycle
      ? olsOver(
          inc + 60,
          exEnd,
          (b) => b.workW ?? NaN,
          (b) => b.vo2MlMin ?? NaN,
        )
      : 0,
    phases: { restEndS: spec.restS, warmupEndS: inc, rampEndS: exEnd, endS: grid.endS },
    rampWPerMin: cycle ? spec.rampWPerMin : 0,
    weightKg: spec.weightKg,
  };

  return {
    table: { shape: "breath", rows, fields: [...fields] },
    noiseFree: { shape: "breath", rows: free, fields: [...fields] },
    truth,
    spec,
    seed,
    secondOpinion: {
      noise: spec.noise,
      group: spec.group,
      protocol: spec.protocol,
      ergometer: cycle ? "cycle" : "treadmill",
      vt1MetabolicTimeS: grid.tLt,
      vt2MetabolicTimeS: grid.tRcp,
      transitDelayS: d,
      endReason: grid.endReason,
      vt1Load: loadOf(tVt1),
      vt2Load: tVt2 === null ? null : loadOf(tVt2),
      twoLineVt1Vo2MlMin: twoLineCornerX(free, s1From, slopeEnd, vo2L, vco2L) * 1000,
      twoLineVt2Vco2MlMin: tVt2 === null ? null : twoLineCornerX(free, tVt1, exEnd, vco2L, veOf) * 1000,
      peakLactateMmolL: Math.max(...grid.lactate),
      artefacts,
      noiseSettings: ns,
    },
  };
}

/**
 * x at the intersection of the least-squares two-line fit (any split with ≥ 8 points a side; O(n) with prefix
 * sums) of y on x over the breaths in [from, to]. NaN when too few breaths.
 */
function twoLineCornerX(
  rows: BreathRow[],
  from: number,
  to: number,
  xs: (b: BreathRow) => number,
  ys: (b: BreathRow) => number,
): number {
  const sel = rows.filter((b) => b.timeS >= from && b.timeS <= to);
  const n = sel.length;
  if (n < 16) return NaN;
  const ps = new PrefixSums(sel.map(xs), sel.map(ys));
  let bestSse = Infinity;
  let bestX = NaN;
  let xMin = Infinity;
  let xMax = -Infinity;
  for (const b of sel) {
    xMin = Math.min(xMin, xs(b));
    xMax = Math.max(xMax, xs(b));
  }
  for (let s = 8; s <= n - 8; s++) {
    const left = ps.fit(0, s);
    const right = ps.fit(s, n);
    const sse = left.sse + right.sse;
    if (sse < bestSse && left.slope !== right.slope) {
      bestSse = sse;
      bestX = (right.intercept - left.intercept) / (left.slope - right.slope);
    }
  }
  return bestX >= xMin && bestX <= xMax ? bestX : NaN;
}
