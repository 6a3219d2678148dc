import type { LactateSample } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { firstUpwardCrossing, interpolateLinear } from "../numeric/interpolate";
import { PrefixSums } from "../numeric/linearRegression";
import { evaluatePolynomialFit, polynomialFit, type PolynomialFit } from "../numeric/polynomialFit";
import type { ConditionedTest } from "../signal";
import { formatClock } from "../units";
import { fieldSeries, provenanceOf } from "./indexSeries";

/** Intensity axis of a lactate curve. */
export type LactateAxis = "workW" | "speedKmh";

export interface LactatePoint {
  /** Work rate (W) or speed (km/h), per the axis; NaN for a sample drawn in recovery (it has no place on the curve). */
  x: number;
  lactateMmolL: number;
  /**
   * Set on a sample drawn in recovery: seconds after the end of exercise. Such a sample counts towards peak lactate
   * only and never enters the lactate–intensity curve (nor is it averaged with a resting sample at 0 W).
   */
  recoveryS?: number;
  /**
   * A resting sample (drawn before exercise began, or placed at 0 W / 0 km/h): kept with the points and shown, never on
   * the exercise curve the methods read (Cheng et al. 1992 fit the exercise stages; see `lactateThresholds`).
   */
  rest?: boolean;
  /**
   * When the sample was drawn (s), or its stage number: the order the loads were given in, for the check that loads rise
   * in time order (`lactate-load-falls`). Absent when not known.
   */
  timeS?: number;
  /** Heart rate (bpm) and VO2 (mL/min) recorded with the sample's stage or at its time, for the same check. */
  hrBpm?: number;
  vo2MlMin?: number;
}

export type LactateMethodId = "obla-4" | "baseline-plus-1" | "log-log" | "dmax" | "modified-dmax";

export interface LactateThreshold {
  id: LactateMethodId;
  /** Intensity at the threshold (W or km/h). */
  intensity: Measured;
  /** Lactate at that intensity, read from the measured points by linear interpolation. */
  lactateMmolL: Measured;
  /**
   * Heart rate and VO2 at the threshold, read at the time the test reached its intensity as VT1/VT2 values are read
   * (`valuesAtLactateThresholds`, filled in by `measureIndices`); absent when the curve was given without a test.
   */
  hrBpm?: Measured;
  vo2MlMin?: Measured;
  /**
   * Set when the method reads across a suspect sample (`lactate-curve-falls`, `lactate-spike`, `lactate-load-falls`):
   * the value is given, with this sentence naming the sample.
   */
  caution?: string;
}

/**
 * The threshold each lactate method estimates, and so the ventilatory threshold it is compared with. Baseline + 1 mmol/L
 * is the first lactate threshold (LT1; Bishop, Jenkins & Mackinnon, Med Sci Sports Exerc 1998 — confirmed, registry
 * `bishop-1998`) and the log-log break is the lactate threshold of Beaver, Wasserman & Whipp 1985 (secondary): both
 * against VT1. OBLA 4 mmol/L, modified Dmax and Dmax are second-threshold (MLSS-type) markers (Faude, Kindermann &
 * Meyer, Sports Med 2009;39:469–490 — secondary, registry `faude-2009-lactate-concepts`; modified Dmax ≈ MLSS: Jamnick et al., PLoS One 2018 — secondary): against
 * VT2. Dmax is not consistently either; we pair it with VT2 (our choice).
 */
export const LACTATE_METHOD_ESTIMATES: Record<LactateMethodId, "VT1" | "VT2"> = {
  "baseline-plus-1": "VT1",
  "log-log": "VT1",
  "obla-4": "VT2",
  "modified-dmax": "VT2",
  dmax: "VT2",
};

/**
 * How a lactate threshold reads against the VT it estimates:
 * - `concordant`: within the tolerance of its own VT;
 * - `not-separable`: within the tolerance, but the tolerance is set by coarse sampling (samples more than 20 W /
 *   1 km/h apart, our choice): the two cannot be told apart at this sampling, which is not a finding of agreement;
 * - `apart`: farther than the tolerance from its own VT, and not nearer the other;
 * - `nearer-other-vt`: farther than the tolerance from its own VT and nearer the other VT: a discordance, check both;
 * - `obla-below-vt1`: OBLA below VT1, physiologically implausible (4 mmol/L lies above the first threshold);
 * - `own-vt-not-determinable`: its own VT is not determinable, so it is not compared (never with the other VT instead).
 */
export type ThresholdReading =
  "concordant" | "not-separable" | "apart" | "nearer-other-vt" | "obla-below-vt1" | "own-vt-not-determinable";

/** Where a lactate threshold sits against the ventilatory threshold it estimates (`LACTATE_METHOD_ESTIMATES`). */
export interface ThresholdRelation {
  id: LactateMethodId;
  /** The VT the method estimates and is compared with (never the other one). */
  comparedWith: "VT1" | "VT2";
  /** Lactate threshold minus that VT, axis units; null when that VT is not determinable. */
  difference: number | null;
  /** Difference as % of the VT; null when that VT is not determinable. */
  differencePercent: number | null;
  /** True only for the reading `concordant`. */
  concordant: boolean;
  reading: ThresholdReading;
  /** Where it lies, in words: "2 W (1.1%) below VT2 (194 W)" or "at VT1 (115 W)". */
  where: string;
  /** The verdict in words, with the tolerance and, when the samples set it, their spacing. */
  verdict: string;
  /** The verdict with the tolerance only ("concordant within 12.5 W"), where `concordance.note` is said once beside it. */
  verdictShort: string;
  /** One sentence: name, value, where, verdict. */
  statement: string;
  /** Sources of the pairing and the reading. */
  sourceIds: string[];
}

export interface LactateThresholdsOptions {
  /** OBLA level, mmol/L (Sjödin & Jacobs 1981). @default 4 */
  oblaMmolL?: number;
  /** Rise above baseline, mmol/L (Bishop 1998 LT1). @default 1 */
  baselineRiseMmolL?: number;
  /** Baseline: lowest value of the curve, or the first point (implementation choice). @default "minimum" */
  baseline?: "minimum" | "first";
  /** Modified Dmax chord start: point before the first rise greater than this, mmol/L (recalled). @default 0.4 */
  modifiedDmaxRiseMmolL?: number;
  /** Fewest points on each side of the log-log split. @default 2 */
  logLogMinPerSegment?: number;
  /** VT1 and VT2 on the same axis (W or km/h), for the concordance statement. */
  vt1?: number | null;
  vt2?: number | null;
  /**
   * |difference| within which a lactate threshold and a VT are called concordant. @default the larger of 10 W
   * (0.5 km/h) and half the median spacing of the samples on the axis (both our choice, no published value): a
   * threshold between two samples is interpolated, so it cannot be read closer than about half their spacing.
   */
  concordanceTolerance?: number;
}

