import type { BreathRow, BreathTable, NumericField, Phase } from "../breath";
import { linearRegression, seededRandom } from "../numeric";
import type { SeededRandom } from "../numeric";
import type { NoiseLevel, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Hold-out synthetic CPET model (invented data, for validating threshold detectors only).
 *
 * Built from the physiology rather than from response shapes: blood lactate as a function of the metabolic
 * rate, excess CO2 from bicarbonate buffering of the lactate rise, ventilation from the alveolar ventilation
 * equation at an arterial PCO2 set-point, dead space from tidal volume, breath noise from tidal-volume
 * irregularity. Sources are registered in `SYNTHETIC_SOURCES` (lib/synthetic/sources.ts) under the ids named
 * beside each coefficient. Every magnitude marked "invented" is a plausible value chosen for this generator.
 */

/** Subject group the spec was drawn from (shapes the ranges; invented grouping). */
export type HoldoutGroup = "active" | "healthy" | "deconditioned" | "heart-failure" | "copd-like";

/** Treadmill incremental protocol: stages of constant speed and grade (no work rate). */
export interface HoldoutTreadmillProtocol {
  /** Stage length, s (30 or 60). */
  stageS: number;
  /** Warm-up walking speed, km/h (used only when `warmupS` > 0). */
  warmupSpeedKmh: number;
  /** Speed of the first incremental stage, km/h. */
  startSpeedKmh: number;
  /** Speed added per stage, km/h (0 = constant-speed, grade-driven protocol). */
  speedStepKmh: number;
  /** Grade of the first incremental stage, %. */
  startGradePct: number;
  /** Grade added per stage, %. */
  gradeStepPct: number;
  /** ACSM running equation (true) or walking equation (false) for the stages. */
  running: boolean;
}

/** Everything that shapes one hold-out test. Units in the names; all values invented physiology. */
export interface HoldoutSpec {
  label: string;
  noise: NoiseLevel;
  group: HoldoutGroup;
  modality: "cycle" | "treadmill";
  /** Age, years (20–80). */
  ageY: number;
  /** Body mass, kg (50–120). */
  weightKg: number;
  // protocol
  /** Rest before exercise, s (60–180). */
  restS: number;
  /** Unloaded / warm-up exercise, s (0–240; 0 = none). */
  warmupS: number;
  /** Incremental phase (ramp or treadmill stages), s (360–900). */
  rampS: number;
  /** Recovery, s (60–240). */
  recoveryS: number;
  /** Cycle: warm-up work rate, W (0–20); treadmill: 0. */
  warmupW: number;
  /** Cycle: ramp rate, W/min (5–50); treadmill: null. */
  rampWPerMin: number | null;
  /** Treadmill protocol; cycle: null. */
  treadmill: HoldoutTreadmillProtocol | null;
  // oxygen uptake
  /** Resting VO2, mL/min. */
  vo2RestMlMin: number;
  /** Cycle: VO2 pedalling at 0 W, mL/min (rest + unloaded cost); treadmill: unused (0). */
  vo2UnloadedMlMin: number;
  /** Cycle: ΔVO2/ΔWR of the demand, mL/min/W (Hansen 1987: 10.29 ± 1.01 normal, 8.29 ± 1.17 in disease). */
  gainMlMinPerW: number;
  /** Treadmill: multiplier on the ACSM walking/running VO2 (individual economy, 0.9–1.1); cycle: 1. */
  treadmillEconomy: number;
  /** Maximal VO2 capacity as a fraction of the end-of-protocol demand (levelling near peak); null = none. */
  vo2CapFraction: number | null;
  /** Phase II time constant, s (20–80, longer when unfit). */
  tauPhase2S: number;
  /** Phase I duration = muscle-to-lung transit delay, s (10–20). */
  phase1DelayS: number;
  /** Cardiodynamic (phase I) share of a demand step, fraction (0.04–0.10). */
  phase1Fraction: number;
  /** Slow component: extra VO2 per VO2 above the lactate threshold, fraction (0–0.12). */
  slowComponentFraction: number;
  /** Slow component time constant, s. */
  tauSlowS: number;
  // lactate and CO2
  /** Lactate threshold (start of excess CO2) as a fraction of peak metabolic VO2. */
  vt1FractionOfPeak: number;
  /** Compensation onset as a fraction of peak metabolic VO2; null = the test never reaches it. */
  vt2FractionOfPeak: number | null;
  /** Resting blood lactate, mmol/L. */
  lactateRestMmolL: number;
  /** Blood lactate at peak metabolic rate, mmol/L. */
  lactatePeakMmolL: number;
  /** Curvature k·(VO2peak − VO2LT) of the exponential lactate curve (1.3–2.3). */
  lactateCurvature: number;
  /** Lactate clearance time constant in recovery, s. */
  lactateClearanceTauS: number;
  /** Excess CO2 at the end of the protocol as a fraction of peak VO2 (sets the buffering volume). */
  excessCo2FractionAtPeak: number;
  /** Metabolic RQ at rest and at peak (RQ rises linearly with metabolic rate). */
  rqRest: number;
  rqPeak: number;
  /** CO2 store time constant, s (VCO2 at the mouth lags the tissue CO2 output by this). */
  tauCo2StoreS: number;
  /** Fast body CO2 capacitance, mL per mmHg of PaCO2 change (washout when PaCO2 falls). */
  co2CapacitanceMlPerMmHg: number;
  // ventilation
  /** Arterial PCO2 set-point at rest, mmHg (34–44 healthy; lower in heart failure). */
  paco2RestMmHg: number;
  /** Rise of the PaCO2 set-point in moderate exercise (complete by VT1), mmHg. */
  paco2ExerciseRiseMmHg: number;
  /** Fall of PaCO2 per mmol/L lactate above the lactate at compensation onset, mmHg per mmol/L. */
  compensationMmHgPerMmolL: number;
  /** Anatomical dead space, L. */
  vdAnatomicL: number;
  /** Alveolar dead space as a fraction of tidal volume. */
  alveolarDeadSpaceFraction: number;
  /** VE lag behind its target, s. */
  tauVeS: number;
  /** Tidal volume VT = vtMax·(1 − exp(−VE/(vtMax·rrLow))): saturation volume, L. */
  vtMaxL: number;
  /** Breathing rate at low ventilation in that law, breaths/min. */
  rrLowBrMin: number;
  /** Maximal voluntary ventilation; VE saturates near 0.92·MVV. null = not limited. */
  mvvLMin: number | null;
  /** End-expiratory lung volume, L (sets the tidal PCO2 oscillation). */
  eelvL: number;
  // heart rate and saturation
  hrRestBpm: number;
  hrPeakBpm: number;
  /** HR = rest + (peak − rest)·x^shape, x = normalised metabolic rate. */
  hrShape: number;
  tauHrOnS: number;
  tauHrOffS: number;
  spo2RestPct: number;
  /** SpO2 fall at peak, percentage points. */
  spo2DropPct: number;
  // breath-by-breath coupling
  /** How much a breath's VO2 follows its alveolar ventilation (0 = not at all, 1 = proportionally). */
  o2BreathCoupling: number;
  /** Same for VCO2 (larger: CO2 output follows ventilation more closely). */
  co2BreathCoupling: number;
}

/** Result of `generateHoldoutTest`. */
export interface HoldoutTest {
  table: BreathTable;
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  spec: HoldoutSpec;
  seed: number;
  holdout: { noise: NoiseLevel };
}

// ---------------------------------------------------------------------------------------------
// Constants with their sources (ids in SYNTHETIC_SOURCES)
// ---------------------------------------------------------------------------------------------

/** mL CO2 released per mmol of lactic acid buffered by bicarbonate (beaver-1986-buffering, confirmed: ≈22 mL/mEq). */
const CO2_ML_PER_MMOL = 22;
/** Alveolar ventilation equation constant (alveolar-ventilation-equation, common practice): PCO2 = 863·VCO2/VA. */
const K_ALV = 863;
/** Barometric pressure, mmHg (sea level, common practice) and water vapour pressure at 37 °C (47 mmHg). */
const PB = 760;
const PH2O = 47;
/** Inspired O2 fraction of room air (common practice). */
const FIO2 = 0.2093;
const PIO2 = FIO2 * (PB - PH2O);
/** Expiratory share of the breath cycle (common practice, ≈0.55–0.6). */
const EXPIRATORY_FRACTION = 0.55;
/** Least fall of PaCO2 from the compensation onset to the end of the ramp, mmHg (invented). */
const MIN_COMPENSATION_MMHG = 4;
/** Cardiodynamic (phase I) fast time constant, s (whipp-1982-kinetics, recalled: phase I ≈ 15 s, near step-like). */
const TAU_PHASE1_S = 4;

/**
 * Breath noise per level (all invented magnitudes; form from lamarra-1987-noise (SD roughly independent of
 * metabolic rate → the analyser part is absolute) and liang-1996-autocorrelation (breath-to-breath ventilation
 * autocorrelated → AR(1) on tidal volume and a slow wandering ventilation)).
 */
const NOISE = {
  none: {
    vtSdRest: 0,
    vtSdExercise: 0,
    timingSd: 0,
    ar: 0,
    wanderSd: 0,
    patternWanderSd: 0,
    vo2SdMlMin: 0,
    vco2SdMlMin: 0,
    veSdFraction: 0,
    petco2SdMmHg: 0,
    peto2SdMmHg: 0,
    hrSdBpm: 0,
    spo2SdPct: 0,
    sighRate: 0,
    coughRate: 0,
    swallowRate: 0,
    glitchRate: 0,
  },
  low: {
    vtSdRest: 0.06,
    vtSdExercise: 0.03,
    timingSd: 0.06,
    ar: 0.3,
    wanderSd: 0.012,
    patternWanderSd: 0.04,
    vo2SdMlMin: 6,
    vco2SdMlMin: 5,
    veSdFraction: 0.01,
    petco2SdMmHg: 0.3,
    peto2SdMmHg: 0.5,
    hrSdBpm: 1,
    spo2SdPct: 0.3,
    sighRate: 0.003,
    coughRate: 0.001,
    swallowRate: 0.003,
    glitchRate: 0.0005,
  },
  moderate: {
    vtSdRest: 0.13,
    vtSdExercise: 0.06,
    timingSd: 0.1,
    ar: 0.4,
    wanderSd: 0.025,
    patternWanderSd: 0.07,
    vo2SdMlMin: 13,
    vco2SdMlMin: 11,
    veSdFraction: 0.02,
    petco2SdMmHg: 0.6,
    peto2SdMmHg: 1,
    hrSdBpm: 1.5,
    spo2SdPct: 0.5,
    sighRate: 0.006,
    coughRate: 0.003,
    swallowRate: 0.006,
    glitchRate: 0.0015,
  },
  high: {
    vtSdRest: 0.2,
    vtSdExercise: 0.09,
    timingSd: 0.15,
    ar: 0.5,
    wanderSd: 0.04,
    patternWanderSd: 0.1,
    vo2SdMlMin: 25,
    vco2SdMlMin: 20,
    veSdFraction: 0.03,
    petco2SdMmHg: 1,
    peto2SdMmHg: 1.6,
    hrSdBpm: 2.5,
    spo2SdPct: 0.8,
    sighRate: 0.012,
    coughRate: 0.008,
    swallowRate: 0.012,
    glitchRate: 0.004,
  },
} as const satisfies Record<NoiseLevel, Record<string, number>>;

// ---------------------------------------------------------------------------------------------
// Spec population
// ---------------------------------------------------------------------------------------------

const between = (r: SeededRandom, lo: number, hi: number): number => lo + (hi - lo) * r.uniform();
const round = (x: number, digits: number): number => Math.round(x * 10 ** digits) / 10 ** digits;
const clamp = (x: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, x));

