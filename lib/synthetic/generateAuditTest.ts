import type { BreathRow, BreathTable, NumericField, Phase } from "../breath";
import { linearRegression, seededRandom } from "../numeric";
import type { SeededRandom } from "../numeric";
import type { NoiseLevel, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Audit model: a fourth synthetic CPET generator, written independently of the other three, to check the
 * threshold detectors blind. All numbers are INVENTED physiology (source `audit-model-invented`) unless a
 * published source id is named beside them.
 *
 * ## Model, in order of computation (1-s grid)
 * 1. Protocol → O2 demand. Cycle: VO2 = rest + unloaded cost + G·W (ΔVO2/ΔWR G, `hansen-1987-ramp-gain`,
 *    confirmed). Treadmill: ACSM walking/running equations × an individual economy factor
 *    (`acsm-metabolic-equations`, secondary). Ramps or stages (1, 2 or 3 min).
 * 2. Muscle O2 uptake `m_u` = demand through a first-order lag τ (phase II, `whipp-1982-kinetics`, recalled),
 *    plus above VT1 an extra O2 cost σ·(m_u − VT1) (slow component, `gaesser-1996-slow-component`, recalled).
 *    The attained VO2 `m` is `m_u` through a smooth ceiling (plateau / flattening near peak).
 * 3. Thresholds are set as chosen values of `m_u` (mL/min): t1 = first time `m_u` ≥ VT1 VO2, t2 = first time
 *    `m_u` ≥ VT2 VO2, both in the incremental phase.
 * 4. VO2 at the mouth = (1 − φ)·m(t − D) + φ·m_fast(t): transit delay D plus a small cardiodynamic share φ
 *    that follows the demand with a 6-s lag.
 * 5. Muscle CO2 output = RER_rest·VO2_rest + S1·(m − VO2_rest) + E(u1), u1 = (m_u − VT1)+, with the excess
 *    CO2 of buffering E(u) = k·u·(1 + c·u/U) (U = u at exercise end): k is the initial extra slope (a corner
 *    in VCO2 vs VO2), c ≥ 0 bends it upwards (lactate rising faster than linearly, `hughson-1987-lactate-continuous`, recalled);
 *    excess CO2 from bicarbonate buffering: `beaver-1986-v-slope-model` (confirmed). In recovery E decays
 *    exponentially. VCO2 at the mouth = that output delayed by D and passed through a first-order CO2-store
 *    lag τC, plus CO2 washed out of the stores while arterial PCO2 falls (store capacity × −dPaCO2/dt).
 * 6. Ventilation: the arterial PCO2 target is PaCO2_set below VT2 and falls by ΔP·((m_u − VT2)/(m_u,end −
 *    VT2))^q above it (respiratory compensation, reaching the carotid bodies Dc after the muscle); VE is
 *    solved from the alveolar ventilation equation PaCO2 = 863·VCO2/((VE − RR·VD)(1 − f_alv))
 *    (`alveolar-ventilation-equation`, common practice) with the breathing pattern VT(VE), times an optional
 *    oscillation (EOV, `eov-criteria-review`), then lagged by τVE.
 * 7. PETCO2 = mixed alveolar PCO2 + the rise through expiration ½·(PB − 47)·VCO2·Te/EELV
 *    (`audit-tidal-pco2-rise`, common practice); PETO2 from the alveolar gas equation.
 * 8. HR: a power law of attained VO2 between rest and a peak set by Tanaka's HRmax × a chronotropic index
 *    (`tanaka-2001-hrmax`, secondary), lagged; SpO2 falls with intensity.
 * 9. Breaths: durations 60/RR with timing jitter; each breath reports the mean of the grid over its span,
 *    stamped at its end. Noise (`lamarra-1987-noise`, `liang-1996-autocorrelation`): AR(1) breath noise with
 *    an absolute and a relative part, VO2 and VCO2 correlated with VE; artefacts (sighs/coughs, swallows,
 *    mask-leak runs, HR double/missed counts, SpO2 probe drops).
 *
 * ## Truth, exactly
 * A delay D followed by a first-order lag τ shifts every feature of a ramp-like input by its mean response
 * time D + τ (exact for piecewise-linear inputs; `audit-mean-response-time`, common practice). So:
 * - VT1 time at the mouth T1 = t1 + D + τC: there the straight-line asymptotes of noise-free mouth VCO2 vs VO2
 *   meet (for c = 0; excess CO2 first appears at the mouth at t1 + D and grows smoothly).
 * - VT2 time at the mouth T2 = t2 + Dc + τVE: the corner of noise-free VE vs VCO2 (hyperventilation onset).
 * - Each truth point = the noise-free continuous signals (VO2, VCO2, VE, HR) and the ergometer work rate at
 *   that time (work NaN on a treadmill). With oscillatory ventilation the truth point uses the signals
 *   without the oscillation (the trend an averaging reader sees); the noise-free table keeps the oscillation. Breath values average the grid over each breath, so a breath stamped
 *   at T differs by at most half a breath.
 * - peak = means of the noise-free breaths over the last 30 s of the incremental phase (time = end − 15 s).
 */

/** Population groups of the audit model (invented ranges per group, see `GROUPS`). */
export type AuditGroup = "athlete" | "active" | "sedentary" | "older" | "heart-failure";

/** Exercise protocol of an audit test. */
export interface AuditProtocol {
  ergometer: "cycle" | "treadmill";
  /** 0 = continuous ramp; otherwise the stage length, s (stages of equal increments). */
  stepS: number;
  /** Cycle: work rate during the warm-up (unloaded / light pedalling), W. */
  warmupW: number;
  /** Cycle: work rate reached at the end of the incremental phase, W. */
  endW: number;
  /** Cycle: cool-down work rate in recovery, W. */
  recoveryW: number;
  /** Treadmill: warm-up walking speed (grade 0 %), km/h. */
  warmupKmh: number;
  /** Treadmill: speed at the start / end of the incremental phase, km/h. */
  startKmh: number;
  endKmh: number;
  /** Treadmill: grade at the start / end of the incremental phase, %. */
  startGradePct: number;
  endGradePct: number;
  /** Treadmill: recovery walking speed (grade 0 %), km/h. */
  recoveryKmh: number;
  /** Treadmill: running (ACSM running equation) rather than walking during the incremental phase. */
  running: boolean;
}

/** Everything that shapes one audit test (invented physiology). Units in the names. */
export interface AuditSpec {
  label: string;
  group: AuditGroup;
  noise: NoiseLevel;
  weightKg: number;
  ageY: number;
  protocol: AuditProtocol;
  /** Phase durations, s. */
  restS: number;
  warmupS: number;
  incrementalS: number;
  recoveryS: number;
  // oxygen
  /** Resting VO2, mL/min. */
  vo2RestMlMin: number;
  /** Cycle: extra VO2 of pedalling at 0 W above rest, mL/min. */
  unloadedCostMlMin: number;
  /** Cycle: ΔVO2/ΔWR below VT1, mL/min/W. */
  gainMlMinPerW: number;
  /** Treadmill: multiplier on the ACSM O2 cost (walking/running economy), dimensionless. */
  economyFactor: number;
  /** Phase II time constant of muscle VO2, s. */
  tauVo2S: number;
  /** Muscle-to-lung transit delay, s. */
  transitDelayS: number;
  /** Share of the mouth VO2 that follows the demand almost at once (cardiodynamic phase I), 0–1. */
  cardiodynamicFraction: number;
  /** Extra O2 cost above VT1 per mL/min of muscle VO2 above VT1 (slow component), dimensionless. */
  slowComponentFraction: number;
  /** Attained VO2 follows the unconstrained one up to this value, mL/min (Infinity = no ceiling). */
  ceilingOnsetMlMin: number;
  /** Asymptote of the attained VO2 above `ceilingOnsetMlMin`, mL/min. */
  vo2MaxMlMin: number;
  /** VT1: unconstrained muscle VO2 at which excess CO2 starts, mL/min. */
  vt1Vo2MlMin: number;
  /** VT2/RCP: unconstrained muscle VO2 at which hyperventilation starts, mL/min; null = no RCP. */
  vt2Vo2MlMin: number | null;
  // carbon dioxide
  rerRest: number;
  /** Metabolic slope of VCO2 on VO2 below VT1, dimensionless. */
  s1: number;
  /** Initial slope k of excess CO2 on muscle VO2 above VT1, mL CO2 per mL O2. */
  excessInitialSlope: number;
  /** Upward bend c of the excess CO2 (0 = straight line above VT1), dimensionless. */
  excessCurvature: number;
  /** First-order lag of VCO2 from the CO2 stores, s (on top of the transit delay). */
  tauCo2S: number;
  /** CO2 released per mmHg fall of arterial PCO2 (fast stores), mL/mmHg. */
  co2StoreMlPerMmHg: number;
  /** Decay time constant of the excess CO2 in recovery, s. */
  recoveryExcessTauS: number;
  // ventilation
  /** Arterial PCO2 held below VT2, mmHg. */
  paco2SetMmHg: number;
  /** Fall of the arterial PCO2 target from VT2 to the end of exercise, mmHg (0 without an RCP). */
  hyperventilationDropMmHg: number;
  /** Shape exponent q of that fall (1 = linear in VO2 above VT2). */
  hyperventilationExponent: number;
  /** Extra delay from the lungs to the carotid bodies, s (so Dc = transitDelayS + this). */
  carotidDelayS: number;
  /** First-order lag of VE behind its target, s. */
  tauVeS: number;
  /** Decay time constant of the hyperventilation drive in recovery, s. */
  recoveryHyperventilationTauS: number;
  /** Anatomic + apparatus dead space, L. */
  deadSpaceL: number;
  /** Fraction of alveolar ventilation going to unperfused units (alveolar dead space), 0–1. */
  alveolarDeadFraction: number;
  /** Tidal volume at rest / maximum, L; VT = max − (max − rest)·exp(−(VE − 8)/scale). */
  vtRestL: number;
  vtMaxL: number;
  /** VE scale of the tidal volume curve, L/min. */
  vtScaleLMin: number;
  /** End-expiratory lung volume, L. */
  eelvL: number;
  /** Barometric pressure, mmHg. */
  barometricMmHg: number;
  // heart rate and saturation
  hrRestBpm: number;
  hrPeakBpm: number;
  /** Exponent of the HR–VO2 relation (1 = linear). */
  hrExponent: number;
  /** HR lag in exercise / recovery, s. */
  tauHrS: number;
  tauHrRecoveryS: number;
  spo2RestPct: number;
  /** Fall of SpO2 from rest to peak, percentage points. */
  spo2DropPct: number;
  /** Oscillatory ventilation or null. `fadeFrom` = fraction of the incremental phase after which it fades. */
  eov: { periodS: number; amplitudeFraction: number; phaseRad: number; fadeFrom: number } | null;
}

/** Result of `generateAuditTest`. */
export interface AuditTest {
  table: BreathTable;
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  spec: AuditSpec;
  seed: number;
  audit: { noise: NoiseLevel };
}

/** Breath noise per level (invented magnitudes; moderate ≈ a typical clinical breath-by-breath export). */
export const AUDIT_NOISE = {
  none: { gasAbs: 0, gasRel: 0, veAbs: 0, veRel: 0, timingCv: 0, petco2: 0, peto2: 0, hr: 0, spo2: 0, rho: 0, artefactRate: 0 },
  low: {
    gasAbs: 30,
    gasRel: 0.025,
    veAbs: 0.5,
    veRel: 0.03,
    timingCv: 0.08,
    petco2: 0.5,
    peto2: 0.8,
    hr: 1,
    spo2: 0.3,
    rho: 0.25,
    artefactRate: 0.003,
  },
  moderate: {
    gasAbs: 60,
    gasRel: 0.05,
    veAbs: 1,
    veRel: 0.06,
    timingCv: 0.15,
    petco2: 1,
    peto2: 1.6,
    hr: 2,
    spo2: 0.6,
    rho: 0.35,
    artefactRate: 0.01,
  },
  high: {
    gasAbs: 100,
    gasRel: 0.09,
    veAbs: 1.8,
    veRel: 0.11,
    timingCv: 0.25,
    petco2: 1.8,
    peto2: 2.8,
    hr: 3,
    spo2: 1,
    rho: 0.45,
    artefactRate: 0.025,
  },
} as const satisfies Record<NoiseLevel, Record<string, number>>;

type Range = readonly [number, number];
interface GroupRanges {
  weightKg: Range;
  ageY: Range;
  peakMlKgMin: Range;
  vt1Fraction: Range;
  vt2Fraction: Range;
  tauVo2S: Range;
  gain: Range;
  chronotropicIndex: Range;
  hrRest: Range;
  paco2: Range;
  alvDead: Range;
  vtMax: Range;
  tauCo2S: Range;
  rerPeak: Range;
  dropMmHg: Range;
  eovChance: number;
  ceilingChance: number;
  minutes: Range;
}

/** Group ranges (invented; VT1 ≈ 33–65 % of peak brackets Lewthwaite 2021 `lewthwaite-2021-vt`, confirmed). */
const GROUPS: Record<AuditGroup, GroupRanges> = {
  athlete: {
    weightKg: [58, 85],
    ageY: [19, 35],
    peakMlKgMin: [50, 68],
    vt1Fraction: [0.56, 0.7],
    vt2Fraction: [0.82, 0.92],
    tauVo2S: [18, 30],
    gain: [10, 11.5],
    chronotropicIndex: [0.92, 1.02],
    hrRest: [45, 60],
    paco2: [38, 42],
    alvDead: [0.02, 0.06],
    vtMax: [2.8, 3.6],
    tauCo2S: [8, 16],
    rerPeak: [1.08, 1.22],
    dropMmHg: [5, 10],
    eovChance: 0,
    ceilingChance: 0.5,
    minutes: [9, 12],
  },
  active: {
    weightKg: [55, 92],
    ageY: [22, 55],
    peakMlKgMin: [34, 48],
    vt1Fraction: [0.5, 0.64],
    vt2Fraction: [0.8, 0.9],
    tauVo2S: [25, 40],
    gain: [9.6, 11],
    chronotropicIndex: [0.9, 1.02],
    hrRest: [52, 72],
    paco2: [37, 42],
    alvDead: [0.03, 0.08],
    vtMax: [2.1, 3],
    tauCo2S: [10, 20],
    rerPeak: [1.08, 1.25],
    dropMmHg: [4.5, 9],
    eovChance: 0,
    ceilingChance: 0.3,
    minutes: [8, 12],
  },
  sedentary: {
    weightKg: [62, 115],
    ageY: [28, 62],
    peakMlKgMin: [22, 33],
    vt1Fraction: [0.46, 0.6],
    vt2Fraction: [0.8, 0.9],
    tauVo2S: [35, 50],
    gain: [9.2, 10.8],
    chronotropicIndex: [0.88, 1],
    hrRest: [62, 82],
    paco2: [37, 41],
    alvDead: [0.04, 0.09],
    vtMax: [1.8, 2.6],
    tauCo2S: [12, 24],
    rerPeak: [1.05, 1.2],
    dropMmHg: [4, 8],
    eovChance: 0,
    ceilingChance: 0.2,
    minutes: [8, 11],
  },
  older: {
    weightKg: [55, 92],
    ageY: [60, 82],
    peakMlKgMin: [17, 27],
    vt1Fraction: [0.5, 0.65],
    vt2Fraction: [0.82, 0.9],
    tauVo2S: [40, 60],
    gain: [8.8, 10.4],
    chronotropicIndex: [0.82, 0.98],
    hrRest: [58, 80],
    paco2: [36, 41],
    alvDead: [0.06, 0.11],
    vtMax: [1.5, 2.2],
    tauCo2S: [14, 26],
    rerPeak: [1.04, 1.16],
    dropMmHg: [3.5, 7],
    eovChance: 0.06,
    ceilingChance: 0.2,
    minutes: [8, 11],
  },
  "heart-failure": {
    weightKg: [58, 105],
    ageY: [42, 80],
    peakMlKgMin: [10, 19],
    vt1Fraction: [0.56, 0.7],
    vt2Fraction: [0.84, 0.92],
    tauVo2S: [55, 85],
    gain: [7.5, 9.2],
    chronotropicIndex: [0.5, 0.8],
    hrRest: [58, 86],
    paco2: [32, 37],
    alvDead: [0.1, 0.2],
    vtMax: [1.1, 1.8],
    tauCo2S: [16, 32],
    rerPeak: [1.02, 1.15],
    dropMmHg: [3, 6],
    eovChance: 0.45,
    ceilingChance: 0.6,
    minutes: [7.5, 10],
  },
};

const GROUP_CYCLE: AuditGroup[] = [
  "active",
  "sedentary",
  "heart-failure",
  "athlete",
  "older",
  "active",
  "heart-failure",
  "sedentary",
  "older",
  "active",
];
const CYCLE_RATES = [5, 8, 10, 12, 15, 20, 25, 30, 35, 40, 50];

const lerp = (r: Range, u: number): number => r[0] + (r[1] - r[0]) * u;

/** ACSM walking / running O2 cost, mL/kg/min (speed km/h, grade %) — `acsm-metabolic-equations`, secondary. */
function acsmMlKgMin(speedKmh: number, gradePct: number, running: boolean): number {
  const s = (speedKmh * 1000) / 60; // m/min
  const g = gradePct / 100;
  return running ? 3.5 + 0.2 * s + 0.9 * s * g : 3.5 + 0.1 * s + 1.8 * s * g;
}

/** Smooth ceiling: identity up to `onset`, then rising to the asymptote `max` with slope 1 at `onset`. */
function ceiling(x: number, onset: number, max: number): number {
  if (x <= onset || !(max > onset) || !Number.isFinite(max)) return x;
  const span = max - onset;
  return onset + span * (1 - Math.exp(-(x - onset) / span));
}

/**
 * A deterministic, varied audit population: group by `i` (active, sedentary, heart failure, athlete, older),
 * about 30 % treadmill (walking ramps, 1-min grade stages, 3-min stages, running ramps), cycle ramps of 5–50
 * W/min and 1- or 2-min cycle stages; no RCP in every tenth test (i % 10 = 6) and in the rare test where no VT2 fits 12 % of peak above VT1 and
 * 2 min before the end; VT1 at least 170 s into the incremental phase (muscle timeline); oscillatory ventilation in
 * about 45 % of heart-failure tests. noise = noiseLevels[i % noiseLevels.length]. Invented data.
 */
export function auditSpec(i: number, seed: number, noiseLevels: NoiseLevel[]): AuditSpec {
  if (noiseLevels.length === 0) throw new Error("auditSpec requires at least one noise level");
  const rng = seededRandom((seed * 2654435761 + i * 40503 + 977) >>> 0);
  const u = (): number => rng.uniform();
  const group: AuditGroup = i % 20 === 16 ? "older" : GROUP_CYCLE[i % 10];
  const g = GROUPS[group];
  const noise = noiseLevels[i % noiseLevels.length];
  const noRcp = i % 10 === 6;

  const weightKg = Math.round(lerp(g.weightKg, u()));
  const ageY = Math.round(lerp(g.ageY, u()));
  const vo2RestMlMin = weightKg * lerp([3.2, 4.1], u());
  let peak = weightKg * lerp(g.peakMlKgMin, u());
  if (group === "heart-failure") peak = Math.max(peak, vo2RestMlMin * 2.8);
  const tauVo2S = lerp(g.tauVo2S, u());
  const kind = (i + Math.floor(i / 10)) % 10;
  const treadmill = kind === 7 || kind === 8 || (kind === 9 && i % 20 >= 10);
  const minutes = lerp(g.minutes, u());
  const slowComponentFraction = group === "heart-failure" ? 0 : lerp([0, 0.1], u());
  const ceilingOn = u() < g.ceilingChance;
  const gain = lerp(g.gain, u());
  const unloadedCostMlMin = 150 + 2.2 * weightKg * lerp([0.8, 1.2], u());

  // Threshold VO2s (muscle, unconstrained), before the protocol checks.
  let vt1 = peak * lerp(g.vt1Fraction, u());
  let vt2: number | null = noRcp ? null : peak * lerp(g.vt2Fraction, u());
  if (vt2 !== null && vt2 < vt1 + 0.12 * peak) vt2 = vt1 + 0.12 * peak;

  // End of exercise: the unconstrained VO2 overshoots the attained peak when a ceiling applies.
  const overshoot = ceilingOn ? lerp([0.05, 0.12], u()) : 0;
  const mEnd = peak * (1 + overshoot);
  const ceilingShare = lerp([0.86, 0.93], u());

  // Demand target at the end = m_u,end without slow component + ramp lag correction.
  const baseEnd = mEnd > vt1 ? vt1 + (mEnd - vt1) / (1 + slowComponentFraction) : mEnd;
  const restS = Math.round(lerp([150, 240], u()));
  const warmupS = Math.round(lerp([150, 210], u()));
  const recoveryS = Math.round(lerp([150, 300], u()));

  let protocol: AuditProtocol;
  let incrementalS: number;
  let demandStart: number;
  let economyFactor = 1;
  const base = {
    warmupW: 0,
    endW: 0,
    recoveryW: 0,
    warmupKmh: 0,
    startKmh: 0,
    endKmh: 0,
    startGradePct: 0,
    endGradePct: 0,
    recoveryKmh: 0,
    running: false,
  };
  if (!treadmill) {
    const warmupW = group === "heart-failure" || group === "older" ? 0 : [0, 10, 20][i % 3];
    demandStart = vo2RestMlMin + unloadedCostMlMin + gain * warmupW;
    const stepped = kind === 6 || kind === 9;
    const stepS = kind === 6 ? 60 : kind === 9 ? 120 : 0;
    const rawRate = (baseEnd - demandStart) / gain / (minutes - tauVo2S / 60);
    const rate = CYCLE_RATES.reduce((best, r) => (Math.abs(r - rawRate) < Math.abs(best - rawRate) ? r : best), CYCLE_RATES[0]);
    const rampMin = (baseEnd - demandStart) / gain / rate + tauVo2S / 60;
    if (stepped) {
      const n = Math.max(5, Math.round((rampMin * 60) / stepS));
      incrementalS = n * stepS;
      const stepW = Math.max(5, Math.round(((baseEnd - demandStart) / gain / n) * 1.02));
      protocol = { ...base, ergometer: "cycle", stepS, warmupW, endW: warmupW + stepW * n, recoveryW: warmupW };
    } else {
      incrementalS = Math.round(rampMin * 60);
      protocol = {
        ...base,
        ergometer: "cycle",
        stepS: 0,
        warmupW,
        endW: warmupW + (rate * incrementalS) / 60,
        recoveryW: warmupW,
      };
    }
  } else {
    const running = group === "athlete" || (group === "active" && i % 3 === 0);
    const stepS = kind === 8 ? 60 : kind === 9 ? 180 : 0;
    const warmupKmh = running ? 5 : group === "heart-failure" ? 1.6 : 2.7;
    const startKmh = running ? 8 : group === "heart-failure" ? 2 : 3.2;
    incrementalS = stepS > 0 ? Math.max(5, Math.round((minutes * 60) / stepS)) * stepS : Math.round(minutes * 60);
    const econ = lerp([0.92, 1.1], u());
    const targetKg = (baseEnd + ((baseEnd - vo2RestMlMin * 2.5) / incrementalS) * tauVo2S) / weightKg / econ;
    let endKmh: number;
    let endGradePct: number;
    if (running) {
      endGradePct = 1; // `jones-1996-treadmill-grade`, recalled
      endKmh = ((targetKg - 3.5) / (0.2 + 0.9 * 0.01)) * 0.06;
    } else {
      endKmh = group === "heart-failure" ? 3.2 : 5;
      const s = (endKmh * 1000) / 60;
      endGradePct = ((targetKg - 3.5 - 0.1 * s) / (1.8 * s)) * 100;
      if (endGradePct > 20) {
        endKmh = 6.3;
        const s2 = (endKmh * 1000) / 60;
        endGradePct = ((targetKg - 3.5 - 0.1 * s2) / (1.8 * s2)) * 100;
      }
      endGradePct = Math.max(2, endGradePct);
    }
    protocol = {
      ...base,
      ergometer: "treadmill",
      stepS,
      warmupKmh,
      startKmh: Math.min(startKmh, endKmh),
      endKmh,
      startGradePct: running ? 1 : 0,
      endGradePct,
      recoveryKmh: running ? 3 : 1.6,
      running,
    };
    demandStart = weightKg * econ * acsmMlKgMin(protocol.startKmh, protocol.startGradePct, running);
    economyFactor = econ;
  }
  // Placement checks on the muscle VO2 of this very protocol (demand through the phase II lag):
  // VT1 at least 170 s into the incremental phase (the brief: ≥ ~2.5 min), VT2 at least 120 s before its end
  // (so hyperventilation can show), VT2 at least 12 % of peak above VT1; otherwise VT1 moves down, or, when
  // nothing fits, the test has no RCP.
  const warmupEndS = restS + warmupS;
  const gridN = Math.ceil(warmupEndS + incrementalS + 2);
  const mBase = firstOrderLag(
    protocolSeries(
      {
        protocol,
        restS,
        warmupS,
        incrementalS,
        recoveryS,
        vo2RestMlMin,
        unloadedCostMlMin,
        gainMlMinPerW: gain,
        weightKg,
        economyFactor,
      },
      gridN,
      1,
    ).demand,
    tauVo2S,
    1,
  );
  const earliest = mBase[Math.round(warmupEndS + 170)];
  if (vt1 < earliest) vt1 = earliest;
  const lateBase = mBase[Math.round(warmupEndS + incrementalS - 120)];
  const latest = Math.min(0.95 * peak, lateBase + slowComponentFraction * Math.max(0, lateBase - vt1));
  if (vt2 !== null && vt2 < vt1 + 0.12 * peak) vt2 = vt1 + 0.12 * peak;
  if (vt2 !== null && vt2 > latest) vt2 = latest;
  if (vt2 !== null && vt2 < vt1 + 0.12 * peak) {
    const lowered = vt2 - 0.12 * peak;
    if (lowered >= earliest && lowered >= 0.35 * peak) vt1 = lowered;
    else vt2 = null;
  }
  const onsetFloor = (vt2 ?? vt1 + 0.1 * peak) + 0.03 * peak;
  const onset = Math.max(onsetFloor, peak * ceilingShare);
  // A ceiling only when its onset lies below the attained peak.
  const ceilingOnsetMlMin = ceilingOn && onset < 0.98 * peak ? onset : Infinity;
  const vo2MaxMlMin = Number.isFinite(ceilingOnsetMlMin) ? solveCeilingMax(ceilingOnsetMlMin, mEnd, peak) : Infinity;
  const mEndForExcess = mEnd;
  const rerPeak = noRcp ? lerp([1.03, 1.1], u()) : lerp(g.rerPeak, u());
  const rerRest = lerp([0.76, 0.88], u());
  const s1 = lerp([0.92, 1.02], u());
  const baseCo2 = rerRest * vo2RestMlMin + s1 * (peak - vo2RestMlMin);
  const excessNeeded = Math.max(0.04 * peak, rerPeak * peak - baseCo2);
  const curvature = u() < 0.35 ? 0 : lerp([0.3, 2], u());
  const span = Math.max(1, mEndForExcess - vt1);
  // At least 0.12 mL CO2 per mL O2 at onset, so that S2 − S1 ≥ 0.1 (Beaver 1986 acceptance rule, recalled).
  const excessInitialSlope = Math.min(0.7, Math.max(0.12, excessNeeded / (span * (1 + curvature))));
  const hrMaxPred = 208 - 0.7 * ageY; // Tanaka 2001, `tanaka-2001-hrmax`, secondary
  const hrRestBpm = lerp(g.hrRest, u());
  const hrPeakBpm = hrRestBpm + lerp(g.chronotropicIndex, u()) * (hrMaxPred - hrRestBpm);
  const vtMaxL = lerp(g.vtMax, u());
  const eovOn = !treadmill || group === "heart-failure" ? u() < g.eovChance : false;
  const peakVeGuess = (rerPeak * peak * 30) / 1000;
  return {
    label: `audit-${i}-${group}-${protocol.ergometer}-${protocol.stepS > 0 ? `steps${protocol.stepS}` : "ramp"}-${noise}`,
    group,
    noise,
    weightKg,
    ageY,
    protocol,
    restS,
    warmupS,
    incrementalS,
    recoveryS,
    vo2RestMlMin,
    unloadedCostMlMin,
    gainMlMinPerW: gain,
    economyFactor,
    tauVo2S,
    transitDelayS: lerp([13, 20], u()),
    cardiodynamicFraction: lerp([0.05, 0.2], u()),
    slowComponentFraction,
    ceilingOnsetMlMin,
    vo2MaxMlMin,
    vt1Vo2MlMin: vt1,
    vt2Vo2MlMin: vt2,
    rerRest,
    s1,
    excessInitialSlope,
    excessCurvature: curvature,
    tauCo2S: lerp(g.tauCo2S, u()),
    co2StoreMlPerMmHg: lerp([8, 30], u()),
    recoveryExcessTauS: lerp([25, 50], u()),
    paco2SetMmHg: lerp(g.paco2, u()),
    hyperventilationDropMmHg: vt2 === null ? 0 : lerp(g.dropMmHg, u()),
    hyperventilationExponent: lerp([1, 1.4], u()),
    carotidDelayS: lerp([3, 8], u()),
    tauVeS: lerp([4, 12], u()),
    recoveryHyperventilationTauS: lerp([100, 220], u()),
    deadSpaceL: lerp([0.18, 0.26], u()),
    alveolarDeadFraction: lerp(g.alvDead, u()),
    vtRestL: lerp([0.5, 0.85], u()),
    vtMaxL,
    vtScaleLMin: Math.max(10, peakVeGuess * lerp([0.22, 0.32], u())),
    eelvL: lerp([2.2, 3.4], u()),
    barometricMmHg: lerp([735, 765], u()),
    hrRestBpm,
    hrPeakBpm,
    hrExponent: lerp([0.9, 1.15], u()),
    tauHrS: lerp([18, 35], u()),
    tauHrRecoveryS: group === "heart-failure" ? lerp([180, 320], u()) : lerp([70, 150], u()),
    spo2RestPct: lerp([96, 99], u()),
    spo2DropPct: group === "heart-failure" || group === "older" ? lerp([0, 4], u()) : lerp([0, 1.5], u()),
    eov: eovOn
      ? {
          periodS: lerp([40, 110], u()),
          amplitudeFraction: lerp([0.15, 0.35], u()),
          phaseRad: lerp([0, 2 * Math.PI], u()),
          fadeFrom: lerp([0.6, 0.9], u()),
        }
      : null,
  };
}

type ProtocolInputs = Pick<
  AuditSpec,
  | "protocol"
  | "restS"
  | "warmupS"
  | "incrementalS"
  | "recoveryS"
  | "vo2RestMlMin"
  | "unloadedCostMlMin"
  | "gainMlMinPerW"
  | "weightKg"
  | "economyFactor"
>;

/** Work rate / speed / grade and the O2 demand (mL/min) on a grid of `n` points every `dt` s. */
function protocolSeries(
  spec: ProtocolInputs,
  n: number,
  dt: number,
): { work: Float64Array; speed: Float64Array; grade: Float64Array; demand: Float64Array } {
  const p = spec.protocol;
  const restEndS = spec.restS;
  const warmupEndS = restEndS + spec.warmupS;
  const rampEndS = warmupEndS + spec.incrementalS;
  const work = new Float64Array(n);
  const speed = new Float64Array(n);
  const grade = new Float64Array(n);
  const demand = new Float64Array(n);
  const fracAt = (te: number): number =>
    p.stepS > 0 ? Math.min(1, (Math.floor(te / p.stepS) + 1) / Math.round(spec.incrementalS / p.stepS)) : te / spec.incrementalS;
  for (let k = 0; k < n; k++) {
    const t = k * dt;
    const phase: Phase = t < restEndS ? "rest" : t < warmupEndS ? "warmup" : t < rampEndS ? "exercise" : "recovery";
    if (p.ergometer === "cycle") {
      const w =
        phase === "rest"
          ? 0
          : phase === "warmup"
            ? p.warmupW
            : phase === "exercise"
              ? p.warmupW + (p.endW - p.warmupW) * fracAt(t - warmupEndS)
              : p.recoveryW;
      work[k] = w;
      demand[k] = phase === "rest" ? spec.vo2RestMlMin : spec.vo2RestMlMin + spec.unloadedCostMlMin + spec.gainMlMinPerW * w;
    } else {
      let s = 0;
      let gr = 0;
      if (phase === "warmup") s = p.warmupKmh;
      else if (phase === "exercise") {
        const f = fracAt(t - warmupEndS);
        s = p.startKmh + (p.endKmh - p.startKmh) * f;
        gr = p.startGradePct + (p.endGradePct - p.startGradePct) * f;
      } else if (phase === "recovery") s = p.recoveryKmh;
      speed[k] = s;
      grade[k] = gr;
      const running = phase === "exercise" && p.running;
      demand[k] =
        s > 0 ? Math.max(spec.vo2RestMlMin, spec.weightKg * spec.economyFactor * acsmMlKgMin(s, gr, running)) : spec.vo2RestMlMin;
    }
  }
  return { work, speed, grade, demand };
}

/** Asymptote `max` such that ceiling(mEnd, onset, max) = target (bisection; target between onset and mEnd). */
function solveCeilingMax(onset: number, mEnd: number, target: number): number {
  if (!(target > onset) || !(mEnd > target)) return Infinity;
  let lo = target;
  let hi = target + 20 * (mEnd - onset);
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (lo + hi);
    if (ceiling(mEnd, onset, mid) < target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Exact first-order lag of a piecewise-linear series sampled every `dt` s (starts at steady state). */
function firstOrderLag(x: Float64Array, tauS: number, dt: number): Float64Array {
  const y = new Float64Array(x.length);
  if (x.length === 0) return y;
  y[0] = x[0];
  if (!(tauS > 0)) {
    y.set(x);
    return y;
  }
  const e = Math.exp(-dt / tauS);
  for (let k = 1; k < x.length; k++) {
    const slope = (x[k] - x[k - 1]) / dt;
    y[k] = x[k] - tauS * slope + (y[k - 1] - x[k - 1] + tauS * slope) * e;
  }
  return y;
}

/** Pure delay by `delayS` (linear interpolation; before the start the first value holds). */
function delayed(x: Float64Array, delayS: number, dt: number): Float64Array {
  const y = new Float64Array(x.length);
  for (let k = 0; k < x.length; k++) {
    const p = Math.max(0, k - delayS / dt);
    const k0 = Math.floor(p);
    const f = p - k0;
    y[k] = k0 + 1 < x.length ? x[k0] * (1 - f) + x[k0 + 1] * f : x[x.length - 1];
  }
  return y;
}

function readGrid(x: Float64Array, t: number, dt: number): number {
  const p = Math.min(Math.max(t / dt, 0), x.length - 1);
  const k0 = Math.min(Math.floor(p), x.length - 2);
  const f = p - k0;
  return x[k0] * (1 - f) + x[k0 + 1] * f;
}

/** First time (s) the series reaches `level` at or after `fromS` (linear interpolation), NaN if never. */
function firstCrossing(x: Float64Array, level: number, fromS: number, toS: number, dt: number): number {
  const k0 = Math.max(1, Math.ceil(fromS / dt));
  const k1 = Math.min(x.length - 1, Math.floor(toS / dt));
  if (x[k0 - 1] >= level) return (k0 - 1) * dt;
  for (let k = k0; k <= k1; k++) {
    if (x[k] >= level) return (k - 1 + (level - x[k - 1]) / (x[k] - x[k - 1])) * dt;
  }
  return NaN;
}

/**
 * Generate one audit test (invented data): noisy and noise-free breath tables on the same breath times, and
 * the truth known by construction (defined in this file's header). `seed` drives breath timing, noise and
 * artefacts only; the physiology comes from `spec`. Noise "none" gives a table equal to `noiseFree`.
 */
export function generateAuditTest(spec: AuditSpec, seed: number): AuditTest {
  const dt = 1;
  const p = spec.protocol;
  const cycle = p.ergometer === "cycle";
  const restEndS = spec.restS;
  const warmupEndS = restEndS + spec.warmupS;
  const rampEndS = warmupEndS + spec.incrementalS;
  const endS = rampEndS + spec.recoveryS;
  const n = Math.ceil(endS / dt) + 2;

  // ---- protocol ----
  const { work, speed, grade, demand } = protocolSeries(spec, n, dt);
  function phaseAt(t: number): Phase {
    return t < restEndS ? "rest" : t < warmupEndS ? "warmup" : t < rampEndS ? "exercise" : "recovery";
  }

  // ---- oxygen ----
  const mBase = firstOrderLag(demand, spec.tauVo2S, dt);
  const mU = new Float64Array(n);
  for (let k = 0; k < n; k++) mU[k] = mBase[k] + spec.slowComponentFraction * Math.max(0, mBase[k] - spec.vt1Vo2MlMin);
  const m = mU.map((x) => ceiling(x, spec.ceilingOnsetMlMin, spec.vo2MaxMlMin));
  const fast = firstOrderLag(
    demand.map((x) => ceiling(x, spec.ceilingOnsetMlMin, spec.vo2MaxMlMin)),
    6,
    dt,
  );
  const mDel = delayed(m, spec.transitDelayS, dt);
  const vo2 = new Float64Array(n);
  for (let k = 0; k < n; k++) vo2[k] = (1 - spec.cardiodynamicFraction) * mDel[k] + spec.cardiodynamicFraction * fast[k];

  // ---- thresholds on the muscle timeline ----
  const t1 = firstCrossing(mU, spec.vt1Vo2MlMin, warmupEndS, rampEndS, dt);
  const t2 = spec.vt2Vo2MlMin === null ? NaN : firstCrossing(mU, spec.vt2Vo2MlMin, warmupEndS, rampEndS, dt);
  const kEnd = Math.round(rampEndS / dt);
  const u1End = Math.max(0, mU[kEnd] - spec.vt1Vo2MlMin);
  const u2End = spec.vt2Vo2MlMin === null ? 0 : Math.max(1e-9, mU[kEnd] - spec.vt2Vo2MlMin);

  // ---- carbon dioxide ----
  const excessOf = (uu: number): number => spec.excessInitialSlope * uu * (1 + (spec.excessCurvature * uu) / Math.max(1, u1End));
  const co2Muscle = new Float64Array(n);
  const hvDrive = new Float64Array(n); // 0..1 fraction of the full fall of the PaCO2 target
  for (let k = 0; k < n; k++) {
    const t = k * dt;
    const inRecovery = t > rampEndS;
    const e = inRecovery
      ? excessOf(u1End) * Math.exp(-(t - rampEndS) / spec.recoveryExcessTauS)
      : excessOf(Math.max(0, mU[k] - spec.vt1Vo2MlMin));
    co2Muscle[k] = spec.rerRest * spec.vo2RestMlMin + spec.s1 * (m[k] - spec.vo2RestMlMin) + e;
    if (spec.vt2Vo2MlMin !== null) {
      hvDrive[k] = inRecovery
        ? Math.exp(-(t - rampEndS) / spec.recoveryHyperventilationTauS)
        : Math.pow(Math.max(0, mU[k] - spec.vt2Vo2MlMin) / u2End, spec.hyperventilationExponent);
    }
  }
  const carotidDelayS = spec.transitDelayS + spec.carotidDelayS;
  const hvAtCarotid = delayed(hvDrive, carotidDelayS, dt);
  const paTarget = hvAtCarotid.map((h) => spec.paco2SetMmHg - spec.hyperventilationDropMmHg * h);
  const paSmooth = firstOrderLag(paTarget, spec.tauVeS, dt);
  const co2Stores = firstOrderLag(delayed(co2Muscle, spec.transitDelayS, dt), spec.tauCo2S, dt);
  const vco2 = new Float64Array(n);
  const vco2Base = new Float64Array(n); // without the ventilatory oscillation
  const vo2Base = new Float64Array(n);
  const eov = new Float64Array(n); // oscillation, −1..1 times envelope
  for (let k = 0; k < n; k++) {
    const t = k * dt;
    const dPa = k > 0 ? ((paSmooth[k] - paSmooth[k - 1]) / dt) * 60 : 0; // mmHg/min
    const washout = -spec.co2StoreMlPerMmHg * dPa;
    if (spec.eov) {
      const fadeStart = warmupEndS + spec.eov.fadeFrom * spec.incrementalS;
      const env = t <= fadeStart ? 1 : t <= rampEndS ? 1 - (0.75 * (t - fadeStart)) / Math.max(1, rampEndS - fadeStart) : 0.25;
      const ph =
        (2 * Math.PI * t) / spec.eov.periodS + spec.eov.phaseRad + 0.6 * Math.sin((2 * Math.PI * t) / (spec.eov.periodS * 4.3));
      eov[k] = spec.eov.amplitudeFraction * env * Math.sin(ph);
    }
    vco2Base[k] = co2Stores[k] + washout;
    vco2[k] = vco2Base[k] * (1 + 0.6 * eov[k]);
    vo2Base[k] = vo2[k];
    vo2[k] = vo2[k] * (1 + 0.35 * eov[k]);
  }

  // ---- ventilation ----
  const vtOf = (ve: number): number =>
    spec.vtMaxL - (spec.vtMaxL - spec.vtRestL) * Math.exp(-Math.max(0, ve - 8) / spec.vtScaleLMin);
  const veTarget = new Float64Array(n);
  const veTargetBase = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // Alveolar ventilation equation: VE·(1 − VD/VT(VE)) = 863·VCO2 / (PaCO2·(1 − f_alv)), fixed point.
    const vaNeed = (863 * (vco2Base[k] / 1000)) / (paTarget[k] * (1 - spec.alveolarDeadFraction));
    let ve = vaNeed / 0.7;
    for (let it = 0; it < 12; it++) ve = vaNeed / Math.max(0.2, 1 - spec.deadSpaceL / vtOf(ve));
    veTargetBase[k] = ve;
    veTarget[k] = ve * (1 + eov[k]);
  }
  const ve = firstOrderLag(veTarget, spec.tauVeS, dt);
  const veBase = firstOrderLag(veTargetBase, spec.tauVeS, dt);
  const rr = new Float64Array(n);
  const vt = new Float64Array(n);
  const petco2 = new Float64Array(n);
  const peto2 = new Float64Array(n);
  const pio2 = (spec.barometricMmHg - 47) * 0.2093; // common practice
  for (let k = 0; k < n; k++) {
    vt[k] = vtOf(ve[k]);
    rr[k] = ve[k] / vt[k];
    // End-tidal gases from the non-oscillating signals; an oscillation then moves PETCO2 against VE.
    const vtB = vtOf(veBase[k]);
    const rrB = veBase[k] / vtB;
    const va = veBase[k] - rrB * spec.deadSpaceL;
    const pa = (863 * (vco2Base[k] / 1000)) / (Math.max(0.5, va) * (1 - spec.alveolarDeadFraction));
    const teS = (0.58 * 60) / rrB;
    // CO2 entering the lung through expiration, diluted in the end-expiratory volume plus half a breath.
    const rise = (0.5 * (spec.barometricMmHg - 47) * (vco2Base[k] / 1000 / 60) * teS) / (spec.eelvL + 0.5 * vtB); // `audit-tidal-pco2-rise`
    petco2[k] = (pa + rise) * (1 - spec.alveolarDeadFraction) * (1 - 0.3 * eov[k]);
    const r = vco2[k] / vo2[k];
    peto2[k] = pio2 - petco2[k] * (0.2093 + (1 - 0.2093) / r); // alveolar gas equation, common practice
  }

  // ---- heart rate and saturation ----
  const mPeak = m[kEnd];
  const hrTarget = new Float64Array(n);
  const spo2 = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const x = Math.min(1.05, Math.max(0, (m[k] - spec.vo2RestMlMin) / Math.max(1, mPeak - spec.vo2RestMlMin)));
    hrTarget[k] = spec.hrRestBpm + (spec.hrPeakBpm - spec.hrRestBpm) * Math.pow(x, spec.hrExponent);
    spo2[k] = spec.spo2RestPct - spec.spo2DropPct * x * x;
  }
  const hr = new Float64Array(n);
  hr[0] = hrTarget[0];
  for (let k = 1; k < n; k++) {
    const tau = k * dt > rampEndS ? spec.tauHrRecoveryS : spec.tauHrS;
    hr[k] = hrTarget[k] + (hr[k - 1] - hrTarget[k]) * Math.exp(-dt / tau);
  }

  // ---- breaths ----
  const lv = AUDIT_NOISE[spec.noise];
  const rng = seededRandom((seed * 747796405 + 2891336453) >>> 0);
  const ends: number[] = [];
  const starts: number[] = [];
  const nominalRr: number[] = [];
  let t = 0;
  while (true) {
    const rrNow = readGrid(rr, t, dt);
    const nominal = 60 / rrNow;
    const jitter = lv.timingCv > 0 ? Math.min(0.6, Math.max(-0.6, lv.timingCv * (t < restEndS ? 1.4 : 1) * rng.normal())) : 0;
    // no breath shorter than 0.6 s (100 breaths/min): jitter on a fast rate at peak must not make impossible breaths
    const dur = Math.max(0.6, nominal * (1 + jitter));
    if (!Number.isFinite(dur)) throw new Error(`generateAuditTest: breath duration ${dur} s at ${t} s (spec ${spec.label})`);
    if (t + dur > endS) break;
    starts.push(t);
    ends.push(t + dur);
    nominalRr.push(rrNow);
    t += dur;
  }
  const spanMean = (x: Float64Array, a: number, b: number): number => {
    let s = 0;
    for (let q = 0; q < 4; q++) s += readGrid(x, a + ((q + 0.5) * (b - a)) / 4, dt);
    return s / 4;
  };
  const nfRows: BreathRow[] = [];
  for (let b = 0; b < ends.length; b++) {
    const a = starts[b];
    const e = ends[b];
    const veB = spanMean(ve, a, e);
    const row: BreathRow = {
      timeS: e,
      vo2MlMin: spanMean(vo2, a, e),
      vco2MlMin: spanMean(vco2, a, e),
      veLMin: veB,
      hrBpm: spanMean(hr, a, e),
      rrBrMin: nominalRr[b],
      vtL: veB / nominalRr[b],
      petco2MmHg: spanMean(petco2, a, e),
      peto2MmHg: spanMean(peto2, a, e),
      spo2Pct: spanMean(spo2, a, e),
      phase: phaseAt(e),
    };
    const kk = Math.min(n - 1, Math.floor(e / dt));
    if (cycle) row.workW = work[kk];
    else {
      row.speedKmh = speed[kk];
      row.gradePct = grade[kk];
    }
    nfRows.push(row);
  }
  const rows = spec.noise === "none" ? nfRows.map((r) => ({ ...r })) : addNoise(nfRows, starts, lv, rng, phaseAt);

  const fields: (NumericField | "phase")[] = ["timeS", "vo2MlMin", "vco2MlMin", "veLMin", "hrBpm"];
  if (cycle) fields.push("workW");
  else fields.push("speedKmh", "gradePct");
  fields.push("rrBrMin", "vtL", "petco2MmHg", "peto2MmHg", "spo2Pct", "phase");
  const table: BreathTable = { shape: "breath", rows, fields: [...fields] };
  const noiseFree: BreathTable = { shape: "breath", rows: nfRows, fields: [...fields] };

  // ---- truth ----
  const point = (tt: number): TruthPoint => ({
    timeS: tt,
    vo2MlMin: readGrid(vo2Base, tt, dt),
    vco2MlMin: readGrid(vco2Base, tt, dt),
    veLMin: readGrid(veBase, tt, dt),
    workW: cycle ? work[Math.min(n - 1, Math.floor(tt / dt))] : NaN,
    hrBpm: readGrid(hr, tt, dt),
  });
  const T1 = t1 + spec.transitDelayS + spec.tauCo2S;
  const T2 = Number.isFinite(t2) ? t2 + carotidDelayS + spec.tauVeS : NaN;
  const inRange = (a: number, b: number): BreathRow[] => nfRows.filter((r) => r.timeS >= a && r.timeS <= b);
  const fitOf = (rs: BreathRow[], x: (r: BreathRow) => number, y: (r: BreathRow) => number): number =>
    rs.length >= 3 ? linearRegression(rs.map(x), rs.map(y)).slope : NaN;
  const lastRows = inRange(rampEndS - 30, rampEndS);
  const mean = (f: (r: BreathRow) => number): number => lastRows.reduce((s, r) => s + f(r), 0) / lastRows.length;
  const peakVo2 = mean((r) => r.vo2MlMin ?? NaN);
  const peakVco2 = mean((r) => r.vco2MlMin ?? NaN);
  const vt2End = Number.isFinite(T2) ? T2 : rampEndS;
  const veOnVco2 = (r: BreathRow): number => r.veLMin ?? NaN;
  const vco2L = (r: BreathRow): number => (r.vco2MlMin ?? NaN) / 1000;
  const truth: SyntheticTruth = {
    invented: true,
    vt1: point(T1),
    vt2: Number.isFinite(T2) ? point(T2) : null,
    peak: {
      vo2MlMin: peakVo2,
      vco2MlMin: peakVco2,
      veLMin: mean((r) => r.veLMin ?? NaN),
      hrBpm: mean((r) => r.hrBpm ?? NaN),
      workW: cycle ? p.endW : NaN,
      rer: peakVco2 / peakVo2,
      timeS: rampEndS - 15,
    },
    vco2Vo2SlopeBelowVt1: spec.s1,
    vco2Vo2SlopeAboveVt1: fitOf(
      inRange(T1, vt2End),
      (r) => r.vo2MlMin ?? NaN,
      (r) => r.vco2MlMin ?? NaN,
    ),
    veVco2SlopeToVt2: fitOf(inRange(warmupEndS, vt2End), vco2L, veOnVco2),
    veVco2SlopeToPeak: fitOf(inRange(warmupEndS, rampEndS), vco2L, veOnVco2),
    deltaVo2DeltaWrMlMinW: cycle
      ? fitOf(
          inRange(warmupEndS + 60, rampEndS),
          (r) => r.workW ?? NaN,
          (r) => r.vo2MlMin ?? NaN,
        )
      : NaN,
    phases: { restEndS, warmupEndS, rampEndS, endS },
    rampWPerMin: cycle ? ((p.endW - p.warmupW) * 60) / spec.incrementalS : NaN,
    weightKg: spec.weightKg,
  };
  return { table, noiseFree, truth, spec, seed, audit: { noise: spec.noise } };
}

type NoiseParams = (typeof AUDIT_NOISE)[NoiseLevel];

/** Breath noise and artefacts on a copy of the noise-free rows (see the file header). */
function addNoise(
  nf: BreathRow[],
  starts: number[],
  lv: NoiseParams,
  rng: SeededRandom,
  phaseAt: (t: number) => Phase,
): BreathRow[] {
  const rho = lv.rho;
  const innov = Math.sqrt(1 - rho * rho);
  let eVe = 0;
  let eO = 0;
  let eC = 0;
  let eP = 0;
  let eH = 0;
  const out: BreathRow[] = [];
  let leakLeft = 0;
  let leakFactor = 1;
  let hrLeft = 0;
  let hrFactor = 1;
  let spo2Left = 0;
  let spo2Value = 0;
  const round = (x: number, d: number): number => Math.round(x * d) / d;
  for (let b = 0; b < nf.length; b++) {
    const r = nf[b];
    const dur = r.timeS - starts[b];
    const rest = phaseAt(r.timeS) === "rest" ? 1.5 : 1;
    eVe = rho * eVe + innov * rng.normal();
    const z1 = rng.normal();
    const z2 = rng.normal();
    eO = rho * eO + innov * (0.6 * rng.normal() + 0.8 * z1);
    eC = rho * eC + innov * (0.48 * z1 + 0.64 * z2 + 0.6 * rng.normal());
    eP = rho * eP + innov * rng.normal();
    eH = 0.8 * eH + 0.6 * rng.normal();
    const veNf = r.veLMin ?? 0;
    const vo2Nf = r.vo2MlMin ?? 0;
    const vco2Nf = r.vco2MlMin ?? 0;
    const veRelNoise = Math.hypot(lv.veAbs / Math.max(1, veNf), lv.veRel) * rest * eVe;
    let veF = 1 + veRelNoise;
    // VO2 and VCO2 share the breath's volume error (a bigger breath empties more of the lung): correlation 0.6.
    let vo2 = vo2Nf + Math.hypot(lv.gasAbs, lv.gasRel * vo2Nf) * rest * (0.6 * eVe + 0.8 * eO);
    let vco2 = vco2Nf + Math.hypot(lv.gasAbs * 0.85, lv.gasRel * vco2Nf) * rest * (0.6 * eVe + 0.8 * eC);
    let petco2 = (r.petco2MmHg ?? 0) + lv.petco2 * eP;
    const peto2 = (r.peto2MmHg ?? 0) - lv.peto2 * eP * 0.8 + lv.peto2 * 0.6 * rng.normal();
    let hr = (r.hrBpm ?? 0) + lv.hr * eH;
    let spo2 = (r.spo2Pct ?? 0) + lv.spo2 * rng.normal();
    // artefacts
    if (leakLeft === 0 && rng.uniform() < lv.artefactRate) {
      const kind = rng.uniform();
      if (kind < 0.35) {
        // sigh or cough
        const f = 1.8 + 1.2 * rng.uniform();
        veF *= f;
        vo2 *= 1.3 + 0.7 * rng.uniform();
        vco2 *= 1.4 + 0.8 * rng.uniform();
        petco2 -= 2 + 4 * rng.uniform();
      } else if (kind < 0.6) {
        // swallow / incomplete breath
        const f = 0.3 + 0.3 * rng.uniform();
        veF *= f;
        vo2 *= f + 0.1 * rng.uniform();
        vco2 *= f + 0.1 * rng.uniform();
        petco2 -= 3 + 7 * rng.uniform();
      } else if (kind < 0.75) {
        leakLeft = 4 + rng.int(9);
        leakFactor = 0.7 + 0.2 * rng.uniform();
      } else if (kind < 0.9) {
        hrLeft = 1 + rng.int(3);
        hrFactor = rng.uniform() < 0.5 ? 2 : 0.5;
      } else {
        spo2Left = 2 + rng.int(4);
        spo2Value = 80 + 8 * rng.uniform();
      }
    }
    if (leakLeft > 0) {
      veF *= leakFactor;
      vo2 *= leakFactor;
      vco2 *= leakFactor;
      leakLeft--;
    }
    if (hrLeft > 0) {
      hr *= hrFactor;
      hrLeft--;
    }
    if (spo2Left > 0) {
      spo2 = spo2Value;
      spo2Left--;
    }
    const veOut = Math.max(0.5, veNf * veF);
    const rrOut = 60 / dur;
    const row: BreathRow = {
      ...r,
      vo2MlMin: Math.round(Math.max(30, vo2)),
      vco2MlMin: Math.round(Math.max(25, vco2)),
      veLMin: round(veOut, 10),
      hrBpm: Math.round(hr),
      rrBrMin: round(rrOut, 10),
      vtL: round(veOut / rrOut, 1000),
      petco2MmHg: round(Math.max(5, petco2), 10),
      peto2MmHg: round(peto2, 10),
      spo2Pct: Math.round(Math.min(100, spo2)),
    };
    out.push(row);
  }
  return out;
}
