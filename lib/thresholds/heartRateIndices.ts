import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import { linearRegression } from "../numeric";
import type { BreathRow } from "../breath";
import type { ConditionedTest } from "../signal";
import { CHANNEL_GAP_MIN_S, channelGaps, describeChannelGap } from "./channelGaps";
import { fieldSeries, provenanceOf, restSpan, WindowMeans } from "./indexSeries";
import { AVERAGED_ROW_INTERVAL_S, medianRowIntervalS } from "./rowSpacing";

export interface HeartRateOptions {
  /** Peak HR as measured (see measurePeaks). */
  peakHr: Measured;
  /** Predicted HRmax, bpm, from the chosen equation. When absent: 220 − age (Fox; used by Cole 1999). */
  predictedHrMaxBpm?: number;
  /** Id of the equation behind `predictedHrMaxBpm`, carried into provenance. */
  predictedHrMaxEquationId?: string;
  /**
   * The lab's chosen HRmax equation could not give a value (e.g. "needs sex"): predicted HRmax is then not
   * determinable with this reason, and 220 − age is not put in its place, so one result holds one predicted HRmax.
   */
  predictedHrMaxNotDeterminedReason?: string;
  ageY?: number;
  betaBlocker?: boolean;
  /** Resting HR = mean of the last `restLastS` s of rest. @default 60 */
  restLastS?: number;
}

export interface HeartRateIndices {
  restingBpm: Measured;
  peakBpm: Measured;
  predictedMaxBpm: Measured;
  percentPredicted: Measured;
  /** Predicted HRmax − peak HR. */
  reserveBpm: Measured;
  /** (HRpeak − HRrest)/(HRpred − HRrest) (Cole 1999). */
  chronotropicIndex: Measured;
  chronotropicCutoff: number;
  /** index < cut-off; null when not determinable. */
  chronotropicImpaired: boolean | null;
  /** Peak HR − HR 60 s after the end of exercise. */
  recovery1MinBpm: Measured;
  /** ≤ 12 bpm (Cole 1999). */
  recovery1MinAbnormal: boolean | null;
  /** Peak HR − HR 120 s after the end of exercise. */
  recovery2MinBpm: Measured;
  /** ≤ 42 bpm (Cole 2000, after a submaximal test). */
  recovery2MinAbnormal: boolean | null;
  issues: Issue[];
}

/** Chronotropic index cut-off: < 0.80 impaired (Cole 1999 NEJM, confirmed). */
export const CHRONOTROPIC_INDEX_CUTOFF = 0.8;
/** On beta-blockers: < 0.62 (Brubaker & Kitzman, recalled). */
export const CHRONOTROPIC_INDEX_CUTOFF_BETA_BLOCKER = 0.62;
/** HR recovery at 1 min ≤ 12 bpm abnormal (Cole 1999 NEJM 341:1351, confirmed). */
export const HR_RECOVERY_1MIN_ABNORMAL_BPM = 12;
/** HR recovery at 2 min ≤ 42 bpm abnormal (Cole 2000 Ann Intern Med 132:552, confirmed). */
export const HR_RECOVERY_2MIN_ABNORMAL_BPM = 42;
/**
 * The recovery each cut-off was set with: Cole 1999, a cool-down walk after a symptom-limited treadmill test
 * (clinical-reference §2, confirmed); Cole 2000, after a submaximal test (confirmed). The recovery protocol of the test at
 * hand is not recorded, so the value's method names it.
 */
const HR_RECOVERY_PROTOCOL: Record<string, string> = {
  "cole-1999": "a cool-down walk after a symptom-limited treadmill test (Cole 1999)",
  "cole-2000": "recovery after a submaximal exercise test (Cole 2000)",
};
/**
 * HR recovery is not read from rows this many seconds apart or more (time averages exported by the cart, or stage
 * values): our choice, measured on the INVENTED normal-adult and heart-failure demo tests exported as 10-, 15- and 30-s
 * bins and compared with the same tests' breaths (answers known by construction; breaths 27.9 and 12.7 bpm at 1 min).
 * Read as breaths, the bins gave 24.2/15.8/10.0 and 9.5/7.9/6.0 bpm. With the end of exercise placed inside the row that
 * spans it (`placeEndOfExercise`) they gave 28.0/26.4/25.0 and 11.3/11.0/10.6 bpm, within the stated margin of one
 * row's HR fall, which was ±4.5/±7.0/±13.5 and ±2.3/±2.7/±4.9 bpm. From 15 s on the margin is more than half the
 * 12-bpm cut-off in the normal test and a 15-s row spans a quarter of the minute being measured, so the value is
 * withheld rather than given with a margin that large.
 */