interface GroupRanges {
  age: [number, number];
  weight: [number, number];
  peakMlKgMin: [number, number];
  tau: [number, number];
  vt1: [number, number];
  paco2: [number, number];
  fAlv: [number, number];
  chronotropic: [number, number];
  lactatePeak: [number, number];
  gain: [number, number];
  pNoVt2: number;
  pTreadmill: number;
}

/** Group ranges (invented; direction of each difference from the clinical pictures in clinical-reference §5). */
const GROUPS: Record<HoldoutGroup, GroupRanges> = {
  active: {
    age: [20, 50],
    weight: [52, 90],
    peakMlKgMin: [40, 55],
    tau: [20, 32],
    vt1: [0.55, 0.7],
    paco2: [37, 44],
    fAlv: [0.02, 0.06],
    chronotropic: [0.92, 1.02],
    lactatePeak: [8, 12],
    gain: [9.8, 11.2],
    pNoVt2: 0.02,
    pTreadmill: 0.4,
  },
  healthy: {
    age: [25, 80],
    weight: [55, 105],
    peakMlKgMin: [22, 40],
    tau: [26, 45],
    vt1: [0.48, 0.64],
    paco2: [36, 43],
    fAlv: [0.03, 0.08],
    chronotropic: [0.85, 1.0],
    lactatePeak: [6, 10],
    gain: [9.2, 11],
    pNoVt2: 0.04,
    pTreadmill: 0.3,
  },
  deconditioned: {
    age: [30, 75],
    weight: [80, 120],
    peakMlKgMin: [14, 24],
    tau: [40, 60],
    vt1: [0.45, 0.6],
    paco2: [36, 43],
    fAlv: [0.04, 0.1],
    chronotropic: [0.8, 0.98],
    lactatePeak: [5, 8],
    gain: [8.8, 10.5],
    pNoVt2: 0.06,
    pTreadmill: 0.2,
  },
  "heart-failure": {
    age: [40, 80],
    weight: [55, 105],
    peakMlKgMin: [10, 20],
    tau: [50, 80],
    vt1: [0.5, 0.66],
    paco2: [31, 36],
    fAlv: [0.14, 0.22],
    chronotropic: [0.55, 0.85],
    lactatePeak: [3.5, 6.5],
    gain: [7.5, 9.5],
    pNoVt2: 0.1,
    pTreadmill: 0.15,
  },
  "copd-like": {
    age: [45, 80],
    weight: [50, 100],
    peakMlKgMin: [12, 22],
    tau: [45, 70],
    vt1: [0.5, 0.68],
    paco2: [38, 45],
    fAlv: [0.14, 0.22],
    chronotropic: [0.7, 0.95],
    lactatePeak: [3.5, 6],
    gain: [8.5, 10],
    pNoVt2: 0.45,
    pTreadmill: 0.2,
  },
};

