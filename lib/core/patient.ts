/** Patient details that predicted values and interpretation need. All optional: missing ones raise issues downstream. */
export type Sex = "male" | "female";
export type Ergometer = "cycle" | "treadmill";

export interface Patient {
  sex?: Sex;
  ageY?: number;
  heightCm?: number;
  weightKg?: number;
  /** Haemoglobin, g/dL (optional). */
  haemoglobinGDl?: number;
  /** Beta-blocker or other rate-limiting drug: changes chronotropic cut-offs. */
  betaBlocker?: boolean;
  /**
   * Atrial fibrillation (or another irregular rhythm) during the test: heart rate is not read against predicted values,
   * and heart-rate criteria, heart-rate indices and O2 pulse are not interpreted.
   */
  atrialFibrillation?: boolean;
}

/** Resting spirometry, canonical units (litres, L/min). */
export interface Spirometry {
  fev1L?: number;
  fvcL?: number;
  /** Measured maximal voluntary ventilation, L/min. */
  mvvLMin?: number;
  /** Diffusing capacity, % predicted (used by the lung-resection flow). */
  dlcoPctPred?: number;
  fev1PctPred?: number;
}
