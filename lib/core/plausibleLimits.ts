/**
 * Generous plausibility limits for values a user types about a patient (common practice: wide enough for any
 * adult or older child tested clinically, narrow enough to catch a unit slip such as height in metres or FEV1 in
 * mL). One table for the upload form and the command line, so both refuse the same values.
 */
export const PLAUSIBLE_LIMITS = {
  ageY: { min: 5, max: 110, label: "Age (years)" },
  heightCm: { min: 100, max: 230, label: "Height (cm)" },
  weightKg: { min: 20, max: 300, label: "Weight (kg)" },
  fev1L: { min: 0.2, max: 8, label: "FEV1 (L)" },
  fvcL: { min: 0.3, max: 10, label: "FVC (L)" },
  mvvLMin: { min: 10, max: 300, label: "Measured MVV (L/min)" },
  dlcoPctPred: { min: 5, max: 200, label: "DLCO (% predicted)" },
  fev1PctPred: { min: 5, max: 200, label: "FEV1 (% predicted)" },
} as const;

export type PlausibleField = keyof typeof PLAUSIBLE_LIMITS;

/** Null when `value` lies within the field's limits, else a plain message naming the field and its range. */
export function plausibilityProblem(field: PlausibleField, value: number): string | null {
  const { min, max, label } = PLAUSIBLE_LIMITS[field];
  if (!Number.isFinite(value)) return `${label} must be a number`;
  if (value < min || value > max) return `${label} must lie between ${min} and ${max}, got ${value}`;
  return null;
}

/** The stage lengths a user may give for a stage table without a time column, s (our choice: 10 s to 1 h). */
export const STAGE_DURATION_LIMITS_S = { min: 10, max: 3600 } as const;

/** Spacing assumed for the stages of a table without a time column when none is given, s (our choice). */
export const DEFAULT_STAGE_DURATION_S = 60;