export const HR_RECOVERY_MAX_ROW_INTERVAL_S = 15;

/**
 * Heart-rate indices: resting HR (mean of the last minute of rest, implementation choice), HR reserve
 * (predicted HRmax − peak), % predicted, chronotropic index (Cole et al. 1999 NEJM, confirmed: impaired
 * < 0.80; < 0.62 on beta-blockers, recalled), HR recovery at 1 min (Cole 1999: ≤ 12 bpm abnormal) and 2 min
 * (Cole 2000: ≤ 42 bpm abnormal). Recovery HR is linearly interpolated from the breaths at end + 60 s and
 * end + 120 s (needs recovery data on both sides of that time).
 *
 * @example peak 150, rest 70, predicted 170 → chronotropic index (150−70)/(170−70) = 0.80 → not impaired
 */
export function heartRateIndices(test: ConditionedTest, options: HeartRateOptions): HeartRateIndices {
  const issues: Issue[] = [];
  const restLastS = options.restLastS ?? 60;
  const rest = restSpan(test, restLastS);
  const hr = fieldSeries(test.clean, "hrBpm");
  const restProv = provenanceOf("rest-mean", `resting HR: mean of the last ${restLastS} s of rest`, ["implementation-choice"], {
    window: rest ?? undefined,
  });
  const restV = rest ? new WindowMeans(hr).mean(rest.startS, rest.endS).mean : NaN;
  const resting = Number.isFinite(restV)
    ? measured(restV, "1/min", restProv)
    : notDetermined("1/min", restProv, rest ? "no HR in the rest phase" : "the recording has no rest phase");

  let predicted: Measured;
  if (options.predictedHrMaxBpm && options.predictedHrMaxBpm > 0) {
    predicted = measured(
      options.predictedHrMaxBpm,
      "1/min",
      provenanceOf(
        options.predictedHrMaxEquationId ?? "predicted-hrmax",
        "predicted HRmax (chosen equation)",
        options.predictedHrMaxEquationId ? [options.predictedHrMaxEquationId] : ["common-practice"],
      ),
    );
  } else if (options.predictedHrMaxNotDeterminedReason) {
    predicted = notDetermined(
      "1/min",
      provenanceOf(options.predictedHrMaxEquationId ?? "predicted-hrmax", "predicted HRmax (chosen equation)", [
        options.predictedHrMaxEquationId ?? "common-practice",
      ]),
      `predicted HRmax not determinable: ${options.predictedHrMaxNotDeterminedReason}`,
    );
  } else if (options.ageY !== undefined && options.ageY > 0) {
    predicted = measured(
      220 - options.ageY,
      "1/min",
      provenanceOf("hrmax-220-minus-age", "predicted HRmax = 220 − age", ["fox-hrmax", "cole-1999"], {
        inputs: { ageY: options.ageY },
      }),
    );
    issues.push(
      makeIssue(
        "info",
        "hrmax-default-equation",
        "Predicted HRmax uses 220 − age (the form used by Cole 1999) because no equation was chosen.",
      ),
    );
  } else {
    predicted = notDetermined(
      "1/min",
      provenanceOf("predicted-hrmax", "predicted HRmax", ["fox-hrmax"]),
      "age not given and no predicted HRmax",
    );
  }
  const peak = options.peakHr;
  const pk = peak.value;
  const pr = predicted.value;
  const rs = resting.value;
  const inputs = { peakBpm: pk, predictedBpm: pr, restBpm: rs };
  const reserveProv = provenanceOf("hr-reserve", "HR reserve = predicted HRmax − peak HR", ["respir-res-2021-guide"], { inputs });
  const reserve =
    pk !== null && pr !== null
      ? measured(pr - pk, "1/min", reserveProv)
      : notDetermined("1/min", reserveProv, hrInputReason(peak, predicted));
  const pctProv = provenanceOf("hr-percent-predicted", "peak HR as % of predicted HRmax", ["respir-res-2021-guide"], { inputs });
  const pct =
    pk !== null && pr !== null
      ? measured((100 * pk) / pr, "%", pctProv)
      : notDetermined("%", pctProv, hrInputReason(peak, predicted));

  const cutoff = options.betaBlocker ? CHRONOTROPIC_INDEX_CUTOFF_BETA_BLOCKER : CHRONOTROPIC_INDEX_CUTOFF;
  // The index is read against Cole 1999's cut-off, derived with HRpred = 220 − age (its source note): it uses that form,
  // whatever HRmax equation the lab chose for HR % predicted and HR reserve, so value and cut-off belong together
  const ciPred = options.ageY !== undefined && options.ageY > 0 ? 220 - options.ageY : null;
  const ciProv = provenanceOf(
    "chronotropic-index-cole-1999",
    "chronotropic index (HRpeak − HRrest)/(HRpred − HRrest), HRpred = 220 − age as in the source of its cut-off",
    options.betaBlocker ? ["cole-1999", "fox-hrmax", "brubaker-kitzman-beta-blocker"] : ["cole-1999", "fox-hrmax"],
    { inputs: { peakBpm: pk, predictedBpm: ciPred, restBpm: rs, cutoff } },
  );
  let ci: Measured;
  if (pk === null) ci = notDetermined("1", ciProv, `no peak HR: ${peak.reason ?? "not determinable"}`);
  else if (ciPred === null) ci = notDetermined("1", ciProv, "no age: HRpred = 220 − age needs it");
  else if (rs === null) ci = notDetermined("1", ciProv, `no resting HR: ${resting.reason ?? "not determinable"}`);
  else if (!(ciPred - rs > 0)) ci = notDetermined("1", ciProv, "220 − age is not above resting HR");
  else ci = measured((pk - rs) / (ciPred - rs), "1", ciProv);

  const ex = test.exercise;
  const end = ex ? placeEndOfExercise(test, ex.endS) : null;
  const endGap = channelGaps(test, "hrBpm").find((g) => g.reachesExerciseEnd) ?? null;
  const rowsAfterEnd = ex ? test.clean.filter((r) => r.timeS > ex.endS) : [];
  const coarse = end !== null && end.rowIntervalS >= HR_RECOVERY_MAX_ROW_INTERVAL_S;
  const rowKind = test.shape === "stage" ? "time averages or stage values" : "time averages";
  const margins: string[] = [];
  const nearCutoff: string[] = [];
  const recovery = (afterS: number, abnormalAt: number, sourceId: string): { m: Measured; abnormal: boolean | null } => {
    const prov = provenanceOf(
      `hr-recovery-${afterS}s`,
      `HR recovery: peak HR − HR ${afterS} s after the end of exercise (interpolated); the ≤ ${abnormalAt} bpm cut-off was set with ${HR_RECOVERY_PROTOCOL[sourceId]}, so after another kind of recovery read it with care`,
      [sourceId],
      {
        window: end ? { startS: end.readS, endS: end.readS + afterS } : undefined,
        inputs: { peakBpm: pk, abnormalAtOrBelowBpm: abnormalAt },
        averaging: end?.averaged ? `rows about ${Math.round(end.rowIntervalS)} s apart (${rowKind})` : undefined,
      },
    );
    const nd = (reason: string) => ({ m: notDetermined("1/min", prov, reason), abnormal: null });
    if (!ex || !end) return nd("end of exercise not known");
    if (pk === null) return nd(`no peak HR: ${peak.reason ?? "not determinable"}`);
    if (coarse)
      return nd(
        `the rows are ${rowKind} about ${Math.round(end.rowIntervalS)} s apart: HR ${afterS} s after the end of exercise cannot be placed from them (the end of exercise falls inside one row and HR falls fastest early in recovery); breath-by-breath HR or averages shorter than ${HR_RECOVERY_MAX_ROW_INTERVAL_S} s are needed`,
      );
    if (endGap) return nd(`${describeChannelGap(endGap)}: HR at the end of exercise is unknown`);
    if (rowsAfterEnd.length === 0) return nd("no recovery recorded: the record ends with exercise");
    if (!rowsAfterEnd.some((r) => typeof r.hrBpm === "number" && Number.isFinite(r.hrBpm))) return nd("no HR in recovery");
    const at = end.readS + afterS;
    const read = readHrAt(hr, at);
    if (read === "after-last") {
      const lastS = hr.t[hr.t.length - 1];
      return nd(
        `recovery HR recorded for only ${Math.max(0, Math.round(lastS - ex.endS))} s after the end of exercise (${afterS} s needed)`,
      );
    }
    if (typeof read !== "number")
      return nd(`HR missing from ${Math.round(read.fromS)} to ${Math.round(read.toS)} s, around ${afterS} s into recovery`);
    const d = pk - read;
    const inputs: Record<string, number | string | null> = { ...prov.inputs, recoveryHrBpm: read };
    if (!end.averaged) {
      // breath by breath, one breath's HR is read at the time: its scatter about the local course of HR is the margin
      // (1.28 × the residual SD of the breath HRs within ±15 s about a line, an 80 % two-sided normal interval, as the
      // reported bands; our choice); a call the margin straddles is withheld, as for time-averaged rows
      const marginBpm = breathHrMargin(hr, at);
      if (!Number.isFinite(marginBpm)) return { m: measured(d, "1/min", { ...prov, inputs }), abnormal: d <= abnormalAt };
      const withheld = marginBpm > 0 && Math.abs(d - abnormalAt) < marginBpm;
      if (withheld)
        nearCutoff.push(
          `${d.toFixed(1)} bpm at ${afterS / 60} min is within ±${marginBpm.toFixed(1)} bpm of the ≤ ${abnormalAt} bpm cut-off`,
        );
      return {
        m: measured(d, "1/min", { ...prov, inputs: { ...inputs, marginBpm } }),
        abnormal: withheld ? null : d <= abnormalAt,
      };
    }
    // time-averaged rows: a margin of one row's HR fall at the reading (our choice): the row labelled as the last of
    // exercise may itself hold the first seconds of recovery, so the end can be off by up to one row
    const slope = (readHrNumber(hr, at + end.rowIntervalS) - readHrNumber(hr, at - end.rowIntervalS)) / (2 * end.rowIntervalS);
    const marginBpm = Number.isFinite(slope) ? Math.abs(slope) * end.rowIntervalS : NaN;
    const withheld = !(Math.abs(d - abnormalAt) > marginBpm);
    margins.push(
      `±${Number.isFinite(marginBpm) ? marginBpm.toFixed(1) : "?"} bpm at ${afterS / 60} min` +
        (withheld ? ` (the ≤ ${abnormalAt} bpm call is withheld: the cut-off lies within it)` : ""),
    );
    return {
      m: measured(d, "1/min", {
        ...prov,
        inputs: { ...inputs, marginBpm, endFractionOfRow: end.fraction, hrAtEndBpm: readHrNumber(hr, end.readS) },
      }),
      abnormal: withheld ? null : d <= abnormalAt,
    };
  };
  const r1 = recovery(60, HR_RECOVERY_1MIN_ABNORMAL_BPM, "cole-1999");
  const r2 = recovery(120, HR_RECOVERY_2MIN_ABNORMAL_BPM, "cole-2000");
  if (nearCutoff.length > 0)
    issues.push(
      makeIssue(
        "info",
        "hr-recovery-near-cutoff",
        `HR recovery ${nearCutoff.join("; ")}, the scatter of breath-by-breath HR around the reading (1.28 × its SD): the abnormal/normal call is withheld; read the HR trace in recovery.`,
        { field: "hrBpm" },
      ),
    );
  if (end?.averaged && !coarse && margins.length > 0)
    issues.push(
      makeIssue(
        "info",
        "hr-recovery-from-averaged-rows",
        `HR recovery is read from ${rowKind} about ${Math.round(end.rowIntervalS)} s apart, not single breaths: the end of exercise was placed ${Math.round(100 * end.fraction)} % of the way into the row that spans it (${end.how}), and the values are approximate (${margins.join("; ")}).`,
        { field: "hrBpm" },
      ),
    );
  return {
    restingBpm: resting,
    peakBpm: peak,
    predictedMaxBpm: predicted,
    percentPredicted: pct,
    reserveBpm: reserve,
    chronotropicIndex: ci,
    chronotropicCutoff: cutoff,
    chronotropicImpaired: ci.value === null ? null : ci.value < cutoff,
    recovery1MinBpm: r1.m,
    recovery1MinAbnormal: r1.abnormal,
    recovery2MinBpm: r2.m,
    recovery2MinAbnormal: r2.abnormal,
    issues,
  };
}

