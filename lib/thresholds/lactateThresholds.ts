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
}

export type LactateMethodId = "obla-4" | "baseline-plus-1" | "log-log" | "dmax" | "modified-dmax";

export interface LactateThreshold {
  id: LactateMethodId;
  /** Intensity at the threshold (W or km/h). */
  intensity: Measured;
  /** Lactate at that intensity, read from the measured points by linear interpolation. */
  lactateMmolL: Measured;
}

/** Where a lactate threshold sits against VT1 and VT2 on the same axis. */
export interface ThresholdRelation {
  id: LactateMethodId;
  nearest: "VT1" | "VT2";
  /** Lactate threshold minus the nearest VT, axis units. */
  difference: number;
  /** Difference as % of the VT. */
  differencePercent: number;
  concordant: boolean;
  /** Where it lies, in words: "2 W (1.1%) below VT2 (194 W)" or "at VT1 (115 W)". */
  where: string;
  /** The verdict in words, with the tolerance and, when the samples set it, their spacing. */
  verdict: string;
  /** The verdict with the tolerance only ("concordant within 12.5 W"), where `concordance.note` is said once beside it. */
  verdictShort: string;
  /** One sentence: name, value, where, verdict. */
  statement: string;
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
  /** Points of the lactate–intensity curve, sorted by intensity, duplicates averaged (recovery samples left out). */
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
  const raw: { w: number; s: number; l: number; t?: number; recoveryS?: number }[] = [];
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
    const byStage = new Map<number, { w: number; s: number }>();
    for (const r of test.clean)
      if (typeof r.stage === "number") byStage.set(r.stage, { w: r.workW ?? NaN, s: r.speedKmh ?? NaN });
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
      raw.push({ w, s, l: smp.lactateMmolL, t });
    }
  } else {
    for (const r of test.clean) {
      if (typeof r.lactateMmolL !== "number") continue;
      // a row with its own load above zero is exercise (a stage table's last stage may end after the detected span)
      const loaded = (r.workW ?? 0) > 0 || (r.speedKmh ?? 0) > 0;
      const place = loaded ? { at: r.timeS } : readTime(r.timeS);
      if (place.recoveryS !== undefined) raw.push({ w: NaN, s: NaN, l: r.lactateMmolL, t: r.timeS, recoveryS: place.recoveryS });
      else if (place.at === r.timeS) raw.push({ w: r.workW ?? NaN, s: r.speedKmh ?? NaN, l: r.lactateMmolL, t: r.timeS });
      else
        raw.push({
          w: interpolateLinear(work.t, work.v, place.at),
          s: interpolateLinear(speed.t, speed.v, place.at),
          l: r.lactateMmolL,
          t: r.timeS,
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
    if (Number.isFinite(x) && Number.isFinite(r.l)) points.push({ x, lactateMmolL: r.l });
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

/** Curve points: recovery samples left out, sorted by intensity, samples at one intensity averaged. */
function prepare(points: readonly LactatePoint[]): LactatePoint[] {
  const sorted = [...points]
    .filter((p) => p.recoveryS === undefined && Number.isFinite(p.x) && Number.isFinite(p.lactateMmolL))
    .sort((a, b) => a.x - b.x);
  const out: LactatePoint[] = [];
  let i = 0;
  while (i < sorted.length) {
    let j = i;
    let sum = 0;
    while (j < sorted.length && sorted[j].x === sorted[i].x) sum += sorted[j++].lactateMmolL;
    out.push({ x: sorted[i].x, lactateMmolL: sum / (j - i) });
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
 * Lactate thresholds against work rate (or speed):
 * - OBLA, intensity at 4 mmol/L by linear interpolation (Sjödin & Jacobs 1981, confirmed);
 * - baseline + 1.0 mmol/L (Bishop et al. 1998, confirmed; baseline = lowest value, implementation choice);
 * - log-log: two least-squares lines on log lactate vs log intensity, split minimising total squared error
 *   (prefix sums, O(n)), threshold at their intersection (Beaver, Wasserman & Whipp 1985; secondary);
 * - Dmax: cubic fit, point of maximum perpendicular distance from the chord joining the fitted curve's ends,
 *   found where the curve's slope equals the chord's (Cheng et al. 1992; secondary);
 * - modified Dmax: chord from the point before the first rise > 0.4 mmol/L (Bishop 1998 named, rule recalled).
 * Every threshold must lie inside the tested range, else "not determinable". Recovery samples (`recoveryS`) count
 * towards `peakMmolL` only. A curve whose lowest value is ≥ 4 mmol/L has no low-intensity part
 * (`LACTATE_LOWEST_IMPLAUSIBLE_MMOL_L`): only OBLA is read and a warning asks to check the unit and positions.
 * With VT1/VT2 on the same axis, each threshold is placed against the nearer VT and called concordant within the
 * larger of 10 W (0.5 km/h) and half the median sample spacing (our choice; `concordance` says which).
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
  const recoveryPoints = points.filter((p) => p.recoveryS !== undefined && Number.isFinite(p.lactateMmolL));
  const all = points.filter((p) => Number.isFinite(p.lactateMmolL)).map((p) => p.lactateMmolL);
  const peakMmolL = all.length ? Math.max(...all) : null;
  const concordance = concordanceTolerance(pts, axis, options.concordanceTolerance);
  const tol = concordance.value;
  const xs = pts.map((p) => p.x);
  const ys = pts.map((p) => p.lactateMmolL);
  const n = pts.length;
  const lo = n ? xs[0] : NaN;
  const hi = n ? xs[n - 1] : NaN;
  const range = { rangeLow: lo, rangeHigh: hi, points: n };

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
      makeIssue("info", "lactate-too-few-points", "Fewer than three lactate points: lactate thresholds not determinable."),
    );
    for (const id of Object.keys(LABELS) as LactateMethodId[]) thresholds.push(make(id, NaN, "fewer than three lactate points"));
    return { axis, unit, points: pts, recoveryPoints, peakMmolL, thresholds, relations: [], concordance, issues };
  }

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

  // baseline + 1
  const baseIdx = options.baseline === "first" ? 0 : minIdx;
  const base = ys[baseIdx];
  const b1 = firstUpwardCrossing(xs, ys, base + rise, baseIdx);
  thresholds.push(
    make("baseline-plus-1", b1, `lactate never rose ${rise} mmol/L above baseline`, {
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
  if (lx.length < Math.max(5, 2 * minSeg)) {
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
    thresholds.push(
      make("dmax", d ? d.x : NaN, "the fitted curve never lies below its chord", {
        cubicR2: fit.r2,
        verticalDistanceMmolL: d?.distance ?? null,
      }),
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

  // relation to VT1 / VT2
  const relations: ThresholdRelation[] = [];
  const vts = (
    [
      ["VT1", options.vt1],
      ["VT2", options.vt2],
    ] as const
  ).filter((v): v is readonly ["VT1" | "VT2", number] => typeof v[1] === "number" && Number.isFinite(v[1]) && v[1] > 0);
  if (vts.length > 0) {
    for (const th of thresholds) {
      const x = th.intensity.value;
      if (x === null) continue;
      let nearest = vts[0];
      for (const v of vts) if (Math.abs(x - v[1]) < Math.abs(x - nearest[1])) nearest = v;
      const diff = x - nearest[1];
      const pct = (100 * diff) / nearest[1];
      const concordant = Math.abs(diff) <= tol;
      const f = (v: number) => (axis === "workW" ? v.toFixed(0) : v.toFixed(1));
      const offset =
        diff === 0 ? "at" : `${f(Math.abs(diff))} ${unit} (${Math.abs(pct).toFixed(1)}%) ${diff > 0 ? "above" : "below"}`;
      const where = `${offset} ${nearest[0]} (${f(nearest[1])} ${unit})`;
      const spacing =
        concordance.basis === "sample-spacing" && concordance.sampleSpacing !== null
          ? ` (half the ${f(concordance.sampleSpacing)} ${unit} median sample spacing)`
          : "";
      const verdictShort = `${concordant ? "concordant within" : "apart by more than"} ${fmtTol(tol, axis)} ${unit}`;
      const verdict = `${verdictShort}${spacing}`;
      relations.push({
        id: th.id,
        nearest: nearest[0],
        difference: diff,
        differencePercent: pct,
        concordant,
        where,
        verdict,
        verdictShort,
        statement: `${SHORT[th.id]} at ${f(x)} ${unit} lies ${where}: ${verdict}.`,
      });
    }
  }
  return { axis, unit, points: pts, recoveryPoints, peakMmolL, thresholds, relations, concordance, issues };
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
      note: `Concordance with VT1/VT2 is read within ${fmtTol(given, axis)} ${AXIS_UNIT[axis]} (set by the lab).`,
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
        note: `Concordance of the lactate thresholds with VT1/VT2 is read within ${fmtTol(shown / 2, axis)} ${u}: the samples lie a median ${shown} ${u} apart and a threshold between two samples is interpolated, so its place is known only to about half that spacing (our choice; at least ${floor} ${u}).`,
      }
    : {
        value: floor,
        basis: "fixed",
        sampleSpacing: shown,
        note: `Concordance of the lactate thresholds with VT1/VT2 is read within ${floor} ${u} (our choice, no published value${shown !== null ? `; half the ${shown} ${u} median sample spacing is no wider` : ""}).`,
      };
}

const AXIS_UNIT: Record<LactateAxis, string> = { workW: "W", speedKmh: "km/h" };

/** A tolerance as written: whole W or 0.1 km/h, one more decimal when it is half of such a value (12.5 W, 0.25 km/h). */
function fmtTol(v: number, axis: LactateAxis): string {
  return String(axis === "workW" ? Math.round(v * 10) / 10 : Math.round(v * 100) / 100);
}