const GROUP_WEIGHTS: [HoldoutGroup, number][] = [
  ["active", 0.18],
  ["healthy", 0.32],
  ["deconditioned", 0.15],
  ["heart-failure", 0.2],
  ["copd-like", 0.15],
];

const mPerMinPerKmh = 1000 / 60;
/** ACSM walking / running VO2, mL/kg/min (acsm-metabolic-equations, secondary): S m/min, G fraction. */
function acsmVo2MlKgMin(speedKmh: number, gradePct: number, running: boolean): number {
  const s = speedKmh * mPerMinPerKmh;
  const g = gradePct / 100;
  return running ? 3.5 + 0.2 * s + 0.9 * s * g : 3.5 + 0.1 * s + 1.8 * s * g;
}

/**
 * A deterministic, varied hold-out spec (invented data). The i-th spec of a seed is always the same;
 * its noise level is `noiseLevels[i % noiseLevels.length]`.
 * @param i index in the population (0, 1, 2, …)
 * @param seed population seed (finite number)
 * @param noiseLevels noise levels to cycle through (non-empty)
 */
export function holdoutSpec(i: number, seed: number, noiseLevels: NoiseLevel[]): HoldoutSpec {
  if (noiseLevels.length === 0) throw new Error("holdoutSpec requires at least one noise level");
  if (!Number.isInteger(i) || i < 0) throw new Error("holdoutSpec requires a non-negative integer index");
  const r = seededRandom((Math.imul((seed >>> 0) ^ 0x5bd1e995, 0x27d4eb2d) ^ Math.imul(i + 1, 0x9e3779b1)) >>> 0);
  for (let k = 0; k < 3; k++) r.uniform(); // decorrelate neighbouring indices
  const noise = noiseLevels[i % noiseLevels.length];

  let u = r.uniform();
  let group: HoldoutGroup = "healthy";
  for (const [g, w] of GROUP_WEIGHTS) {
    if (u < w) {
      group = g;
      break;
    }
    u -= w;
  }
  const G = GROUPS[group];
  const ageY = Math.round(between(r, ...G.age));
  const weightKg = round(between(r, ...G.weight), 1);
  const peakMlKgMin = clamp(between(r, ...G.peakMlKgMin) * clamp(1.1 - 0.004 * (ageY - 25), 0.85, 1.1), 10, 55);
  const modality: "cycle" | "treadmill" = r.uniform() < G.pTreadmill && peakMlKgMin >= 16 ? "treadmill" : "cycle";

  const restS = Math.round(between(r, 60, 180));
  const warmupS = r.uniform() < 0.2 ? 0 : Math.round(between(r, 60, 240) / 10) * 10;
  const recoveryS = Math.round(between(r, 60, 240));
  const fit = clamp((peakMlKgMin - 10) / 45, 0, 1);
  // Resting VO2 about 1 MET (3.5 mL/kg/min, common practice), spread ±15 % (invented).
  const vo2RestMlMin = round(weightKg * between(r, 3.0, 4.0), 0);
  const tauPhase2S = round(between(r, ...G.tau), 1);
  const peakMlMin = peakMlKgMin * weightKg;

  let rampS = Math.round(between(r, 480, 780));
  let rampWPerMin: number | null = null;
  let warmupW = 0;
  let vo2UnloadedMlMin = 0;
  let gainMlMinPerW = 1;
  let treadmillEconomy = 1;
  let treadmill: HoldoutTreadmillProtocol | null = null;
  if (modality === "cycle") {
    gainMlMinPerW = round(between(r, ...G.gain), 2);
    // Unloaded pedalling above rest: 1.5–3 mL/kg/min (invented, below the recalled Hansen/Wasserman unloaded cost).
    vo2UnloadedMlMin = round(vo2RestMlMin + weightKg * between(r, 1.5, 3.0), 0);
    warmupW = warmupS > 0 && r.uniform() < 0.4 ? Math.round(between(r, 5, 20) / 5) * 5 : 0;
    // The ramp must end at a demand that lagged VO2 turns into the intended peak (lag ≈ tau).
    const startDemand = vo2UnloadedMlMin + gainMlMinPerW * warmupW;
    const neededW = Math.max(30, (peakMlMin - startDemand) / gainMlMinPerW);
    let rate = clamp(Math.round(neededW / (rampS / 60) / 5) * 5, 5, 50);
    let minutes = neededW / rate;
    while (minutes > 15 && rate < 50) minutes = neededW / (rate += 5);
    while (minutes < 6 && rate > 5) minutes = neededW / (rate -= 5);
    rampWPerMin = rate;
    // lagged VO2 trails the demand by about tau: extend the ramp by tau so VO2 reaches the intended peak
    rampS = Math.round(clamp(minutes * 60 + tauPhase2S, 360, 900));
  } else {
    treadmillEconomy = round(between(r, 0.92, 1.08), 3);
    const stageS = r.uniform() < 0.5 ? 60 : 30;
    const stages = Math.max(12, Math.round(rampS / stageS));
    rampS = stages * stageS;
    const targetEnd = peakMlKgMin / treadmillEconomy + (tauPhase2S / 60) * 2;
    if (peakMlKgMin >= 42) {
      // running: speed rises, grade held at 1 % (jones-1996-treadmill-grade, recalled)
      const startSpeedKmh = round(between(r, 7, 8.5), 1);
      const gradePct = 1;
      const endS = (targetEnd - 3.5) / (0.2 + 0.9 * (gradePct / 100)) / mPerMinPerKmh;
      treadmill = {
        stageS,
        warmupSpeedKmh: round(between(r, 4, 5.5), 1),
        startSpeedKmh,
        speedStepKmh: round(Math.max(0.05, (endS - startSpeedKmh) / (stages - 1)), 3),
        startGradePct: gradePct,
        gradeStepPct: 0,
        running: true,
      };
    } else {
      // walking: constant speed, grade rises from 0 %
      let speedKmh = round(clamp(2.5 + (peakMlKgMin - 16) * 0.12 + between(r, -0.3, 0.3), 2.7, 6), 1);
      let gradeEnd = ((targetEnd - acsmVo2MlKgMin(speedKmh, 0, false)) / (1.8 * speedKmh * mPerMinPerKmh)) * 100;
      while (gradeEnd > 22 && speedKmh < 6.4) {
        speedKmh = round(speedKmh + 0.3, 1);
        gradeEnd = ((targetEnd - acsmVo2MlKgMin(speedKmh, 0, false)) / (1.8 * speedKmh * mPerMinPerKmh)) * 100;
      }
      treadmill = {
        stageS,
        warmupSpeedKmh: round(Math.min(speedKmh, between(r, 2, 3)), 1),
        startSpeedKmh: speedKmh,
        speedStepKmh: 0,
        startGradePct: 0,
        gradeStepPct: round(Math.max(0.1, gradeEnd / (stages - 1)), 3),
        running: false,
      };
    }
  }

  const vt1FractionOfPeak = round(between(r, ...G.vt1), 3);
  const noVt2 = r.uniform() < G.pNoVt2;
  const vt2FractionOfPeak = noVt2
    ? null
    : round(clamp(vt1FractionOfPeak + between(r, 0.14, 0.3), vt1FractionOfPeak + 0.12, 0.93), 3);

  const hrMaxPred = 208 - 0.7 * ageY; // tanaka-2001-hrmax (secondary)
  const hrRestBpm = Math.round(between(r, 58, 88));
  const chronotropic = between(r, ...G.chronotropic);
  const hrPeakBpm = Math.round(hrRestBpm + chronotropic * (hrMaxPred - hrRestBpm));

  const vtMaxL = round(
    group === "copd-like"
      ? between(r, 1.1, 1.6)
      : group === "heart-failure"
        ? between(r, 1.3, 2.0)
        : weightKg * between(r, 0.026, 0.036),
    2,
  );
  const desaturates =
    group === "copd-like" ? r.uniform() < 0.6 : group === "heart-failure" ? r.uniform() < 0.15 : r.uniform() < 0.03;

  return {
    label: `holdout-${i}-${group}-${modality}`,
    noise,
    group,
    modality,
    ageY,
    weightKg,
    restS,
    warmupS,
    rampS,
    recoveryS,
    warmupW,
    rampWPerMin,
    treadmill,
    vo2RestMlMin,
    vo2UnloadedMlMin,
    gainMlMinPerW,
    treadmillEconomy,
    vo2CapFraction: r.uniform() < 0.35 ? round(between(r, 0.93, 0.97), 3) : null,
    tauPhase2S,
    phase1DelayS: Math.round(between(r, 10, 20)),
    phase1Fraction: round(between(r, 0.04, 0.1), 3),
    slowComponentFraction: round(between(r, 0, 0.12) * (0.5 + fit), 3),
    tauSlowS: Math.round(between(r, 90, 180)),
    vt1FractionOfPeak,
    vt2FractionOfPeak,
    lactateRestMmolL: round(between(r, 0.7, 1.4), 2),
    lactatePeakMmolL: round(between(r, ...G.lactatePeak), 1),
    lactateCurvature: round(between(r, 1.3, 2.3), 2),
    lactateClearanceTauS: Math.round(between(r, 600, 1200)),
    excessCo2FractionAtPeak: round(between(r, 0.2, 0.32), 3),
    rqRest: round(between(r, 0.76, 0.86), 3),
    rqPeak: round(between(r, 0.95, 1.0), 3),
    tauCo2StoreS: round(between(r, 12, 35), 1),
    co2CapacitanceMlPerMmHg: round(between(r, 5, 25), 1),
    paco2RestMmHg: round(between(r, ...G.paco2), 1),
    paco2ExerciseRiseMmHg: round(between(r, 0, 2), 2),
    compensationMmHgPerMmolL: round(between(r, 0.7, 1.4), 2),
    vdAnatomicL: round(0.1 + weightKg * between(r, 0.0006, 0.001), 3),
    alveolarDeadSpaceFraction: round(between(r, ...G.fAlv), 3),
    tauVeS: round(between(r, 2, 6), 1),
    vtMaxL,
    rrLowBrMin: round(between(r, 11, 15), 1),
    mvvLMin: group === "copd-like" && noVt2 ? Math.round(between(r, 40, 75)) : null,
    eelvL: round(weightKg * between(r, 0.035, 0.045), 2),
    hrRestBpm,
    hrPeakBpm,
    hrShape: round(between(r, 0.9, 1.15), 2),
    tauHrOnS: Math.round(between(r, 15, 35)),
    tauHrOffS: Math.round(between(r, 35, 70)),
    spo2RestPct: round(between(r, 95, 99), 1),
    spo2DropPct: desaturates ? round(between(r, 3, 8), 1) : round(between(r, 0, 1), 1),
    o2BreathCoupling: round(between(r, 0.5, 0.7), 2),
    co2BreathCoupling: round(between(r, 0.7, 0.9), 2),
  };
}

