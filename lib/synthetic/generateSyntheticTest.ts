import type { BreathRow, BreathTable, NumericField, Phase } from "../breath";
import { linearRegression, seededRandom } from "../numeric";
import type { NoiseLevel, SyntheticSpec, SyntheticTest, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Breath-noise magnitudes per level (invented; source `synthetic-invented`). Noise is Gaussian with an SD
 * largely independent of metabolic rate (Lamarra et al. 1987, confirmed abstract): a multiplicative
 * breath-size factor shared by VO2, VCO2 and VE (`commonCv`) plus independent parts.
 */
export const NOISE_LEVELS: Record<
  NoiseLevel,
  {
    commonCv: number;
    vo2SdMlMin: number;
    vco2SdMlMin: number;
    veCv: number;
    petSdMmHg: number;
    hrSdBpm: number;
    spo2SdPct: number;
    timingCv: number;
  }
> = {
  none: { commonCv: 0, vo2SdMlMin: 0, vco2SdMlMin: 0, veCv: 0, petSdMmHg: 0, hrSdBpm: 0, spo2SdPct: 0, timingCv: 0 },
  low: { commonCv: 0.04, vo2SdMlMin: 40, vco2SdMlMin: 35, veCv: 0.03, petSdMmHg: 0.6, hrSdBpm: 1, spo2SdPct: 0.3, timingCv: 0.1 },
  moderate: {
    commonCv: 0.08,
    vo2SdMlMin: 80,
    vco2SdMlMin: 70,
    veCv: 0.05,
    petSdMmHg: 1.2,
    hrSdBpm: 2,
    spo2SdPct: 0.6,
    timingCv: 0.18,
  },
  high: { commonCv: 0.14, vo2SdMlMin: 150, vco2SdMlMin: 130, veCv: 0.08, petSdMmHg: 2, hrSdBpm: 3, spo2SdPct: 1, timingCv: 0.25 },
};

/** Default spec: a healthy adult on a 20 W/min cycle ramp (invented values; typical ranges in README). */
export const DEFAULT_SYNTHETIC_SPEC: SyntheticSpec = {
  label: "default healthy adult (invented)",
  weightKg: 75,
  restS: 180,
  warmupS: 180,
  warmupW: 10,
  rampWPerMin: 20,
  recoveryS: 180,
  vo2RestMlMin: 300,
  vo2UnloadedMlMin: 600,
  gainMlMinPerW: 10.3,
  tauVo2S: 40,
  slowComponentFraction: 0,
  peakVo2MlMin: 2600,
  plateau: false,
  vt1FractionOfPeak: 0.55,
  vt2FractionOfPeak: 0.82,
  rerRest: 0.82,
  s1: 0.95,
  s2: 1.3,
  tauCo2ExtraS: 10,
  veInterceptLMin: 3,
  veVco2Slope: 26,
  hyperventilationSlope: 18,
  tauVeS: 0,
  mvvLMin: null,
  vdVtRest: 0.32,
  vdVtExercise: 0.2,
  vtRestL: 0.6,
  vtMaxL: 2.6,
  hrRestBpm: 70,
  hrPeakBpm: 172,
  o2PulsePlateauFromFraction: null,
  spo2RestPct: 98,
  spo2DropPct: 0,
  noise: "moderate",
  noiseAutocorrelation: 0,
  artefactRate: 0,
  eov: null,
};

/** Inspired PO2 at sea level: 0.2093·(760 − 47) mmHg (common practice). */
const PIO2_MMHG = 0.2093 * (760 - 47);
const FIO2 = 0.2093;

/** First-order lag step with exact exponential weighting for a 1-s step. */
const lagStep = (current: number, target: number, tauS: number): number =>
  tauS > 0 ? current + (target - current) * (1 - Math.exp(-1 / tauS)) : target;

interface Grid {
  t: Float64Array;
  workW: Float64Array;
  vo2: Float64Array;
  vco2: Float64Array;
  ve: Float64Array;
  hr: Float64Array;
  rr: Float64Array;
  vt: Float64Array;
  peto2: Float64Array;
  petco2: Float64Array;
  spo2: Float64Array;
}

/**
 * Generate a synthetic cycle-ergometer CPET (breath by breath) whose thresholds and slopes are known by
 * construction. Deterministic for a given (spec, seed). The output is invented data.
 *
 * Model (1-s grid, then sampled at breath times): protocol rest → warm-up → ramp → recovery with phase
 * markers; VO2 = first-order lag of its steady-state demand (rest, unloaded + ΔVO2/ΔWR·W, optional slow
 * component and plateau); VCO2 = lag of a piecewise-linear function of VO2 (S1 below VT1, S2 above:
 * Beaver, Wasserman & Whipp 1986, confirmed abstract; slope values recalled); VE = intercept + slope·VCO2,
 * plus hyperventilation above the RCP, optional saturation near MVV and EOV; end-tidal gases from the
 * alveolar ventilation and alveolar gas equations (common practice); HR linear in VO2 with optional O2-pulse
 * plateau, and in recovery a first-order fall towards rest whose 1-min drop grows with fitness (invented); tidal volume saturating, breathing frequency = VE/VT; breath noise Gaussian, optionally AR(1)
 * (Lamarra 1987; Liang 1996, both confirmed abstracts) and artefact breaths.
 *
 * @param overrides spec fields differing from `DEFAULT_SYNTHETIC_SPEC`
 * @param seed any finite number
 */
export function generateSyntheticTest(overrides: Partial<SyntheticSpec>, seed: number): SyntheticTest {
  const spec: SyntheticSpec = { ...DEFAULT_SYNTHETIC_SPEC, ...overrides };
  const rng = seededRandom(seed);
  const noise = NOISE_LEVELS[spec.noise];

  // ---- thresholds in VO2, made feasible (VT1 at least 150 s of ramp above unloaded VO2, VT2 above VT1)
  const peak = spec.peakVo2MlMin;
  const rampVo2PerS = (spec.gainMlMinPerW * spec.rampWPerMin) / 60;
  const v1Min = spec.vo2UnloadedMlMin + rampVo2PerS * 150;
  const v1 = Math.min(Math.max(spec.vt1FractionOfPeak * peak, v1Min), 0.85 * peak);
  const v2 =
    spec.vt2FractionOfPeak === null ? null : Math.min(Math.max(spec.vt2FractionOfPeak * peak, v1 + 0.08 * peak), 0.96 * peak);

  // ---- protocol: ramp long enough for the lagged VO2 to reach the target peak
  const sc = spec.slowComponentFraction;
  const vo2SsAtPeak = peak > v1 ? v1 + (peak - v1) / (1 + sc) : peak;
  let peakW = spec.warmupW + (vo2SsAtPeak - spec.vo2UnloadedMlMin) / spec.gainMlMinPerW + (spec.rampWPerMin * spec.tauVo2S) / 60;
  if (spec.plateau) peakW += spec.rampWPerMin;
  const restEndS = spec.restS;
  const warmupEndS = restEndS + spec.warmupS;
  const rampEndS = warmupEndS + Math.round(((peakW - spec.warmupW) / spec.rampWPerMin) * 60);
  const endS = rampEndS + spec.recoveryS;
  const n = endS + 1;

  const g: Grid = {
    t: new Float64Array(n),
    workW: new Float64Array(n),
    vo2: new Float64Array(n),
    vco2: new Float64Array(n),
    ve: new Float64Array(n),
    hr: new Float64Array(n),
    rr: new Float64Array(n),
    vt: new Float64Array(n),
    peto2: new Float64Array(n),
    petco2: new Float64Array(n),
    spo2: new Float64Array(n),
  };
  const a = spec.vo2RestMlMin * (spec.rerRest - spec.s1);
  const vco2Target = (vo2: number): number => (vo2 <= v1 ? a + spec.s1 * vo2 : a + spec.s1 * v1 + spec.s2 * (vo2 - v1));
  const veRest = spec.veInterceptLMin + (spec.veVco2Slope * vco2Target(spec.vo2RestMlMin)) / 1000;
  let vo2 = spec.vo2RestMlMin;
  let vco2 = vco2Target(vo2);
  let ve = veRest;
  let crossV1 = -1;
  let crossV2 = -1;
  let vco2AtV2 = NaN;
  const vd0 = spec.vdVtRest * spec.vtRestL;
  const vdPerVt = (spec.vdVtExercise * spec.vtMaxL - vd0) / Math.max(1e-6, spec.vtMaxL - spec.vtRestL);
  const pulseFrom = spec.o2PulsePlateauFromFraction;
  const hrLinear = (x: number) =>
    spec.hrRestBpm + ((spec.hrPeakBpm - spec.hrRestBpm) * (x - spec.vo2RestMlMin)) / (peak - spec.vo2RestMlMin);
  const pulseVo2 = pulseFrom === null ? Infinity : pulseFrom * peak;
  const pulseAtPlateau = pulseFrom === null ? NaN : pulseVo2 / hrLinear(pulseVo2);
  // Recovery HR (invented kinetics, source `synthetic-invented`): after the ramp HR falls from its end-of-ramp
  // value towards rest as a first-order decay, not with VO2 (which would drop it ~80 bpm in the first minute).
  // The fraction of the HR reserve (end-of-ramp HR − rest) recovered in the first minute grows with fitness
  // (invented line: 0.065 + 0.0075 per mL/kg/min of peak VO2, kept within 0.10–0.30), giving 1-min recoveries of
  // ~30 bpm for a fit adult (peak 37 mL/kg/min, reserve 108 bpm) and ~10 bpm for heart failure (14 mL/kg/min,
  // reserve ~60 bpm). Published context: 1-min HR recovery after exercise is typically ~15–40 bpm in healthy
  // adults and ≤ 12 bpm is abnormal (Cole et al., N Engl J Med 1999, confirmed: `cole-1999` in lib/thresholds).
  const recoveredIn1Min = Math.min(0.3, Math.max(0.1, 0.065 + (0.0075 * peak) / spec.weightKg));
  const tauHrRecoveryS = -60 / Math.log(1 - recoveredIn1Min);
  let hrAtRampEnd = spec.hrRestBpm;

  for (let i = 0; i < n; i++) {
    const t = i;
    let w = 0;
    let ss = spec.vo2RestMlMin;
    if (t >= restEndS && t < warmupEndS) w = spec.warmupW;
    else if (t >= warmupEndS && t <= rampEndS)
      w = spec.stageS
        ? spec.warmupW + (spec.rampWPerMin * spec.stageS * (1 + Math.floor((t - warmupEndS) / spec.stageS))) / 60
        : spec.warmupW + (spec.rampWPerMin * (t - warmupEndS)) / 60;
    if (t >= restEndS && t <= rampEndS) {
      ss = spec.vo2UnloadedMlMin + spec.gainMlMinPerW * (w - spec.warmupW);
      if (ss > v1) ss += sc * (ss - v1);
      if (spec.plateau) ss = Math.min(ss, peak);
    }
    vo2 = i === 0 ? vo2 : lagStep(vo2, ss, spec.tauVo2S);
    vco2 = i === 0 ? vco2 : lagStep(vco2, vco2Target(vo2), spec.tauCo2ExtraS);
    const exercising = t >= restEndS && t <= rampEndS;
    if (crossV1 < 0 && exercising && vo2 >= v1) crossV1 = t;
    if (v2 !== null && crossV2 < 0 && exercising && vo2 >= v2) {
      crossV2 = t;
      vco2AtV2 = vco2;
    }
    let veTarget = spec.veInterceptLMin + (spec.veVco2Slope * vco2) / 1000;
    if (crossV2 >= 0 && t <= rampEndS + 30) veTarget += (spec.hyperventilationSlope * Math.max(0, vco2 - vco2AtV2)) / 1000;
    if (spec.eov && t >= restEndS && t <= rampEndS)
      veTarget *= 1 + spec.eov.amplitudeFraction * Math.sin((2 * Math.PI * (t - restEndS)) / spec.eov.periodS);
    if (spec.mvvLMin !== null) {
      const cap = spec.mvvLMin;
      const knee = 0.8 * cap;
      if (veTarget > knee) veTarget = knee + (cap - knee) * Math.tanh((veTarget - knee) / (cap - knee));
    }
    ve = i === 0 ? ve : lagStep(ve, veTarget, spec.tauVeS);
    const vt = spec.vtMaxL - (spec.vtMaxL - spec.vtRestL) * Math.exp(-Math.max(0, ve - veRest) / 40);
    // dead space grows a little with tidal volume (VD = VD0 + k·(VT − VT rest)), so VD/VT falls smoothly as VT
    // rises — no corner of its own at VT1 (a corner there would bend PETCO2 up and hide the PETO2 rise from VT1)
    const vdVt = (vd0 + vdPerVt * (vt - spec.vtRestL)) / vt;
    const petco2 = (863 * (vco2 / 1000)) / (ve * (1 - vdVt));
    const rer = vco2 / vo2;
    const peto2 = PIO2_MMHG - petco2 * (FIO2 + (1 - FIO2) / rer);
    let hr = hrLinear(vo2);
    if (vo2 > pulseVo2) hr = Math.min(vo2 / pulseAtPlateau, spec.hrPeakBpm * 1.03);
    if (t === rampEndS) hrAtRampEnd = hr;
    else if (t > rampEndS) hr = spec.hrRestBpm + (hrAtRampEnd - spec.hrRestBpm) * Math.exp(-(t - rampEndS) / tauHrRecoveryS);
    const effort = Math.min(1, Math.max(0, (vo2 - spec.vo2UnloadedMlMin) / (peak - spec.vo2UnloadedMlMin)));
    g.t[i] = t;
    g.workW[i] = w;
    g.vo2[i] = vo2;
    g.vco2[i] = vco2;
    g.ve[i] = ve;
    g.hr[i] = hr;
    g.vt[i] = vt;
    g.rr[i] = ve / vt;
    g.petco2[i] = petco2;
    g.peto2[i] = peto2;
    g.spo2[i] = spec.spo2RestPct - spec.spo2DropPct * effort;
  }

  // ---- breath times and noise
  const phaseAt = (t: number): Phase =>
    t < restEndS ? "rest" : t < warmupEndS ? "warmup" : t <= rampEndS ? "exercise" : "recovery";
  const at = (arr: Float64Array, t: number): number => {
    const i = Math.min(n - 2, Math.max(0, Math.floor(t)));
    const f = Math.min(1, Math.max(0, t - i));
    return arr[i] + f * (arr[i + 1] - arr[i]);
  };
  const phi = Math.min(0.95, Math.max(0, spec.noiseAutocorrelation));
  const innov = Math.sqrt(1 - phi * phi);
  const streams = new Float64Array(8);
  const nextNoise = (k: number): number => {
    streams[k] = phi * streams[k] + innov * rng.normal();
    return streams[k];
  };
  const rows: BreathRow[] = [];
  const clean: BreathRow[] = [];
  const r1 = (x: number) => Math.round(x * 10) / 10;
  const r3 = (x: number) => Math.round(x * 1000) / 1000;
  let t = 60 / at(g.rr, 0);
  while (t < endS) {
    const base: BreathRow = {
      timeS: r3(t),
      vo2MlMin: at(g.vo2, t),
      vco2MlMin: at(g.vco2, t),
      veLMin: at(g.ve, t),
      hrBpm: at(g.hr, t),
      workW: at(g.workW, t),
      rrBrMin: at(g.rr, t),
      vtL: at(g.vt, t),
      peto2MmHg: at(g.peto2, t),
      petco2MmHg: at(g.petco2, t),
      spo2Pct: at(g.spo2, t),
      phase: phaseAt(t),
    };
    clean.push(roundRow(base, r1, r3));
    const common = 1 + noise.commonCv * nextNoise(0);
    const noisy: BreathRow = {
      ...base,
      vo2MlMin: base.vo2MlMin! * common + noise.vo2SdMlMin * nextNoise(1),
      vco2MlMin: base.vco2MlMin! * common + noise.vco2SdMlMin * nextNoise(2),
      veLMin: base.veLMin! * common * (1 + noise.veCv * nextNoise(3)),
      petco2MmHg: base.petco2MmHg! + noise.petSdMmHg * nextNoise(4),
      peto2MmHg: base.peto2MmHg! + 1.5 * noise.petSdMmHg * nextNoise(5),
      hrBpm: base.hrBpm! + noise.hrSdBpm * nextNoise(6),
      spo2Pct: Math.min(100, base.spo2Pct! + noise.spo2SdPct * nextNoise(7)),
    };
    noisy.vtL = base.vtL! * common;
    noisy.rrBrMin = noisy.veLMin! / noisy.vtL;
    if (spec.artefactRate > 0 && rng.uniform() < spec.artefactRate) {
      const cough = rng.uniform() < 0.5;
      const f = cough ? 1.8 + rng.uniform() : 0.25 + 0.2 * rng.uniform();
      noisy.vo2MlMin = noisy.vo2MlMin! * f;
      noisy.vco2MlMin = noisy.vco2MlMin! * f * (cough ? 1.1 : 1);
      noisy.veLMin = noisy.veLMin! * f * (cough ? 1.2 : 1);
      noisy.petco2MmHg = noisy.petco2MmHg! - (cough ? 4 : 10);
      noisy.vtL = noisy.vtL! * f;
    }
    for (const k of ["vo2MlMin", "vco2MlMin", "veLMin", "vtL"] as const) noisy[k] = Math.max(0.01, noisy[k]!);
    rows.push(roundRow(noisy, r1, r3));
    const dur = (60 / base.rrBrMin!) * Math.min(2.5, Math.max(0.4, 1 + noise.timingCv * rng.normal()));
    t += dur;
  }

  // ---- truth, from the noise-free signals
  const point = (ts: number): TruthPoint => ({
    timeS: ts,
    vo2MlMin: at(g.vo2, ts),
    vco2MlMin: at(g.vco2, ts),
    veLMin: at(g.ve, ts),
    workW: at(g.workW, ts),
    hrBpm: at(g.hr, ts),
  });
  const vt1Time = (crossV1 < 0 ? rampEndS : crossV1) + spec.tauCo2ExtraS;
  const vt2Time = v2 !== null && crossV2 >= 0 ? crossV2 + spec.tauVeS : null;
  let peakI = warmupEndS;
  for (let i = warmupEndS; i <= Math.min(n - 1, rampEndS + 10); i++) if (g.vo2[i] > g.vo2[peakI]) peakI = i;
  const span = (from: number, to: number, xs: NumericField, ys: NumericField, sx = 1, sy = 1) => {
    const x: number[] = [];
    const y: number[] = [];
    for (const r of clean)
      if (r.timeS >= from && r.timeS <= to) {
        x.push((r[xs] as number) * sx);
        y.push((r[ys] as number) * sy);
      }
    return linearRegression(x, y).slope;
  };
  const truth: SyntheticTruth = {
    invented: true,
    vt1: point(vt1Time),
    vt2: vt2Time === null ? null : point(vt2Time),
    peak: {
      vo2MlMin: g.vo2[peakI],
      vco2MlMin: g.vco2[peakI],
      veLMin: g.ve[peakI],
      hrBpm: g.hr[peakI],
      workW: g.workW[Math.min(peakI, rampEndS)],
      rer: g.vco2[peakI] / g.vo2[peakI],
      timeS: peakI,
    },
    vco2Vo2SlopeBelowVt1: spec.s1,
    vco2Vo2SlopeAboveVt1: spec.s2,
    veVco2SlopeToVt2: span(warmupEndS, vt2Time ?? rampEndS, "vco2MlMin", "veLMin", 0.001),
    veVco2SlopeToPeak: span(warmupEndS, rampEndS, "vco2MlMin", "veLMin", 0.001),
    deltaVo2DeltaWrMlMinW: span(warmupEndS + 60, rampEndS, "workW", "vo2MlMin"),
    phases: { restEndS, warmupEndS, rampEndS, endS },
    rampWPerMin: spec.rampWPerMin,
    weightKg: spec.weightKg,
  };
  const fields: BreathTable["fields"] = [
    "timeS",
    "vo2MlMin",
    "vco2MlMin",
    "veLMin",
    "hrBpm",
    "workW",
    "rrBrMin",
    "vtL",
    "peto2MmHg",
    "petco2MmHg",
    "spo2Pct",
    "phase",
  ];
  return { table: { shape: "breath", rows, fields }, noiseFree: { shape: "breath", rows: clean, fields }, truth, spec, seed };
}

function roundRow(r: BreathRow, r1: (x: number) => number, r3: (x: number) => number): BreathRow {
  return {
    timeS: r.timeS,
    vo2MlMin: r1(r.vo2MlMin!),
    vco2MlMin: r1(r.vco2MlMin!),
    veLMin: r3(r.veLMin!),
    hrBpm: r1(r.hrBpm!),
    workW: r1(r.workW!),
    rrBrMin: r1(r.rrBrMin!),
    vtL: r3(r.vtL!),
    peto2MmHg: r1(r.peto2MmHg!),
    petco2MmHg: r1(r.petco2MmHg!),
    spo2Pct: r1(r.spo2Pct!),
    phase: r.phase,
  };
}
