import { measured, notDetermined, type Provenance } from "../core";
import { firstUpwardCrossing, interpolateLinear } from "../numeric/interpolate";
import type { MethodEstimate, MethodQuality, ThresholdConfidence, ThresholdSeries, ThresholdWhich } from "./thresholdTypes";

/** Bin indices of `series` inside [startS, endS]. */
export function seriesWindow(series: ThresholdSeries, startS: number, endS: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < series.timeS.length; i++) if (series.timeS[i] >= startS && series.timeS[i] <= endS) out.push(i);
  return out;
}

/** VO2 of the series' trend at a time (mL/min); NaN outside the series. */
export function vo2AtTime(series: ThresholdSeries, timeS: number): number {
  const n = series.timeS.length;
  if (n === 0) return NaN;
  const t = Math.min(series.timeS[n - 1], Math.max(series.timeS[0], timeS));
  return interpolateLinear(series.timeS, series.vo2Trend, t);
}

/** First time the trend of `trend` (VO2 or VCO2) reaches `level`; clamps to the series ends. */
export function timeAtLevel(series: ThresholdSeries, trend: Float64Array, level: number): number {
  const n = series.timeS.length;
  if (n === 0 || !Number.isFinite(level)) return NaN;
  if (trend[0] >= level) return series.timeS[0];
  const t = firstUpwardCrossing(series.timeS, trend, level);
  return Number.isFinite(t) ? t : series.timeS[n - 1];
}

/** Assemble a method's estimate with full provenance; `value` NaN/null gives "not determinable". */
export function buildMethodEstimate(args: {
  id: string;
  which: ThresholdWhich;
  label: string;
  series: ThresholdSeries;
  window: { startS: number; endS: number };
  vo2MlMin: number | null;
  timeS: number | null;
  fit: Record<string, number | null>;
  quality: MethodQuality;
  reasons: string[];
  sourceIds: string[];
}): MethodEstimate {
  const provenance: Provenance = {
    method: args.id,
    label: args.label,
    sourceIds: args.sourceIds,
    window: args.window,
    inputs: Object.fromEntries(
      Object.entries(args.fit).map(([k, v]) => [k, v === null || !Number.isFinite(v) ? null : Math.round(v * 1000) / 1000]),
    ),
    averaging: args.series.averaging,
  };
  const ok = args.quality !== "failed" && args.vo2MlMin !== null && Number.isFinite(args.vo2MlMin);
  return {
    id: args.id,
    which: args.which,
    label: args.label,
    timeS: ok && args.timeS !== null && Number.isFinite(args.timeS) ? args.timeS : null,
    vo2MlMin: ok
      ? measured(args.vo2MlMin as number, "mL/min", provenance)
      : notDetermined(
          "mL/min",
          provenance,
          args.reasons.filter((r) => r.startsWith("not determinable")).join("; ") || args.reasons.join("; "),
        ),
    window: args.window,
    fit: args.fit,
    quality: ok ? args.quality : "failed",
    reasons: args.reasons,
    sourceIds: args.sourceIds,
  };
}

export interface ConsensusOptions {
  /**
   * Two methods agree when their VO2 differ by at most this fraction of the larger (our choice; no
   * published tolerance was found). @default 0.1
   */
  agreementFraction?: number;
  /** Agreeing methods spread no more than this fraction for "high" confidence (our choice). @default 0.06 */
  highSpreadFraction?: number;
  /** Order of preference when a single method must be chosen (first = preferred). */
  preference?: string[];
  /**
   * When given, the value is the weighted median of every usable method (weight by id, default 1; "poor"
   * fits count half) instead of the agreeing group's median — a robust pooled value (our choice); the
   * confidence still follows agreement. A key `"<id>:<quality>"` (e.g. `"vt1-joint-profile:good"`) overrides the
   * id's weight for fits with that verdict. @default undefined
   */
  weights?: Record<string, number>;
}

/** Weighted median (lower weighted median at an exact half). Empty → NaN. */
export function weightedMedian(values: readonly number[], weights: readonly number[]): number {
  const order = values.map((_, i) => i).filter((i) => weights[i] > 0 && Number.isFinite(values[i]));
  if (order.length === 0) return NaN;
  order.sort((a, b) => values[a] - values[b]);
  const total = order.reduce((s, i) => s + weights[i], 0);
  let acc = 0;
  for (const i of order) {
    acc += weights[i];
    if (acc > total / 2 + 1e-12) return values[i];
    if (Math.abs(acc - total / 2) <= 1e-12) {
      const next = order[order.indexOf(i) + 1];
      return next === undefined ? values[i] : (values[i] + values[next]) / 2;
    }
  }
  return values[order[order.length - 1]];
}

/** Joins each method's reason in a "not determinable" consensus reason; screens split on it to list them. */
export const METHOD_REASON_SEPARATOR = " | ";