// ---------------------------------------------------------------------------------------------
// Continuous model on a 1-s grid
// ---------------------------------------------------------------------------------------------

/**
 * First-order lag, exact for input that is linear between grid points (ramp-invariant discretisation,
 * common practice): a ramp comes out delayed by exactly tau.
 */
function lagStep(yPrev: number, xPrev: number, x: number, tauS: number): number {
  if (!(tauS > 0)) return x;
  const a = Math.exp(-1 / tauS);
  return a * yPrev + x - a * xPrev - tauS * (1 - a) * (x - xPrev);
}

/** Smooth minimum of x and cap (width w): equals the smaller far from the cap, levels off near it. */
function softMin(x: number, cap: number, w: number): number {
  return (x + cap - Math.sqrt((x - cap) ** 2 + w * w)) / 2;
}

interface Grid {
  n: number;
  phase: Phase[];
  workW: Float64Array;
  speedKmh: Float64Array;
  gradePct: Float64Array;
  vo2: Float64Array;
  vco2: Float64Array;
  ve: Float64Array;
  hr: Float64Array;
  rr: Float64Array;
  vt: Float64Array;
  petco2: Float64Array;
  peto2: Float64Array;
  spo2: Float64Array;
  vdvt: Float64Array;
  tLtS: number;
  tCompS: number | null;
  restEndS: number;
  warmupEndS: number;
  rampEndS: number;
  endS: number;
}

