import type { BreathRow, BreathTable, Phase } from "../breath";
import { linearRegression, seededRandom } from "../numeric";
import type { NoiseLevel, SyntheticTruth, TruthPoint } from "./syntheticTypes";

/**
 * Second, independent synthetic test model for validating threshold detection (invented data, source
 * `synthetic-invented`). Its modelling choices differ on purpose from `generateSyntheticTest` so that a
 * method tuned on one is checked on the other:
 * - load: linear ramp, accelerating (treadmill-like, smooth curvilinear) or 1-min steps; unloaded pedalling
 *   60–360 s; ramps of 6–16 min;
 * - VO2: phase-I delay plus first-order phase II, gain rising gradually above VT1;
 * - VCO2: metabolic CO2 (RQ·VO2) plus buffering excess with a curvilinear (softplus) onset over about a
 *   minute, passed through a two-compartment CO2 store (fast and slow stores in parallel);
 * - VE: driven by VCO2 with its own lag, compensation above VT2 with a softplus onset; VD/VT falling with time;
 * - CO2 washout: while the compensation drives PCO2 down, the stores release CO2 (optional, invented magnitude);
 * - noise: Student-t (3 degrees of freedom) breath noise scaled by breath duration (short breaths noisier),
 *   tidal-volume deviations shared by VO2, VCO2 (amplified) and VE, breath-timing jitter (log-normal
 *   durations), optional 1-s time stamps, HR drift.
 */
export interface VariantSpec {
  label: string;
  noise: NoiseLevel;
  protocol: "ramp" | "accelerating" | "steps";
  restS: number;
  unloadedS: number;
  rampS: number;
  vo2RestMlMin: number;
  vo2UnloadedMlMin: number;
  peakVo2MlMin: number;
  /** VO2 at VT1 and VT2 as fractions of peak. */
  vt1Fraction: number;
  vt2Fraction: number;
  delayS: number;
  tauVo2S: number;
  rq: number;
  /** Excess CO2 per unit VO2 above VT1 (asymptotic). */
  excessSlope: number;
  /** Width of the excess-CO2 onset, s of ramp. */
  onsetS: number;
  storeFastTauS: number;
  storeSlowTauS: number;
  storeSlowFraction: number;
  veVco2Slope: number;
  veInterceptLMin: number;
  tauVeS: number;
  compensationSlope: number;
  hrDriftBpmPerMin: number;
  roundTimesToS: boolean;
  /**
   * CO2 released from body stores per mmHg fall of PCO2 once ventilation outpaces VCO2 above VT2, mL/mmHg
   * (invented magnitude; the washout is why Beaver 1986 stops the V-slope at the RCP). 0 = none.
   */
  co2WashoutMlPerMmHg?: number;
}

/** Noise magnitudes per level for the variant model (invented). */
const VARIANT_NOISE: Record<
  NoiseLevel,
  { tidalCv: number; vo2Sd: number; vco2Sd: number; veCv: number; pet: number; jitterCv: number }
> = {
  none: { tidalCv: 0, vo2Sd: 0, vco2Sd: 0, veCv: 0, pet: 0, jitterCv: 0 },
  low: { tidalCv: 0.04, vo2Sd: 35, vco2Sd: 30, veCv: 0.03, pet: 0.6, jitterCv: 0.12 },
  moderate: { tidalCv: 0.08, vo2Sd: 70, vco2Sd: 60, veCv: 0.05, pet: 1.2, jitterCv: 0.2 },
  high: { tidalCv: 0.13, vo2Sd: 130, vco2Sd: 110, veCv: 0.08, pet: 2, jitterCv: 0.3 },
};

export interface VariantTest {
  table: BreathTable;
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  variant: VariantSpec;
  seed: number;
}

/** Student-t draw with `df` degrees of freedom scaled to unit SD (df > 2). */
function studentT(rng: ReturnType<typeof seededRandom>, df: number): number {
  let chi = 0;
  for (let k = 0; k < df; k++) {
    const z = rng.normal();
    chi += z * z;
  }
  return rng.normal() / Math.sqrt(chi / df) / Math.sqrt(df / (df - 2));
}

const softplus = (z: number) => (z > 30 ? z : Math.log1p(Math.exp(z)));

/**
 * Draw a varied variant spec (invented) for index `i` of a validation bank.
 * Noise levels cycle low → moderate → high.
 */
