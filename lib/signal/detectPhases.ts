import { makeIssue, type Issue } from "../core";
import type { BreathRow } from "../breath";
import { linearRegression, median } from "../numeric";
import { phasesFromVo2 } from "./phasesFromVo2";
import type { PhaseSpan } from "./types";

export interface PhaseOptions {
  /** Work rate at or below this counts as zero load (W). @default 1 */
  zeroLoadW?: number;
  /** Loads within this fraction of the peak count as constant. @default 0.03 */
  constantFraction?: number;
  /** Shortest constant low load that counts as a warm-up (s). @default 60 */
  minWarmupS?: number;
  /**
   * The incremental exercise phase as set by a reviewer (times in s on the file's clock, with the reason). It replaces the
   * detected span: phases found before its start keep their names (cut at the start), the span is "exercise", the rest
   * after it "recovery". A span that does not lie inside the record is refused with a warning and detection stands.
   * @default none
   */
  exerciseSpan?: ReviewerExerciseSpan;
}

/** A reviewer's incremental exercise phase. */
export interface ReviewerExerciseSpan {
  startS: number;
  endS: number;
  reason: string;
}

export interface PhaseDetection {
  phases: PhaseSpan[];
  /** Incremental phase span, or null when it cannot be found. */
  exercise: { startS: number; endS: number } | null;
  /** OLS slope of work rate on time over the incremental phase, W/min; null without a work-rate signal. */
  rampRateWPerMin: number | null;
  rampRateR2: number | null;
  issues: Issue[];
}

/**
 * Find the phases of a test.
 * - From phase markers when any row carries one: each run of breaths with the same marker is a span;
 *   the exercise span runs from the first to the last "exercise" breath.
 * - Otherwise from the work rate (or, on a treadmill, the ACSM walking cost of speed and grade, then grade alone):
 *   rest = zero load before the first loaded breath; warm-up = a first constant low load (≤ half the peak) lasting at least 60 s and,
 *   in a step protocol, 1.5 times the usual step (its level is the median of the first five loaded breaths, so a
 *   breath that straddles the load change does not set it); incremental = from the first rise (on a steady ramp,
 *   where the ramp's first minute extrapolates back to the warm-up load) to the last breath at peak load;
 *   recovery = after the peak load drops. Protocol shape as in the ERS statement (≥3 min
 *   rest, ~3 min unloaded, 8–12 min incremental, ≥2–3 min recovery; Radtke et al. 2019, Eur Respir Rev
 *   28:180101, confirmed); the detection rules themselves are common practice.
 * - With no markers and no load signal at all, from the course of VO2 (`phasesFromVo2`), with a warning.
 * - A reviewer's exercise span (`exerciseSpan`) replaces whatever was found.
 * - Ramp rate: OLS slope of work (W) on time (min) over the incremental phase (standard statistics);
 *   for a step protocol this is the mean rate of the steps.
 * Issues say when no phases could be found. O(n).
 */
export function detectPhases(rows: readonly BreathRow[], options: PhaseOptions = {}): PhaseDetection {
  const found = detectPhasesFromData(rows, options);
  return options.exerciseSpan ? withReviewerSpan(rows, found, options.exerciseSpan) : found;
}

/**
 * Put a reviewer's exercise span in place of the detected one (see `PhaseOptions.exerciseSpan`); the ramp rate is the
 * OLS of work on time over it. Refused (warning, detection kept) unless start < end and both lie within the record.
 */