function simulate(spec: HoldoutSpec): Grid {
  const restEndS = spec.restS;
  const warmupEndS = restEndS + spec.warmupS;
  const rampEndS = warmupEndS + spec.rampS;
  const endS = rampEndS + spec.recoveryS;
  const n = Math.floor(endS) + 1;
  const phase: Phase[] = new Array(n);
  const workW = new Float64Array(n);
  const speedKmh = new Float64Array(n);
  const gradePct = new Float64Array(n);
  const demand = new Float64Array(n);
  const tm = spec.treadmill;
  const kg = spec.weightKg;

  // 1. Protocol and metabolic O2 demand, mL/min.
  for (let i = 0; i < n; i++) {
    const t = i;
    const ph: Phase = t < restEndS ? "rest" : t < warmupEndS ? "warmup" : t < rampEndS ? "exercise" : "recovery";
    phase[i] = ph;
    if (spec.modality === "cycle") {
      const rate = spec.rampWPerMin ?? 0;
      const w =
        ph === "rest" || ph === "recovery" ? 0 : ph === "warmup" ? spec.warmupW : spec.warmupW + (rate * (t - warmupEndS)) / 60;
      workW[i] = w;
      demand[i] = ph === "rest" ? spec.vo2RestMlMin : spec.vo2UnloadedMlMin + spec.gainMlMinPerW * w;
    } else if (tm) {
      let v = 0;
      let g = 0;
      let running = false;
      if (ph === "warmup") v = tm.warmupSpeedKmh;
      else if (ph === "exercise") {
        const stage = Math.floor((t - warmupEndS) / tm.stageS);
        v = tm.startSpeedKmh + stage * tm.speedStepKmh;
        g = tm.startGradePct + stage * tm.gradeStepPct;
        running = tm.running;
      } else if (ph === "recovery") v = Math.min(2.5, tm.warmupSpeedKmh || 2.5);
      speedKmh[i] = v;
      gradePct[i] = g;
      // standing rest ≈ resting VO2; walking/running from the ACSM equations scaled to this subject's rest VO2
      demand[i] =
        v === 0 ? spec.vo2RestMlMin : spec.vo2RestMlMin + (acsmVo2MlKgMin(v, g, running) - 3.5) * kg * spec.treadmillEconomy;
    }
  }

  // 2. Phase II (muscle VO2, before the VO2 cap) and phase I (cardiodynamic) responses.
  const mBase = new Float64Array(n);
  const fast = new Float64Array(n);
  mBase[0] = demand[0];
  fast[0] = demand[0];
  for (let i = 1; i < n; i++) {
    mBase[i] = lagStep(mBase[i - 1], demand[i - 1], demand[i], spec.tauPhase2S);
    fast[i] = lagStep(fast[i - 1], demand[i - 1], demand[i], TAU_PHASE1_S);
  }
  const rampStartI = Math.ceil(warmupEndS);
  const rampEndI = Math.min(n - 1, Math.floor(rampEndS));
  let peakDemand = 0;
  for (let i = rampStartI; i <= rampEndI; i++) peakDemand = Math.max(peakDemand, mBase[i]);

  // 3. Lactate threshold: the VO2 at which lactate (and excess CO2) starts rising; at least 150 s into the ramp.
  const ltFloor = mBase[Math.min(rampEndI, rampStartI + 150)];
  const lt = Math.max(spec.vt1FractionOfPeak * peakDemand, ltFloor + 1);

  // 4. Slow component above LT (gaesser-1996-slow-component, recalled) and the VO2 cap.
  const mRaw = new Float64Array(n);
  let sc = 0;
  let scTargetPrev = 0;
  for (let i = 0; i < n; i++) {
    const target = phase[i] === "recovery" ? 0 : spec.slowComponentFraction * Math.max(0, mBase[i] - lt);
    sc = i === 0 ? 0 : lagStep(sc, scTargetPrev, target, spec.tauSlowS);
    scTargetPrev = target;
    mRaw[i] = mBase[i] + sc;
  }
  let peakRaw = 0;
  for (let i = rampStartI; i <= rampEndI; i++) peakRaw = Math.max(peakRaw, mRaw[i]);
  const cap = spec.vo2CapFraction === null ? Infinity : spec.vo2CapFraction * peakRaw;
  const m = new Float64Array(n);
  for (let i = 0; i < n; i++) m[i] = cap === Infinity ? mRaw[i] : softMin(mRaw[i], cap, 0.03 * cap);
  const fastCapped = new Float64Array(n);
  for (let i = 0; i < n; i++) fastCapped[i] = cap === Infinity ? fast[i] : softMin(fast[i], cap, 0.03 * cap);

  // VO2 at the mouth: phase II delayed by the muscle-to-lung transit time, plus the phase I (cardiodynamic) share.
  const td = spec.phase1DelayS;
  const at = (arr: Float64Array, i: number): number => arr[clamp(i, 0, n - 1)];
  const phi = spec.phase1Fraction;
  const vo2 = new Float64Array(n);
  for (let i = 0; i < n; i++) vo2[i] = (1 - phi) * at(m, i - td) + phi * fastCapped[i];
  let peakVo2Mouth = 0;
  for (let i = rampStartI; i <= rampEndI; i++) peakVo2Mouth = Math.max(peakVo2Mouth, vo2[i]);

  // Threshold times in metabolic VO2: lactate threshold ...
  let tLtS = rampEndS;
  for (let i = rampStartI + 1; i <= rampEndI; i++) {
    if (mRaw[i] >= lt) {
      tLtS = i - 1 + (mRaw[i] > mRaw[i - 1] ? (lt - mRaw[i - 1]) / (mRaw[i] - mRaw[i - 1]) : 1);
      break;
    }
  }
  // ... and compensation onset (VT2): at least the spec's fraction, at least VT1 + 10 % of peak in metabolic VO2
  // and in VO2 at the mouth (where a detector reads it), and seen at the mouth at least 45 s before the ramp ends.
  const vo2AtVt1Mouth = sampleAt(vo2, tLtS + td + spec.tauCo2StoreS);
  let vt2Level: number | null = null;
  let tCompS: number | null = null;
  if (spec.vt2FractionOfPeak !== null) {
    // earliest index meeting the margins, index of the spec's level, latest index seen 45 s before the end;
    // a spec level that comes too late is moved back to the latest feasible point
    const margin = lt + 0.1 * peakRaw;
    let iMin = -1;
    let iSpec = -1;
    let iLatest = -1;
    for (let i = rampStartI + 1; i <= rampEndI; i++) {
      const mouthS = i + td + spec.tauVeS;
      if (mouthS <= rampEndS - 45) iLatest = i;
      if (iMin < 0 && mRaw[i] >= margin && sampleAt(vo2, mouthS) >= vo2AtVt1Mouth + 0.1 * peakVo2Mouth) iMin = i;
      if (iSpec < 0 && mRaw[i] >= spec.vt2FractionOfPeak * peakRaw) iSpec = i;
    }
    if (iMin >= 0 && iLatest >= iMin) {
      const i = Math.max(iMin, Math.min(iSpec < 0 ? iLatest : iSpec, iLatest));
      vt2Level = mRaw[i];
      tCompS = i;
    }
  }

  // 5. Blood lactate (hughson-1987-lactate-continuous, recalled: exponential rise in VO2 above the threshold).
  // La = LaRest + A·(e^{kx} − 1 − kx), x = VO2 − LT: flat to LT, slope rising from 0 (so excess CO2 starts
  // with a slope, not a step), lactatePeak at the peak; in recovery it clears with its own time constant.
  const xPeak = Math.max(1, peakRaw - lt);
  const k = spec.lactateCurvature / xPeak;
  const aLa = (spec.lactatePeakMmolL - spec.lactateRestMmolL) / (Math.exp(spec.lactateCurvature) - 1 - spec.lactateCurvature);
  const laOf = (x: number): number =>
    x <= 0 ? spec.lactateRestMmolL : spec.lactateRestMmolL + aLa * (Math.exp(k * x) - 1 - k * x);
  const la = new Float64Array(n);
  la[0] = spec.lactateRestMmolL;
  for (let i = 1; i < n; i++) {
    const cleared = la[i - 1] - ((la[i - 1] - spec.lactateRestMmolL) * 1) / spec.lactateClearanceTauS;
    la[i] = Math.max(laOf(mRaw[i] - lt), cleared);
  }
  const laVt2 = vt2Level === null ? null : laOf(vt2Level - lt);
  // dLa/dt, mmol/L per min
  const dLa = new Float64Array(n);
  for (let i = 1; i < n; i++) dLa[i] = (la[i] - la[i - 1]) * 60;
  // Buffering volume so that excess CO2 at the end of the ramp is the spec's fraction of peak VO2 (invented
  // calibration): excess CO2 (mL/min) = 22 mL/mmol × V (L) × dLa/dt (mmol/L/min) (beaver-1986-buffering).
  let dLaEnd = 1e-6;
  for (let i = rampStartI; i < rampEndI; i++) dLaEnd = Math.max(dLaEnd, dLa[i]);
  const bufferVolumeL = (spec.excessCo2FractionAtPeak * peakRaw) / (CO2_ML_PER_MMOL * dLaEnd);

  // 6. Tissue CO2 output: metabolic RQ rises linearly with metabolic rate (common practice: more carbohydrate
  // at higher intensity), plus buffering CO2.
  const mRest = spec.vo2RestMlMin;
  const rqOf = (x: number): number =>
    spec.rqRest + (spec.rqPeak - spec.rqRest) * clamp((x - mRest) / Math.max(1, peakRaw - mRest), 0, 1);
  const co2Tissue = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const metab = rqOf(m[i]) * m[i];
    const excess = Math.max(-0.25 * metab, CO2_ML_PER_MMOL * bufferVolumeL * dLa[i]);
    co2Tissue[i] = metab + excess;
  }

  // 7. PaCO2 set-point: small rise in moderate exercise (complete by LT), flat (isocapnic buffering) to the
  // compensation onset, then falling with the lactate (acidosis) above it (winters-1967-compensation, recalled).
  // A compensation too small to see is no compensation: the gain is raised when needed so that PaCO2 has
  // fallen at least MIN_COMPENSATION_MMHG by the end of the ramp (invented floor).
  const laRampEnd = la[Math.max(0, rampEndI - 1 - td)]; // as it reaches the chemoreceptors by the ramp end
  const compGain =
    laVt2 === null ? 0 : Math.max(spec.compensationMmHgPerMmolL, MIN_COMPENSATION_MMHG / Math.max(0.1, laRampEnd - laVt2));
  const paco2Set = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const mLung = at(m, i - td);
    const rise = spec.paco2ExerciseRiseMmHg * (1 - Math.exp((-3 * Math.max(0, mLung - mRest)) / Math.max(1, lt - mRest)));
    const comp = laVt2 === null ? 0 : compGain * Math.max(0, at(la, i - td) - laVt2);
    paco2Set[i] = Math.max(20, spec.paco2RestMmHg + rise - comp);
  }

  // 8. VCO2 at the mouth: tissue CO2 delayed by the transit time + phase I share, through the CO2 store lag,
  // with fast-store washout when PaCO2 falls (and refilling when it rises).
  const vco2 = new Float64Array(n);
  const co2Lung = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const washout = i === 0 ? 0 : -spec.co2CapacitanceMlPerMmHg * (paco2Set[i] - paco2Set[i - 1]) * 60;
    co2Lung[i] = (1 - phi) * at(co2Tissue, i - td) + phi * rqOf(fastCapped[i]) * fastCapped[i] + washout;
  }
  vco2[0] = co2Lung[0];
  for (let i = 1; i < n; i++) vco2[i] = lagStep(vco2[i - 1], co2Lung[i - 1], co2Lung[i], spec.tauCo2StoreS);

  // 9. Ventilation from the alveolar ventilation equation: VE·(1 − VD/VT) = 863·VCO2/PaCO2, VD/VT =
  // VDanat/VT + alveolar dead-space fraction, VT from VE by the saturating pattern (hey-1966-pattern, recalled).
  const fA = spec.alveolarDeadSpaceFraction;
  const vtOf = (veL: number): number => spec.vtMaxL * (1 - Math.exp(-veL / (spec.vtMaxL * spec.rrLowBrMin)));
  const ve = new Float64Array(n);
  let veTargetPrev = 0;
  for (let i = 0; i < n; i++) {
    const va = (K_ALV * (vco2[i] / 1000)) / paco2Set[i];
    let veT = i === 0 ? va / (1 - fA - 0.3) : veTargetPrev;
    for (let it = 0; it < 30; it++) {
      const vtL = vtOf(veT);
      const alvFraction = Math.max(0.15, 1 - spec.vdAnatomicL / vtL - fA);
      const next = va / alvFraction;
      if (Math.abs(next - veT) < 1e-9) break;
      veT = next;
    }
    if (spec.mvvLMin !== null) veT = softMin(veT, 0.92 * spec.mvvLMin, 0.05 * spec.mvvLMin);
    ve[i] = i === 0 ? veT : lagStep(ve[i - 1], veTargetPrev, veT, spec.tauVeS);
    veTargetPrev = veT;
  }

  // 10. Breathing pattern, end-tidal gases, HR, SpO2.
  const vt = new Float64Array(n);
  const rr = new Float64Array(n);
  const vdvt = new Float64Array(n);
  const petco2 = new Float64Array(n);
  const peto2 = new Float64Array(n);
  const hr = new Float64Array(n);
  const spo2 = new Float64Array(n);
  let hrTargetPrev = spec.hrRestBpm;
  let spo2TargetPrev = spec.spo2RestPct;
  for (let i = 0; i < n; i++) {
    vt[i] = vtOf(ve[i]);
    rr[i] = ve[i] / vt[i];
    vdvt[i] = Math.min(0.85, spec.vdAnatomicL / vt[i] + fA);
    const paco2 = (K_ALV * (vco2[i] / 1000)) / (ve[i] * (1 - vdvt[i]));
    // Expired alveolar gas mixes perfused alveoli (PaCO2) with alveolar dead space (no CO2); during expiration
    // alveolar PCO2 rises as CO2 flows into the lung volume, so the end-tidal value sits above the mean by
    // half that rise (tidal-pco2-oscillation, common practice; invented lung volume).
    const texpMin = EXPIRATORY_FRACTION / rr[i];
    const oscillation = (0.5 * (PB - PH2O) * (vco2[i] / 1000) * texpMin) / spec.eelvL;
    petco2[i] = paco2 * (1 - (fA * vt[i]) / Math.max(0.05, vt[i] - spec.vdAnatomicL)) + oscillation;
    const rer = clamp(vco2[i] / vo2[i], 0.6, 1.7);
    peto2[i] = PIO2 - petco2[i] * (FIO2 + (1 - FIO2) / rer); // alveolar gas equation
    const x = clamp((m[i] - mRest) / Math.max(1, peakRaw - mRest), 0, 1.05);
    const hrTarget = spec.hrRestBpm + (spec.hrPeakBpm - spec.hrRestBpm) * Math.pow(x, spec.hrShape);
    hr[i] =
      i === 0 ? hrTarget : lagStep(hr[i - 1], hrTargetPrev, hrTarget, hrTarget >= hr[i - 1] ? spec.tauHrOnS : spec.tauHrOffS);
    hrTargetPrev = hrTarget;
    const xd = clamp((m[i] - lt) / Math.max(1, peakRaw - lt), 0, 1);
    const spo2Target = spec.spo2RestPct - spec.spo2DropPct * Math.pow(xd, 1.5);
    spo2[i] = i === 0 ? spo2Target : lagStep(spo2[i - 1], spo2TargetPrev, spo2Target, 20);
    spo2TargetPrev = spo2Target;
  }

  return {
    n,
    phase,
    workW,
    speedKmh,
    gradePct,
    vo2,
    vco2,
    ve,
    hr,
    rr,
    vt,
    petco2,
    peto2,
    spo2,
    vdvt,
    tLtS,
    tCompS,
    restEndS,
    warmupEndS,
    rampEndS,
    endS,
  };
}

