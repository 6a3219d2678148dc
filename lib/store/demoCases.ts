import type { Ergometer, Patient, Spirometry } from "../core";
import type { ClinicalContext, ReferralQuestion, TestConduct } from "../analysis";
import { breathTableToCsv, generateSyntheticTest, SYNTHETIC_PRESETS } from "../synthetic";

/**
 * INVENTED demo cases (not patient data): breath files made by the synthetic generator from its
 * presets, with invented patient details chosen to fit each physiology. Deterministic (fixed seeds),
 * so the demo is the same on every machine.
 */
export interface DemoCase {
  presetId: string;
  label: string;
  fileName: string;
  patient: Patient;
  ergometer: Ergometer;
  referral: ReferralQuestion;
  spirometry?: Spirometry;
  conduct?: TestConduct;
  context?: ClinicalContext;
  seed: number;
}

export const DEMO_CASES: DemoCase[] = [
  {
    presetId: "normal-adult",
    label: "Demo (invented): breathless runner, normal study",
    fileName: "demo-normal.csv",
    patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 75 },
    ergometer: "cycle",
    referral: "general",
    spirometry: { fev1L: 3.9 },
    conduct: { protocol: "Cycle ramp 25 W/min after 3 min unloaded pedalling", reasonForStopping: "leg fatigue", peakBorg: 18 },
    seed: 101,
  },
  {
    presetId: "heart-failure",
    label: "Demo (invented): heart failure assessment",
    fileName: "demo-heart-failure.csv",
    patient: { sex: "male", ageY: 62, heightCm: 174, weightKg: 80, betaBlocker: true },
    ergometer: "cycle",
    referral: "heart-failure",
    spirometry: { fev1L: 2.9 },
    conduct: { protocol: "Cycle ramp 10 W/min", reasonForStopping: "breathlessness and fatigue", peakBorg: 17 },
    seed: 102,
  },
  {
    presetId: "ventilatory-limitation",
    label: "Demo (invented): COPD, ventilatory limitation",
    fileName: "demo-ventilatory.csv",
    patient: { sex: "male", ageY: 64, heightCm: 172, weightKg: 70 },
    ergometer: "cycle",
    referral: "general",
    spirometry: { fev1L: 1.4, mvvLMin: 45, fev1PctPred: 45 },
    conduct: { protocol: "Cycle ramp 10 W/min", reasonForStopping: "breathlessness", peakBorg: 19 },
    seed: 103,
  },
  {
    presetId: "pulmonary-vascular",
    label: "Demo (invented): suspected pulmonary vascular disease",
    fileName: "demo-pulmonary-vascular.csv",
    patient: { sex: "female", ageY: 52, heightCm: 165, weightKg: 65 },
    ergometer: "cycle",
    referral: "pulmonary-hypertension",
    spirometry: { fev1L: 2.6 },
    conduct: { protocol: "Cycle ramp 10 W/min", reasonForStopping: "breathlessness, light-headedness", peakBorg: 17 },
    seed: 104,
  },
  {
    presetId: "deconditioning",
    label: "Demo (invented): deconditioning after illness",
    fileName: "demo-deconditioning.csv",
    patient: { sex: "male", ageY: 40, heightCm: 185, weightKg: 85 },
    ergometer: "cycle",
    referral: "training",
    spirometry: { fev1L: 3.8 },
    conduct: { protocol: "Cycle ramp 15 W/min", reasonForStopping: "leg fatigue", peakBorg: 18 },
    seed: 105,
  },
  {
    presetId: "preop-low-at",
    label: "Demo (invented): pre-operative assessment, colorectal surgery",
    fileName: "demo-preop.csv",
    patient: { sex: "male", ageY: 71, heightCm: 172, weightKg: 82 },
    ergometer: "cycle",
    referral: "pre-operative",
    spirometry: { fev1L: 2.7 },
    conduct: { protocol: "Cycle ramp 10 W/min", reasonForStopping: "leg fatigue", peakBorg: 17 },
    context: { ischaemicHeartDisease: false },
    seed: 106,
  },
];

/** The demo case's breath file (plain column convention), generated from its preset. */
export function demoCsv(demo: DemoCase): string {
  const preset = SYNTHETIC_PRESETS.find((p) => p.id === demo.presetId);
  if (!preset) throw new Error(`unknown synthetic preset ${demo.presetId}`);
  return breathTableToCsv(generateSyntheticTest(preset.spec, demo.seed).table);
}