export interface Consensus {
  vo2MlMin: number | null;
  confidence: ThresholdConfidence;
  methodIds: string[];
  band: { lowMlMin: number; highMlMin: number } | null;
  reason?: string;
}

const QUALITY_RANK: Record<MethodQuality, number> = { good: 0, fair: 1, poor: 2, failed: 3 };

/**
 * Combine method estimates of one threshold. Rule: report with confidence "moderate" or "high" when at
 * least two methods agree (common practice, recalled: source `vt-two-methods-agree-recalled`); the agreement
 * tolerance and the "high" spread are our choices (`vt-implementation-choice`). With one usable method or
 * none agreeing, a value is still given with confidence "low" (median of three or more, else the preferred
 * method) so a reviewer can confirm it; with none, "not-determinable" with the methods' reasons.
 */
export function combineEstimates(methods: readonly MethodEstimate[], options: ConsensusOptions = {}): Consensus {
  const tol = options.agreementFraction ?? 0.1;
  const highSpread = options.highSpreadFraction ?? 0.06;
  const pref = options.preference ?? [];
  const usable = methods.filter((m) => m.quality !== "failed" && m.vo2MlMin.value !== null);
  if (usable.length === 0) {
    const why = methods.map((m) => `${m.label}: ${m.vo2MlMin.reason ?? m.reasons.join("; ")}`).join(METHOD_REASON_SEPARATOR);
    return { vo2MlMin: null, confidence: "not-determinable", methodIds: [], band: null, reason: why || "no method could run" };
  }
  const v = (m: MethodEstimate) => m.vo2MlMin.value as number;
  let best: MethodEstimate[] = [];
  let bestScore = Infinity;
  for (const anchor of usable) {
    const group = usable.filter((m) => Math.abs(v(m) - v(anchor)) <= tol * Math.max(v(m), v(anchor)));
    // pairwise agreement within the group
    const ok = group.filter((m) => group.every((o) => Math.abs(v(m) - v(o)) <= tol * Math.max(v(m), v(o))));
    const score = -ok.length * 100 + ok.reduce((s, m) => s + QUALITY_RANK[m.quality], 0);
    if (ok.length > best.length || (ok.length === best.length && score < bestScore)) {
      best = ok;
      bestScore = score;
    }
  }
  const values = best.map(v).sort((a, b) => a - b);
  const pooled = options.weights
    ? weightedMedian(
        usable.map(v),
        usable.map(
          (m) => (options.weights?.[`${m.id}:${m.quality}`] ?? options.weights?.[m.id] ?? 1) * (m.quality === "poor" ? 0.5 : 1),
        ),
      )
    : NaN;
  if (best.length >= 2) {
    const mid = values.length >> 1;
    const est = Number.isFinite(pooled) ? pooled : values.length % 2 ? values[mid] : (values[mid - 1] + values[mid]) / 2;
    const spread = (values[values.length - 1] - values[0]) / est;
    const allAgree = best.length === usable.length;
    const goodCount = best.filter((m) => m.quality === "good").length;
    const confidence: ThresholdConfidence = allAgree && spread <= highSpread && goodCount >= 1 ? "high" : "moderate";
    const reason =
      confidence === "high"
        ? undefined
        : !allAgree
          ? `${usable.length - best.length === 1 ? "one method disagreed" : `${usable.length - best.length} methods disagreed`} beyond ${Math.round(tol * 100)} %`
          : spread > highSpread
            ? `methods agree within ${Math.ceil(spread * 100)} % (high confidence needs ${Math.round(highSpread * 100)} %)`
            : `methods agree within ${Math.max(1, Math.ceil(spread * 100))} %, but no method's fit is rated good`;
    return {
      vo2MlMin: est,
      confidence,
      methodIds: best.map((m) => m.id),
      band: { lowMlMin: values[0], highMlMin: values[values.length - 1] },
      reason,
    };
  }
  // no two agree
  let chosen: MethodEstimate;
  if (usable.length >= 3) {
    const sorted = [...usable].sort((a, b) => v(a) - v(b));
    chosen = sorted[sorted.length >> 1];
  } else {
    chosen = [...usable].sort(
      (a, b) => QUALITY_RANK[a.quality] - QUALITY_RANK[b.quality] || rank(pref, a.id) - rank(pref, b.id),
    )[0];
  }
  const all = usable.map(v);
  return {
    vo2MlMin: Number.isFinite(pooled) ? pooled : v(chosen),
    confidence: "low",
    methodIds: [chosen.id],
    band: { lowMlMin: Math.min(...all), highMlMin: Math.max(...all) },
    reason:
      usable.length === 1
        ? "only one method could place the threshold; confirm by review"
        : "the methods disagree; confirm by review",
  };
}

function rank(pref: string[], id: string): number {
  const i = pref.indexOf(id);
  return i < 0 ? pref.length : i;
}