/** How the concordance tolerance was set. */
export interface ConcordanceTolerance {
  /** Axis units (W or km/h). */
  value: number;
  /** "fixed": the 10 W / 0.5 km/h floor; "sample-spacing": half the median sample spacing; "option": given by the caller. */
  basis: "fixed" | "sample-spacing" | "option";
  /** Median spacing of neighbouring curve points on the axis (whole W, 0.1 km/h), or null with fewer than two points. */
  sampleSpacing: number | null;
  /** One sentence saying how concordance is read (for the methods of a report). */
  note: string;
}

export interface LactateThresholdsResult {
  axis: LactateAxis;
  unit: string;
  /**
   * Points of the lactate–intensity curve, sorted by intensity, duplicates averaged (recovery samples left out). Resting
   * samples (`rest`) are kept here, marked, but no method reads them.
   */
  points: LactatePoint[];
  /** Samples drawn in recovery: peak lactate only, never on the curve. */
  recoveryPoints: LactatePoint[];
  /** Highest lactate of all samples, recovery included, mmol/L; null without samples. */
  peakMmolL: number | null;
  thresholds: LactateThreshold[];
  relations: ThresholdRelation[];
  /** The tolerance the relations were read with. */
  concordance: ConcordanceTolerance;
  issues: Issue[];
}

/**
 * The name of each lactate threshold method, as every view writes it (page table, relations, report table, draft
 * text, chart legend, CLI). Each method label below starts with it.
 */
export const LACTATE_METHOD_NAMES: Record<LactateMethodId, string> = {
  "obla-4": "OBLA (4 mmol/L)",
  "baseline-plus-1": "Baseline + 1 mmol/L",
  "log-log": "Log-log threshold",
  dmax: "Dmax",
  "modified-dmax": "Modified Dmax",
};
const SHORT = LACTATE_METHOD_NAMES;
const LABELS: Record<LactateMethodId, string> = {
  "obla-4": `${SHORT["obla-4"]}: intensity at 4 mmol/L (linear interpolation)`,
  "baseline-plus-1": `${SHORT["baseline-plus-1"]}: 1.0 mmol/L above the baseline (linear interpolation)`,
  "log-log": `${SHORT["log-log"]}: two-segment fit of log lactate on log intensity, intersection`,
  dmax: `${SHORT.dmax}: cubic fit, maximum distance from the chord joining its ends`,
  "modified-dmax": `${SHORT["modified-dmax"]}: chord from the point before the first rise > 0.4 mmol/L`,
};

/**
 * A sample drawn up to this long after the end of exercise is read at the end of exercise (the load has just
 * dropped; a draw as the test stops), s. Our choice: about two breaths or one 10-s display bin.
 */
export const LACTATE_END_OF_EXERCISE_GRACE_S = 10;

/**
 * A lactate curve whose lowest value reaches this level (mmol/L) has no low-intensity part: resting blood lactate is
 * about 0.5–2 mmol/L (common practice, recalled textbook range), and 4 mmol/L is the OBLA level itself (Sjödin &
 * Jacobs 1981, confirmed). Thresholds read from a baseline are then not given (our choice).
 */
export const LACTATE_LOWEST_IMPLAUSIBLE_MMOL_L = 4;

/** Concordance floor, axis units (our choice, no published value). */
const FIXED_TOLERANCE: Record<LactateAxis, number> = { workW: 10, speedKmh: 0.5 };
const SOURCES: Record<LactateMethodId, string[]> = {
  "obla-4": ["sjodin-jacobs-1981"],
  "baseline-plus-1": ["bishop-1998", "implementation-choice"],
  "log-log": ["beaver-1985-loglog"],
  dmax: ["cheng-1992-dmax"],
  "modified-dmax": ["bishop-1998", "bishop-1998-mod-dmax-rule", "cheng-1992-dmax"],
};

/**
 * Gather lactate points from samples (intensity from the sample; else read from the test at the sample time;
 * else the work rate / speed of the sample's stage) or, without samples, from the rows that carry lactate.
 *
 * A sample drawn after the end of exercise (later than `LACTATE_END_OF_EXERCISE_GRACE_S`) is a recovery sample
 * (e.g. the routine peak-lactate draw 3 min after exercise): it is kept with `recoveryS` set and x = NaN, counts
 * towards peak lactate only, and never enters the curve (the work rate at its time — 0 W — did not produce it, and
 * lactate keeps changing for minutes after exercise stops; common practice). When every timed sample falls before
 * exercise starts, none is placed and a warning asks whether the times were minutes.
 */