/** Value of a grid signal at time t (linear interpolation, clamped to the record). */
function sampleAt(arr: Float64Array, t: number): number {
  const n = arr.length;
  if (t <= 0) return arr[0];
  if (t >= n - 1) return arr[n - 1];
  const i = Math.floor(t);
  return arr[i] + (t - i) * (arr[i + 1] - arr[i]);
}

/** Mean of a grid signal over [a, b] (trapezoid integral of the piecewise-linear signal). */
function meanOver(cum: Float64Array, arr: Float64Array, a: number, b: number): number {
  const integ = (t: number): number => {
    const n = arr.length;
    const tc = clamp(t, 0, n - 1);
    const i = Math.min(n - 2, Math.floor(tc));
    const v = sampleAt(arr, tc);
    return cum[i] + ((tc - i) * (arr[i] + v)) / 2;
  };
  if (b - a < 1e-9) return sampleAt(arr, b);
  return (integ(b) - integ(a)) / (b - a);
}

function cumulative(arr: Float64Array): Float64Array {
  const c = new Float64Array(arr.length);
  for (let i = 1; i < arr.length; i++) c[i] = c[i - 1] + (arr[i - 1] + arr[i]) / 2;
  return c;
}

// ---------------------------------------------------------------------------------------------
// Generator
// ---------------------------------------------------------------------------------------------