/** Reason for a null HR reserve or % predicted: which input is missing, and why. */
function hrInputReason(peak: Measured, predicted: Measured): string {
  if (peak.value === null) return `no peak HR: ${peak.reason ?? "not determinable"}`;
  return `no predicted HRmax: ${predicted.reason ?? "not determinable"}`;
}

/** Where HR recovery readings start, on the rows' own time labels. */
interface EndOfExercise {
  /** Time label from which "60 s after the end of exercise" is counted. s */
  readS: number;
  /** Median spacing of the rows from the exercise start on. s */
  rowIntervalS: number;
  /** Rows are time averages (or stage values), not single breaths (`AVERAGED_ROW_INTERVAL_S`). */
  averaged: boolean;
  /** Averaged rows: fraction of the row spanning the end of exercise that was still exercise (0–1). */
  fraction: number;
  /** Averaged rows: how the end was placed, in plain words. */
  how: string;
}

/**
 * Breaths: the end of exercise is the last exercise breath (unchanged). Time-averaged rows: the last exercise row
 * holds only exercise, so the end lies in the row after it, which mixes exercise and recovery. Its work rate (or speed)
 * between the last exercise row's and the next row's gives the fraction of it still in exercise (our choice; half a
 * row when there is no load signal). On the rows' own labels a row's value sits at its label and rows meet halfway
 * between labels, so the end is read at lastLabel + interval/2 + fraction × interval whether the cart labels a row
 * by its start, centre or end, and the +60 s reading shifts with it.
 */