export function lactatePointsFromTest(
  test: ConditionedTest,
  samples?: readonly LactateSample[],
): { axis: LactateAxis; points: LactatePoint[]; issues: Issue[] } {
  const issues: Issue[] = [];
  const work = fieldSeries(test.clean, "workW");
  const speed = fieldSeries(test.clean, "speedKmh");
  const ex = test.exercise;
  const raw: {
    w: number;
    s: number;
    l: number;
    t?: number;
    recoveryS?: number;
    rest?: boolean;
    hr?: number;
    vo2?: number;
  }[] = [];
  const hrS = fieldSeries(test.clean, "hrBpm");
  const vo2S = fieldSeries(test.clean, "vo2MlMin");
  /** HR and VO2 at a time (linear interpolation in the rows; for the load-order check only). */
  const physAt = (t: number) => ({ hr: interpolateLinear(hrS.t, hrS.v, t), vo2: interpolateLinear(vo2S.t, vo2S.v, t) });
  /** Drawn before exercise began: a resting sample. */
  const beforeExercise = (t: number | undefined) => ex !== null && ex !== undefined && t !== undefined && t < ex.startS;
  let atEnd = 0;
  /** Where a sample drawn at time t is read: at t, at the end of exercise (just after it), or nowhere (recovery). */
  const readTime = (t: number): { at: number; recoveryS?: number } => {
    if (!ex || t <= ex.endS) return { at: t };
    if (t - ex.endS <= LACTATE_END_OF_EXERCISE_GRACE_S) {
      atEnd++;
      return { at: ex.endS };
    }
    return { at: t, recoveryS: t - ex.endS };
  };
  if (samples && samples.length > 0) {
    const timedOnly = samples.filter(
      (x) => x.timeS !== undefined && x.workW === undefined && x.speedKmh === undefined && x.stage === undefined,
    );
    if (ex && timedOnly.length >= 2 && timedOnly.length === samples.length && timedOnly.every((x) => x.timeS! < ex.startS)) {
      issues.push(
        allBeforeExerciseIssue(
          test,
          timedOnly.map((x) => x.timeS!),
        ),
      );
      return { axis: work.v.some((v) => v > 0) ? "workW" : "speedKmh", points: [], issues };
    }
    // stage number → the work rate / speed of that stage's last row
    const byStage = new Map<number, { w: number; s: number; t: number; hr?: number; vo2?: number }>();
    for (const r of test.clean)
      if (typeof r.stage === "number")
        byStage.set(r.stage, { w: r.workW ?? NaN, s: r.speedKmh ?? NaN, t: r.timeS, hr: r.hrBpm, vo2: r.vo2MlMin });
    for (const smp of samples) {
      const t = smp.timeS;
      const st = smp.stage !== undefined ? byStage.get(smp.stage) : undefined;
      // a work rate or speed above zero given with the sample places it in exercise whatever its time
      const given = (smp.workW ?? 0) > 0 || (smp.speedKmh ?? 0) > 0;
      const place = t !== undefined && !given ? readTime(t) : t !== undefined ? { at: t } : undefined;
      if (place?.recoveryS !== undefined) {
        raw.push({ w: NaN, s: NaN, l: smp.lactateMmolL, t, recoveryS: place.recoveryS });
        continue;
      }
      const w = smp.workW ?? (place ? interpolateLinear(work.t, work.v, place.at) : (st?.w ?? NaN));
      const s = smp.speedKmh ?? (place ? interpolateLinear(speed.t, speed.v, place.at) : (st?.s ?? NaN));
      const phys = place ? physAt(place.at) : { hr: st?.hr, vo2: st?.vo2 };
      raw.push({
        w,
        s,
        l: smp.lactateMmolL,
        t: t ?? st?.t,
        rest: !given && beforeExercise(t),
        hr: phys.hr,
        vo2: phys.vo2,
      });
    }
  } else {
    for (const r of test.clean) {
      if (typeof r.lactateMmolL !== "number") continue;
      // a row with its own load above zero is exercise (a stage table's last stage may end after the detected span)
      const loaded = (r.workW ?? 0) > 0 || (r.speedKmh ?? 0) > 0;
      const place = loaded ? { at: r.timeS } : readTime(r.timeS);
      if (place.recoveryS !== undefined) raw.push({ w: NaN, s: NaN, l: r.lactateMmolL, t: r.timeS, recoveryS: place.recoveryS });
      else if (place.at === r.timeS)
        raw.push({
          w: r.workW ?? NaN,
          s: r.speedKmh ?? NaN,
          l: r.lactateMmolL,
          t: r.timeS,
          rest: !loaded && beforeExercise(r.timeS),
          hr: r.hrBpm,
          vo2: r.vo2MlMin,
        });
      else
        raw.push({
          w: interpolateLinear(work.t, work.v, place.at),
          s: interpolateLinear(speed.t, speed.v, place.at),
          l: r.lactateMmolL,
          t: r.timeS,
          ...physAt(place.at),
        });
    }
  }
  const hasWork = raw.some((r) => r.recoveryS === undefined && Number.isFinite(r.w) && r.w > 0);
  const axis: LactateAxis = hasWork ? "workW" : "speedKmh";
  const points: LactatePoint[] = [];
  const recovery: { t: number; after: number; l: number }[] = [];
  let dropped = 0;
  for (const r of raw) {
    if (r.recoveryS !== undefined) {
      if (!Number.isFinite(r.l)) continue;
      points.push({ x: NaN, lactateMmolL: r.l, recoveryS: r.recoveryS });
      recovery.push({ t: r.t!, after: r.recoveryS, l: r.l });
      continue;
    }
    const x = axis === "workW" ? r.w : r.s;
    if (Number.isFinite(x) && Number.isFinite(r.l))
      points.push({
        x,
        lactateMmolL: r.l,
        ...(r.rest || x <= 0 ? { rest: true } : {}),
        ...(r.t !== undefined ? { timeS: r.t } : {}),
        ...(r.hr !== undefined && Number.isFinite(r.hr) ? { hrBpm: r.hr } : {}),
        ...(r.vo2 !== undefined && Number.isFinite(r.vo2) ? { vo2MlMin: r.vo2 } : {}),
      });
    else dropped++;
  }
  if (recovery.length > 0) {
    const peak = Math.max(...points.map((p) => p.lactateMmolL));
    const list = recovery
      .map((r) => `${formatClock(r.t)}, ${formatClock(r.after)} after the end of exercise: ${r.l.toFixed(1)} mmol/L`)
      .join("; ");
    const axisWords = axis === "workW" ? "work rate" : "speed";
    issues.push(
      makeIssue(
        "info",
        "lactate-recovery-sample",
        `${recovery.length} lactate sample(s) drawn in recovery (${list}) ${recovery.length === 1 ? "is" : "are"} not on the lactate–${axisWords} curve: lactate keeps changing after exercise stops and the ${axisWords} at that time did not produce it. ${recovery.length === 1 ? "It counts" : "They count"} only towards peak lactate (${peak.toFixed(1)} mmol/L).`,
      ),
    );
  }
  if (atEnd > 0 && ex)
    issues.push(
      makeIssue(
        "info",
        "lactate-at-end-of-exercise",
        `${atEnd} lactate sample(s) drawn within ${LACTATE_END_OF_EXERCISE_GRACE_S} s after the end of exercise (${formatClock(ex.endS)}) ${atEnd === 1 ? "was" : "were"} read at the end of exercise.`,
      ),
    );
  if (dropped > 0 && points.length > 0)
    issues.push(
      makeIssue("info", "lactate-without-intensity", `${dropped} lactate sample(s) had no work rate or speed and were left out.`),
    );
  if (dropped > 0 && points.length === 0) {
    // nothing could be placed: say why, so the samples are not silently ignored
    const byStageOnly = (samples ?? []).some((x) => x.stage !== undefined && x.timeS === undefined && x.workW === undefined);
    const testHasStages = test.clean.some((r) => typeof r.stage === "number");
    issues.push(
      makeIssue(
        "warning",
        "lactate-not-placed",
        byStageOnly && !testHasStages
          ? `None of the ${dropped} lactate sample(s) could be placed: they name a stage, but the exercise file has no stage column. Give each sample's time or work rate.`
          : `None of the ${dropped} lactate sample(s) could be placed on a work rate or speed. Give each sample's time, stage or work rate.`,
      ),
    );
  }
  return { axis, points, issues };
}