/**
 * Generate one hold-out synthetic CPET test (invented data) from a spec and a seed.
 *
 * Breaths: durations 60/RR with log-normal jitter (AR(1)); each breath reports the mean of the continuous
 * signals over its duration and is stamped at its end. Noise comes mainly from tidal-volume irregularity:
 * a breath's alveolar ventilation relative to the mean (q) scales VE fully, VCO2 by `co2BreathCoupling` and
 * VO2 by `o2BreathCoupling` (lung gas stores buffer O2 more than CO2), end-tidal gases move opposite; plus
 * absolute analyser noise, a slowly wandering ventilation, sighs, coughs, swallowed breaths and rare
 * non-physiological glitches. Noise level "none" gives exactly the noise-free table.
 *
 * Truth: see lib/synthetic/README.md "Hold-out model".
 * @param spec from `holdoutSpec` (or hand-made)
 * @param seed breath timing and noise seed (finite number)
 */
export function generateHoldoutTest(spec: HoldoutSpec, seed: number): HoldoutTest {
  if (!Number.isFinite(seed)) throw new Error("generateHoldoutTest requires a finite seed");
  const g = simulate(spec);
  const lvl = NOISE[spec.noise];
  const rTime = seededRandom((seed ^ 0x2545f491) >>> 0);
  const rNoise = seededRandom((Math.imul(seed >>> 0, 0x01000193) ^ 0x811c9dc5) >>> 0);

  // Breath boundaries.
  const starts: number[] = [];
  const ends: number[] = [];
  const logDur: number[] = [];
  const patternLog: number[] = [];
  let t = 0;
  let zT = 0;
  let pattern = 0;
  while (true) {
    zT = lvl.ar * zT + Math.sqrt(1 - lvl.ar * lvl.ar) * rTime.normal();
    const rrNow = sampleAt(g.rr, t);
    // slow wander (Ornstein–Uhlenbeck, time constant 60 s) of the VT/RR split: slower, deeper breathing or
    // faster, shallower breathing at the same ventilation
    const rho = Math.exp(-(60 / rrNow) / 60);
    pattern = rho * pattern + Math.sqrt(1 - rho * rho) * lvl.patternWanderSd * rTime.normal();
    const lg = clamp(lvl.timingSd * zT + pattern, -1.2, 1.2);
    const dur = (60 / rrNow) * Math.exp(lg);
    if (t + dur > g.endS) break;
    starts.push(t);
    ends.push(t + dur);
    logDur.push(lvl.timingSd * zT);
    patternLog.push(pattern);
    t += dur;
  }

  const signals = {
    vo2: g.vo2,
    vco2: g.vco2,
    ve: g.ve,
    hr: g.hr,
    rr: g.rr,
    vt: g.vt,
    petco2: g.petco2,
    peto2: g.peto2,
    spo2: g.spo2,
    vdvt: g.vdvt,
  };
  const cums = Object.fromEntries(Object.entries(signals).map(([key, arr]) => [key, cumulative(arr)])) as Record<
    keyof typeof signals,
    Float64Array
  >;
  const mean = (key: keyof typeof signals, a: number, b: number): number => meanOver(cums[key], signals[key], a, b);
  const phaseAt = (time: number): Phase =>
    time < g.restEndS ? "rest" : time < g.warmupEndS ? "warmup" : time < g.rampEndS ? "exercise" : "recovery";
  const cycle = spec.modality === "cycle";

  const nfRows: BreathRow[] = [];
  for (let b = 0; b < starts.length; b++) {
    const a = starts[b];
    const e = ends[b];
    const i = Math.min(g.n - 1, Math.floor(e));
    const row: BreathRow = {
      timeS: round(e, 3),
      vo2MlMin: mean("vo2", a, e),
      vco2MlMin: mean("vco2", a, e),
      veLMin: mean("ve", a, e),
      hrBpm: mean("hr", a, e),
      rrBrMin: mean("rr", a, e),
      vtL: mean("vt", a, e),
      peto2MmHg: mean("peto2", a, e),
      petco2MmHg: mean("petco2", a, e),
      spo2Pct: mean("spo2", a, e),
      phase: phaseAt(e),
    };
    if (cycle) row.workW = round(sampleAt(g.workW, e), 1);
    else {
      row.speedKmh = round(g.speedKmh[i], 2);
      row.gradePct = round(g.gradePct[i], 2);
    }
    nfRows.push(row);
  }

  // Noisy breaths.
  const rows: BreathRow[] = [];
  let zV = 0;
  let wander = 0;
  const veRest = nfRows.length > 0 ? (nfRows[0].veLMin ?? 10) : 10;
  let vePeak = veRest;
  for (const row of nfRows) vePeak = Math.max(vePeak, row.veLMin ?? 0);
  for (let b = 0; b < nfRows.length; b++) {
    const nf = nfRows[b];
    const dur = ends[b] - starts[b];
    const ve0 = nf.veLMin as number;
    const vt0 = nf.vtL as number;
    // Irregularity falls from rest to heavy exercise (invented shape).
    const w = clamp((ve0 - veRest) / Math.max(1, vePeak - veRest), 0, 1);
    const vtSd = lvl.vtSdExercise + (lvl.vtSdRest - lvl.vtSdExercise) * Math.exp(-4 * w);
    zV = lvl.ar * zV + Math.sqrt(1 - lvl.ar * lvl.ar) * rNoise.normal();
    // slow wander (Ornstein–Uhlenbeck, time constant 60 s) of ventilation (drive)
    const rho = Math.exp(-dur / 60);
    wander = rho * wander + Math.sqrt(1 - rho * rho) * lvl.wanderSd * rNoise.normal();
    // tidal volume: partly follows the breath's duration (longer breaths are deeper: 0.6 of the short-term
    // jitter, all of the slow pattern wander, invented) + its own AR(1) irregularity
    let vtFactor = Math.exp(0.6 * logDur[b] + patternLog[b] + vtSd * zV) * (1 + wander);
    let durFactor = Math.exp(logDur[b] + patternLog[b]); // already applied to the breath times
    let event: "sigh" | "cough" | "swallow" | "glitch" | null = null;
    const u = rNoise.uniform();
    if (u < lvl.sighRate) event = "sigh";
    else if (u < lvl.sighRate + lvl.coughRate) event = "cough";
    else if (u < lvl.sighRate + lvl.coughRate + lvl.swallowRate) event = "swallow";
    else if (u < lvl.sighRate + lvl.coughRate + lvl.swallowRate + lvl.glitchRate) event = "glitch";
    if (event === "sigh") vtFactor *= 2 + 1.5 * rNoise.uniform();
    if (event === "swallow") vtFactor *= 0.2 + 0.2 * rNoise.uniform();
    if (event === "cough") {
      vtFactor *= 1.2 + 0.8 * rNoise.uniform();
      durFactor *= 0.5;
    }
    const vtB = vt0 * vtFactor;
    // the reported rate follows the breath's own duration (nominal 60/RR times the duration factor)
    const rrB = (nf.rrBrMin as number) / durFactor;
    const veB = vtB * rrB * (1 + lvl.veSdFraction * rNoise.normal());
    const vd = vt0 * (g.vdvt[Math.min(g.n - 1, Math.floor(ends[b]))] ?? 0.3);
    const q = Math.max(0.05, ((vtB - vd) * rrB) / Math.max(1e-6, (vt0 - vd) * (nf.rrBrMin as number)));
    let vo2B = (nf.vo2MlMin as number) * (1 + spec.o2BreathCoupling * (q - 1)) + lvl.vo2SdMlMin * rNoise.normal();
    let vco2B = (nf.vco2MlMin as number) * (1 + spec.co2BreathCoupling * (q - 1)) + lvl.vco2SdMlMin * rNoise.normal();
    const qp = Math.pow(q, -0.25); // end-tidal response to a bigger or smaller breath (invented exponent)
    let petco2B = (nf.petco2MmHg as number) * qp + lvl.petco2SdMmHg * rNoise.normal();
    const peto2Nf = nf.peto2MmHg as number;
    const peto2B = peto2Nf + (PIO2 - peto2Nf) * (1 - qp) + lvl.peto2SdMmHg * rNoise.normal();
    let hrB = (nf.hrBpm as number) + lvl.hrSdBpm * rNoise.normal();
    const spo2B = (nf.spo2Pct as number) + lvl.spo2SdPct * rNoise.normal();
    if (event === "cough") {
      // a cough moves gas without exchange: VO2/VCO2 erratic, end-tidal sample diluted
      vo2B *= 0.5 + rNoise.uniform();
      vco2B *= 0.5 + rNoise.uniform();
      petco2B *= 0.75 + 0.2 * rNoise.uniform();
    }
    if (event === "glitch") {
      // non-physiological: one analyser or sensor channel jumps for one breath
      const which = rNoise.int(4);
      if (which === 0) vo2B *= rNoise.uniform() < 0.5 ? 0.15 : 2.8;
      else if (which === 1) vco2B *= rNoise.uniform() < 0.5 ? 0.2 : 2.5;
      else if (which === 2) petco2B = 4 + 6 * rNoise.uniform();
      else hrB = rNoise.uniform() < 0.5 ? hrB * 2 : hrB / 2;
    }
    const noisy: BreathRow = { ...nf };
    if (spec.noise !== "none") {
      noisy.vo2MlMin = round(Math.max(5, vo2B), 1);
      noisy.vco2MlMin = round(Math.max(5, vco2B), 1);
      noisy.veLMin = round(Math.max(0.3, veB), 2);
      noisy.vtL = round(Math.max(0.05, vtB), 3);
      noisy.rrBrMin = round(rrB, 1);
      noisy.petco2MmHg = round(clamp(petco2B, 1, 80), 1);
      noisy.peto2MmHg = round(clamp(peto2B, 40, 148), 1);
      noisy.hrBpm = Math.round(clamp(hrB, 30, 240));
      noisy.spo2Pct = Math.round(clamp(spo2B, 70, 100));
    }
    rows.push(noisy);
  }

  const load: NumericField[] = cycle ? ["workW"] : ["speedKmh", "gradePct"];
  const fields: (NumericField | "phase")[] = [
    "timeS",
    "vo2MlMin",
    "vco2MlMin",
    "veLMin",
    "hrBpm",
    ...load,
    "rrBrMin",
    "vtL",
    "peto2MmHg",
    "petco2MmHg",
    "spo2Pct",
    "phase",
  ];
  const noiseFree: BreathTable = { shape: "breath", rows: nfRows, fields: [...fields] };
  const table: BreathTable = { shape: "breath", rows, fields: [...fields] };
  const truth = buildTruth(spec, g, nfRows);
  return { table, noiseFree, truth, spec, seed, holdout: { noise: spec.noise } };
}

