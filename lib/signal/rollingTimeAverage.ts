import type { BreathRow, NumericField } from "../breath";

export interface WindowAverage {
  /** Mean of the field over the window (breath values, each weighted equally). */
  mean: number;
  startS: number;
  endS: number;
  count: number;
}

/**
 * Rolling time-window averages of one field, one window ending at each breath.
 * Uses prefix sums so the whole pass is O(n).
 * Breaths lacking the field are skipped. Windows shorter than `minFraction` of `windowS` are skipped.
 *
 * @param rows breaths in time order
 * @param field canonical field to average
 * @param windowS window length in seconds @default 30
 */
export function rollingTimeAverage(
  rows: readonly BreathRow[],
  field: NumericField,
  windowS = 30,
  minFraction = 0.8,
): WindowAverage[] {
  const t: number[] = [];
  const v: number[] = [];
  for (const r of rows) {
    const x = r[field];
    if (typeof x === "number" && Number.isFinite(x)) {
      t.push(r.timeS);
      v.push(x);
    }
  }
  const prefix = new Float64Array(v.length + 1);
  for (let i = 0; i < v.length; i++) prefix[i + 1] = prefix[i] + v[i];
  const out: WindowAverage[] = [];
  let start = 0;
  for (let end = 0; end < v.length; end++) {
    while (t[end] - t[start] > windowS) start++;
    // the window spans from the breath before `start` (or `start` itself) to `end`
    const spanS = t[end] - (start > 0 ? t[start - 1] : t[start]);
    if (spanS < windowS * minFraction) continue;
    const count = end - start + 1;
    out.push({ mean: (prefix[end + 1] - prefix[start]) / count, startS: t[start], endS: t[end], count });
  }
  return out;
}
