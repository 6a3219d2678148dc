import type { PredictedValue } from "./evaluateEquation";
import { percentPredicted } from "./percentPredicted";
import { PREDICTED_QUANTITIES } from "./quantities";

export interface PredictedComparison {
  /** 100 · measured / predicted, or null when not computable. */
  percentPredicted: number | null;
  /** (measured − predicted) / SEE where the equation has an SEE. */
  zScore?: number;
  /** True when measured is beyond the published limit (below LLN, or above ULN for high-abnormal quantities). */
  beyondLimit?: boolean;
  equationId: string;
}

/**
 * Compare a measured value (in the prediction's unit) with a prediction: % predicted, z-score
 * (from the equation's SEE) and whether it is beyond the limit of normal. Fields the equation
 * cannot give are left out; no cut-off of its own is applied here (that is interpretation).
 */
export function compareWithPredicted(measured: number | null | undefined, predicted: PredictedValue): PredictedComparison {
  const out: PredictedComparison = {
    percentPredicted: percentPredicted(measured, predicted.value),
    equationId: predicted.equationId,
  };
  if (measured === null || measured === undefined || !Number.isFinite(measured) || predicted.value === null) return out;
  const high = PREDICTED_QUANTITIES[predicted.quantity].abnormalWhen === "high";
  if (predicted.see !== undefined && predicted.see > 0) out.zScore = (measured - predicted.value) / predicted.see;
  if (high && predicted.uln !== undefined) out.beyondLimit = measured > predicted.uln;
  if (!high && predicted.lln !== undefined) out.beyondLimit = measured < predicted.lln;
  return out;
}
