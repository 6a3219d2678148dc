import { median } from "../numeric";

/**
 * Rows whose median spacing in exercise is at least this many seconds are time averages exported by the cart, not
 * single breaths. Exercise breathing is faster than 10 breaths/min (common practice), so single breaths come less than
 * 6 s apart; 6 s is our choice. Breath-level screens that count rows (a 9-breath running median spans 20-30 s of
 * exercise) would span 90 s and more on 10-s averages.
 */
export const AVERAGED_ROW_INTERVAL_S = 6;

/** Median spacing of consecutive times, s (NaN with fewer than two times). */
export function medianRowIntervalS(timeS: readonly number[]): number {
  if (timeS.length < 2) return NaN;
  const d: number[] = [];
  for (let i = 1; i < timeS.length; i++) d.push(timeS[i] - timeS[i - 1]);
  return median(d);
}

/** True when rows this far apart are time averages rather than single breaths (see `AVERAGED_ROW_INTERVAL_S`). */
export function areTimeAveragedRows(timeS: readonly number[], thresholdS = AVERAGED_ROW_INTERVAL_S): boolean {
  return medianRowIntervalS(timeS) >= thresholdS;
}