/**
 * Every timed sample lies before exercise starts: read as given they would all be resting values. When the times read
 * as minutes fit inside the recording, ask whether they were minutes (a plain-number time column without a unit).
 */
function allBeforeExerciseIssue(test: ConditionedTest, times: number[]): Issue {
  const ex = test.exercise!;
  const lo = Math.min(...times);
  const hi = Math.max(...times);
  const end = test.clean.length ? test.clean[test.clean.length - 1].timeS : ex.endS;
  const asMinutes = hi * 60 <= end && hi * 60 > ex.startS;
  const where = `${times.length} lactate samples fall before exercise starts (${formatClock(lo)}–${formatClock(hi)}; exercise ${formatClock(ex.startS)}–${formatClock(ex.endS)}), at rest: none was placed on the curve.`;
  return makeIssue(
    "warning",
    "lactate-all-before-exercise",
    asMinutes
      ? `All ${where} Are the times in minutes? Read as minutes they fall at ${formatClock(lo * 60)}–${formatClock(hi * 60)}. Give the time unit: "Plain-number times are in: minutes" on the inputs page, --lactate-time-unit min on the command line, or a unit in the header (e.g. time_min).`
      : `All ${where} Check the sample times against the exercise file's clock.`,
  );
}

/**
 * Curve points: recovery samples left out, sorted by intensity, samples at one intensity averaged (a resting sample is
 * never averaged with an exercise one). A point at 0 W / 0 km/h, or marked `rest`, is a resting sample.
 */
function prepare(points: readonly LactatePoint[]): LactatePoint[] {
  const sorted = [...points]
    .filter((p) => p.recoveryS === undefined && Number.isFinite(p.x) && Number.isFinite(p.lactateMmolL))
    .map((p) => ({ x: p.x, lactateMmolL: p.lactateMmolL, rest: p.rest === true || p.x <= 0 }))
    .sort((a, b) => Number(b.rest) - Number(a.rest) || a.x - b.x);
  const out: LactatePoint[] = [];
  let i = 0;
  while (i < sorted.length) {
    let j = i;
    let sum = 0;
    while (j < sorted.length && sorted[j].x === sorted[i].x && sorted[j].rest === sorted[i].rest) sum += sorted[j++].lactateMmolL;
    out.push({ x: sorted[i].x, lactateMmolL: sum / (j - i), ...(sorted[i].rest ? { rest: true } : {}) });
    i = j;
  }
  return out;
}

/** Where the cubic's slope equals `chordSlope` inside (a, b), choosing the root farthest below the chord. */
function dmaxOnFit(fit: PolynomialFit, a: number, b: number): { x: number; distance: number } | null {
  const fa = evaluatePolynomialFit(fit, a);
  const fb = evaluatePolynomialFit(fit, b);
  const chordSlope = (fb - fa) / (b - a);
  const [, c1, c2, c3] = fit.coefficients;
  // d/du: c1 + 2 c2 u + 3 c3 u² = chordSlope · scale
  const A = 3 * c3;
  const B = 2 * c2;
  const C = c1 - chordSlope * fit.scale;
  const roots: number[] = [];
  if (Math.abs(A) < 1e-12) {
    if (Math.abs(B) > 1e-12) roots.push(-C / B);
  } else {
    const disc = B * B - 4 * A * C;
    if (disc >= 0) {
      const q = Math.sqrt(disc);
      roots.push((-B + q) / (2 * A), (-B - q) / (2 * A));
    }
  }
  let best: { x: number; distance: number } | null = null;
  for (const u of roots) {
    const x = fit.center + fit.scale * u;
    if (!(x > a && x < b)) continue;
    const distance = fa + chordSlope * (x - a) - evaluatePolynomialFit(fit, x);
    if (distance > 0 && (!best || distance > best.distance)) best = { x, distance };
  }
  return best;
}

/**
 * A fall to the next point, or a spike above both neighbours, larger than this many mmol/L or `LACTATE_SHAPE_FRACTION`
 * of the higher value, whichever is larger, marks a suspect sample (our choice: blood lactate rises monotonically in an
 * incremental test apart from small early dips — common practice, Faude, Kindermann & Meyer, Sports Med
 * 2009;39:469–490, recalled; 1 mmol/L is about twice the usual early dip and well above analyser error).
 */
export const LACTATE_SHAPE_FALL_MMOL_L = 1.0;
/** The relative part of the shape check (our choice; see `LACTATE_SHAPE_FALL_MMOL_L`). */
export const LACTATE_SHAPE_FRACTION = 0.25;
/** Falls between the first this-many exercise points are not checked: small early dips are normal (common practice). */
export const LACTATE_SHAPE_SKIP_POINTS = 2;
/**
 * A curve whose lowest exercise lactate lies above this level (mmol/L) starts above the first lactate threshold: resting
 * blood lactate is about 0.5–2 mmol/L (common practice, recalled textbook range), so 2.0 mmol/L at the lowest point
 * means the rise had begun before the first sample, or lactate was raised before the test (our choice). An early dip
 * (3.8 → 3.0 → 8.0) does not make such a curve readable from a baseline.
 */
export const LACTATE_HIGH_START_MMOL_L = 2.0;
/**
 * Sample spacing above which a concordance tolerance set by that spacing says "cannot be told apart at this sampling"
 * rather than "concordant": twice the fixed tolerance, 20 W (1 km/h) (our choice).
 */
const COARSE_SPACING: Record<LactateAxis, number> = { workW: 20, speedKmh: 1 };

/** A sample the shape or load-order checks call suspect: index on the exercise curve, and why. */
interface Suspect {
  index: number;
  words: string;
}

