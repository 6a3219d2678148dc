import type { BreathRow, NumericField } from "../breath";
import type { Provenance } from "../core";
import { areTimeAveragedRows, type ConditionedTest } from "../signal";

/** A time span in seconds from the start of the record (inclusive at both ends). */
export interface TimeSpan {
  startS: number;
  endS: number;
}

/** Times and values of one field, rows lacking it skipped (missing-value policy: skip). */
export interface FieldSeries {
  t: number[];
  v: number[];
}

/**
 * The times and values of `field` in time order, optionally limited to `span`.
 * Breaths lacking the field (or holding a non-finite value) are skipped. The caller owns the arrays returned.
 */
export function fieldSeries(rows: readonly BreathRow[], field: NumericField | "vo2MlKgMin", span?: TimeSpan | null): FieldSeries {
  const c = fieldColumn(rows, field);
  if (!span) return { t: c.t.slice(), v: c.v.slice() };
  const { startS, endS } = span;
  if (c.ascending) {
    // first time not below startS, first time above endS (NaN bounds keep every breath, as the scan below does)
    const a = firstIndexWhere(c.t, (x) => !(x < startS));
    const b = Math.max(
      a,
      firstIndexWhere(c.t, (x) => x > endS),
    );
    return { t: c.t.slice(a, b), v: c.v.slice(a, b) };
  }
  const t: number[] = [];
  const v: number[] = [];
  for (let i = 0; i < c.t.length; i++) {
    if (c.t[i] < startS || c.t[i] > endS) continue;
    t.push(c.t[i]);
    v.push(c.v[i]);
  }
  return { t, v };
}

interface FieldColumn extends FieldSeries {
  rowCount: number;
  ascending: boolean;
}

/**
 * One field's finite values, read from the rows once per rows array: the indices read the same few fields of the same
 * thousands of breaths dozens of times per analysis (values at each threshold, peaks, slopes), and a keyed property
 * read per breath cost more than the arithmetic. Rows are not edited after conditioning; a changed length rebuilds.
 */
const fieldColumns = new WeakMap<readonly BreathRow[], Map<string, FieldColumn>>();

function fieldColumn(rows: readonly BreathRow[], field: NumericField | "vo2MlKgMin"): FieldColumn {
  let byField = fieldColumns.get(rows);
  if (!byField) fieldColumns.set(rows, (byField = new Map()));
  const cached = byField.get(field);
  if (cached && cached.rowCount === rows.length) return cached;
  const t: number[] = [];
  const v: number[] = [];
  let ascending = true;
  for (const r of rows) {
    const x = r[field];
    if (typeof x === "number" && Number.isFinite(x)) {
      if (t.length > 0 && !(r.timeS >= t[t.length - 1])) ascending = false;
      t.push(r.timeS);
      v.push(x);
    }
  }
  const column = { t, v, rowCount: rows.length, ascending };
  byField.set(field, column);
  return column;
}

/** First index whose value meets a predicate that is false then true along the array (its length when never). */
function firstIndexWhere(values: readonly number[], meets: (x: number) => boolean): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (meets(values[mid])) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** Paired values of two fields at the breaths that carry both, optionally limited to `span`. */
export function pairedSeries(
  rows: readonly BreathRow[],
  xField: NumericField,
  yField: NumericField,
  span?: TimeSpan | null,
): { t: number[]; x: number[]; y: number[] } {
  const t: number[] = [];
  const x: number[] = [];
  const y: number[] = [];
  for (const r of rows) {
    if (span && (r.timeS < span.startS || r.timeS > span.endS)) continue;
    const a = r[xField];
    const b = r[yField];
    if (typeof a === "number" && Number.isFinite(a) && typeof b === "number" && Number.isFinite(b)) {
      t.push(r.timeS);
      x.push(a);
      y.push(b);
    }
  }
  return { t, x, y };
}

/**
 * Mean of a field over any time window in O(log n): prefix sums of the values plus binary search on time.
 * Each breath counts once (breath values weighted equally, as in `rollingTimeAverage`).
 */
export class WindowMeans {
  private readonly t: number[];
  private readonly prefix: Float64Array;

  constructor(series: FieldSeries) {
    this.t = series.t;
    this.prefix = new Float64Array(series.v.length + 1);
    for (let i = 0; i < series.v.length; i++) this.prefix[i + 1] = this.prefix[i] + series.v[i];
  }

  /** Index of the first time ≥ s. */
  private lowerBound(s: number): number {
    let lo = 0;
    let hi = this.t.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.t[mid] < s) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  /** Mean and count of the breaths with startS ≤ t ≤ endS; mean NaN when none. */
  mean(startS: number, endS: number): { mean: number; count: number } {
    const a = this.lowerBound(startS);
    let b = this.lowerBound(endS);
    while (b < this.t.length && this.t[b] <= endS) b++;
    const count = Math.max(0, b - a);
    return { mean: count > 0 ? (this.prefix[b] - this.prefix[a]) / count : NaN, count };
  }
}

/** A window found by a rolling search, with its value. */
export interface RollingExtreme {
  value: number;
  startS: number;
  endS: number;
}

/**
 * The longest gap a rolling window may hold between its values (or from its start to its first value), s: 10 s or 1.5 ×
 * the median spacing of the values, whichever is longer (our choice). A window across a span of breaths set aside by
 * review, or a run of removed breaths, is then not an "N-s average" of the few breaths left in it.
 */