function buildTruth(spec: HoldoutSpec, g: Grid, rows: BreathRow[]): SyntheticTruth {
  const cycle = spec.modality === "cycle";
  const point = (time: number): TruthPoint => ({
    timeS: time,
    vo2MlMin: sampleAt(g.vo2, time),
    vco2MlMin: sampleAt(g.vco2, time),
    veLMin: sampleAt(g.ve, time),
    workW: cycle ? sampleAt(g.workW, time) : NaN,
    hrBpm: sampleAt(g.hr, time),
  });
  // As seen at the mouth: excess CO2 starts in the tissue at tLt, reaches the lung after the transit delay and
  // passes the CO2 store lag (a ramp corner through a first-order lag keeps its asymptotes' crossing tau later).
  const vt1Time = g.tLtS + spec.phase1DelayS + spec.tauCo2StoreS;
  // Compensation: the acid reaches the chemoreceptors after the transit delay; VE follows with its lag.
  const vt2Time = g.tCompS === null ? null : g.tCompS + spec.phase1DelayS + spec.tauVeS;
  const vt2 = vt2Time !== null && vt2Time < g.rampEndS ? point(vt2Time) : null;

  // Peak: maximum noise-free VO2 of the exercise phase (1-s grid).
  let peakI = Math.ceil(g.warmupEndS);
  for (let i = peakI; i <= Math.min(g.n - 1, Math.floor(g.rampEndS)); i++) if (g.vo2[i] > g.vo2[peakI]) peakI = i;
  const peak = {
    vo2MlMin: g.vo2[peakI],
    vco2MlMin: g.vco2[peakI],
    veLMin: g.ve[peakI],
    hrBpm: g.hr[peakI],
    workW: cycle ? g.workW[peakI] : NaN,
    rer: g.vco2[peakI] / g.vo2[peakI],
    timeS: peakI,
  };

  const span = (from: number, to: number): BreathRow[] => rows.filter((r) => r.timeS >= from && r.timeS <= to);
  const fit = (rs: BreathRow[], x: (r: BreathRow) => number, y: (r: BreathRow) => number): number =>
    linearRegression(rs.map(x), rs.map(y)).slope;
  const rampStart = g.warmupEndS;
  const vt2OrEnd = vt2 ? vt2.timeS : g.rampEndS;
  const ve = (r: BreathRow): number => r.veLMin as number;
  const vco2L = (r: BreathRow): number => (r.vco2MlMin as number) / 1000;
  return {
    invented: true,
    vt1: point(vt1Time),
    vt2,
    peak,
    vco2Vo2SlopeBelowVt1: fit(
      span(rampStart + 120, vt1Time),
      (r) => r.vo2MlMin as number,
      (r) => r.vco2MlMin as number,
    ),
    vco2Vo2SlopeAboveVt1: fit(
      span(vt1Time, vt2OrEnd),
      (r) => r.vo2MlMin as number,
      (r) => r.vco2MlMin as number,
    ),
    veVco2SlopeToVt2: fit(span(rampStart, vt2OrEnd), vco2L, ve),
    veVco2SlopeToPeak: fit(span(rampStart, g.rampEndS), vco2L, ve),
    deltaVo2DeltaWrMlMinW: cycle
      ? fit(
          span(rampStart + 60, g.rampEndS),
          (r) => r.workW as number,
          (r) => r.vo2MlMin as number,
        )
      : NaN,
    phases: { restEndS: g.restEndS, warmupEndS: g.warmupEndS, rampEndS: g.rampEndS, endS: g.endS },
    rampWPerMin: spec.rampWPerMin ?? NaN,
    weightKg: spec.weightKg,
  };
}
