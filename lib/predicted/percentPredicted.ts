/**
 * Measured as a percentage of predicted: 100 · measured / predicted (definition; common practice).
 * Degenerate cases: a missing, non-finite or non-positive predicted value, or a missing or
 * non-finite measured value, gives `null`.
 * @example percentPredicted(2000, 2500) // 80
 */
export function percentPredicted(measured: number | null | undefined, predicted: number | null | undefined): number | null {
  if (measured === null || measured === undefined || !Number.isFinite(measured)) return null;
  if (predicted === null || predicted === undefined || !Number.isFinite(predicted) || predicted <= 0) return null;
  return (100 * measured) / predicted;
}
