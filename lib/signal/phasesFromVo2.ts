import { makeIssue, type Issue } from "../core";
import type { BreathRow } from "../breath";
import { binByTime } from "../numeric";
import type { PhaseSpan } from "./types";

/** Bin length for the VO2 course, s (our choice). */
const BIN_S = 10;
/** Rolling window over the bins for the peak, s: the usual 30-s averaging of peak VO2 (common practice). */
const PEAK_WINDOW_S = 30;
/** The peak must be at least this many times the lowest 30-s VO2 before it to read as an exercise test (our choice). */
const MIN_RISE_RATIO = 1.5;
/** Shortest warm-up plateau, s (the 60-s floor of the load-based rule; our choice). */
const MIN_WARMUP_S = 60;

export interface Vo2Phases {
  phases: PhaseSpan[];
  exercise: { startS: number; endS: number } | null;
}

/**
 * Phases of a test from the course of VO2 alone, for files with no phase markers, no work rate, speed or grade.
 * VO2 is averaged into 10-s bins; the end of exercise is the last breath of the highest 30-s mean (so the peak window lies inside it; it may
 * run a few breaths into recovery); the start is the break of a
 * rest level, an optional warm-up level and a straight rise fitted to the bins up to that peak (`rampStart`). Before the start is read as rest (it may hold a warm-up), after the end as recovery.
 * Because VO2 lags the load (phase II time constant 20–80 s; Whipp, Ward, Lamarra et al. 1982, J Appl Physiol, recalled),
 * the start found lies after the true start of the increment by up to about that lag, and a warm-up at a constant load is not told from rest: the
 * warning says so. Returns null exercise (with a warning) when VO2 does not rise at least 1.5-fold.
 * O(n) for the bins plus the hinge search over the bins.
 */
export function phasesFromVo2(rows: readonly BreathRow[], issues: Issue[]): Vo2Phases {
  const t: number[] = [];
  const v: number[] = [];
  for (const r of rows)
    if (Number.isFinite(r.timeS) && r.vo2MlMin !== undefined && Number.isFinite(r.vo2MlMin)) {
      t.push(r.timeS);
      v.push(r.vo2MlMin);
    }
  const fail = (why: string): Vo2Phases => {
    issues.push(
      makeIssue(
        "warning",
        "phases-not-found",
        `No phase markers and no work rate, speed or grade, and ${why}: the phases of the test could not be found. Add a phase column or a work-rate column.`,
      ),
    );
    return { phases: [], exercise: null };
  };
  if (t.length < 20 || t[t.length - 1] - t[0] < 6 * BIN_S) return fail("too few breaths with VO2 to follow its course");
  const bins = binByTime(t, [t, v], { startS: t[0], endS: t[t.length - 1] + 1e-9, binS: BIN_S });
  const bt: number[] = [];
  const bv: number[] = [];
  for (let b = 0; b < bins.counts.length; b++)
    if (bins.counts[b] > 0 && Number.isFinite(bins.means[1][b])) {
      bt.push(bins.means[0][b]);
      bv.push(bins.means[1][b]);
    }
  const w = Math.max(1, Math.round(PEAK_WINDOW_S / BIN_S));
  if (bv.length < w + 8) return fail("too few breaths with VO2 to follow its course");
  // 30-s means of the bins, each ending at bin b (running sum); the highest, and the lowest before it
  const windowMean = new Float64Array(bv.length).fill(NaN);
  let sum = 0;
  for (let b = 0; b < bv.length; b++) {
    sum += bv[b] - (b >= w ? bv[b - w] : 0);
    if (b >= w - 1) windowMean[b] = sum / w;
  }
  let peakEnd = w - 1;
  for (let b = w; b < bv.length; b++) if (windowMean[b] > windowMean[peakEnd]) peakEnd = b;
  const best = windowMean[peakEnd];
  let lowest = Infinity;
  for (let b = w - 1; b <= peakEnd; b++) lowest = Math.min(lowest, windowMean[b]);
  if (!(best >= MIN_RISE_RATIO * lowest)) return fail("VO2 does not rise 1.5-fold over the record");
  const first = t[0];
  const startS = rampStart(bt, bv, peakEnd) ?? first;
  // the end: the last breath of the highest 30-s mean, so that the peak window lies inside the exercise phase
  const peakBinEnd = first + (Math.floor((bt[peakEnd] - first) / BIN_S) + 1) * BIN_S;
  let endIdx = 0;
  for (let i = 0; i < t.length && t[i] < peakBinEnd; i++) endIdx = i;
  const endS = t[endIdx];
  if (!(endS > startS)) return fail("no rise of VO2 could be placed before its peak");
  const firstEx = t.findIndex((x) => x >= startS);
  const phases: PhaseSpan[] = [];
  if (firstEx > 0) phases.push({ phase: "rest", startS: first, endS: t[firstEx], source: "vo2" });
  phases.push({ phase: "exercise", startS: t[firstEx], endS, source: "vo2" });
  if (endIdx + 1 < t.length) phases.push({ phase: "recovery", startS: t[endIdx + 1], endS: t[t.length - 1], source: "vo2" });
  issues.push(
    makeIssue(
      "warning",
      "phases-from-vo2",
      `No phase markers and no work rate, speed or grade: the exercise phase was estimated from the course of VO2 ` +
        `(${Math.round(t[firstEx] - first)}–${Math.round(endS - first)} s from the start of the record: from where VO2 begins to rise to its peak). ` +
        `VO2 lags the load, so the start may lie up to a minute late, and a warm-up is not told from rest. Check the phases, or add a phase or work-rate column.`,
    ),
  );
  return { phases, exercise: { startS: t[firstEx], endS } };
}