function withReviewerSpan(rows: readonly BreathRow[], found: PhaseDetection, span: ReviewerExerciseSpan): PhaseDetection {
  const first = rows[0]?.timeS ?? NaN;
  const last = rows[rows.length - 1]?.timeS ?? NaN;
  const { startS, endS } = span;
  if (!(Number.isFinite(startS) && Number.isFinite(endS) && startS < endS && startS >= first && endS <= last)) {
    const issue = makeIssue(
      "warning",
      "exercise-span-refused",
      `The exercise phase set by review (${Math.round(startS)}–${Math.round(endS)} s) does not lie inside the record ` +
        `(${Math.round(first)}–${Math.round(last)} s) with its start before its end; the detected phases are used.`,
    );
    return { ...found, issues: [...found.issues, issue] };
  }
  const phases: PhaseSpan[] = [];
  for (const p of found.phases)
    if (p.startS < startS && p.phase !== "exercise" && p.phase !== "recovery")
      phases.push({ ...p, endS: Math.min(p.endS, startS) });
  if (phases.length === 0 && first < startS) phases.push({ phase: "rest", startS: first, endS: startS, source: "reviewer" });
  phases.push({ phase: "exercise", startS, endS, source: "reviewer" });
  if (endS < last) phases.push({ phase: "recovery", startS: endS, endS: last, source: "reviewer" });
  const hasWork = rows.some((r) => r.workW !== undefined && r.timeS >= startS && r.timeS <= endS);
  const { rate, r2 } = hasWork ? rampRate(rows, startS, endS) : { rate: null, r2: null };
  const issue = makeIssue(
    "info",
    "exercise-span-by-review",
    `The incremental exercise phase was set by review to ${Math.round(startS)}–${Math.round(endS)} s (reason: ${span.reason}); ` +
      (found.exercise
        ? `detection had found ${Math.round(found.exercise.startS)}–${Math.round(found.exercise.endS)} s.`
        : "detection had found none."),
  );
  return {
    phases,
    exercise: { startS, endS },
    rampRateWPerMin: rate,
    rampRateR2: r2,
    // the reviewer has answered "check the phases"
    issues: [...found.issues.filter((i) => i.code !== "phases-not-found" && i.code !== "phases-from-vo2"), issue],
  };
}