export function windowGapLimitS(times: readonly number[]): number {
  if (times.length < 2) return Infinity;
  const d = new Float64Array(times.length - 1);
  for (let i = 1; i < times.length; i++) d[i - 1] = times[i] - times[i - 1];
  d.sort(); // typed arrays sort numerically, without a comparator call per pair
  return Math.max(10, 1.5 * d[d.length >> 1]);
}

/**
 * True when the window from `fromS` to `ends[i]` has no gap longer than `maxGapS` between its values or before its first:
 * a walk back through the window's values, O(values in the window).
 */
function windowCovered(ends: readonly number[], i: number, fromS: number, maxGapS: number): boolean {
  let j = i;
  while (j > 0 && ends[j - 1] > fromS) {
    if (ends[j] - ends[j - 1] > maxGapS) return false;
    j--;
  }
  return ends[j] - fromS <= maxGapS;
}

/**
 * End of the last `windowS`-s window of `ends` that is covered (no gap longer than `windowGapLimitS` inside it or before
 * its first value), or null when there is none: a few values left after a gap do not make a window.
 */
export function lastCoveredWindowEnd(ends: readonly number[], windowS: number, spanStartS: number): number | null {
  const maxGapS = windowGapLimitS(ends);
  for (let i = ends.length - 1; i >= 0; i--) {
    const startS = ends[i] - windowS;
    if (ends[i] - spanStartS < 0.8 * windowS) return null;
    if (windowCovered(ends, i, Math.max(startS, spanStartS), maxGapS)) return ends[i];
  }
  return null;
}

/**
 * Highest (or lowest) value of `evaluate(startS, endS)` over time windows of `windowS` seconds ending at each
 * of `ends` (window = [end − windowS, end]). Windows starting before `spanStartS` by more than 20% of the
 * window are skipped (a window must be at least 80% covered, as in `rollingTimeAverage`), and so are windows with a gap
 * longer than `windowGapLimitS` between their values or before their first. O(n log n).
 */
export function rollingExtreme(
  ends: readonly number[],
  windowS: number,
  spanStartS: number,
  evaluate: (startS: number, endS: number) => number,
  kind: "max" | "min",
): RollingExtreme | null {
  let best: RollingExtreme | null = null;
  const maxGapS = windowGapLimitS(ends);
  // the last long gap at or before each value (index of the value after it), and the first value inside the window,
  // moved forward with the window: the coverage test is O(1) per window
  let gapAt = -1;
  let first = 0;
  for (let i = 0; i < ends.length; i++) {
    if (i > 0 && ends[i] - ends[i - 1] > maxGapS) gapAt = i;
    const end = ends[i];
    if (end - spanStartS < 0.8 * windowS) continue;
    const startS = end - windowS;
    if (windowS > 0) {
      const fromS = Math.max(startS, spanStartS);
      while (ends[first] <= fromS && first < i) first++;
      if (gapAt > first || ends[first] - fromS > maxGapS) continue;
    }
    const value = evaluate(startS, end);
    if (!Number.isFinite(value)) continue;
    if (!best || (kind === "max" ? value > best.value : value < best.value))
      best = { value, startS: Math.max(startS, spanStartS), endS: end };
  }
  return best;
}

/**
 * The resting span: the last `rest` phase ending at or before the exercise start, or null.
 * With `lastS`, only its final `lastS` seconds.
 */
export function restSpan(test: ConditionedTest, lastS?: number): TimeSpan | null {
  const exStart = test.exercise?.startS ?? Infinity;
  let best: TimeSpan | null = null;
  for (const p of test.phases) if (p.phase === "rest" && p.endS <= exStart) best = { startS: p.startS, endS: p.endS };
  if (!best) return null;
  return lastS === undefined ? best : { startS: Math.max(best.startS, best.endS - lastS), endS: best.endS };
}

/** The exercise span, or the whole record when the exercise phase is unknown. */
export function exerciseSpan(test: ConditionedTest): TimeSpan | null {
  if (test.exercise) return test.exercise;
  const rows = test.clean;
  return rows.length > 0 ? { startS: rows[0].timeS, endS: rows[rows.length - 1].timeS } : null;
}

/** Provenance builder so every module writes the same shape. */
export function provenanceOf(
  method: string,
  label: string,
  sourceIds: string[],
  extra: Omit<Provenance, "method" | "label" | "sourceIds"> = {},
): Provenance {
  const p: Provenance = { method, label, sourceIds };
  if (extra.window) p.window = extra.window;
  if (extra.inputs) p.inputs = extra.inputs;
  if (extra.averaging) p.averaging = extra.averaging;
  return p;
}

/**
 * The calibrated bands of the slope indices (and their breath-noise correction) apply: single breaths, not stage values
 * nor rows the cart exported as time averages. The bands and the correction were calibrated on breaths
 * (README-thresholds.md round 18); on 10-s averages of an oscillating test the correction took the oscillation for
 * breath noise and moved OUES by +30 % (round 20).
 */
export function breathLevelBands(test: ConditionedTest): boolean {
  if (test.shape !== "breath") return false;
  const span = exerciseSpan(test);
  const t = test.clean.filter((r) => !span || (r.timeS >= span.startS && r.timeS <= span.endS)).map((r) => r.timeS);
  return !areTimeAveragedRows(t);
}
