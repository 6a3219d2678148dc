import { makeIssue } from "../core";
import { convertPredictedUnit } from "./convertPredictedUnit";
import type { PredictedValue } from "./evaluateEquation";
import { PREDICTED_QUANTITIES, sameConcept, type PredictedQuantity } from "./quantities";

/**
 * Express a prediction as another quantity of the same concept (peak VO2 in mL/kg/min ↔ mL/min,
 * by actual body weight). Value, limits and SEE are converted together; the z-score is unchanged.
 * The conversion is written into `steps`. When it needs a weight that is missing, the value becomes
 * `null` with a `missing-input` error. Converting to an unrelated quantity is a programming mistake.
 * @example toQuantity(friend2017Result, "vo2PeakMlMin", 80) // 38.00106 mL/kg/min × 80 kg = 3040.08 mL/min
 */
export function toQuantity(pv: PredictedValue, quantity: PredictedQuantity, weightKg: number | undefined): PredictedValue {
  if (pv.quantity === quantity) return pv;
  if (!sameConcept(pv.quantity, quantity)) throw new Error(`cannot express ${pv.quantity} as ${quantity}`);
  const unit = PREDICTED_QUANTITIES[quantity].unit;
  const conv = (v: number | undefined) =>
    v === undefined ? undefined : (convertPredictedUnit(v, pv.unit, unit, weightKg) ?? undefined);
  const base = { ...pv, quantity, unit, lln: conv(pv.lln), uln: conv(pv.uln), see: conv(pv.see) };
  for (const k of ["lln", "uln", "see"] as const) if (base[k] === undefined) delete base[k];
  if (pv.value === null) return base;
  const value = convertPredictedUnit(pv.value, pv.unit, unit, weightKg);
  if (value === null) {
    const reason = `${pv.equationLabel} gives ${pv.unit}; ${unit} needs body weight.`;
    return {
      ...base,
      value: null,
      reason,
      issues: [...pv.issues, makeIssue("error", "missing-input", reason, { field: "weightKg" })],
    };
  }
  return {
    ...base,
    value,
    steps: [...pv.steps, { label: `${pv.unit} → ${unit} with actual body weight ${weightKg} kg`, value, unit }],
  };
}