export function variantSpec(i: number, seed = 77, levels: NoiseLevel[] = ["low", "moderate", "high"]): VariantSpec {
  const rng = seededRandom(seed * 1000 + i);
  const u = (lo: number, hi: number) => lo + (hi - lo) * rng.uniform();
  const peak = u(1000, 4000);
  const rest = u(250, 380);
  const unloaded = rest + u(150, 350);
  const vt1 = Math.max(u(0.45, 0.68), (unloaded + 0.12 * peak) / peak);
  const vt2 = Math.min(0.92, Math.max(u(0.75, 0.9), vt1 + 0.15));
  const r = rng.uniform();
  return {
    label: `variant-${i}`,
    noise: levels[i % levels.length],
    protocol: r < 0.5 ? "ramp" : r < 0.8 ? "accelerating" : "steps",
    restS: Math.round(u(120, 240)),
    unloadedS: Math.round(u(60, 360)),
    rampS: Math.round(u(360, 960)),
    vo2RestMlMin: rest,
    vo2UnloadedMlMin: unloaded,
    peakVo2MlMin: peak,
    vt1Fraction: Math.min(0.72, vt1),
    vt2Fraction: vt2,
    delayS: u(10, 20),
    tauVo2S: u(20, 60),
    rq: u(0.8, 0.95),
    excessSlope: u(0.25, 0.55),
    onsetS: u(40, 80),
    storeFastTauS: u(5, 20),
    storeSlowTauS: u(40, 90),
    storeSlowFraction: u(0.1, 0.3),
    veVco2Slope: u(22, 42),
    veInterceptLMin: u(2, 6),
    tauVeS: u(5, 25),
    compensationSlope: u(10, 30),
    hrDriftBpmPerMin: u(0, 0.4),
    roundTimesToS: rng.uniform() < 0.3,
    co2WashoutMlPerMmHg: u(0, 30),
  };
}

/**
 * Generate one breath-by-breath test from the variant model (invented data; deterministic for spec and seed).
 * Truth: VT1 = the corner of the excess-CO2 asymptotes as seen at the mouth (metabolic crossing of VT1 plus
 * the CO2 store's mean delay); VT2 = where VO2 at the mouth crosses the VT2 level, plus the VE lag.
 */