/**
 * Lactate thresholds against work rate (or speed), read from the exercise curve (resting samples — drawn before
 * exercise or at 0 W / 0 km/h — kept with the points but off the curve: Cheng et al. 1992 fit the exercise stages,
 * secondary; recovery samples count towards `peakMmolL` only):
 * - OBLA, intensity at 4 mmol/L by linear interpolation (Sjödin & Jacobs 1981, confirmed);
 * - baseline + 1.0 mmol/L (Bishop et al. 1998, confirmed; baseline = lowest exercise value, implementation choice);
 * - log-log: two least-squares lines on log lactate vs log intensity, split minimising total squared error
 *   (prefix sums, O(n)), threshold at their intersection (Beaver, Wasserman & Whipp 1985; secondary);
 * - Dmax: cubic fit, point of maximum perpendicular distance from the chord joining the fitted curve's ends,
 *   found where the curve's slope equals the chord's (Cheng et al. 1992; secondary);
 * - modified Dmax: chord from the point before the first rise > 0.4 mmol/L (Bishop 1998 named, rule recalled).
 * Every threshold must lie inside the tested range, else "not determinable". A curve whose lowest value is ≥ 4 mmol/L
 * has no low-intensity part (`LACTATE_LOWEST_IMPLAUSIBLE_MMOL_L`): only OBLA is read. A curve whose lowest exercise value is
 * above 2 mmol/L (`LACTATE_HIGH_START_MMOL_L`) started above the first threshold: baseline + 1 and
 * log-log are not given.
 *
 * Shape checks (warnings; the methods are still given, each one that reads across a suspect sample with a `caution`
 * naming it — no sample is deleted, since the suspect one may be the true one): a fall to the next point, after the
 * first two exercise points, or a spike above both neighbours, of more than max(1.0 mmol/L, 25 %)
 * (`lactate-curve-falls`, `lactate-spike`); a load that falls in the order the samples were drawn while heart rate or
 * VO2 keep rising (`lactate-load-falls`, a typing error in the load?). A cubic through exactly four points is warned
 * of (Dmax near the baseline is not: on smooth, steeply rising curves it is where Dmax falls, 50 of 271 TCD running
 * curves).
 *
 * With VT1/VT2 on the same axis, each threshold is compared with the VT it estimates (`LACTATE_METHOD_ESTIMATES`),
 * never the other, within the larger of 10 W (0.5 km/h) and half the median sample spacing (our choice;
 * `concordance` says which); see `ThresholdReading` for the verdicts.
 */
