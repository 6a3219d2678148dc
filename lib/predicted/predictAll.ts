import { makeIssue, type Ergometer, type Issue, type Patient, type Spirometry } from "../core";
import { bodySize, OBESITY_BMI_KG_M2, type BodySize } from "./bodySize";
import { toQuantity } from "./convertPredictedValue";
import { evaluateEquation, type PredictedValue } from "./evaluateEquation";
import { getEquation } from "./equations";
import { DEFAULT_LAB_SETTINGS, resolveEquationId, type LabSettings } from "./labSettings";
import { LAB_QUANTITIES, type PredictedQuantity } from "./quantities";

/** Every applicable predicted quantity for one patient and test, each naming its equation. */
export interface PredictedSet {
  ergometer: Ergometer;
  /** Equation id used per quantity (after refusing invalid lab choices). */
  equationIds: Partial<Record<PredictedQuantity, string>>;
  /** Predicted values; a quantity with no applicable equation is absent (e.g. work rate on a treadmill). */
  values: Partial<Record<PredictedQuantity, PredictedValue>>;
  body: BodySize;
  /** Set-level issues (refused lab settings, obesity note). Per-value issues stay on each value. */
  issues: Issue[];
}

export interface PredictAllOptions {
  /** Resting spirometry: FEV1 for the MVV estimate. */
  spirometry?: Spirometry;
}

/**
 * Predict every quantity the lab settings name for this ergometer: peak VO2 (mL/min, and per kg
 * of actual weight from the same equation), maximal work rate (cycle), maximal heart rate, maximal
 * O2 pulse, lowest VE/VCO2 and MVV (when FEV1 is given). Equations, sources and statuses are data
 * (`reference-equations/`); defaults and their reasons are in `DEFAULT_LAB_SETTINGS`.
 *
 * When BMI ≥ 30 kg/m² an info issue `obesity-weight-basis` reports the peak-VO2 prediction on
 * predicted (ideal) weight beside the one on actual weight; `assessWeightBasis` tells whether the
 * basis changes the conclusion for a measured value.
 */
export function predictAll(
  patient: Patient,
  ergometer: Ergometer,
  labSettings: LabSettings = DEFAULT_LAB_SETTINGS,
  options: PredictAllOptions = {},
): PredictedSet {
  const issues: Issue[] = [];
  const values: PredictedSet["values"] = {};
  const equationIds: PredictedSet["equationIds"] = {};
  const inputs = { patient, ergometer, spirometry: options.spirometry };

  for (const quantity of LAB_QUANTITIES) {
    const resolved = resolveEquationId(quantity, ergometer, labSettings);
    issues.push(...resolved.issues);
    if (!resolved.equationId) continue;
    if (quantity === "mvvLMin" && options.spirometry?.fev1L === undefined) continue;
    const eq = getEquation(resolved.equationId);
    const pv = evaluateEquation(eq, inputs, { labSettings });
    equationIds[quantity] = eq.id;
    values[quantity] = toQuantity(pv, quantity, patient.weightKg);
    if (quantity === "vo2PeakMlMin") {
      equationIds.vo2PeakMlKgMin = eq.id;
      values.vo2PeakMlKgMin = toQuantity(pv, "vo2PeakMlKgMin", patient.weightKg);
    }
  }

  const body = bodySize(patient);
  const vo2 = values.vo2PeakMlMin;
  if (body.bmiKgM2 !== null && body.bmiKgM2 >= OBESITY_BMI_KG_M2 && vo2?.value != null && body.predictedWeightKg !== null) {
    const ideal = toQuantity(
      evaluateEquation(vo2.equationId, { ...inputs, patient: { ...patient, weightKg: body.predictedWeightKg } }, { labSettings }),
      "vo2PeakMlMin",
      body.predictedWeightKg,
    );
    if (ideal.value !== null) {
      issues.push(
        makeIssue(
          "info",
          "obesity-weight-basis",
          `BMI ${body.bmiKgM2.toFixed(1)} kg/m²: predicted peak VO2 ${Math.round(vo2.value)} mL/min on actual weight, ${Math.round(ideal.value)} mL/min on predicted weight ${body.predictedWeightKg.toFixed(1)} kg (${vo2.equationLabel}). Per-kg values read lower on actual weight; compare on predicted weight too.`,
          { field: "weightKg" },
        ),
      );
    }
  }
  return { ergometer, equationIds, values, body, issues };
}
