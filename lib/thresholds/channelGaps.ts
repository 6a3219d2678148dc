import type { NumericField } from "../breath";
import { makeIssue, type Issue } from "../core";
import type { ConditionedTest } from "../signal";
import { exerciseSpan } from "./indexSeries";

/**
 * A stretch of exercise this long or longer with no value in one channel (HR, say) while rows keep coming is
 * reported and the readings that span it are withheld. 30 s is our choice: the peak window and the O2 pulse bins
 * are 30 s long (peak averaging: common practice), so a 30-s hole can empty a whole window; shorter holes (a few
 * beats or breaths lost) are bridged by the window means.
 */
export const CHANNEL_GAP_MIN_S = 30;

/** A stretch of exercise where one channel is missing while other rows continue. */
export interface ChannelGap {
  field: NumericField;
  /** Time of the last row carrying the field before the gap, or the exercise start. s */
  startS: number;
  /** Time of the first row carrying the field after the gap, or the exercise end. s */
  endS: number;
  /** Rows inside the gap that lack the field (the other channels were still recorded). */
  rowsWithout: number;
  /** The gap reaches the end of exercise: the last exercise value of the field is unknown. */
  reachesExerciseEnd: boolean;
}

/**
 * Stretches of the exercise phase (or the whole record when it is unknown) at least `minGapS` long in which
 * `field` is missing while rows lacking it keep coming (gas exchange still recorded). Gaps are measured between
 * the rows that carry the field and clipped to the exercise span. A channel absent from the whole exercise phase
 * gives no gap: that is a missing signal, reported by the modules that need it. O(n).
 *
 * @example HR on every breath but none between the breaths at 1050 and 1320 s of a 356–1436 s exercise phase
 *   → one gap { startS: 1050, endS: 1320, reachesExerciseEnd: false }
 */
export function channelGaps(test: ConditionedTest, field: NumericField, minGapS = CHANNEL_GAP_MIN_S): ChannelGap[] {
  const span = exerciseSpan(test);
  if (!span) return [];
  const has = (v: unknown) => typeof v === "number" && Number.isFinite(v);
  if (!test.clean.some((r) => r.timeS >= span.startS && r.timeS <= span.endS && has(r[field]))) return [];
  const gaps: ChannelGap[] = [];
  let lastWithS = -Infinity;
  let without = 0;
  const close = (nextWithS: number) => {
    const startS = Math.max(lastWithS, span.startS);
    const endS = Math.min(nextWithS, span.endS);
    if (without > 0 && endS - startS >= minGapS)
      gaps.push({ field, startS, endS, rowsWithout: without, reachesExerciseEnd: nextWithS > span.endS });
  };
  for (const r of test.clean) {
    if (has(r[field])) {
      if (r.timeS > span.startS && lastWithS < span.endS) close(r.timeS);
      lastWithS = r.timeS;
      without = 0;
    } else if (r.timeS >= span.startS && r.timeS <= span.endS) without++;
  }
  if (lastWithS < span.endS) close(Infinity);
  return gaps;
}

const FIELD_LABEL: Partial<Record<NumericField, string>> = { hrBpm: "HR", spo2Pct: "SpO2", workW: "work rate" };

/** The words for one gap, e.g. "HR missing from 1050 to 1320 s of exercise (270 s)". */
export function describeChannelGap(g: ChannelGap): string {
  const what = FIELD_LABEL[g.field] ?? g.field;
  const lengthS = Math.round(g.endS - g.startS);
  return g.reachesExerciseEnd
    ? `${what} missing from ${Math.round(g.startS)} s to the end of exercise (${Math.round(g.endS)} s; ${lengthS} s)`
    : `${what} missing from ${Math.round(g.startS)} to ${Math.round(g.endS)} s of exercise (${lengthS} s)`;
}

/**
 * One warning per HR gap in exercise (code `hr-missing-in-exercise`): where HR is missing, what is withheld, and
 * what a gap at the end of exercise does to peak HR.
 */
export function hrGapIssues(test: ConditionedTest, gaps: readonly ChannelGap[] = channelGaps(test, "hrBpm")): Issue[] {
  const rowWord = test.shape === "breath" ? "breaths" : "rows";
  return gaps.map((g) =>
    makeIssue(
      "warning",
      "hr-missing-in-exercise",
      `${describeChannelGap(g)}: ${g.rowsWithout} ${rowWord} carry gas exchange but no HR. The O2 pulse trajectory is not assessed across it` +
        (g.reachesExerciseEnd
          ? "; HR at the end of exercise is unknown, so peak HR (and HR reserve, % predicted HR and the chronotropic index built on it) and HR recovery are not determined."
          : ", and O2 pulse is not read where HR is missing.") +
        " Check the HR recording (chest strap, ECG lead).",
      { field: "hrBpm", timeS: Math.round(g.startS) },
    ),
  );
}