export function lactateThresholds(
  points: readonly LactatePoint[],
  axis: LactateAxis,
  options: LactateThresholdsOptions = {},
): LactateThresholdsResult {
  const unit = axis === "workW" ? "W" : "km/h";
  const obla = options.oblaMmolL ?? 4;
  const rise = options.baselineRiseMmolL ?? 1;
  const modRise = options.modifiedDmaxRiseMmolL ?? 0.4;
  const minSeg = Math.max(2, options.logLogMinPerSegment ?? 2);
  const issues: Issue[] = [];
  const pts = prepare(points);
  const curve = pts.filter((p) => !p.rest);
  const restCount = pts.length - curve.length;
  const recoveryPoints = points.filter((p) => p.recoveryS !== undefined && Number.isFinite(p.lactateMmolL));
  const all = points.filter((p) => Number.isFinite(p.lactateMmolL)).map((p) => p.lactateMmolL);
  const peakMmolL = all.length ? Math.max(...all) : null;
  const concordance = concordanceTolerance(curve, axis, options.concordanceTolerance);
  const xs = curve.map((p) => p.x);
  const ys = curve.map((p) => p.lactateMmolL);
  const n = curve.length;
  const lo = n ? xs[0] : NaN;
  const hi = n ? xs[n - 1] : NaN;
  const range = { rangeLow: lo, rangeHigh: hi, points: n, ...(restCount ? { restPointsLeftOut: restCount } : {}) };
  const f = (v: number) => (axis === "workW" ? v.toFixed(0) : v.toFixed(1));

  const make = (id: LactateMethodId, x: number, reason: string, extra: Provenance["inputs"] = {}): LactateThreshold => {
    const prov = provenanceOf(id, LABELS[id], SOURCES[id], { inputs: { ...range, ...extra }, averaging: "lactate samples" });
    if (!Number.isFinite(x))
      return { id, intensity: notDetermined(unit, prov, reason), lactateMmolL: notDetermined("mmol/L", prov, reason) };
    if (x < lo || x > hi) {
      const r = "the threshold falls outside the tested range";
      return {
        id,
        intensity: notDetermined(unit, { ...prov, inputs: { ...prov.inputs, outsideAt: x } }, r),
        lactateMmolL: notDetermined("mmol/L", prov, r),
      };
    }
    return { id, intensity: measured(x, unit, prov), lactateMmolL: measured(interpolateLinear(xs, ys, x), "mmol/L", prov) };
  };

  let minIdx = 0;
  for (let i = 1; i < n; i++) if (ys[i] < ys[minIdx]) minIdx = i;
  const thresholds: LactateThreshold[] = [];
  if (n < 3) {
    issues.push(
      makeIssue(
        "info",
        "lactate-too-few-points",
        `Fewer than three lactate points in exercise${restCount ? ` (${restCount} resting sample${restCount === 1 ? "" : "s"} not on the curve)` : ""}: lactate thresholds not determinable.`,
      ),
    );
    for (const id of Object.keys(LABELS) as LactateMethodId[]) thresholds.push(make(id, NaN, "fewer than three lactate points"));
    return { axis, unit, points: pts, recoveryPoints, peakMmolL, thresholds, relations: [], concordance, issues };
  }

  const shape = shapeSuspects(xs, ys, f, unit);
  const order = loadOrderSuspects(points, xs, f, unit);
  for (const s of [...shape, ...order]) issues.push(s.issue);
  // one sample flagged by both checks is named once in a caution
  const suspects: Suspect[] = [
    ...shape.map((s) =>
      order.some((o) => o.index === s.index) ? { ...s, words: `${s.words}, whose load falls in time order` } : s,
    ),
    ...order.filter((o) => !shape.some((s) => s.index === o.index)),
  ];

  // OBLA
  const oblaX = firstUpwardCrossing(xs, ys, obla, minIdx);
  thresholds.push(
    make("obla-4", oblaX, ys[minIdx] >= obla ? `lactate never below ${obla} mmol/L` : `lactate never reached ${obla} mmol/L`, {
      levelMmolL: obla,
    }),
  );

  // a curve with no low-intensity part: only OBLA ("never below 4 mmol/L") is read from it
  if (ys[minIdx] >= LACTATE_LOWEST_IMPLAUSIBLE_MMOL_L) {
    const low = ys[minIdx].toFixed(1);
    const why = `the lowest lactate (${low} mmol/L) is at or above ${LACTATE_LOWEST_IMPLAUSIBLE_MMOL_L} mmol/L: the curve has no low-intensity part`;
    issues.push(
      makeIssue(
        "warning",
        "lactate-no-low-part",
        `The lowest lactate on the curve is ${low} mmol/L, far above a resting value (about 0.5–2 mmol/L): no threshold is read from a baseline. Check the unit (were the values mg/dL? 1 mmol/L = 9.008 mg/dL) and the samples' times or work rates.`,
      ),
    );
    for (const id of ["baseline-plus-1", "log-log", "dmax", "modified-dmax"] as const) thresholds.push(make(id, NaN, why));
    return { axis, unit, points: pts, recoveryPoints, peakMmolL, thresholds, relations: [], concordance, issues };
  }

  // a curve that starts high: the first stage already lay above the first lactate threshold
  const highStart = ys[minIdx] > LACTATE_HIGH_START_MMOL_L;
  const highStartWhy = `the lowest exercise lactate (${ys[minIdx].toFixed(1)} mmol/L at ${f(xs[minIdx])} ${unit}) is above ${LACTATE_HIGH_START_MMOL_L.toFixed(1)} mmol/L: the first stage already lay above the first lactate threshold`;
  if (highStart)
    issues.push(
      makeIssue(
        "warning",
        "lactate-high-start",
        `The lowest exercise lactate, ${ys[minIdx].toFixed(1)} mmol/L at ${f(xs[minIdx])} ${unit}, is above ${LACTATE_HIGH_START_MMOL_L.toFixed(1)} mmol/L (our choice; resting lactate is about 0.5–2 mmol/L): the first stage already lay above the first lactate threshold, so ${SHORT["baseline-plus-1"]} and the ${SHORT["log-log"].toLowerCase()} are not given. OBLA and Dmax are read as usual. A lower first stage finds the first threshold.`,
      ),
    );

  // baseline + 1
  const baseIdx = options.baseline === "first" ? 0 : minIdx;
  const base = ys[baseIdx];
  const b1 = highStart ? NaN : firstUpwardCrossing(xs, ys, base + rise, baseIdx);
  thresholds.push(
    make("baseline-plus-1", b1, highStart ? highStartWhy : `lactate never rose ${rise} mmol/L above baseline`, {
      baselineMmolL: base,
      riseMmolL: rise,
      baseline: options.baseline ?? "minimum",
    }),
  );

  // log-log two segments
  const lx: number[] = [];
  const ly: number[] = [];
  for (let i = 0; i < n; i++) {
    if (xs[i] > 0 && ys[i] > 0) {
      lx.push(Math.log10(xs[i]));
      ly.push(Math.log10(ys[i]));
    }
  }
  if (highStart) thresholds.push(make("log-log", NaN, highStartWhy));
  else if (lx.length < Math.max(5, 2 * minSeg)) {
    thresholds.push(make("log-log", NaN, `fewer than ${Math.max(5, 2 * minSeg)} points with positive intensity and lactate`));
  } else {
    const sums = new PrefixSums(lx, ly);
    let best = { k: -1, sse: Infinity };
    for (let k = minSeg; k <= lx.length - minSeg; k++) {
      const sse = sums.fit(0, k).sse + sums.fit(k, lx.length).sse;
      if (sse < best.sse) best = { k, sse };
    }
    const f1 = sums.fit(0, best.k);
    const f2 = sums.fit(best.k, lx.length);
    const lxStar = (f2.intercept - f1.intercept) / (f1.slope - f2.slope);
    const ok = f2.slope > f1.slope && Number.isFinite(lxStar);
    thresholds.push(
      make("log-log", ok ? 10 ** lxStar : NaN, "the upper segment is not steeper than the lower one", {
        lowerSlope: f1.slope,
        upperSlope: f2.slope,
        splitAfterPoint: best.k,
      }),
    );
  }

  // Dmax and modified Dmax on one cubic fit
  const fit = polynomialFit(xs, ys, 3);
  if (n < 4 || !fit.coefficients.every(Number.isFinite)) {
    thresholds.push(make("dmax", NaN, "a cubic needs at least four distinct intensities"));
    thresholds.push(make("modified-dmax", NaN, "a cubic needs at least four distinct intensities"));
  } else {
    const d = dmaxOnFit(fit, lo, hi);
    const dmax = make("dmax", d ? d.x : NaN, "the fitted curve never lies below its chord", {
      cubicR2: fit.r2,
      verticalDistanceMmolL: d?.distance ?? null,
    });
    thresholds.push(dmax);
    if (n === 4)
      issues.push(
        makeIssue(
          "warning",
          "lactate-dmax-four-points",
          `${SHORT.dmax} and ${SHORT["modified-dmax"]} rest on a cubic through exactly four points: it passes through every one, so one sample's error moves them freely. Read them with care.`,
        ),
      );
    let start = -1;
    for (let i = 0; i + 1 < n; i++)
      if (ys[i + 1] - ys[i] > modRise) {
        start = i;
        break;
      }
    if (start < 0)
      thresholds.push(make("modified-dmax", NaN, `lactate never rose by more than ${modRise} mmol/L between points`));
    else {
      const m = dmaxOnFit(fit, xs[start], hi);
      thresholds.push(
        make("modified-dmax", m ? m.x : NaN, "the fitted curve never lies below the modified chord", {
          chordStart: xs[start],
          riseMmolL: modRise,
          cubicR2: fit.r2,
          verticalDistanceMmolL: m?.distance ?? null,
        }),
      );
    }
  }

  // a method that reads across a suspect sample is given with a caution naming it
  if (suspects.length > 0)
    for (const th of thresholds) {
      const x = th.intensity.value;
      if (x === null) continue;
      const crossing = th.id === "obla-4" || th.id === "baseline-plus-1";
      // a crossing read from the lowest point upwards reads every point up to the one above it; a fit reads them all
      const upTo = crossing ? xs.findIndex((v) => v >= x) : n - 1;
      const hit = suspects.filter((s) => s.index <= upTo);
      if (hit.length)
        th.caution = `read across ${hit.map((s) => s.words).join(" and ")}: may be wrong (a sampling or transcription error, or real)`;
    }

  const relations = relate(thresholds, options, axis, concordance, f);
  return { axis, unit, points: pts, recoveryPoints, peakMmolL, thresholds, relations, concordance, issues };
}

