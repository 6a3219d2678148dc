/**
 * The quantities a reference equation may predict, each with its one unit (names carry units).
 * `abnormalWhen` says which side of the prediction is the abnormal one, so a lower limit (LLN) or
 * an upper limit reads the right way round.
 */
export const PREDICTED_QUANTITIES = {
  vo2PeakMlMin: { unit: "mL/min", label: "peak VO2", abnormalWhen: "low" },
  vo2PeakMlKgMin: { unit: "mL/kg/min", label: "peak VO2 per kg", abnormalWhen: "low" },
  workMaxW: { unit: "W", label: "maximal work rate", abnormalWhen: "low" },
  hrMaxBpm: { unit: "1/min", label: "maximal heart rate", abnormalWhen: "low" },
  o2PulseMaxMlBeat: { unit: "mL/beat", label: "maximal O2 pulse", abnormalWhen: "low" },
  veVco2NadirRatio: { unit: "1", label: "lowest VE/VCO2", abnormalWhen: "high" },
  mvvLMin: { unit: "L/min", label: "maximal voluntary ventilation", abnormalWhen: "low" },
} as const;

export type PredictedQuantity = keyof typeof PREDICTED_QUANTITIES;

export const PREDICTED_QUANTITY_IDS = Object.keys(PREDICTED_QUANTITIES) as PredictedQuantity[];

/**
 * Quantities a lab chooses an equation for. Peak VO2 per kg is not chosen separately: it is the
 * chosen peak VO2 divided by body weight, so the two can never disagree.
 */
export const LAB_QUANTITIES = [
  "vo2PeakMlMin",
  "workMaxW",
  "hrMaxBpm",
  "o2PulseMaxMlBeat",
  "veVco2NadirRatio",
  "mvvLMin",
] as const satisfies readonly PredictedQuantity[];

export type LabQuantity = (typeof LAB_QUANTITIES)[number];

/**
 * Quantities that answer the same question in another unit. An equation giving peak VO2 in
 * mL/kg/min may be chosen for peak VO2 in mL/min (multiplied by the patient's weight).
 */
export function sameConcept(a: PredictedQuantity, b: PredictedQuantity): boolean {
  const vo2 = (q: PredictedQuantity) => q === "vo2PeakMlMin" || q === "vo2PeakMlKgMin";
  return a === b || (vo2(a) && vo2(b));
}
