/**
 * Convert a predicted value between units of the same quantity.
 * Supported: identity; mL/kg/min ↔ mL/min (× or ÷ body weight, kg); L/min ↔ mL/min (× 1000).
 * Returns `null` when the conversion needs a weight that is missing or not positive, or when the
 * pair is not convertible (the caller reports that as an issue).
 */
export function convertPredictedUnit(value: number, fromUnit: string, toUnit: string, weightKg?: number): number | null {
  if (fromUnit === toUnit) return value;
  const hasWeight = weightKg !== undefined && weightKg > 0;
  if (fromUnit === "mL/kg/min" && toUnit === "mL/min") return hasWeight ? value * weightKg : null;
  if (fromUnit === "mL/min" && toUnit === "mL/kg/min") return hasWeight ? value / weightKg : null;
  if (fromUnit === "L/min" && toUnit === "mL/min") return value * 1000;
  if (fromUnit === "mL/min" && toUnit === "L/min") return value / 1000;
  return null;
}