/**
 * Falls and spikes on the exercise curve (sorted by intensity): a fall from point i to i + 1 (i from the third exercise
 * point on) of more than max(1.0 mmol/L, 25 % of point i), or a point above both neighbours by more than max(1.0 mmol/L,
 * 25 % of itself). A spike and the fall after it are one finding.
 */
function shapeSuspects(
  xs: readonly number[],
  ys: readonly number[],
  f: (v: number) => string,
  unit: string,
): (Suspect & { issue: Issue })[] {
  const out: (Suspect & { issue: Issue })[] = [];
  const lim = (v: number) => Math.max(LACTATE_SHAPE_FALL_MMOL_L, LACTATE_SHAPE_FRACTION * v);
  const at = (i: number) => `${ys[i].toFixed(1)} mmol/L at ${f(xs[i])} ${unit}`;
  const rule = `more than ${LACTATE_SHAPE_FALL_MMOL_L.toFixed(1)} mmol/L or ${100 * LACTATE_SHAPE_FRACTION} %, our choice`;
  let skipFallAt = -1;
  for (let i = 1; i + 1 < ys.length; i++) {
    if (ys[i] - ys[i - 1] > lim(ys[i]) && ys[i] - ys[i + 1] > lim(ys[i])) {
      skipFallAt = i;
      out.push({
        index: i,
        words: `the spike of ${at(i)}`,
        issue: makeIssue(
          "warning",
          "lactate-spike",
          `Lactate spikes to ${at(i)}, above both neighbours (${at(i - 1)}, ${at(i + 1)}; ${rule}): blood lactate rises steadily in an incremental test, so this sample may be a sampling or transcription error (or the spike is real). The thresholds that read across it are given with this caution and may be wrong.`,
        ),
      });
      continue;
    }
    if (i >= LACTATE_SHAPE_SKIP_POINTS && i !== skipFallAt && ys[i] - ys[i + 1] > lim(ys[i])) {
      // either the sample after the fall is wrong, or every earlier sample the fall contradicts (above the later value
      // by the same margin): a method reading any of them reads across the fall
      let first = i;
      while (first > 0 && ys[first - 1] - ys[i + 1] > lim(ys[first - 1])) first--;
      out.push({
        index: first,
        words: `the fall from ${at(i)} to ${at(i + 1)}`,
        issue: makeIssue(
          "warning",
          "lactate-curve-falls",
          `Lactate falls from ${at(i)} to ${at(i + 1)} (${rule}): blood lactate rises steadily in an incremental test after its first stages, so one of these samples is a sampling or transcription error, or the fall is real. The thresholds that read across it are given with this caution and may be wrong.`,
        ),
      });
    }
  }
  return out;
}

/**
 * Loads out of order: in the order the samples were drawn (`timeS`, exercise samples only), a load below the one
 * before while heart rate or VO2 rise (or neither was recorded) — a typing error in the load is likely (TCD-like stage
 * tables; common practice: the load of an incremental test does not fall). Checked before the points are sorted.
 */
function loadOrderSuspects(
  points: readonly LactatePoint[],
  xs: readonly number[],
  f: (v: number) => string,
  unit: string,
): (Suspect & { issue: Issue })[] {
  const timed = points
    .filter((p) => p.recoveryS === undefined && p.rest !== true && p.x > 0 && p.timeS !== undefined && Number.isFinite(p.x))
    .sort((a, b) => a.timeS! - b.timeS!);
  const out: (Suspect & { issue: Issue })[] = [];
  for (let i = 1; i < timed.length; i++) {
    const a = timed[i - 1];
    const b = timed[i];
    if (!(b.x < a.x)) continue;
    const hrUp = a.hrBpm !== undefined && b.hrBpm !== undefined && b.hrBpm > a.hrBpm;
    const vo2Up = a.vo2MlMin !== undefined && b.vo2MlMin !== undefined && b.vo2MlMin > a.vo2MlMin;
    const noSign = a.hrBpm === undefined && b.hrBpm === undefined && a.vo2MlMin === undefined && b.vo2MlMin === undefined;
    if (!hrUp && !vo2Up && !noSign) continue;
    const rising = [
      hrUp ? `heart rate rises ${a.hrBpm!.toFixed(0)} → ${b.hrBpm!.toFixed(0)} bpm` : "",
      vo2Up ? `VO2 rises ${a.vo2MlMin!.toFixed(0)} → ${b.vo2MlMin!.toFixed(0)} mL/min` : "",
    ]
      .filter(Boolean)
      .join(" and ");
    const index = xs.indexOf(b.x);
    out.push({
      index: index < 0 ? 0 : index,
      words: `the sample at ${f(b.x)} ${unit} (${b.lactateMmolL.toFixed(1)} mmol/L), whose load falls in time order`,
      issue: makeIssue(
        "warning",
        "lactate-load-falls",
        `The load falls in time order from ${f(a.x)} to ${f(b.x)} ${unit} (lactate ${b.lactateMmolL.toFixed(1)} mmol/L)${rising ? ` while ${rising}` : " (no heart rate or VO2 to judge by)"}: check for a typing error in that stage's load. The points are sorted by load as given; the thresholds that read across this sample are given with this caution and may be wrong.`,
      ),
    });
  }
  return out;
}

