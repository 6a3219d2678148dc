import type { LactateSample } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { firstUpwardCrossing, interpolateLinear } from "../numeric/interpolate";
import { PrefixSums } from "../numeric/linearRegression";
import { evaluatePolynomialFit, polynomialFit, type PolynomialFit } from "../numeric/polynomialFit";
import type { ConditionedTest } from "../signal";
import { fieldSeries, provenanceOf } from "./indexSeries";

/** Intensity axis of a lactate curve. */
export type LactateAxis = "workW" | "speedKmh";

export interface LactatePoint {
  /** Work rate (W) or speed (km/h), per the axis. */
  x: number;
  lactateMmolL: number;
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
  /** |difference| within which a lactate threshold and a VT are called concordant (implementation choice). @default 10 W or 0.5 km/h */
  concordanceTolerance?: number;
}

export interface LactateThresholdsResult {
  axis: LactateAxis;
  unit: string;
  /** Points used, sorted by intensity, duplicates averaged. */
  points: LactatePoint[];
  thresholds: LactateThreshold[];
  relations: ThresholdRelation[];
  issues: Issue[];
}

const LABELS: Record<LactateMethodId, string> = {
  "obla-4": "OBLA: intensity at 4 mmol/L (linear interpolation)",
  "baseline-plus-1": "baseline + 1.0 mmol/L (linear interpolation)",
  "log-log": "log-log two-segment fit, intersection",
  dmax: "Dmax: cubic fit, maximum distance from the chord joining its ends",
  "modified-dmax": "modified Dmax: chord from the point before the first rise > 0.4 mmol/L",
};
const SHORT: Record<LactateMethodId, string> = {
  "obla-4": "OBLA (4 mmol/L)",
  "baseline-plus-1": "Baseline + 1 mmol/L",
  "log-log": "Log-log threshold",
  dmax: "Dmax",
  "modified-dmax": "Modified Dmax",
};
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
 */
export function lactatePointsFromTest(
  test: ConditionedTest,
  samples?: readonly LactateSample[],
): { axis: LactateAxis; points: LactatePoint[]; issues: Issue[] } {
  const issues: Issue[] = [];
  const work = fieldSeries(test.clean, "workW");
  const speed = fieldSeries(test.clean, "speedKmh");
  const raw: { w: number; s: number; l: number }[] = [];
  if (samples && samples.length > 0) {
    // stage number → the work rate / speed of that stage's last row
    const byStage = new Map<number, { w: number; s: number }>();
    for (const r of test.clean)
      if (typeof r.stage === "number") byStage.set(r.stage, { w: r.workW ?? NaN, s: r.speedKmh ?? NaN });
    for (const smp of samples) {
      const t = smp.timeS;
      const st = smp.stage !== undefined ? byStage.get(smp.stage) : undefined;
      const w = smp.workW ?? (t !== undefined ? interpolateLinear(work.t, work.v, t) : (st?.w ?? NaN));
      const s = smp.speedKmh ?? (t !== undefined ? interpolateLinear(speed.t, speed.v, t) : (st?.s ?? NaN));
      raw.push({ w, s, l: smp.lactateMmolL });
    }
  } else {
    for (const r of test.clean)
      if (typeof r.lactateMmolL === "number") raw.push({ w: r.workW ?? NaN, s: r.speedKmh ?? NaN, l: r.lactateMmolL });
  }
  const hasWork = raw.some((r) => Number.isFinite(r.w) && r.w > 0);
  const axis: LactateAxis = hasWork ? "workW" : "speedKmh";
  const points: LactatePoint[] = [];
  let dropped = 0;
  for (const r of raw) {
    const x = axis === "workW" ? r.w : r.s;
    if (Number.isFinite(x) && Number.isFinite(r.l)) points.push({ x, lactateMmolL: r.l });
    else dropped++;
  }
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

function prepare(points: readonly LactatePoint[]): LactatePoint[] {
  const sorted = [...points].filter((p) => Number.isFinite(p.x) && Number.isFinite(p.lactateMmolL)).sort((a, b) => a.x - b.x);
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
 * Every threshold must lie inside the tested range, else "not determinable". With VT1/VT2 on the same axis,
 * each threshold is placed against the nearer VT.
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
  const tol = options.concordanceTolerance ?? (axis === "workW" ? 10 : 0.5);
  const issues: Issue[] = [];
  const pts = prepare(points);
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
    return { axis, unit, points: pts, thresholds, relations: [], issues };
  }

  // OBLA
  const oblaX = firstUpwardCrossing(xs, ys, obla, minIdx);
  thresholds.push(
    make("obla-4", oblaX, ys[minIdx] >= obla ? `lactate never below ${obla} mmol/L` : `lactate never reached ${obla} mmol/L`, {
      levelMmolL: obla,
    }),
  );

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
      const where =
        diff === 0 ? "at" : `${f(Math.abs(diff))} ${unit} (${Math.abs(pct).toFixed(1)}%) ${diff > 0 ? "above" : "below"}`;
      relations.push({
        id: th.id,
        nearest: nearest[0],
        difference: diff,
        differencePercent: pct,
        concordant,
        statement: `${SHORT[th.id]} at ${f(x)} ${unit} lies ${where} ${nearest[0]} (${f(nearest[1])} ${unit}): ${
          concordant ? `concordant within ${f(tol)} ${unit}` : `apart by more than ${f(tol)} ${unit}`
        }.`,
      });
    }
  }
  return { axis, unit, points: pts, thresholds, relations, issues };
}