export function generateVariantTest(spec: VariantSpec, seed: number): VariantTest {
  const rng = seededRandom(seed);
  const nz = VARIANT_NOISE[spec.noise];
  const restEnd = spec.restS;
  const warmEnd = restEnd + spec.unloadedS;
  const rampEnd = warmEnd + spec.rampS;
  const endS = rampEnd + 150;
  const n = endS + 1;
  const v1 = spec.vt1Fraction * spec.peakVo2MlMin;
  const v2 = spec.vt2Fraction * spec.peakVo2MlMin;
  // demand reaching peak at ramp end (plus the lag), shaped by the protocol
  const span = spec.peakVo2MlMin - spec.vo2UnloadedMlMin;
  const shape = (f: number) =>
    spec.protocol === "ramp"
      ? f
      : spec.protocol === "accelerating"
        ? 0.6 * f + 0.4 * f * f
        : Math.floor(f * (spec.rampS / 60)) / (spec.rampS / 60);
  const demandAt = (t: number) => {
    if (t < restEnd) return spec.vo2RestMlMin;
    if (t < warmEnd) return spec.vo2UnloadedMlMin;
    if (t <= rampEnd) {
      const f = Math.min(1, (t - warmEnd + spec.tauVo2S + spec.delayS) / spec.rampS);
      return spec.vo2UnloadedMlMin + span * shape(f);
    }
    return spec.vo2RestMlMin + 0.3 * (spec.vo2UnloadedMlMin - spec.vo2RestMlMin);
  };
  const vo2M = new Float64Array(n); // metabolic (muscle) VO2
  const vo2 = new Float64Array(n); // at the mouth
  const vco2 = new Float64Array(n);
  const ve = new Float64Array(n);
  const peto2 = new Float64Array(n);
  const petco2 = new Float64Array(n);
  const hr = new Float64Array(n);
  const work = new Float64Array(n);
  let m = spec.vo2RestMlMin;
  const onsetVo2 = Math.max(20, (span / spec.rampS) * spec.onsetS * 0.25);
  const production = (x: number) => spec.rq * x + spec.excessSlope * onsetVo2 * softplus((x - v1) / onsetVo2);
  let fast = production(m);
  let slow = production(m);
  let veNow = spec.veInterceptLMin + (spec.veVco2Slope * fast) / 1000;
  let crossV1 = -1;
  let veBase = veNow;
  let lastDrop = 0;
  const washout = spec.co2WashoutMlPerMmHg ?? 0;
  for (let t = 0; t < n; t++) {
    let d = demandAt(t - spec.delayS);
    if (d > v1) d += 0.12 * (d - v1) * Math.min(1, Math.max(0, (d - v1) / (0.3 * span)));
    m += (d - m) * (1 - Math.exp(-1 / spec.tauVo2S));
    vo2M[t] = m;
    vo2[t] = m;
    const p = production(m);
    fast += (p - fast) * (1 - Math.exp(-1 / spec.storeFastTauS));
    slow += (p - slow) * (1 - Math.exp(-1 / spec.storeSlowTauS));
    vco2[t] = (1 - spec.storeSlowFraction) * fast + spec.storeSlowFraction * slow;
    if (crossV1 < 0 && t >= warmEnd && m >= v1) crossV1 = t;
    const w2 = Math.max(20, onsetVo2);
    const comp = t <= rampEnd + 20 ? (spec.compensationSlope * w2 * softplus((vo2[t] - v2) / w2)) / 1000 : 0;
    const target = spec.veInterceptLMin + (spec.veVco2Slope * vco2[t]) / 1000 + comp;
    veNow += (target - veNow) * (1 - Math.exp(-1 / spec.tauVeS));
    veBase += (target - comp - veBase) * (1 - Math.exp(-1 / spec.tauVeS));
    ve[t] = veNow;
    const frac = Math.min(1, Math.max(0, (t - restEnd) / (rampEnd - restEnd)));
    const vdVt = 0.3 - 0.12 * frac;
    // CO2 washed out of the stores while ventilation drives PCO2 down above VT2 (invented magnitude)
    const drop = Math.max(0, ((863 * (vco2[t] / 1000)) / (1 - vdVt)) * (1 / veBase - 1 / veNow));
    if (washout > 0 && drop > lastDrop) vco2[t] += washout * (drop - lastDrop) * 60;
    lastDrop = drop;
    petco2[t] = (863 * (vco2[t] / 1000)) / (ve[t] * (1 - vdVt));
    const rer = vco2[t] / vo2[t];
    peto2[t] = 0.2093 * 713 - petco2[t] * (0.2093 + (1 - 0.2093) / rer);
    hr[t] = 65 + (110 * (vo2[t] - spec.vo2RestMlMin)) / span + (spec.hrDriftBpmPerMin * t) / 60;
    // the commanded load (whole watts), 0 W at the start of the ramp: an ergometer's load leads VO2, never lags it
    work[t] = t < warmEnd || t > rampEnd ? 0 : Math.floor(Math.max(0, (span / 10) * shape((t - warmEnd) / spec.rampS)));
  }
  const meanDelay = (1 - spec.storeSlowFraction) * spec.storeFastTauS + spec.storeSlowFraction * spec.storeSlowTauS;
  const at = (a: Float64Array, t: number) => {
    const i = Math.min(n - 2, Math.max(0, Math.floor(t)));
    const f = Math.min(1, Math.max(0, t - i));
    return a[i] + f * (a[i + 1] - a[i]);
  };
  const point = (t: number): TruthPoint => ({
    timeS: t,
    vo2MlMin: at(vo2, t),
    vco2MlMin: at(vco2, t),
    veLMin: at(ve, t),
    workW: at(work, t),
    hrBpm: at(hr, t),
  });
  let crossV2 = -1;
  for (let t = warmEnd; t <= rampEnd; t++)
    if (vo2[t] >= v2) {
      crossV2 = t;
      break;
    }
  const vt1T = (crossV1 < 0 ? rampEnd : crossV1) + meanDelay;
  const vt2T = crossV2 < 0 ? null : crossV2 + spec.tauVeS;
  // breaths
  const phaseAt = (t: number): Phase => (t < restEnd ? "rest" : t < warmEnd ? "warmup" : t <= rampEnd ? "exercise" : "recovery");
  const rows: BreathRow[] = [];
  const clean: BreathRow[] = [];
  let t = 3;
  while (t < endS - 1) {
    const veT = at(ve, t);
    const rr = Math.min(55, 10 + veT * 0.28);
    const meanDur = 60 / rr;
    const dur = meanDur * Math.exp(nz.jitterCv * rng.normal() - (nz.jitterCv * nz.jitterCv) / 2);
    const scale = Math.sqrt(meanDur / Math.max(0.5, dur));
    const tidal = nz.tidalCv * studentT(rng, 3);
    const ts = spec.roundTimesToS ? Math.round(t) : Math.round(t * 1000) / 1000;
    const base: BreathRow = {
      timeS: ts,
      vo2MlMin: at(vo2, t),
      vco2MlMin: at(vco2, t),
      veLMin: veT,
      hrBpm: at(hr, t),
      workW: at(work, t),
      peto2MmHg: at(peto2, t),
      petco2MmHg: at(petco2, t),
      rrBrMin: rr,
      phase: phaseAt(t),
    };
    clean.push(base);
    rows.push({
      ...base,
      vo2MlMin: Math.max(10, base.vo2MlMin! * (1 + tidal) + scale * nz.vo2Sd * studentT(rng, 3)),
      vco2MlMin: Math.max(10, base.vco2MlMin! * (1 + 1.2 * tidal) + scale * nz.vco2Sd * studentT(rng, 3)),
      veLMin: Math.max(0.5, base.veLMin! * (1 + tidal) * (1 + scale * nz.veCv * studentT(rng, 3))),
      peto2MmHg: base.peto2MmHg! + 1.5 * nz.pet * studentT(rng, 3) + 8 * tidal,
      petco2MmHg: base.petco2MmHg! + nz.pet * studentT(rng, 3) - 4 * tidal,
      hrBpm: base.hrBpm! + 2 * rng.normal() * (nz.pet > 0 ? 1 : 0),
      rrBrMin: 60 / dur,
    });
    t += dur;
  }
  // OLS over the noise-free breaths between two times: VE (L/min) on VCO2 (L/min) by default, or VO2 on work rate
  const slope = (from: number, to: number, xOf = (r: BreathRow) => r.vco2MlMin! / 1000, yOf = (r: BreathRow) => r.veLMin!) => {
    const x: number[] = [];
    const y: number[] = [];
    for (const r of clean)
      if (r.timeS >= from && r.timeS <= to) {
        x.push(xOf(r));
        y.push(yOf(r));
      }
    return linearRegression(x, y).slope;
  };
  let peakI = warmEnd;
  for (let i = warmEnd; i <= rampEnd; i++) if (vo2[i] > vo2[peakI]) peakI = i;
  const truth: SyntheticTruth = {
    invented: true,
    vt1: point(vt1T),
    vt2: vt2T === null ? null : point(vt2T),
    peak: {
      vo2MlMin: vo2[peakI],
      vco2MlMin: vco2[peakI],
      veLMin: ve[peakI],
      hrBpm: hr[peakI],
      workW: work[peakI],
      rer: vco2[peakI] / vo2[peakI],
      timeS: peakI,
    },
    vco2Vo2SlopeBelowVt1: spec.rq,
    vco2Vo2SlopeAboveVt1: spec.rq + spec.excessSlope,
    veVco2SlopeToVt2: slope(warmEnd, vt2T ?? rampEnd),
    veVco2SlopeToPeak: slope(warmEnd, rampEnd),
    // as the truth type defines it (OLS of the noise-free breaths, ramp start + 60 s to ramp end); the demand rises at
    // 10 mL/min/W of the work rate, yet the fitted slope of the breaths is 4–12 % steeper (12 tests of seed 77 measured)
    deltaVo2DeltaWrMlMinW: slope(
      warmEnd + 60,
      rampEnd,
      (r) => r.workW!,
      (r) => r.vo2MlMin!,
    ),
    phases: { restEndS: restEnd, warmupEndS: warmEnd, rampEndS: rampEnd, endS },
    rampWPerMin: (span / 10 / spec.rampS) * 60,
    weightKg: 75,
  };
  const fields: BreathTable["fields"] = [
    "timeS",
    "vo2MlMin",
    "vco2MlMin",
    "veLMin",
    "hrBpm",
    "workW",
    "rrBrMin",
    "peto2MmHg",
    "petco2MmHg",
    "phase",
  ];
  return {
    table: { shape: "breath", rows, fields },
    noiseFree: { shape: "breath", rows: clean, fields },
    truth,
    variant: spec,
    seed,
  };
}
