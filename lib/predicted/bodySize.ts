import type { Patient } from "../core";

/**
 * Body-size helpers used by the weight rules and the obesity note.
 *
 * - BMI = weight (kg) / height (m)² — definition (common practice).
 * - Predicted ("ideal") weight, Wasserman/Hansen: men 0.79·H − 60.7, women 0.65·H − 42.8 (kg, H in cm)
 *   — Hansen, Sue & Wasserman 1984 as reproduced in JAHA 2020;9:e015117 Table 1 (secondary; source
 *   id `hansen-1984`).
 *
 * Degenerate cases: a missing or non-positive height/weight, or a missing sex (for predicted
 * weight), gives `null`.
 */
export interface BodySize {
  /** kg/m², or null when height or weight is missing. */
  bmiKgM2: number | null;
  /** Predicted (ideal) weight, kg, or null when sex or height is missing. */
  predictedWeightKg: number | null;
}

/** Obesity threshold, kg/m² (WHO 2000 definition, source `who-bmi`: recalled citation of a common-practice value). */
export const OBESITY_BMI_KG_M2 = 30;

export function bodySize(patient: Patient): BodySize {
  const h = patient.heightCm;
  const w = patient.weightKg;
  const bmiKgM2 = h !== undefined && w !== undefined && h > 0 && w > 0 ? w / (h / 100) ** 2 : null;
  let predictedWeightKg: number | null = null;
  if (h !== undefined && h > 0 && patient.sex) {
    predictedWeightKg = patient.sex === "male" ? 0.79 * h - 60.7 : 0.65 * h - 42.8;
  }
  return { bmiKgM2, predictedWeightKg };
}