function detectPhasesFromData(rows: readonly BreathRow[], options: PhaseOptions): PhaseDetection {
  const issues: Issue[] = [];
  const none = (code: string, message: string): PhaseDetection => {
    issues.push(makeIssue("warning", code, message));
    return { phases: [], exercise: null, rampRateWPerMin: null, rampRateR2: null, issues };
  };
  if (rows.length < 2) return none("phases-not-found", "Too few rows to find the phases of the test.");
  if (rows.some((r) => r.phase !== undefined)) return fromMarkers(rows, issues);

  let source: PhaseSpan["source"] = "work-rate";
  let signal: (number | undefined)[] = rows.map((r) => r.workW);
  let zero = options.zeroLoadW ?? 1;
  if (!signal.some((x) => x !== undefined && x > zero)) {
    source = "speed";
    const anySpeed = rows.some((r) => r.speedKmh !== undefined && r.speedKmh > 0.1);
    const anyGrade = rows.some((r) => r.gradePct !== undefined && r.gradePct > 0.1);
    if (anySpeed) {
      // A treadmill load from speed and grade together: the net O2 cost of the ACSM walking equation, 0.1·S + 1.8·S·G
      // (S m/min, G fraction; source `acsm-metabolic-equations`, secondary). A walking warm-up at 0 % grade then sits
      // well below the peak of a grade or speed protocol, and a rise in grade alone starts the incremental phase.
      signal = rows.map((r) => (r.speedKmh === undefined ? undefined : treadmillLoad(r.speedKmh, r.gradePct)));
      zero = treadmillLoad(0.1, 0);
    } else if (anyGrade) {
      signal = rows.map((r) => r.gradePct);
      zero = 0.1;
    } else {
      // last resort: the course of VO2 itself (the warning says how rough it is)
      const fromVo2 = phasesFromVo2(rows, issues);
      return { ...fromVo2, rampRateWPerMin: null, rampRateR2: null, issues };
    }
  }
  // carry the last known value forward over rows without one
  const x = new Float64Array(rows.length);
  let last = 0;
  for (let i = 0; i < rows.length; i++) {
    const v = signal[i];
    if (v !== undefined && Number.isFinite(v)) last = v;
    x[i] = last;
  }
  const t = rows.map((r) => r.timeS);
  let peak = -Infinity;
  for (const v of x) peak = Math.max(peak, v);
  const tol = Math.max(zero, (options.constantFraction ?? 0.03) * peak);
  let firstLoaded = -1;
  for (let i = 0; i < x.length; i++) {
    if (x[i] > zero) {
      firstLoaded = i;
      break;
    }
  }
  if (firstLoaded < 0)
    return none("phases-not-found", "The load never rises above zero; the phases of the test could not be found.");
  let peakLast = firstLoaded;
  for (let i = x.length - 1; i >= firstLoaded; i--) {
    if (x[i] >= peak - tol) {
      peakLast = i;
      break;
    }
  }
  // warm-up: first constant low load. Its level is the median of the first five loaded breaths, not the first one:
  // a breath that straddles the load change carries a time-averaged load between rest and warm-up.
  const level = median(x.subarray(firstLoaded, Math.min(peakLast + 1, firstLoaded + 5)));
  let runEnd = firstLoaded;
  while (runEnd + 1 <= peakLast && Math.abs(x[runEnd + 1] - level) <= tol) runEnd++;
  const firstRunS = (runEnd + 1 < t.length ? t[runEnd + 1] : t[runEnd]) - t[firstLoaded];
  const stepDurations: number[] = [];
  const stepRises: number[] = [];
  let s0 = runEnd + 1;
  for (let i = runEnd + 2; i <= peakLast + 1; i++) {
    if (i > peakLast || Math.abs(x[i] - x[s0]) > tol) {
      if (i <= peakLast) {
        stepDurations.push(t[i] - t[s0]);
        stepRises.push(x[i] - x[s0]);
      }
      s0 = i;
    }
  }
  stepDurations.sort((a, b) => a - b);
  stepRises.sort((a, b) => a - b);
  const typicalStep = stepDurations.length > 0 ? stepDurations[Math.floor(stepDurations.length / 2)] : 0;
  const typicalRise = stepRises.length > 0 ? stepRises[Math.floor(stepRises.length / 2)] : 0;
  // In a step protocol a warm-up is told from the first stage by its length (1.5 stages) or, when it is as short as a
  // stage, by the rise out of it: at least twice the usual step (a walking warm-up before running stages). Both
  // factors are our choice.
  const riseOut = runEnd + 1 <= peakLast ? x[runEnd + 1] - level : 0;
  const warmup =
    runEnd < peakLast &&
    level <= 0.5 * peak &&
    firstRunS >= (options.minWarmupS ?? 60) &&
    (typicalStep < 10 || firstRunS >= 1.5 * typicalStep || (typicalRise > 0 && riseOut >= 2 * typicalRise));
  let incStart = warmup ? runEnd + 1 : firstLoaded;
  if (warmup) {
    // the rise began at the last breath still at the warm-up load (within a small tolerance) …
    const small = Math.max(zero, 0.005 * peak);
    while (incStart - 1 > firstLoaded && x[incStart - 1] > level + small) incStart--;
    // … or, on a steady ramp, where the ramp's first minute extrapolates back to the warm-up load
    incStart = rampOnset(t, x, incStart, firstLoaded, level, tol);
  } else if (firstLoaded > 0) {
    // a ramp straight from rest or unloaded pedalling (0 W): where it extrapolates back to the resting load
    let restLoad = x[0];
    for (let i = 1; i < firstLoaded; i++) restLoad = Math.min(restLoad, x[i]);
    incStart = rampOnset(t, x, incStart, 0, restLoad, tol);
  }
  const phases: PhaseSpan[] = [];
  const restEnd = warmup ? firstLoaded : Math.min(firstLoaded, incStart);
  if (restEnd > 0) phases.push({ phase: "rest", startS: t[0], endS: t[restEnd], source });
  if (warmup) phases.push({ phase: "warmup", startS: t[firstLoaded], endS: t[incStart], source });
  if (incStart >= peakLast) {
    issues.push(
      makeIssue(
        "warning",
        "no-incremental-phase",
        "The load does not rise during the test (constant load?); no incremental phase was found.",
      ),
    );
    phases.push({ phase: "exercise", startS: t[firstLoaded], endS: t[peakLast], source });
    if (peakLast + 1 < t.length) phases.push({ phase: "recovery", startS: t[peakLast + 1], endS: t[t.length - 1], source });
    return { phases, exercise: null, rampRateWPerMin: null, rampRateR2: null, issues };
  }
  phases.push({ phase: "exercise", startS: t[incStart], endS: t[peakLast], source });
  if (peakLast + 1 < t.length) phases.push({ phase: "recovery", startS: t[peakLast + 1], endS: t[t.length - 1], source });
  const { rate, r2 } = source === "work-rate" ? rampRate(rows, t[incStart], t[peakLast]) : { rate: null, r2: null };
  if (source !== "work-rate")
    issues.push(
      makeIssue(
        "info",
        "ramp-rate-not-in-watts",
        "Phases were found from treadmill speed or grade; a ramp rate in W/min cannot be given.",
      ),
    );
  else if (r2 !== null && r2 < 0.8)
    issues.push(
      makeIssue(
        "info",
        "ramp-rate-irregular",
        `Work rate rises irregularly during the incremental phase (R² ${r2.toFixed(2)}); the ramp rate is an average.`,
      ),
    );
  issues.push(
    makeIssue(
      "info",
      "phases-from-load",
      `Phases were found from the ${source === "work-rate" ? "work rate" : "treadmill speed or grade"} (no phase markers in the file).`,
    ),
  );
  return { phases, exercise: { startS: t[incStart], endS: t[peakLast] }, rampRateWPerMin: rate, rampRateR2: r2, issues };
}