/** Each threshold against the VT it estimates (`LACTATE_METHOD_ESTIMATES`); none when neither VT is given. */
function relate(
  thresholds: readonly LactateThreshold[],
  options: LactateThresholdsOptions,
  axis: LactateAxis,
  concordance: ConcordanceTolerance,
  f: (v: number) => string,
): ThresholdRelation[] {
  const unit = AXIS_UNIT[axis];
  const ok = (v: number | null | undefined): v is number => typeof v === "number" && Number.isFinite(v) && v > 0;
  const vt = { VT1: ok(options.vt1) ? options.vt1 : null, VT2: ok(options.vt2) ? options.vt2 : null };
  if (vt.VT1 === null && vt.VT2 === null) return [];
  const tol = concordance.value;
  const coarse =
    concordance.basis === "sample-spacing" &&
    concordance.sampleSpacing !== null &&
    concordance.sampleSpacing > COARSE_SPACING[axis];
  const spacing =
    concordance.basis === "sample-spacing" && concordance.sampleSpacing !== null
      ? ` (half the ${f(concordance.sampleSpacing)} ${unit} median sample spacing)`
      : "";
  const out: ThresholdRelation[] = [];
  for (const th of thresholds) {
    const x = th.intensity.value;
    if (x === null) continue;
    const own = LACTATE_METHOD_ESTIMATES[th.id];
    const other = own === "VT1" ? "VT2" : "VT1";
    const sourceIds = [
      ...SOURCES[th.id],
      "faude-2009-lactate-concepts",
      ...(th.id === "modified-dmax" ? ["jamnick-2018-mod-dmax"] : []),
      "implementation-choice",
    ];
    const ownVt = vt[own];
    const name = `${SHORT[th.id]} at ${f(x)} ${unit}`;
    if (ownVt === null) {
      const where = `${own} not determinable`;
      const verdict = `not compared (it estimates ${own === "VT1" ? "the first" : "the second"} threshold, ${own})`;
      out.push({
        id: th.id,
        comparedWith: own,
        difference: null,
        differencePercent: null,
        concordant: false,
        reading: "own-vt-not-determinable",
        where,
        verdict,
        verdictShort: verdict,
        statement: `${name}: ${where}, so ${verdict}.`,
        sourceIds,
      });
      continue;
    }
    const diff = x - ownVt;
    const pct = (100 * diff) / ownVt;
    const offset =
      diff === 0 ? "at" : `${f(Math.abs(diff))} ${unit} (${Math.abs(pct).toFixed(1)}%) ${diff > 0 ? "above" : "below"}`;
    let where = `${offset} ${own} (${f(ownVt)} ${unit})`;
    const otherVt = vt[other];
    const within = Math.abs(diff) <= tol;
    let reading: ThresholdReading;
    let verdictShort: string;
    let verdict: string;
    if (th.id === "obla-4" && vt.VT1 !== null && x < vt.VT1) {
      reading = "obla-below-vt1";
      if (own !== "VT1") where = `${f(vt.VT1 - x)} ${unit} below VT1 (${f(vt.VT1)} ${unit})`;
      verdictShort = "below VT1, physiologically implausible: check the samples and VT1";
      verdict = verdictShort;
    } else if (within && coarse) {
      reading = "not-separable";
      verdictShort = `cannot be told apart at this sampling (within ${fmtTol(tol, axis)} ${unit})`;
      verdict = `cannot be told apart at this sampling: the samples lie a median ${f(concordance.sampleSpacing!)} ${unit} apart, so a threshold is placed only to within ${fmtTol(tol, axis)} ${unit}`;
    } else if (within) {
      reading = "concordant";
      verdictShort = `concordant within ${fmtTol(tol, axis)} ${unit}`;
      verdict = `${verdictShort}${spacing}`;
    } else if (otherVt !== null && Math.abs(x - otherVt) < Math.abs(diff)) {
      reading = "nearer-other-vt";
      where = `${where}, ${Math.abs(x - otherVt) <= tol ? "near" : "nearer"} ${other} (${f(otherVt)} ${unit})`;
      verdictShort = "check both";
      verdict = `check both: it estimates ${own}`;
    } else {
      reading = "apart";
      verdictShort = `apart by more than ${fmtTol(tol, axis)} ${unit}`;
      verdict = `${verdictShort}${spacing}`;
    }
    out.push({
      id: th.id,
      comparedWith: own,
      difference: diff,
      differencePercent: pct,
      concordant: reading === "concordant",
      reading,
      where,
      verdict,
      verdictShort,
      statement: `${name} lies ${where}: ${verdict}.`,
      sourceIds,
    });
  }
  return out;
}

/**
 * The concordance tolerance: the caller's, else the larger of the fixed floor (10 W / 0.5 km/h) and half the median
 * spacing of neighbouring curve points (both our choice, no published value: a threshold between two samples is a
 * linear interpolation, so its place is known only to about half their spacing).
 */
function concordanceTolerance(pts: readonly LactatePoint[], axis: LactateAxis, given?: number): ConcordanceTolerance {
  const gaps: number[] = [];
  for (let i = 1; i < pts.length; i++) gaps.push(pts[i].x - pts[i - 1].x);
  gaps.sort((a, b) => a - b);
  const m = gaps.length;
  const sampleSpacing = m === 0 ? null : m % 2 ? gaps[(m - 1) / 2] : (gaps[m / 2 - 1] + gaps[m / 2]) / 2;
  if (given !== undefined && Number.isFinite(given))
    return {
      value: given,
      basis: "option",
      sampleSpacing,
      note: `${PAIRING_NOTE} Concordance is read within ${fmtTol(given, axis)} ${AXIS_UNIT[axis]} (set by the lab).`,
    };
  const floor = FIXED_TOLERANCE[axis];
  // half the spacing as displayed (whole W, 0.1 km/h), so the tolerance written is the one applied
  const shown =
    sampleSpacing === null ? null : axis === "workW" ? Math.round(sampleSpacing) : Math.round(sampleSpacing * 10) / 10;
  const u = AXIS_UNIT[axis];
  return shown !== null && shown / 2 > floor
    ? {
        value: shown / 2,
        basis: "sample-spacing",
        sampleSpacing: shown,
        note: `${PAIRING_NOTE} The samples lie a median ${shown} ${u} apart and a threshold between two samples is interpolated, so its place is known only to about half that spacing, ${fmtTol(shown / 2, axis)} ${u}: within that of its VT the two cannot be told apart at this sampling, which is not a finding of agreement (our choice; at least ${floor} ${u}, and "concordant" only with samples ${COARSE_SPACING[axis]} ${u} apart or closer).`,
      }
    : {
        value: floor,
        basis: "fixed",
        sampleSpacing: shown,
        note: `${PAIRING_NOTE} Concordance is read within ${floor} ${u} (our choice, no published value${shown !== null ? `; half the ${shown} ${u} median sample spacing is no wider` : ""}).`,
      };
}

const AXIS_UNIT: Record<LactateAxis, string> = { workW: "W", speedKmh: "km/h" };

/** How the lactate thresholds are paired with the VTs (`LACTATE_METHOD_ESTIMATES`), said once in the methods. */
const PAIRING_NOTE =
  "Each lactate threshold is compared with the ventilatory threshold it estimates: baseline + 1 mmol/L and the log-log threshold with VT1; OBLA, Dmax and modified Dmax with VT2.";

/** A tolerance as written: whole W or 0.1 km/h, one more decimal when it is half of such a value (12.5 W, 0.25 km/h). */
function fmtTol(v: number, axis: LactateAxis): string {
  return String(axis === "workW" ? Math.round(v * 10) / 10 : Math.round(v * 100) / 100);
}