function placeEndOfExercise(test: ConditionedTest, exEndS: number): EndOfExercise {
  const rows = test.clean;
  const startS = test.exercise?.startS ?? -Infinity;
  const rowIntervalS = medianRowIntervalS(rows.filter((r) => r.timeS >= startS).map((r) => r.timeS));
  const averaged = rowIntervalS >= AVERAGED_ROW_INTERVAL_S;
  if (!averaged) return { readS: exEndS, rowIntervalS, averaged, fraction: 0, how: "last exercise breath" };
  let i = -1;
  for (let k = 0; k < rows.length && rows[k].timeS <= exEndS; k++) i = k;
  const prev = rows[i];
  const next = rows[i + 1];
  if (!prev || !next) return { readS: exEndS, rowIntervalS, averaged, fraction: 0, how: "last exercise row" };
  const dS = next.timeS - prev.timeS;
  const after = rows[i + 2];
  const loadOf = (r: BreathRow | undefined): number =>
    r === undefined ? NaN : typeof r.workW === "number" ? r.workW : typeof r.speedKmh === "number" ? r.speedKmh : NaN;
  const [wPrev, wNext, wAfter] = [loadOf(prev), loadOf(next), loadOf(after)];
  const byLoad = [wPrev, wNext, wAfter].every(Number.isFinite) && wPrev - wAfter > 0;
  const fraction = byLoad ? Math.min(1, Math.max(0, (wNext - wAfter) / (wPrev - wAfter))) : 0.5;
  return {
    readS: prev.timeS + dS / 2 + fraction * dS,
    rowIntervalS,
    averaged,
    fraction,
    how: byLoad ? "from its work rate" : "halfway, with no load signal to place it",
  };
}