/** Net O2 cost of treadmill walking, mL/kg/min: 0.1·S + 1.8·S·G (ACSM walking equation, secondary), S in m/min. */
export function treadmillLoad(speedKmh: number, gradePct: number | undefined): number {
  const s = (speedKmh * 1000) / 60;
  return 0.1 * s + (1.8 * s * Math.max(0, gradePct ?? 0)) / 100;
}

/**
 * Back-extrapolate a steady ramp to its onset: OLS of load on time over the first 60 s of the incremental phase; when
 * that is a clean rise (slope > 0, R² ≥ 0.95: a ramp, not a step), the onset is the first breath at or after the time
 * the line meets the warm-up level, unless the protocol opens with a step. Moves the start earlier only. Straight-line
 * extrapolation is common practice; the 60-s window and R² ≥ 0.95 are our choice (load-only phases then match the markers within 6–10 s on the synthetic
 * models, tests/signal/phasesWithoutMarkers.test.ts).
 */
function rampOnset(
  t: readonly number[],
  x: Float64Array,
  incStart: number,
  lowest: number,
  level: number,
  stepTolerance: number,
): number {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = incStart; i < t.length && t[i] <= t[incStart] + 60; i++) {
    xs.push(t[i]);
    ys.push(x[i]);
  }
  if (xs.length < 5) return incStart;
  const fit = linearRegression(xs, ys);
  if (!(fit.slope > 0) || !(fit.r2 >= 0.95)) return incStart;
  // a protocol that opens with a step (a treadmill jump from walking to running, a first stage above the warm-up)
  // starts at the step: its first breath lies above the warm-up level by more than `stepTolerance` (the constant-load
  // tolerance), straight after a breath at that level; a ramp's loads creep up over the breaths before it, even when
  // rounded to whole watts (0.1 × the tolerance: our choice)
  const small = Math.max(1e-9, 0.1 * stepTolerance);
  if (x[incStart] - level > stepTolerance && incStart > lowest && x[incStart - 1] <= level + small) return incStart;
  const onsetS = (level - fit.intercept) / fit.slope;
  let i = incStart;
  while (i - 1 > lowest && t[i - 1] >= onsetS) i--;
  return i;
}

function rampRate(rows: readonly BreathRow[], startS: number, endS: number): { rate: number | null; r2: number | null } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const r of rows) {
    if (r.timeS < startS || r.timeS > endS || r.workW === undefined) continue;
    xs.push(r.timeS / 60);
    ys.push(r.workW);
  }
  const fit = linearRegression(xs, ys);
  return Number.isFinite(fit.slope) ? { rate: fit.slope, r2: Number.isFinite(fit.r2) ? fit.r2 : null } : { rate: null, r2: null };
}

function fromMarkers(rows: readonly BreathRow[], issues: Issue[]): PhaseDetection {
  const phases: PhaseSpan[] = [];
  for (const r of rows) {
    if (!r.phase) continue;
    const lastSpan = phases[phases.length - 1];
    if (lastSpan && lastSpan.phase === r.phase) lastSpan.endS = r.timeS;
    else phases.push({ phase: r.phase, startS: r.timeS, endS: r.timeS, source: "markers" });
  }
  const ex = phases.filter((p) => p.phase === "exercise");
  if (ex.length === 0) {
    issues.push(
      makeIssue(
        "warning",
        "no-exercise-marker",
        "The phase markers name no exercise phase; the incremental phase could not be found.",
      ),
    );
    return { phases, exercise: null, rampRateWPerMin: null, rampRateR2: null, issues };
  }
  const exercise = { startS: ex[0].startS, endS: ex[ex.length - 1].endS };
  const hasWork = rows.some((r) => r.workW !== undefined && r.timeS >= exercise.startS && r.timeS <= exercise.endS);
  const { rate, r2 } = hasWork ? rampRate(rows, exercise.startS, exercise.endS) : { rate: null, r2: null };
  issues.push(makeIssue("info", "phases-from-markers", "Phases were taken from the phase markers in the file."));
  return { phases, exercise, rampRateWPerMin: rate, rampRateR2: r2, issues };
}
