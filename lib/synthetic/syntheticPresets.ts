import type { SyntheticSpec } from "./syntheticTypes";

/** A named synthetic patient: invented data for tests and demonstrations. */
export interface SyntheticPreset {
  id: string;
  label: string;
  /** Always true: these are invented, not patients. */
  invented: true;
  /** The physiology the preset is meant to show, in plain words. */
  description: string;
  spec: Partial<SyntheticSpec>;
}

/**
 * Presets of typical physiologies (all invented data, source `synthetic-invented`). Patterns follow the
 * clinical sheet's pattern table (ATS/ACCP 2003 and Wasserman textbook — recalled; CCJM table — secondary):
 * heart failure = low peak VO2 and AT, high VE/VCO2 slope, O2-pulse plateau, EOV; ventilatory limitation =
 * VE near MVV, no RCP, HR reserve; pulmonary vascular = very high VE/VCO2, low PETCO2, desaturation;
 * deconditioning = low-normal peak VO2, low AT, steep HR; pre-operative low AT = AT < 11 mL/kg/min (Older 1993).
 */
export const SYNTHETIC_PRESETS: readonly SyntheticPreset[] = [
  {
    id: "normal-adult",
    label: "Healthy adult (invented)",
    invented: true,
    description: "Normal peak VO2 and AT, VE/VCO2 slope 26, clear RCP.",
    spec: {
      label: "normal-adult",
      weightKg: 75,
      peakVo2MlMin: 2800,
      rampWPerMin: 25,
      vt1FractionOfPeak: 0.55,
      vt2FractionOfPeak: 0.83,
      veVco2Slope: 26,
      hrRestBpm: 68,
      hrPeakBpm: 176,
    },
  },
  {
    id: "heart-failure",
    label: "Heart failure with high VE/VCO2 slope and EOV (invented)",
    invented: true,
    description:
      "Peak VO2 ≈ 14 mL/kg/min, slow VO2 kinetics, ΔVO2/ΔWR 8, O2-pulse plateau, VE/VCO2 slope ≈ 40, oscillatory ventilation (period 60 s, ±20 %).",
    spec: {
      label: "heart-failure",
      weightKg: 80,
      vo2RestMlMin: 280,
      vo2UnloadedMlMin: 470,
      gainMlMinPerW: 8,
      tauVo2S: 70,
      peakVo2MlMin: 1150,
      rampWPerMin: 10,
      vt1FractionOfPeak: 0.62,
      vt2FractionOfPeak: 0.86,
      veInterceptLMin: 4,
      veVco2Slope: 40,
      vdVtRest: 0.38,
      vdVtExercise: 0.3,
      hrRestBpm: 72,
      hrPeakBpm: 128,
      o2PulsePlateauFromFraction: 0.7,
      eov: { periodS: 60, amplitudeFraction: 0.2 },
    },
  },
  {
    id: "ventilatory-limitation",
    label: "Ventilatory limitation (invented)",
    invented: true,
    description: "VE reaches ≈ MVV (45 L/min), no respiratory compensation, large HR reserve, mild desaturation.",
    spec: {
      label: "ventilatory-limitation",
      weightKg: 70,
      peakVo2MlMin: 1300,
      vo2UnloadedMlMin: 500,
      rampWPerMin: 10,
      vt1FractionOfPeak: 0.6,
      vt2FractionOfPeak: null,
      veInterceptLMin: 4,
      veVco2Slope: 33,
      mvvLMin: 45,
      vdVtRest: 0.42,
      vdVtExercise: 0.34,
      vtMaxL: 1.4,
      hrRestBpm: 85,
      hrPeakBpm: 130,
      spo2DropPct: 4,
    },
  },
  {
    id: "pulmonary-vascular",
    label: "Pulmonary vascular disease (invented)",
    invented: true,
    description: "Low peak VO2 and AT, VE/VCO2 slope ≈ 48, low PETCO2, O2-pulse plateau, SpO2 falls 8 points.",
    spec: {
      label: "pulmonary-vascular",
      weightKg: 65,
      vo2UnloadedMlMin: 450,
      gainMlMinPerW: 8.3,
      tauVo2S: 60,
      peakVo2MlMin: 1050,
      rampWPerMin: 10,
      vt1FractionOfPeak: 0.62,
      vt2FractionOfPeak: 0.86,
      veInterceptLMin: 5,
      veVco2Slope: 48,
      vdVtRest: 0.45,
      vdVtExercise: 0.4,
      hrRestBpm: 88,
      hrPeakBpm: 150,
      o2PulsePlateauFromFraction: 0.6,
      spo2DropPct: 8,
    },
  },
  {
    id: "deconditioning",
    label: "Deconditioning (invented)",
    invented: true,
    description: "Low-normal peak VO2, early AT (≈ 45 % of peak), steep HR rise, normal ventilatory efficiency.",
    spec: {
      label: "deconditioning",
      weightKg: 85,
      peakVo2MlMin: 1800,
      vo2UnloadedMlMin: 550,
      rampWPerMin: 15,
      vt1FractionOfPeak: 0.47,
      vt2FractionOfPeak: 0.8,
      veVco2Slope: 28,
      hrRestBpm: 88,
      hrPeakBpm: 178,
    },
  },
  {
    id: "preop-low-at",
    label: "Pre-operative patient with low AT (invented)",
    invented: true,
    description: "Older patient, AT ≈ 9 mL/kg/min (below 11, Older 1993), peak VO2 ≈ 15 mL/kg/min, VE/VCO2 slope 35.",
    spec: {
      label: "preop-low-at",
      weightKg: 82,
      vo2RestMlMin: 270,
      vo2UnloadedMlMin: 470,
      gainMlMinPerW: 9.2,
      peakVo2MlMin: 1250,
      rampWPerMin: 10,
      vt1FractionOfPeak: 0.6,
      vt2FractionOfPeak: 0.85,
      veVco2Slope: 35,
      hrRestBpm: 76,
      hrPeakBpm: 138,
    },
  },
];