/**
 * HR at `atS` by linear interpolation between the rows carrying HR; "after-last" beyond the last one, or the
 * bracketing rows when they are `CHANNEL_GAP_MIN_S` or more apart (HR missing there).
 */
function readHrAt(hr: { t: number[]; v: number[] }, atS: number): number | "after-last" | { fromS: number; toS: number } {
  const n = hr.t.length;
  if (n === 0 || atS > hr.t[n - 1]) return "after-last";
  let hi = 0;
  while (hi < n && hr.t[hi] < atS) hi++;
  if (hr.t[hi] === atS) return hr.v[hi];
  if (hi === 0) return { fromS: atS, toS: hr.t[0] };
  const lo = hi - 1;
  if (hr.t[hi] - hr.t[lo] >= CHANNEL_GAP_MIN_S) return { fromS: hr.t[lo], toS: hr.t[hi] };
  return hr.v[lo] + ((atS - hr.t[lo]) / (hr.t[hi] - hr.t[lo])) * (hr.v[hi] - hr.v[lo]);
}

/**
 * The scatter of breath-by-breath HR about its local course at `atS`: 1.28 × the residual SD of the breaths within
 * ±15 s about a least-squares line (our choice). NaN with fewer than 6 breaths there.
 */
function breathHrMargin(hr: { t: number[]; v: number[] }, atS: number): number {
  const near = hr.t.flatMap((t, i) => (Math.abs(t - atS) <= 15 && Number.isFinite(hr.v[i]) ? [i] : []));
  if (near.length < 6) return NaN;
  const fit = linearRegression(
    near.map((i) => hr.t[i]),
    near.map((i) => hr.v[i]),
  );
  // prefix-sum rounding leaves a scatter of ~1e-6 bpm on a noise-free line: below 0.01 bpm there is none (HR is whole bpm)
  const margin = 1.28 * Math.sqrt(Math.max(0, fit.sse) / (fit.n - 2));
  return margin < 0.01 ? 0 : margin;
}

function readHrNumber(hr: { t: number[]; v: number[] }, atS: number): number {
  const v = readHrAt(hr, atS);
  return typeof v === "number" ? v : NaN;
}
