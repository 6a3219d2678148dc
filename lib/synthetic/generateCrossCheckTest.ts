import type { BreathRow, BreathTable, NumericField, Phase } from "../breath";
import { PrefixSums, seededRandom, type SeededRandom } from "../numeric";
import type { NoiseLevel, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Cross-check model: a synthetic CPET generator written from physiology, independently of the
 * threshold detectors, for blind checks. Every number not tied to another source id is invented
 * (source id `cross-check-model-invented`).
 *
 * Model in brief (each relation names its source id from `SYNTHETIC_SOURCES`):
 * - Protocols: seated/standing rest, optional unloaded pedalling or warm-up walk, an incremental phase
 *   (cycle ramp, cycle steps, treadmill walking-grade or running-speed ramp, treadmill stages) to
 *   exhaustion, then recovery (`radtke-2019-protocol`, confirmed, for the phase lengths).
 * - VO2 demand: cycle = unloaded VO2 (`wasserman-unloaded-pedalling`, recalled) + gain·W (gain around
 *   `hansen-1987-ramp-gain`, confirmed); treadmill = ACSM walking/running equations
 *   (`acsm-metabolic-equations`, secondary) × an individual economy factor (invented). Above VT1 an extra
 *   slow-component VO2 (`gaesser-1996-slow-component`, recalled); in part of the heart-failure group the
 *   gain falls near peak (`hansen-1987-ramp-gain`: lower ΔVO2/ΔWR in circulatory disorders).
 * - VO2 at the mouth: demand → pure delay (phase I) → first-order phase II lag τ → a 4 s mixing lag
 *   (`whipp-1982-kinetics`, recalled; the mixing lag is invented and keeps dVO2/dt continuous).
 * - CO2: aerobic VCO2 = RER_rest·VO2_rest + S1·(VO2 − VO2_rest) with S1 ≈ 1 (`sue-1988-modified-v-slope`,
 *   confirmed). Blood lactate is flat up to VT1, then rises exponentially with VO2
 *   (`hughson-1987-lactate-continuous`, recalled): La = La0 + c·(e^z − 1 − z), z = (VO2 − VO2_VT1)/s.
 *   Buffering releases excess CO2 at G·dLa/dt (`beaver-1986-buffering`: ≈22 mL CO2 per mEq; G = 22·V with
 *   V an effective buffering volume, set so the built-in peak RER is reached — invented). Aerobic and
 *   excess CO2 pass through a CO2-store lag τc (`whipp-1982-kinetics`, VCO2 slower than VO2).
 * - Ventilation: VA = 0.863·VCO2/PaCO2, VE = VA/(1 − VD/VT) (`alveolar-ventilation-equation`, common
 *   practice). PaCO2 is flat (isocapnic buffering) until VT2, then falls by β mmHg per mmol/L of lactate
 *   above its VT2 value (`winters-1967-compensation`, recalled; β invented, ≤ Winters' 1.5). VT = VTmax·
 *   (1 − e^(−VE/k)) (`hey-1966-pattern`, recalled), RR = VE/VT. PETCO2 from PaCO2 and VT by inverting
 *   `jones-1979-petco2-paco2` (recalled), diluted by alveolar dead space; PETO2 from the alveolar gas
 *   equation (`alveolar-ventilation-equation`).
 * - Truth (onset convention, both thresholds):
 *   VT1 = the VO2 at the mouth at the instant excess CO2 from bicarbonate buffering begins
 *   (= `vt1Vo2MlMin` exactly; the excess then grows smoothly, so the corner of two fitted lines lies a
 *   little later, by about τc). VT2 = the moment PaCO2 starts to fall, i.e. VE starts rising faster than
 *   VCO2 and PETCO2 turns down (VO2 at the mouth = `vt2Vo2MlMin`); null when the spec has no RCP.
 *   Truth points are read from the trend signals (without oscillatory ventilation).
 */

/** Population group of a cross-check test (invented mix, `cross-check-model-invented`). */
export type CrossCheckGroup = "athlete" | "healthy-active" | "sedentary" | "older" | "heart-failure" | "copd-like";

/** Incremental protocol shape. */
export type CrossCheckProtocol = "cycle-ramp" | "cycle-steps" | "treadmill-ramp" | "treadmill-steps";

/** Everything that shapes one cross-check test. Units in the names; all values invented unless a source is named. */
export interface CrossCheckSpec {
  label: string;
  group: CrossCheckGroup;
  ageY: number;
  sex: "male" | "female";
  weightKg: number;
  noise: NoiseLevel;

  // ---- protocol ----
  protocol: CrossCheckProtocol;
  /** Rest before exercise, s. */
  restS: number;
  /** Unloaded pedalling / warm-up walk, s (0 = none: the incremental phase starts from rest). */
  warmupS: number;
  /** Cycle: warm-up load, W. */
  warmupW: number;
  /** Cycle: load at the start of the incremental phase, W. */
  startW: number;
  /** Cycle: mean rate of load increase, W/min (steps: step size = rate·stageS/60). 0 on a treadmill. */
  rampWPerMin: number;
  /** Stage length of stepped protocols, s; null = continuous ramp. */
  stageS: number | null;
  /** Treadmill: warm-up walking speed, km/h (grade 0 %). */
  warmupSpeedKmh: number;
  /** Treadmill: speed and grade at the start of the incremental phase. */
  startSpeedKmh: number;
  startGradePct: number;
  /** Treadmill: mean increase of speed (km/h per min) and grade (% per min). */
  speedKmhPerMin: number;
  gradePctPerMin: number;
  /** Treadmill economy: measured VO2 / ACSM-predicted VO2 (invented individual variation). */
  treadmillEconomy: number;
  recoveryS: number;
  /** Cycle recovery load, W. */
  recoveryW: number;
  /** Treadmill recovery speed, km/h (0 = standing). */
  recoverySpeedKmh: number;

  // ---- oxygen uptake ----
  vo2RestMlMin: number;
  /** Cycle: steady VO2 of pedalling at 0 W, mL/min (`wasserman-unloaded-pedalling`, recalled). */
  vo2UnloadedMlMin: number;
  /** Cycle: steady-state ΔVO2/ΔWR below VT1, mL/min/W (`hansen-1987-ramp-gain`). */
  gainMlMinPerW: number;
  /** Extra VO2 demand above VT1 as a fraction of the demand above VT1 (slow component, `gaesser-1996-slow-component`). */
  slowComponentFraction: number;
  /** Loss of VO2 gain above 80 % of peak (heart failure), fraction 0–1; 0 = none. */
  gainFallFraction: number;
  /** Phase I duration (pure delay), s, and phase II time constant, s (`whipp-1982-kinetics`). */
  delayVo2S: number;
  tauVo2S: number;
  /** Off-kinetics time constant in recovery, s. */
  tauVo2OffS: number;
  /** Peak VO2 at the mouth the test ends at, mL/min. */
  peakVo2MlMin: number;
  /** VO2 levels off: demand is capped at peak and exercise goes on for `plateauS` seconds. 0 = no plateau. */
  plateauS: number;
  /** VT1 truth: VO2 at the mouth where excess CO2 begins, mL/min. */
  vt1Vo2MlMin: number;
  /** VT2/RCP truth: VO2 at the mouth where PaCO2 starts to fall, mL/min; null = no respiratory compensation. */
  vt2Vo2MlMin: number | null;

  // ---- carbon dioxide and lactate ----
  rerRest: number;
  /** Metabolic VCO2-vs-VO2 slope below VT1 (S1, `sue-1988-modified-v-slope`). */
  s1: number;
  /** CO2-store lag of VCO2 behind the metabolic CO2, s. */
  tauCo2S: number;
  lactateRestMmolL: number;
  lactatePeakMmolL: number;
  /** (peak VO2 − VT1 VO2)/s of the exponential lactate curve (curvature, dimensionless). */
  lactateCurvature: number;
  /** Peak RER the buffering volume is set to reach on the mean rate of VO2 rise. */
  targetPeakRer: number;
  /** Decay of excess CO2 output in recovery, s. */
  tauExcessRecoveryS: number;

  // ---- ventilation ----
  paco2RestMmHg: number;
  /** Respiratory compensation, mmHg fall of PaCO2 per mmol/L of lactate above its VT2 value. */
  compensationMmHgPerMmolL: number;
  /** Rise of PaCO2 towards peak from ventilatory limitation (no RCP), mmHg; 0 = none. */
  paco2RiseAtPeakMmHg: number;
  /** Anatomic dead space at zero VT, L (grows by 8 % of VT with airway distension), and alveolar dead space, L. */
  vdAnatomicL: number;
  vdAlveolarL: number;
  vtMaxL: number;
  /** Lag of VE behind its target, s. */
  tauVeS: number;
  /** Hyperventilation at rest (anxiety), mmHg PaCO2 below the set point, fading over the warm-up; 0 = none. */
  restHyperventilationMmHg: number;
  barometricMmHg: number;

  // ---- heart rate and saturation ----
  hrRestBpm: number;
  hrPeakBpm: number;
  /** HR = rest + (peak − rest)·q^exponent, q = normalised VO2 (exponent > 1: flattening O2 pulse). */
  hrExponent: number;
  /** Time constant of heart-rate recovery, s. */
  tauHrRecoveryS: number;
  spo2RestPct: number;
  spo2DropPct: number;

  // ---- oscillatory ventilation ----
  /** Exercise oscillatory ventilation: cycle length, s; amplitude as a fraction of mean VE; fades out at
   * `fadeAtFraction` of the incremental phase. null = none (`eov-criteria-review`, secondary). */
  eov: { periodS: number; amplitudeFraction: number; fadeAtFraction: number } | null;
}

/** Breath-to-breath noise of one level. Magnitudes invented (`cross-check-model-invented`). */
export interface CrossCheckNoise {
  /** Coefficient of variation of breath duration (log-normal). */
  intervalCv: number;
  /** SD of the breath-depth factor (AR(1), `liang-1996-autocorrelation`). */
  depthSd: number;
  depthAutocorrelation: number;
  /** Additive Gaussian VO2 / VCO2 noise, mL/min, independent of metabolic rate (`lamarra-1987-noise`). */
  vo2SdMlMin: number;
  vco2SdMlMin: number;
  petco2SdMmHg: number;
  peto2SdMmHg: number;
  hrSdBpm: number;
  spo2SdPct: number;
  /** Fraction of breaths carrying an artefact (sigh, cough, swallow, sensor spike). */
  artefactRate: number;
}

/**
 * Noise levels. "low" ≈ a good modern cart and a calm subject, "moderate" ≈ a typical clinical test,
 * "high" ≈ a noisy, anxious or irregular breather. Measured on exercise breaths without artefacts
 * (robust SD of breath minus noise-free value): VO2 ≈ 35–90 (low), 75–170 (moderate), 140–330 mL/min
 * (high); VE ≈ 3–8 %, 7–14 %, 12–25 % of the value. All invented.
 */
export const CROSS_CHECK_NOISE: Record<NoiseLevel, CrossCheckNoise> = {
  none: {
    intervalCv: 0,
    depthSd: 0,
    depthAutocorrelation: 0,
    vo2SdMlMin: 0,
    vco2SdMlMin: 0,
    petco2SdMmHg: 0,
    peto2SdMmHg: 0,
    hrSdBpm: 0,
    spo2SdPct: 0,
    artefactRate: 0,
  },
  low: {
    intervalCv: 0.08,
    depthSd: 0.04,
    depthAutocorrelation: 0.3,
    vo2SdMlMin: 45,
    vco2SdMlMin: 40,
    petco2SdMmHg: 0.6,
    peto2SdMmHg: 1,
    hrSdBpm: 0.8,
    spo2SdPct: 0.4,
    artefactRate: 0.004,
  },
  moderate: {
    intervalCv: 0.15,
    depthSd: 0.08,
    depthAutocorrelation: 0.3,
    vo2SdMlMin: 90,
    vco2SdMlMin: 80,
    petco2SdMmHg: 1.1,
    peto2SdMmHg: 1.8,
    hrSdBpm: 1.5,
    spo2SdPct: 0.8,
    artefactRate: 0.012,
  },
  high: {
    intervalCv: 0.26,
    depthSd: 0.14,
    depthAutocorrelation: 0.4,
    vo2SdMlMin: 170,
    vco2SdMlMin: 150,
    petco2SdMmHg: 1.9,
    peto2SdMmHg: 3,
    hrSdBpm: 3,
    spo2SdPct: 1.3,
    artefactRate: 0.03,
  },
};

/** Output of the cross-check generator. */
export interface CrossCheckTest {
  /** Breath table with noise and artefacts, phase markers included. */
  table: BreathTable;
  /** Same breath times, noise-free and artefact-free (oscillatory ventilation included: it is physiology). */
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  spec: CrossCheckSpec;
  seed: number;
  crossCheck: {
    noise: NoiseLevel;
    group: CrossCheckGroup;
    protocol: CrossCheckProtocol;
    /** Time the excess CO2 begins (VT1) and PaCO2 starts to fall (VT2, null = none), s. */
    vt1TimeS: number;
    vt2TimeS: number | null;
    /** Indices of noisy-table rows carrying an artefact. */
    artefactRows: number[];
  };
}

// ------------------------------------------------------------------------------------------------
// Group parameter ranges (uniform draws between lo and hi). All invented (`cross-check-model-invented`)
// unless a source id is given.
// ------------------------------------------------------------------------------------------------
type Range = readonly [number, number];
interface GroupRanges {
  weight: number;
  age: Range;
  maleShare: number;
  weightMaleKg: Range;
  weightFemaleKg: Range;
  /** Peak VO2, mL/kg/min (men; women × 0.88). */
  peakPerKg: Range;
  /** VT1 as a fraction of peak VO2 (`lewthwaite-2021-vt`: healthy 48 ± 11 %; `hansen-1984-predicted`: > 40 %). */
  vt1Fraction: Range;
  vt2Fraction: Range;
  rcpProbability: number;
  tauVo2S: Range;
  gain: Range;
  slowComponent: Range;
  gainFallProbability: number;
  /** Peak RER (`kaminsky-2017-cycle-standards`: ≥ 1.10 in maximal cycle tests; lower in HF/COPD). */
  peakRer: Range;
  lactatePeak: Range;
  paco2: Range;
  compensation: Range;
  paco2Rise: Range;
  vdAnatomic: Range;
  vdAlveolar: Range;
  vtMaxMale: Range;
  hrRest: Range;
  /** Share of the heart-rate reserve used at peak (chronotropic index, `tanaka-2001-hrmax` for HRmax). */
  chronotropic: Range;
  hrExponent: Range;
  tauHrRecovery: Range;
  spo2Rest: Range;
  spo2Drop: Range;
  plateauProbability: number;
  eovProbability: number;
  /** Protocol weights: cycle ramp, cycle steps, treadmill ramp, treadmill steps. */
  protocols: readonly [number, number, number, number];
}

const GROUPS: Record<CrossCheckGroup, GroupRanges> = {
  athlete: {
    weight: 0.1,
    age: [18, 40],
    maleShare: 0.65,
    weightMaleKg: [62, 88],
    weightFemaleKg: [50, 68],
    peakPerKg: [52, 72],
    vt1Fraction: [0.55, 0.72],
    vt2Fraction: [0.82, 0.91],
    rcpProbability: 1,
    tauVo2S: [15, 28],
    gain: [9.6, 11.0],
    slowComponent: [0.02, 0.08],
    gainFallProbability: 0,
    peakRer: [1.1, 1.24],
    lactatePeak: [9, 14],
    paco2: [38, 42],
    compensation: [0.8, 1.4],
    paco2Rise: [0, 0],
    vdAnatomic: [0.17, 0.21],
    vdAlveolar: [0, 0.01],
    vtMaxMale: [3.0, 3.8],
    hrRest: [42, 62],
    chronotropic: [0.94, 1.02],
    hrExponent: [0.95, 1.1],
    tauHrRecovery: [90, 150],
    spo2Rest: [96, 99],
    spo2Drop: [0, 2],
    plateauProbability: 0.5,
    eovProbability: 0,
    protocols: [0.5, 0.15, 0.25, 0.1],
  },
  "healthy-active": {
    weight: 0.2,
    age: [20, 60],
    maleShare: 0.55,
    weightMaleKg: [62, 95],
    weightFemaleKg: [50, 80],
    peakPerKg: [36, 52],
    vt1Fraction: [0.45, 0.62],
    vt2Fraction: [0.78, 0.9],
    rcpProbability: 0.95,
    tauVo2S: [22, 38],
    gain: [9.5, 11.2],
    slowComponent: [0.02, 0.07],
    gainFallProbability: 0,
    peakRer: [1.08, 1.24],
    lactatePeak: [8, 12],
    paco2: [38, 42],
    compensation: [0.8, 1.4],
    paco2Rise: [0, 0],
    vdAnatomic: [0.17, 0.21],
    vdAlveolar: [0, 0.015],
    vtMaxMale: [2.6, 3.4],
    hrRest: [55, 75],
    chronotropic: [0.9, 1.02],
    hrExponent: [0.95, 1.15],
    tauHrRecovery: [110, 180],
    spo2Rest: [96, 99],
    spo2Drop: [0, 2],
    plateauProbability: 0.3,
    eovProbability: 0,
    protocols: [0.5, 0.15, 0.25, 0.1],
  },
  sedentary: {
    weight: 0.2,
    age: [25, 65],
    maleShare: 0.5,
    weightMaleKg: [70, 118],
    weightFemaleKg: [58, 100],
    peakPerKg: [21, 34],
    vt1Fraction: [0.4, 0.56],
    vt2Fraction: [0.76, 0.88],
    rcpProbability: 0.85,
    tauVo2S: [30, 48],
    gain: [9.2, 11.0],
    slowComponent: [0.02, 0.06],
    gainFallProbability: 0,
    peakRer: [1.06, 1.22],
    lactatePeak: [7, 11],
    paco2: [38, 42],
    compensation: [0.7, 1.3],
    paco2Rise: [0, 0],
    vdAnatomic: [0.17, 0.22],
    vdAlveolar: [0, 0.02],
    vtMaxMale: [2.3, 3.0],
    hrRest: [62, 86],
    chronotropic: [0.85, 1.0],
    hrExponent: [1.0, 1.2],
    tauHrRecovery: [140, 220],
    spo2Rest: [95, 99],
    spo2Drop: [0, 2],
    plateauProbability: 0.1,
    eovProbability: 0,
    protocols: [0.55, 0.15, 0.2, 0.1],
  },
  older: {
    weight: 0.15,
    age: [65, 85],
    maleShare: 0.5,
    weightMaleKg: [62, 95],
    weightFemaleKg: [50, 82],
    peakPerKg: [16, 28],
    vt1Fraction: [0.45, 0.64],
    vt2Fraction: [0.8, 0.9],
    rcpProbability: 0.75,
    tauVo2S: [38, 60],
    gain: [9.0, 10.8],
    slowComponent: [0.01, 0.05],
    gainFallProbability: 0,
    peakRer: [1.04, 1.18],
    lactatePeak: [5, 9],
    paco2: [37, 41],
    compensation: [0.6, 1.2],
    paco2Rise: [0, 0],
    vdAnatomic: [0.17, 0.22],
    vdAlveolar: [0.01, 0.03],
    vtMaxMale: [1.9, 2.6],
    hrRest: [58, 82],
    chronotropic: [0.8, 1.0],
    hrExponent: [1.0, 1.2],
    tauHrRecovery: [160, 260],
    spo2Rest: [94, 98],
    spo2Drop: [0, 3],
    plateauProbability: 0.05,
    eovProbability: 0,
    protocols: [0.6, 0.15, 0.2, 0.05],
  },
  "heart-failure": {
    weight: 0.2,
    age: [45, 80],
    maleShare: 0.7,
    weightMaleKg: [62, 105],
    weightFemaleKg: [50, 90],
    peakPerKg: [10, 20],
    vt1Fraction: [0.52, 0.72],
    vt2Fraction: [0.82, 0.92],
    rcpProbability: 0.5,
    tauVo2S: [45, 80],
    gain: [7.2, 9.4],
    slowComponent: [0, 0.02],
    gainFallProbability: 0.4,
    peakRer: [1.0, 1.15],
    lactatePeak: [4, 8],
    paco2: [33, 38],
    compensation: [0.6, 1.2],
    paco2Rise: [0, 0],
    vdAnatomic: [0.17, 0.22],
    vdAlveolar: [0.02, 0.07],
    vtMaxMale: [1.5, 2.2],
    hrRest: [58, 82],
    chronotropic: [0.45, 0.8],
    hrExponent: [1.1, 1.4],
    tauHrRecovery: [250, 420],
    spo2Rest: [94, 98],
    spo2Drop: [0, 3],
    plateauProbability: 0,
    eovProbability: 0.35,
    protocols: [0.65, 0.15, 0.15, 0.05],
  },
  "copd-like": {
    weight: 0.15,
    age: [50, 80],
    maleShare: 0.6,
    weightMaleKg: [55, 95],
    weightFemaleKg: [45, 85],
    peakPerKg: [11, 22],
    vt1Fraction: [0.5, 0.75],
    vt2Fraction: [0.82, 0.9],
    rcpProbability: 0.2,
    tauVo2S: [40, 70],
    gain: [8.8, 10.6],
    slowComponent: [0, 0.03],
    gainFallProbability: 0,
    peakRer: [0.96, 1.08],
    lactatePeak: [3, 6],
    paco2: [40, 45],
    compensation: [0.4, 0.8],
    paco2Rise: [0, 4],
    vdAnatomic: [0.18, 0.23],
    vdAlveolar: [0.08, 0.16],
    vtMaxMale: [1.1, 1.7],
    hrRest: [70, 95],
    chronotropic: [0.6, 0.85],
    hrExponent: [1.0, 1.2],
    tauHrRecovery: [200, 320],
    spo2Rest: [92, 97],
    spo2Drop: [2, 7],
    plateauProbability: 0,
    eovProbability: 0,
    protocols: [0.7, 0.1, 0.2, 0],
  },
};

const GROUP_ORDER: readonly CrossCheckGroup[] = ["athlete", "healthy-active", "sedentary", "older", "heart-failure", "copd-like"];
const PROTOCOLS: readonly CrossCheckProtocol[] = ["cycle-ramp", "cycle-steps", "treadmill-ramp", "treadmill-steps"];
/** Ramp rates offered on a cycle, W/min (common practice: round rates). */
const RAMP_RATES = [5, 8, 10, 12, 15, 20, 25, 30, 35, 40, 50] as const;
/** Walking/running boundary of the ACSM equations used here, km/h (invented choice between 6 and 8 km/h). */
const RUN_FROM_KMH = 7;

const mix = (seed: number, i: number, salt: number): number =>
  (Math.imul((seed | 0) ^ salt, 0x9e3779b1) ^ Math.imul(i + 0x51ed27, 0x85ebca6b)) >>> 0;
const draw = (rng: SeededRandom, r: Range): number => r[0] + (r[1] - r[0]) * rng.uniform();
const pick = <T>(rng: SeededRandom, items: readonly T[], weights: readonly number[]): T => {
  const total = weights.reduce((a, b) => a + b, 0);
  let u = rng.uniform() * total;
  for (let k = 0; k < items.length; k++) {
    u -= weights[k];
    if (u < 0) return items[k];
  }
  return items[items.length - 1];
};
const clamp = (x: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, x));
const round = (x: number, step: number): number => Math.round(x / step) * step;

/**
 * ACSM steady-state treadmill VO2 (`acsm-metabolic-equations`, secondary): walking 3.5 + 0.1·S + 1.8·S·G,
 * running 3.5 + 0.2·S + 0.9·S·G (mL/kg/min, S m/min, G fraction). Returns mL/kg/min.
 */
function acsmPerKg(speedKmh: number, gradePct: number): number {
  const s = (speedKmh * 1000) / 60;
  const g = gradePct / 100;
  return speedKmh >= RUN_FROM_KMH ? 3.5 + 0.2 * s + 0.9 * s * g : 3.5 + 0.1 * s + 1.8 * s * g;
}

/**
 * Draw the i-th cross-check spec, deterministic from (i, seed). Noise level = noiseLevels[i % length].
 * Throws on an empty noise list (programming mistake).
 */
export function crossCheckSpec(i: number, seed: number, noiseLevels: NoiseLevel[]): CrossCheckSpec {
  if (noiseLevels.length === 0) throw new Error("crossCheckSpec needs at least one noise level");
  const rng = seededRandom(mix(seed, i, 0x2c1b3c6d));
  const noise = noiseLevels[((i % noiseLevels.length) + noiseLevels.length) % noiseLevels.length];
  const group = pick(
    rng,
    GROUP_ORDER,
    GROUP_ORDER.map((g) => GROUPS[g].weight),
  );
  const G = GROUPS[group];
  const sex = rng.uniform() < G.maleShare ? "male" : "female";
  const ageY = Math.round(draw(rng, G.age));
  const weightKg = round(draw(rng, sex === "male" ? G.weightMaleKg : G.weightFemaleKg), 0.5);
  // Heavier people carry less VO2 per kg (Hansen 1984 weight terms, `hansen-1984-predicted`; scaling invented).
  const overweight = Math.max(0, weightKg - (sex === "male" ? 80 : 68));
  let peakPerKg = draw(rng, G.peakPerKg) * (sex === "male" ? 1 : 0.88) * (1 - 0.006 * overweight);
  let protocol = pick(rng, PROTOCOLS, G.protocols);
  const vo2RestMlMin = round(weightKg * draw(rng, [3.2, 4.2]), 1); // 1 MET = 3.5 mL/kg/min, common practice
  const vo2UnloadedMlMin = round((150 + 6 * weightKg) * draw(rng, [0.92, 1.08]), 1); // wasserman-unloaded-pedalling
  const gainMlMinPerW = draw(rng, G.gain);
  const tauVo2S = draw(rng, G.tauVo2S);
  const cycle = protocol.startsWith("cycle");
  const targetMin = draw(rng, [7, 13]); // Radtke 2019: 8–12 min incremental phase; spread invented

  // -- protocol --
  const restS = round(draw(rng, [120, 240]), 10);
  let warmupS = round(draw(rng, [120, 180]), 30);
  let warmupW = 0;
  let startW = 0;
  let rampWPerMin = 0;
  let stageS: number | null = null;
  let warmupSpeedKmh = 0;
  let startSpeedKmh = 0;
  let startGradePct = 0;
  let speedKmhPerMin = 0;
  let gradePctPerMin = 0;
  const treadmillEconomy = cycle ? 1 : draw(rng, [0.92, 1.08]);
  let vStart: number;
  let peakVo2MlMin = peakPerKg * weightKg;
  if (cycle) {
    if (rng.uniform() < 0.2) warmupS = 0;
    warmupW = warmupS > 0 && rng.uniform() < 0.3 ? (rng.uniform() < 0.5 ? 10 : 20) : 0;
    startW = warmupW;
    vStart = vo2UnloadedMlMin + gainMlMinPerW * startW;
    peakVo2MlMin = Math.max(peakVo2MlMin, vStart + 400);
    const peakW = (peakVo2MlMin - vStart) / gainMlMinPerW;
    const ideal = peakW / targetMin;
    rampWPerMin = RAMP_RATES.reduce((best, r) => (Math.abs(r - ideal) < Math.abs(best - ideal) ? r : best), 10);
    if (protocol === "cycle-steps") {
      stageS = pick(rng, [60, 120, 180], [0.6, 0.2, 0.2]);
      const stepW = Math.max(5, round((rampWPerMin * stageS) / 60, 5));
      rampWPerMin = (stepW * 60) / stageS;
    }
  } else {
    warmupSpeedKmh = round(draw(rng, [2.5, 4]), 0.1);
    const econW = treadmillEconomy * weightKg;
    const running = peakPerKg >= 42 && rng.uniform() < 0.7;
    if (running) {
      startGradePct = 1; // jones-1996-treadmill-grade
      startSpeedKmh = round(draw(rng, [7.5, 9.5]), 0.5);
      vStart = acsmPerKg(startSpeedKmh, startGradePct) * econW;
      peakVo2MlMin = Math.max(peakVo2MlMin, vStart + 600);
      const perKmh = acsmPerKg(startSpeedKmh + 1, 1) - acsmPerKg(startSpeedKmh, 1);
      speedKmhPerMin = Math.max(0.2, round((peakVo2MlMin - vStart) / (econW * perKmh * targetMin), 0.1));
    } else {
      startGradePct = rng.uniform() < 0.5 ? 0 : 2;
      let speed = clamp(2.6 + 0.07 * peakPerKg + draw(rng, [-0.3, 0.3]), 3, 5.5);
      let rate = 0;
      for (;;) {
        startSpeedKmh = round(speed, 0.1);
        vStart = acsmPerKg(startSpeedKmh, startGradePct) * econW;
        peakVo2MlMin = Math.max(peakVo2MlMin, vStart + 400);
        const perPct = acsmPerKg(startSpeedKmh, startGradePct + 1) - acsmPerKg(startSpeedKmh, startGradePct);
        rate = (peakVo2MlMin - vStart) / (econW * perPct * targetMin);
        if (startGradePct + rate * targetMin <= 20 || speed >= 6.4) break;
        speed += 0.3;
      }
      gradePctPerMin = Math.max(0.2, round(rate, 0.1));
    }
    if (protocol === "treadmill-steps") {
      stageS = pick(rng, [120, 180], [0.6, 0.4]);
      const stepMin = stageS / 60;
      speedKmhPerMin = speedKmhPerMin > 0 ? round(speedKmhPerMin * stepMin, 0.5) / stepMin : 0;
      gradePctPerMin = gradePctPerMin > 0 ? round(gradePctPerMin * stepMin, 0.5) / stepMin : 0;
      if (speedKmhPerMin === 0 && gradePctPerMin === 0) gradePctPerMin = 1 / stepMin;
    }
    if (protocol === "treadmill-steps" && stageS === null) protocol = "treadmill-ramp";
  }
  peakPerKg = peakVo2MlMin / weightKg;

  // -- thresholds (VO2 at the mouth) --
  const riseRate = (peakVo2MlMin - vStart) / targetMin; // mL/min per min, nominal
  let vt1 = draw(rng, G.vt1Fraction) * peakVo2MlMin;
  vt1 = clamp(vt1, vStart + 2 * riseRate, peakVo2MlMin - 2.5 * riseRate);
  const hasRcp = rng.uniform() < G.rcpProbability;
  let vt2: number | null = null;
  if (hasRcp) {
    const v = clamp(draw(rng, G.vt2Fraction) * peakVo2MlMin, vt1 + 1.5 * riseRate, peakVo2MlMin - 1 * riseRate);
    vt2 = v > vt1 + riseRate ? v : null;
  }

  // -- CO2, lactate, ventilation --
  const paco2RestMmHg = draw(rng, G.paco2);
  const anxious = noise === "high" ? rng.uniform() < 0.6 : noise === "moderate" ? rng.uniform() < 0.15 : false;
  const vtMaxL = draw(rng, G.vtMaxMale) * (sex === "male" ? 1 : 0.78);
  const hrRestBpm = Math.round(draw(rng, G.hrRest));
  const hrMaxPred = 208 - 0.7 * ageY; // tanaka-2001-hrmax (secondary)
  const hrPeakBpm = Math.round(hrRestBpm + draw(rng, G.chronotropic) * (hrMaxPred - hrRestBpm));
  const eov =
    rng.uniform() < G.eovProbability
      ? {
          periodS: draw(rng, [40, 90]),
          amplitudeFraction: draw(rng, [0.15, 0.35]),
          fadeAtFraction: draw(rng, [0.65, 0.9]),
        }
      : null;
  const plateauS = rng.uniform() < G.plateauProbability ? round(draw(rng, [30, 60]), 5) : 0;

  return {
    label: `cross-check #${i} ${group} ${sex} ${ageY} y, ${protocol}, noise ${noise}`,
    group,
    ageY,
    sex,
    weightKg,
    noise,
    protocol,
    restS,
    warmupS,
    warmupW,
    startW,
    rampWPerMin: cycle ? rampWPerMin : 0,
    stageS,
    warmupSpeedKmh,
    startSpeedKmh,
    startGradePct,
    speedKmhPerMin,
    gradePctPerMin,
    treadmillEconomy,
    recoveryS: round(draw(rng, [120, 300]), 30),
    recoveryW: cycle ? (rng.uniform() < 0.5 ? 0 : 20) : 0,
    recoverySpeedKmh: cycle ? 0 : rng.uniform() < 0.7 ? round(draw(rng, [2, 3]), 0.5) : 0,
    vo2RestMlMin,
    vo2UnloadedMlMin,
    gainMlMinPerW,
    slowComponentFraction: draw(rng, G.slowComponent),
    gainFallFraction: rng.uniform() < G.gainFallProbability ? draw(rng, [0.2, 0.45]) : 0,
    delayVo2S: draw(rng, [12, 20]),
    tauVo2S,
    tauVo2OffS: tauVo2S * draw(rng, [1.0, 1.3]),
    peakVo2MlMin,
    plateauS,
    vt1Vo2MlMin: vt1,
    vt2Vo2MlMin: vt2,
    rerRest: draw(rng, [0.78, 0.88]), // resting RER ≈ 0.8–0.85, common practice
    s1: draw(rng, [0.92, 1.02]), // sue-1988-modified-v-slope: ≈ 1 in fed subjects
    tauCo2S: draw(rng, [6, 16]),
    lactateRestMmolL: draw(rng, [0.7, 1.4]),
    lactatePeakMmolL: draw(rng, G.lactatePeak),
    lactateCurvature: draw(rng, [1.8, 3]),
    targetPeakRer: draw(rng, G.peakRer),
    tauExcessRecoveryS: draw(rng, [60, 120]),
    paco2RestMmHg,
    compensationMmHgPerMmolL: vt2 === null ? 0 : draw(rng, G.compensation),
    paco2RiseAtPeakMmHg: vt2 === null ? draw(rng, G.paco2Rise) : 0,
    vdAnatomicL: draw(rng, G.vdAnatomic),
    vdAlveolarL: draw(rng, G.vdAlveolar),
    vtMaxL,
    tauVeS: draw(rng, [3, 10]),
    restHyperventilationMmHg: anxious ? draw(rng, [3, 6]) : 0,
    barometricMmHg: round(draw(rng, [730, 765]), 1),
    hrRestBpm,
    hrPeakBpm: Math.max(hrPeakBpm, hrRestBpm + 30),
    hrExponent: draw(rng, G.hrExponent),
    tauHrRecoveryS: draw(rng, G.tauHrRecovery),
    spo2RestPct: draw(rng, G.spo2Rest),
    spo2DropPct: draw(rng, G.spo2Drop),
    eov,
  };
}

// ------------------------------------------------------------------------------------------------
// Simulation on a fine time grid
// ------------------------------------------------------------------------------------------------
const DT_S = 0.5;
const MIXING_LAG_S = 4;
const MAX_EXERCISE_S = 45 * 60;

/** One first-order lag step, exact for a held input over dt (common practice). */
const lag = (y: number, x: number, tauS: number): number => (tauS <= 0 ? x : y + (x - y) * (1 - Math.exp(-DT_S / tauS)));

interface Load {
  workW: number;
  speedKmh: number;
  gradePct: number;
  stage: number;
}

function loadAt(spec: CrossCheckSpec, t: number, exStart: number, exEnd: number): Load {
  const cycle = spec.protocol.startsWith("cycle");
  const restEnd = spec.restS;
  if (t < restEnd) return { workW: 0, speedKmh: 0, gradePct: 0, stage: 0 };
  if (t < exStart)
    return cycle
      ? { workW: spec.warmupW, speedKmh: 0, gradePct: 0, stage: 0 }
      : { workW: 0, speedKmh: spec.warmupSpeedKmh, gradePct: 0, stage: 0 };
  if (t > exEnd)
    return cycle
      ? { workW: spec.recoveryW, speedKmh: 0, gradePct: 0, stage: 0 }
      : { workW: 0, speedKmh: spec.recoverySpeedKmh, gradePct: 0, stage: 0 };
  const te = t - exStart;
  const stage = spec.stageS === null ? 0 : Math.floor(te / spec.stageS) + 1;
  // Stepped: the load rises by rate·stageS/60 at the start of each stage after the first.
  const minutes = spec.stageS === null ? te / 60 : ((stage - 1) * spec.stageS) / 60;
  if (cycle) return { workW: spec.startW + spec.rampWPerMin * minutes, speedKmh: 0, gradePct: 0, stage };
  return {
    workW: 0,
    speedKmh: spec.startSpeedKmh + spec.speedKmhPerMin * minutes,
    gradePct: spec.startGradePct + spec.gradePctPerMin * minutes,
    stage,
  };
}

/** Steady-state VO2 demand of a load, before slow component and gain fall, mL/min. */
function baseDemand(spec: CrossCheckSpec, load: Load, phase: Phase): number {
  if (phase === "rest") return spec.vo2RestMlMin;
  if (spec.protocol.startsWith("cycle")) return spec.vo2UnloadedMlMin + spec.gainMlMinPerW * load.workW;
  if (load.speedKmh <= 0.2) return spec.vo2RestMlMin;
  return Math.max(spec.vo2RestMlMin, acsmPerKg(load.speedKmh, load.gradePct) * spec.weightKg * spec.treadmillEconomy);
}

function shapeDemand(spec: CrossCheckSpec, d: number): number {
  let out = d + spec.slowComponentFraction * Math.max(0, d - spec.vt1Vo2MlMin); // gaesser-1996-slow-component
  out -= spec.gainFallFraction * Math.max(0, out - 0.8 * spec.peakVo2MlMin);
  return out;
}

interface Grid {
  t: number[];
  phase: Phase[];
  load: Load[];
  vo2: number[];
  /** Mouth VO2 the lactate follows: equal to vo2 except during a VO2 plateau (uncapped demand). */
  vo2Drive: number[];
  vco2: number[];
  excess: number[];
  ve: number[];
  vt: number[];
  rr: number[];
  paco2: number[];
  petco2: number[];
  peto2: number[];
  hr: number[];
  spo2: number[];
  exStart: number;
  exEnd: number;
  end: number;
  t1: number;
  t2: number | null;
}

/** Solve VE·(1 − VD/VT(VE)) = VA for VE by bisection (VT from the Hey pattern, `hey-1966-pattern`). */
function solveVe(spec: CrossCheckSpec, vaLMin: number): number {
  const k = spec.vtMaxL * 12.5; // L/min; VT reaches 63 % of VTmax at VE = k (invented)
  const f = (ve: number): number => {
    const vt = spec.vtMaxL * (1 - Math.exp(-ve / k));
    const vd = spec.vdAnatomicL + 0.08 * vt + spec.vdAlveolarL;
    return ve * (1 - vd / vt) - vaLMin;
  };
  let lo = vaLMin;
  let hi = vaLMin * 3 + 5;
  while (f(hi) < 0) hi *= 2;
  if (f(lo) > 0) return lo;
  for (let n = 0; n < 40; n++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

const tidalVolume = (spec: CrossCheckSpec, ve: number): number => spec.vtMaxL * (1 - Math.exp(-ve / (spec.vtMaxL * 12.5)));

function simulate(spec: CrossCheckSpec): Grid {
  const restEnd = spec.restS;
  const exStart = restEnd + spec.warmupS;
  const t: number[] = [];
  const phase: Phase[] = [];
  const load: Load[] = [];
  const vo2: number[] = [];
  const vo2Drive: number[] = [];
  const delayN = Math.round(spec.delayVo2S / DT_S);
  const demandHist: number[] = [];
  const driveHist: number[] = [];
  let y1 = spec.vo2RestMlMin;
  let y2 = spec.vo2RestMlMin;
  let z1 = spec.vo2RestMlMin;
  let z2 = spec.vo2RestMlMin;
  let exEnd = Infinity;
  let demandCapAt = Infinity;
  let end = Infinity;
  for (let n = 0; ; n++) {
    const tn = n * DT_S;
    if (tn > end + 1e-9) break;
    if (tn - exStart > MAX_EXERCISE_S) throw new Error(`cross-check spec never reaches its peak VO2: ${spec.label}`);
    const ph: Phase = tn < restEnd ? "rest" : tn < exStart ? "warmup" : tn <= exEnd ? "exercise" : "recovery";
    const ld = loadAt(spec, tn, exStart, exEnd);
    let drive = baseDemand(spec, ld, ph);
    if (ph === "exercise") drive = shapeDemand(spec, drive);
    let demand = drive;
    if (spec.plateauS > 0 && ph === "exercise") {
      demand = Math.min(drive, spec.peakVo2MlMin);
      if (drive >= spec.peakVo2MlMin && demandCapAt === Infinity) demandCapAt = tn;
    }
    if (ph === "recovery") drive = demand;
    demandHist.push(demand);
    driveHist.push(drive);
    const dIn = demandHist[Math.max(0, n - delayN)];
    const gIn = driveHist[Math.max(0, n - delayN)];
    const tau = ph === "recovery" ? spec.tauVo2OffS : spec.tauVo2S;
    y1 = lag(y1, dIn, tau);
    y2 = lag(y2, y1, MIXING_LAG_S);
    z1 = ph === "recovery" ? y1 : lag(z1, gIn, tau);
    z2 = ph === "recovery" ? y2 : lag(z2, z1, MIXING_LAG_S);
    t.push(tn);
    phase.push(ph);
    load.push(ld);
    vo2.push(y2);
    vo2Drive.push(z2);
    if (ph === "exercise" && exEnd === Infinity) {
      const reached = spec.plateauS > 0 ? tn >= demandCapAt + spec.plateauS : y2 >= spec.peakVo2MlMin;
      if (reached) {
        exEnd = tn;
        end = exEnd + spec.recoveryS;
      }
    }
  }
  const N = t.length;
  const firstCross = (v: number): number => {
    for (let n = 0; n < N; n++) if (phase[n] === "exercise" && vo2Drive[n] >= v) return n;
    return -1;
  };
  const n1 = firstCross(spec.vt1Vo2MlMin);
  if (n1 < 0) throw new Error(`cross-check spec: VT1 VO2 not reached in exercise: ${spec.label}`);
  const n2 = spec.vt2Vo2MlMin === null ? -1 : firstCross(spec.vt2Vo2MlMin);
  if (spec.vt2Vo2MlMin !== null && n2 < 0) throw new Error(`cross-check spec: VT2 VO2 not reached: ${spec.label}`);
  const nEnd = t.findIndex((x) => x >= exEnd);

  // ---- lactate (hughson-1987-lactate-continuous) and excess CO2 (beaver-1986-buffering) ----
  const v1 = spec.vt1Vo2MlMin;
  const peakDrive = vo2Drive[nEnd];
  const s = Math.max(50, (peakDrive - v1) / spec.lactateCurvature);
  const zp = (peakDrive - v1) / s;
  const c = (spec.lactatePeakMmolL - spec.lactateRestMmolL) / Math.max(1e-6, Math.exp(zp) - 1 - zp);
  const laEq = (u: number): number => {
    const z = Math.max(0, (u - v1) / s);
    return spec.lactateRestMmolL + c * (Math.exp(z) - 1 - z);
  };
  const aerobic = (u: number): number => spec.rerRest * spec.vo2RestMlMin + spec.s1 * (u - spec.vo2RestMlMin);
  // G = 22·V mL CO2 per (mmol/L): sized so that at the mean rate of VO2 rise above VT1 the excess at peak
  // reaches the target RER (floor: 3 % of peak VO2, invented). Rate r in mL/min per min.
  const r = (peakDrive - v1) / Math.max(0.5, (exEnd - t[n1]) / 60);
  const excessTarget = Math.max(spec.targetPeakRer * peakDrive - aerobic(peakDrive), 0.03 * peakDrive);
  const dLaDuPeak = (c / s) * (Math.exp(zp) - 1);
  const gain = excessTarget / Math.max(1e-9, dLaDuPeak * r);
  const la: number[] = new Array<number>(N);
  const excessIn: number[] = new Array<number>(N);
  let laState = spec.lactateRestMmolL;
  let excessEnd = 0;
  // Buffering CO2 is released at most at twice the rate a ramp at the mean rate of VO2 rise would give at
  // the same VO2 (invented cap; the rest waits in the stores): steps spread their excess over the stage,
  // a ramp is not affected.
  let pending = 0;
  for (let n = 0; n < N; n++) {
    if (phase[n] === "recovery") {
      laState = spec.lactateRestMmolL + (laState - spec.lactateRestMmolL) * Math.exp(-DT_S / 900); // ~10 min half-life, invented
      la[n] = laState;
      excessIn[n] = excessEnd * Math.exp(-(t[n] - exEnd) / spec.tauExcessRecoveryS);
      continue;
    }
    const next = phase[n] === "exercise" ? Math.max(laState, laEq(vo2Drive[n])) : laState;
    pending += gain * (next - laState); // mL CO2
    const zNow = Math.max(0, (vo2Drive[n] - v1) / s);
    const capMlMin = 2 * gain * (c / s) * (Math.exp(zNow) - 1) * r + 1;
    const release = Math.min(pending, (capMlMin * DT_S) / 60);
    pending -= release;
    excessIn[n] = release / (DT_S / 60); // mL/min
    laState = next;
    la[n] = laState;
    if (n === nEnd) excessEnd = excessIn[n];
  }

  // ---- hyperventilation at rest (anxiety) fading over the warm-up ----
  const fadeStart = spec.warmupS > 0 ? restEnd : restEnd - 60;
  const fadeEnd = spec.warmupS > 0 ? restEnd + Math.min(spec.warmupS, 90) : restEnd;
  const anxiety = (tn: number): number =>
    tn <= fadeStart ? 1 : tn >= fadeEnd ? 0 : 1 - (tn - fadeStart) / Math.max(1, fadeEnd - fadeStart);

  const vco2: number[] = new Array<number>(N);
  const excess: number[] = new Array<number>(N);
  const ve: number[] = new Array<number>(N);
  const vt: number[] = new Array<number>(N);
  const rr: number[] = new Array<number>(N);
  const paco2: number[] = new Array<number>(N);
  const petco2: number[] = new Array<number>(N);
  const peto2: number[] = new Array<number>(N);
  const hr: number[] = new Array<number>(N);
  const spo2: number[] = new Array<number>(N);
  const la2 = n2 >= 0 ? laEq(spec.vt2Vo2MlMin as number) : Infinity;
  const pio2 = 0.2093 * (spec.barometricMmHg - 47); // common practice
  let aerOut = aerobic(spec.vo2RestMlMin);
  let exOut = 0;
  let veOut = NaN;
  let hrOut = spec.hrRestBpm;
  const hrEnd = { v: NaN };
  for (let n = 0; n < N; n++) {
    const a = anxiety(t[n]);
    // CO2 washed out of the stores while hyperventilating at rest: +8 % of resting VCO2 per 5 mmHg (invented).
    const washout =
      spec.restHyperventilationMmHg > 0 ? (0.08 * a * spec.restHyperventilationMmHg * aerobic(spec.vo2RestMlMin)) / 5 : 0;
    aerOut = lag(aerOut, aerobic(vo2[n]) + washout, spec.tauCo2S);
    exOut = lag(exOut, excessIn[n], spec.tauCo2S);
    excess[n] = exOut;
    vco2[n] = aerOut + exOut;
    const q = clamp((vo2[n] - spec.vo2RestMlMin) / (spec.peakVo2MlMin - spec.vo2RestMlMin), 0, 1.05);
    const qRet = clamp((vo2Drive[n] - v1) / (spec.peakVo2MlMin - v1), 0, 1);
    let pa = spec.paco2RestMmHg - spec.restHyperventilationMmHg * a;
    if (la[n] > la2) pa -= spec.compensationMmHgPerMmolL * (la[n] - la2); // winters-1967-compensation
    if (phase[n] !== "recovery") pa += spec.paco2RiseAtPeakMmHg * qRet * qRet;
    else pa += spec.paco2RiseAtPeakMmHg * q * q;
    paco2[n] = pa;
    const va = (0.863 * vco2[n]) / pa; // alveolar-ventilation-equation
    const target = solveVe(spec, va);
    veOut = Number.isNaN(veOut) ? target : lag(veOut, target, spec.tauVeS);
    ve[n] = veOut;
    vt[n] = tidalVolume(spec, veOut);
    rr[n] = veOut / vt[n];
    // Inverse of jones-1979-petco2-paco2: PETCO2 = (PaCO2 − 5.5 + 0.0021·VT mL)/0.90, then diluted by
    // alveolar dead-space gas (CO2-free, common practice).
    const jones = (pa - 5.5 + 2.1 * vt[n]) / 0.9;
    const dil = spec.vdAlveolarL / Math.max(0.3, vt[n] - spec.vdAnatomicL);
    petco2[n] = jones * (1 - dil);
    const rer = vco2[n] / vo2[n];
    peto2[n] = pio2 - petco2[n] * (0.2093 + (1 - 0.2093) / rer); // alveolar gas equation
    if (phase[n] !== "recovery") {
      const hrTarget = spec.hrRestBpm + (spec.hrPeakBpm - spec.hrRestBpm) * Math.pow(q, spec.hrExponent);
      hrOut = lag(hrOut, hrTarget, 8);
    } else {
      if (Number.isNaN(hrEnd.v)) hrEnd.v = hrOut;
      const floor = spec.hrRestBpm + 0.15 * (spec.hrPeakBpm - spec.hrRestBpm);
      hrOut = floor + (hrEnd.v - floor) * Math.exp(-(t[n] - exEnd) / spec.tauHrRecoveryS);
    }
    hr[n] = hrOut;
    spo2[n] = Math.min(100, spec.spo2RestPct - spec.spo2DropPct * Math.pow(q, 1.5));
  }
  return {
    t,
    phase,
    load,
    vo2,
    vo2Drive,
    vco2,
    excess,
    ve,
    vt,
    rr,
    paco2,
    petco2,
    peto2,
    hr,
    spo2,
    exStart,
    exEnd,
    end,
    t1: t[n1],
    t2: n2 >= 0 ? t[n2] : null,
  };
}

/** Linear interpolation of a grid series at time x. */
function at(g: Grid, series: number[], x: number): number {
  const k = clamp(x / DT_S, 0, g.t.length - 1);
  const i0 = Math.floor(k);
  const i1 = Math.min(g.t.length - 1, i0 + 1);
  const f = k - i0;
  return series[i0] * (1 - f) + series[i1] * f;
}

/** Oscillatory ventilation as a relative modulation at time x (0 outside EOV). */
function eovAt(spec: CrossCheckSpec, g: Grid, x: number, phase0: number): number {
  if (!spec.eov) return 0;
  const fadeT = g.exStart + spec.eov.fadeAtFraction * (g.exEnd - g.exStart);
  const w = x <= fadeT ? 1 : Math.max(0, 1 - (x - fadeT) / 60);
  return spec.eov.amplitudeFraction * w * Math.sin((2 * Math.PI * x) / spec.eov.periodS + phase0);
}

type ArtefactKind = "sigh" | "cough" | "swallow" | "spike";

/**
 * Generate one cross-check test from a spec (deterministic for a seed). Throws only when the spec cannot
 * be simulated (programming mistake: the peak or a threshold VO2 is never reached).
 */
export function generateCrossCheckTest(spec: CrossCheckSpec, seed: number): CrossCheckTest {
  const g = simulate(spec);
  const rng = seededRandom(mix(seed, 7, 0x68e31da4));
  const nz = CROSS_CHECK_NOISE[spec.noise];
  const cycle = spec.protocol.startsWith("cycle");
  const eovPhase = rng.uniform() * 2 * Math.PI;

  // ---- breath times (shared by both tables): trend RR, log-normal jitter, swallow pauses ----
  const times: number[] = [];
  const intervalRatio: number[] = [];
  const kinds: (ArtefactKind | null)[] = [];
  let tb = 0;
  const sdLog = Math.sqrt(Math.log(1 + nz.intervalCv * nz.intervalCv));
  for (;;) {
    const osc = eovAt(spec, g, tb, eovPhase);
    const rrNow = at(g, g.rr, tb) * (1 + 0.2 * osc);
    const nominal = 60 / rrNow;
    let ratio = Math.exp(sdLog * rng.normal() - (sdLog * sdLog) / 2);
    let kind: ArtefactKind | null = null;
    if (nz.artefactRate > 0 && rng.uniform() < nz.artefactRate) {
      kind = pick(rng, ["sigh", "cough", "swallow", "spike"] as const, [0.35, 0.25, 0.2, 0.2]);
      if (kind === "sigh") ratio *= 1.3 + 0.5 * rng.uniform();
      if (kind === "cough") ratio *= 0.4 + 0.2 * rng.uniform();
      if (kind === "swallow") ratio *= 1.8 + 0.7 * rng.uniform();
    }
    const next = tb + nominal * ratio;
    if (next > g.end) break;
    tb = next;
    times.push(tb);
    intervalRatio.push(ratio);
    kinds.push(kind);
  }

  const phaseAt = (x: number): Phase =>
    x < spec.restS ? "rest" : x < g.exStart ? "warmup" : x <= g.exEnd ? "exercise" : "recovery";
  const pio2 = 0.2093 * (spec.barometricMmHg - 47);
  const free: BreathRow[] = [];
  const noisy: BreathRow[] = [];
  const artefactRows: number[] = [];
  let depth = 0;
  const arSd = nz.depthSd * Math.sqrt(1 - nz.depthAutocorrelation * nz.depthAutocorrelation);
  let postSigh = false;
  for (let k = 0; k < times.length; k++) {
    const x = times[k];
    const ph = phaseAt(x);
    const ld = loadAt(spec, x, g.exStart, g.exEnd);
    const osc = eovAt(spec, g, x, eovPhase);
    // Oscillatory ventilation: VE ±A, VT carries most of it, VCO2 and VO2 follow partly, PETCO2 moves
    // opposite (invented proportions).
    const vo2 = at(g, g.vo2, x) * (1 + 0.2 * osc);
    const vco2 = at(g, g.vco2, x) * (1 + 0.35 * osc);
    const ve = at(g, g.ve, x) * (1 + osc);
    const vt = at(g, g.vt, x) * (1 + 0.8 * osc);
    const petco2 = at(g, g.petco2, x) * (1 - 0.2 * osc);
    const peto2 = pio2 - petco2 * (0.2093 + (1 - 0.2093) / (vco2 / vo2));
    const row: BreathRow = {
      timeS: x,
      phase: ph,
      vo2MlMin: vo2,
      vco2MlMin: vco2,
      veLMin: ve,
      hrBpm: at(g, g.hr, x),
      rrBrMin: ve / vt,
      vtL: vt,
      peto2MmHg: peto2,
      petco2MmHg: petco2,
      spo2Pct: at(g, g.spo2, x),
    };
    if (cycle) row.workW = ld.workW;
    else {
      row.speedKmh = ld.speedKmh;
      row.gradePct = ld.gradePct;
    }
    if (spec.stageS !== null && ph === "exercise") row.stage = ld.stage;
    free.push(row);

    // ---- noise ----
    depth = nz.depthAutocorrelation * depth + arSd * rng.normal();
    const ratio = intervalRatio[k];
    let vtN = vt * (1 + depth) * Math.pow(ratio, 0.6); // longer breaths are deeper (invented exponent)
    const interval = (60 / (ve / vt)) * ratio;
    let veN = (vtN * 60) / interval;
    const dv = veN / ve - 1;
    const e1 = rng.normal();
    const e2 = 0.5 * e1 + Math.sqrt(0.75) * rng.normal(); // shared volume-measurement error, ρ = 0.5 (invented)
    let vo2N = vo2 * (1 + 0.3 * dv) + nz.vo2SdMlMin * e1;
    let vco2N = vco2 * (1 + 0.5 * dv) + nz.vco2SdMlMin * e2;
    let petco2N = petco2 * (1 - 0.1 * dv) + nz.petco2SdMmHg * rng.normal();
    let peto2N =
      pio2 - petco2N * (0.2093 + (1 - 0.2093) / Math.max(0.5, vco2N / Math.max(50, vo2N))) + nz.peto2SdMmHg * rng.normal();
    const hrN = row.hrBpm! + nz.hrSdBpm * rng.normal();
    const spo2N = row.spo2Pct! + nz.spo2SdPct * rng.normal();
    const kind = kinds[k];
    if (postSigh) {
      // the breath after a sigh is small
      vtN *= 0.6;
      veN *= 0.6;
      vo2N *= 0.8;
      vco2N *= 0.7;
      postSigh = false;
    }
    if (kind !== null) {
      artefactRows.push(k);
      const u = rng.uniform();
      if (kind === "sigh") {
        const m = 2 + 1.5 * u;
        vtN *= m;
        veN *= m / 1.5;
        vo2N *= 1.3 + 0.5 * u;
        vco2N *= 1.6 + 0.6 * u;
        petco2N -= 1 + 2 * u;
        peto2N += 2 + 3 * u;
        postSigh = true;
      } else if (kind === "cough") {
        vtN *= 0.4 + 0.3 * u;
        veN *= 0.8 + 0.6 * u;
        vo2N *= 0.5 + 1.1 * rng.uniform();
        vco2N *= 0.5 + 1.1 * rng.uniform();
        petco2N -= 2 + 6 * u;
      } else if (kind === "swallow") {
        vtN *= 1.1 + 0.3 * u;
        veN = (vtN * 60) / interval;
        vo2N *= 0.7 + 0.2 * u;
        vco2N *= 0.7 + 0.2 * u;
        petco2N += 1 + 2 * u;
      } else {
        const f = u < 0.5 ? 0.3 + 0.2 * rng.uniform() : 1.6 + 0.9 * rng.uniform();
        const ch = rng.int(4);
        if (ch === 0) vo2N *= f;
        else if (ch === 1) vco2N *= f;
        else if (ch === 2) veN *= f;
        else petco2N *= f;
      }
    }
    const nrow: BreathRow = {
      timeS: Math.round(x * 100) / 100,
      phase: ph,
      vo2MlMin: Math.round(Math.max(40, vo2N)),
      vco2MlMin: Math.round(Math.max(30, vco2N)),
      veLMin: Math.round(Math.max(1, veN) * 10) / 10,
      hrBpm: Math.round(Math.max(30, hrN)),
      rrBrMin: Math.round((60 / interval) * 10) / 10,
      vtL: Math.round(Math.max(0.08, vtN) * 1000) / 1000,
      peto2MmHg: Math.round(clamp(peto2N, 60, 140) * 10) / 10,
      petco2MmHg: Math.round(clamp(petco2N, 8, 65) * 10) / 10,
      spo2Pct: Math.round(clamp(spo2N, 70, 100)),
    };
    if (cycle) nrow.workW = row.workW;
    else {
      nrow.speedKmh = row.speedKmh;
      nrow.gradePct = row.gradePct;
    }
    if (row.stage !== undefined) nrow.stage = row.stage;
    noisy.push(nrow);
  }

  const fields: (NumericField | "phase")[] = [
    "timeS",
    "vo2MlMin",
    "vco2MlMin",
    "veLMin",
    "hrBpm",
    ...(cycle ? (["workW"] as const) : (["speedKmh", "gradePct"] as const)),
    "rrBrMin",
    "vtL",
    "peto2MmHg",
    "petco2MmHg",
    "spo2Pct",
    ...(spec.stageS !== null ? (["stage"] as const) : []),
    "phase",
  ];
  const table: BreathTable = { shape: "breath", rows: noisy, fields };
  const noiseFree: BreathTable = { shape: "breath", rows: free, fields: [...fields] };
  const truth = buildTruth(spec, g, free);
  return {
    table,
    noiseFree,
    truth,
    spec,
    seed,
    crossCheck: { noise: spec.noise, group: spec.group, protocol: spec.protocol, vt1TimeS: g.t1, vt2TimeS: g.t2, artefactRows },
  };
}

function truthPoint(spec: CrossCheckSpec, g: Grid, x: number): TruthPoint {
  const cycle = spec.protocol.startsWith("cycle");
  return {
    timeS: x,
    vo2MlMin: at(g, g.vo2, x),
    vco2MlMin: at(g, g.vco2, x),
    veLMin: at(g, g.ve, x),
    workW: cycle ? loadAt(spec, x, g.exStart, g.exEnd).workW : 0,
    hrBpm: at(g, g.hr, x),
  };
}

/** OLS slope of y on x over noise-free rows with from ≤ timeS ≤ to (NaN when fewer than 3 rows). */
function slopeBetween(
  rows: BreathRow[],
  from: number,
  to: number,
  x: (r: BreathRow) => number,
  y: (r: BreathRow) => number,
): number {
  const sel = rows.filter((r) => r.timeS >= from && r.timeS <= to);
  if (sel.length < 3) return NaN;
  return new PrefixSums(sel.map(x), sel.map(y)).fit(0, sel.length).slope;
}

/**
 * Truth from the noise-free signals:
 * - vt1 / vt2: trend values at the onset times (see the module TSDoc); workW = 0 on a treadmill.
 * - peak: at the end of the incremental phase (VO2 = its highest trend value in exercise).
 * - vco2Vo2SlopeBelowVt1: OLS of noise-free VCO2 on VO2 from incremental start + 90 s to VT1 (from the
 *   start when that window holds fewer than 3 breaths); above VT1: VT1 to VT2 (or to the end).
 * - veVco2SlopeToVt2 / ToPeak: OLS of noise-free VE (L/min) on VCO2 (L/min) from incremental start.
 * - deltaVo2DeltaWrMlMinW: OLS of noise-free VO2 on work rate from incremental start + 60 s to the end
 *   (cycle); NaN on a treadmill (no work rate). rampWPerMin = 0 on a treadmill.
 */
function buildTruth(spec: CrossCheckSpec, g: Grid, rows: BreathRow[]): SyntheticTruth {
  const cycle = spec.protocol.startsWith("cycle");
  const start = g.exStart;
  const endEx = g.exEnd;
  const t1 = g.t1;
  const t2 = g.t2;
  const vo2 = (r: BreathRow): number => r.vo2MlMin!;
  const vco2 = (r: BreathRow): number => r.vco2MlMin!;
  const vco2L = (r: BreathRow): number => r.vco2MlMin! / 1000;
  const ve = (r: BreathRow): number => r.veLMin!;
  let below = slopeBetween(rows, start + 90, t1, vo2, vco2);
  if (!Number.isFinite(below)) below = slopeBetween(rows, start, t1, vo2, vco2);
  let peakVo2 = 0;
  for (let n = 0; n < g.t.length; n++) if (g.phase[n] === "exercise") peakVo2 = Math.max(peakVo2, g.vo2[n]);
  const endPt = truthPoint(spec, g, endEx);
  return {
    invented: true,
    vt1: truthPoint(spec, g, t1),
    vt2: t2 === null ? null : truthPoint(spec, g, t2),
    peak: {
      vo2MlMin: peakVo2,
      vco2MlMin: endPt.vco2MlMin,
      veLMin: endPt.veLMin,
      hrBpm: endPt.hrBpm,
      workW: endPt.workW,
      rer: endPt.vco2MlMin / endPt.vo2MlMin,
      timeS: endEx,
    },
    vco2Vo2SlopeBelowVt1: below,
    vco2Vo2SlopeAboveVt1: slopeBetween(rows, t1, t2 ?? endEx, vo2, vco2),
    veVco2SlopeToVt2: slopeBetween(rows, start, t2 ?? endEx, vco2L, ve),
    veVco2SlopeToPeak: slopeBetween(rows, start, endEx, vco2L, ve),
    deltaVo2DeltaWrMlMinW: cycle ? slopeBetween(rows, start + 60, endEx, (r) => r.workW!, vo2) : NaN,
    phases: { restEndS: spec.restS, warmupEndS: g.exStart, rampEndS: endEx, endS: g.end },
    rampWPerMin: cycle ? spec.rampWPerMin : 0,
    weightKg: spec.weightKg,
  };
}
