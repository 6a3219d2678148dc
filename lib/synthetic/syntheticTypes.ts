import type { BreathTable } from "../breath";

/** Breath-to-breath noise level of a synthetic test (invented magnitudes, see `NOISE_LEVELS`). */
export type NoiseLevel = "none" | "low" | "moderate" | "high";

/**
 * Everything that shapes one synthetic cycle-ergometer test. All values are invented physiology
 * (see lib/synthetic/README.md for where the typical ranges come from). Units in the names.
 */
export interface SyntheticSpec {
  label: string;
  weightKg: number;
  // protocol
  /** Seated rest, s. */
  restS: number;
  /** Unloaded / warm-up pedalling, s. */
  warmupS: number;
  /** Warm-up work rate, W (0–20). */
  warmupW: number;
  rampWPerMin: number;
  /**
   * Stepped protocol: the load rises by rampWPerMin·stageS/60 every stageS seconds (same mean rate as the ramp; first
   * step at the start of the incremental phase). Absent or null = a continuous ramp.
   */
  stageS?: number | null;
  recoveryS: number;
  // oxygen uptake
  vo2RestMlMin: number;
  /** Steady VO2 while pedalling at the warm-up work rate, mL/min. */
  vo2UnloadedMlMin: number;
  /** ΔVO2/ΔWR during the ramp, mL/min/W. */
  gainMlMinPerW: number;
  /** First-order time constant of VO2, s. */
  tauVo2S: number;
  /** Extra VO2 above VT1 as a fraction of the VO2 rise above VT1 (slow component), 0 = none. */
  slowComponentFraction: number;
  /** Peak VO2 the ramp is built to reach, mL/min. */
  peakVo2MlMin: number;
  /** VO2 levels off at `peakVo2MlMin` for the last minute. */
  plateau: boolean;
  /** VO2 at VT1 (start of excess CO2) as a fraction of peak VO2. */
  vt1FractionOfPeak: number;
  /** VO2 at VT2/RCP (start of hyperventilation) as a fraction of peak VO2; null = no RCP. */
  vt2FractionOfPeak: number | null;
  // carbon dioxide
  rerRest: number;
  /** Slope of VCO2 on VO2 below VT1 (S1). */
  s1: number;
  /** Slope of VCO2 on VO2 above VT1 (S2). */
  s2: number;
  /** Extra first-order lag of VCO2 behind VO2, s (CO2 stores); 0 = none. */
  tauCo2ExtraS: number;
  // ventilation
  veInterceptLMin: number;
  /** VE/VCO2 slope below the RCP (VE L/min per VCO2 L/min). */
  veVco2Slope: number;
  /** Extra VE per extra VCO2 above the RCP (L/min per L/min). */
  hyperventilationSlope: number;
  /** First-order lag of VE behind its target, s; 0 = none. */
  tauVeS: number;
  /** Maximal voluntary ventilation; VE saturates near it (ventilatory limitation). null = no cap. */
  mvvLMin: number | null;
  vdVtRest: number;
  vdVtExercise: number;
  vtRestL: number;
  vtMaxL: number;
  // heart rate and saturation
  hrRestBpm: number;
  hrPeakBpm: number;
  /** From this fraction of peak VO2 the O2 pulse stays flat (HR rises faster); null = linear HR–VO2. */
  o2PulsePlateauFromFraction: number | null;
  spo2RestPct: number;
  /** Fall of SpO2 from rest to peak exercise, percentage points. */
  spo2DropPct: number;
  // disturbances
  noise: NoiseLevel;
  /** AR(1) coefficient of breath noise (0 = white). */
  noiseAutocorrelation: number;
  /** Fraction of breaths replaced by artefacts (coughs, swallows). */
  artefactRate: number;
  /** Exercise oscillatory ventilation, or null. */
  eov: { periodS: number; amplitudeFraction: number } | null;
}

/** Noise-free values at one moment of a synthetic test. */
export interface TruthPoint {
  timeS: number;
  vo2MlMin: number;
  vco2MlMin: number;
  veLMin: number;
  workW: number;
  hrBpm: number;
}

/** What the generator built in, known by construction (invented data). */
export interface SyntheticTruth {
  invented: true;
  /**
   * VT1: where excess CO2 starts, as seen at the mouth (the corner of the VCO2-vs-VO2 relation of the
   * noise-free signals; with a VCO2 lag the corner lies `tauCo2ExtraS` after metabolic VO2 reached it).
   */
  vt1: TruthPoint;
  /** VT2/RCP: where VE starts rising faster than VCO2 (corner of VE vs VCO2), or null. */
  vt2: TruthPoint | null;
  peak: { vo2MlMin: number; vco2MlMin: number; veLMin: number; hrBpm: number; workW: number; rer: number; timeS: number };
  vco2Vo2SlopeBelowVt1: number;
  vco2Vo2SlopeAboveVt1: number;
  /** OLS of noise-free VE on VCO2 (L/min on L/min) from ramp start to VT2 (or ramp end without VT2). */
  veVco2SlopeToVt2: number;
  /** OLS of noise-free VE on VCO2 from ramp start to ramp end. */
  veVco2SlopeToPeak: number;
  /** OLS of noise-free VO2 on work rate from ramp start + 60 s to ramp end, mL/min/W. */
  deltaVo2DeltaWrMlMinW: number;
  phases: { restEndS: number; warmupEndS: number; rampEndS: number; endS: number };
  rampWPerMin: number;
  weightKg: number;
}

export interface SyntheticTest {
  /** The breath table with noise and artefacts, phase markers included. */
  table: BreathTable;
  /** Same breath times, noise-free and artefact-free. */
  noiseFree: BreathTable;
  truth: SyntheticTruth;
  spec: SyntheticSpec;
  seed: number;
}