/**
 * Start of the incremental rise in the bins up to `peakEnd`, by least squares over all of them: a level L1 (rest),
 * from a step at s a level L2 (a warm-up, at least 60 s long; s at the first bin means no warm-up), and from τ a
 * straight rise L2 + b·(t − τ) to the peak (continuous at τ, b > 0). Every (s, τ) pair of bin times is tried with
 * prefix sums, O(1) each, O(bins²) in all. One flat level from the start of the record would have to average rest and
 * warm-up and puts the start at the rest-to-warm-up step. Our choice.
 */
function rampStart(bt: readonly number[], bv: readonly number[], peakEnd: number): number | null {
  const n = peakEnd + 1;
  const c = (f: (b: number) => number) => {
    const out = new Float64Array(n + 1);
    for (let b = 0; b < n; b++) out[b + 1] = out[b] + f(b);
    return out;
  };
  const Y = c((b) => bv[b]);
  const YY = c((b) => bv[b] * bv[b]);
  const T = c((b) => bt[b]);
  const TT = c((b) => bt[b] * bt[b]);
  const TY = c((b) => bt[b] * bv[b]);
  const sum = (P: Float64Array, from: number, to: number) => P[to] - P[from]; // bins [from, to)
  let best: { sse: number; tau: number } | null = null;
  for (let k = 3; k <= peakEnd - 3; k++) {
    const tau = bt[k];
    const m = n - (k + 1); // bins above τ
    const sz = sum(T, k + 1, n) - tau * m;
    const szz = sum(TT, k + 1, n) - 2 * tau * sum(T, k + 1, n) + tau * tau * m;
    const szyAbove = sum(TY, k + 1, n) - tau * sum(Y, k + 1, n);
    for (let a = 0; a <= k - 2; a++) {
      if (a > 0 && (a < 3 || tau - bt[a] < MIN_WARMUP_S)) continue;
      const sseA = a > 0 ? sum(YY, 0, a) - sum(Y, 0, a) ** 2 / a : 0;
      const nb = n - a;
      const sy = sum(Y, a, n);
      const den = nb * szz - sz * sz;
      if (!(den > 0)) continue;
      const slope = (nb * szyAbove - sz * sy) / den;
      if (!(slope > 0)) continue;
      const sseB = sum(YY, a, n) - (sy * sy) / nb - slope * (szyAbove - (sz * sy) / nb);
      const sse = sseA + sseB;
      if (!best || sse < best.sse) best = { sse, tau };
    }
  }
  return best ? best.tau : null;
}
