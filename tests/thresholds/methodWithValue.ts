import type { MethodEstimate, MethodQuality } from "../../lib/thresholds/thresholdTypes";

/**
 * A method estimate for consensus tests: a real estimate's shape (window, fit, sources) with the id, verdict and VO2
 * value replaced (the values the tests pass are invented).
 */
export function methodWithValue(base: MethodEstimate, id: string, vo2MlMin: number, quality: MethodQuality): MethodEstimate {
  return { ...base, id, quality, vo2MlMin: { ...base.vo2MlMin, value: vo2MlMin } };
}
