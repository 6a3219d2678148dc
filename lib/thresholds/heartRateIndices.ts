import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { fieldSeries, provenanceOf, restSpan, WindowMeans } from "./indexSeries";
import { interpolateLinear } from "../numeric/interpolate";

export interface HeartRateOptions {
  /** Peak HR as measured (see measurePeaks). */
  peakHr: Measured;
  /** Predicted HRmax, bpm, from the chosen equation. When absent: 220 − age (Fox; used by Cole 1999). */
  predictedHrMaxBpm?: number;
  /** Id of the equation behind `predictedHrMaxBpm`, carried into provenance. */
  predictedHrMaxEquationId?: string;
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
    : notDetermined("1/min", restProv, rest ? "no HR at rest" : "no rest phase marked");

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
      : notDetermined("1/min", reserveProv, "peak or predicted HR not determinable");
  const pctProv = provenanceOf("hr-percent-predicted", "peak HR as % of predicted HRmax", ["respir-res-2021-guide"], { inputs });
  const pct =
    pk !== null && pr !== null
      ? measured((100 * pk) / pr, "%", pctProv)
      : notDetermined("%", pctProv, "peak or predicted HR not determinable");

  const cutoff = options.betaBlocker ? CHRONOTROPIC_INDEX_CUTOFF_BETA_BLOCKER : CHRONOTROPIC_INDEX_CUTOFF;
  const ciProv = provenanceOf(
    "chronotropic-index-cole-1999",
    "chronotropic index (HRpeak − HRrest)/(HRpred − HRrest)",
    options.betaBlocker ? ["cole-1999", "brubaker-kitzman-beta-blocker"] : ["cole-1999"],
    { inputs: { ...inputs, cutoff } },
  );
  let ci: Measured;
  if (pk === null || pr === null || rs === null)
    ci = notDetermined("1", ciProv, "peak, predicted or resting HR not determinable");
  else if (!(pr - rs > 0)) ci = notDetermined("1", ciProv, "predicted HRmax is not above resting HR");
  else ci = measured((pk - rs) / (pr - rs), "1", ciProv);

  const ex = test.exercise;
  const recovery = (afterS: number, abnormalAt: number, sourceId: string): { m: Measured; abnormal: boolean | null } => {
    const prov = provenanceOf(
      `hr-recovery-${afterS}s`,
      `HR recovery: peak HR − HR ${afterS} s after the end of exercise (interpolated)`,
      [sourceId],
      {
        window: ex ? { startS: ex.endS, endS: ex.endS + afterS } : undefined,
        inputs: { peakBpm: pk, abnormalAtOrBelowBpm: abnormalAt },
      },
    );
    if (!ex) return { m: notDetermined("1/min", prov, "end of exercise not known"), abnormal: null };
    if (pk === null) return { m: notDetermined("1/min", prov, "peak HR not determinable"), abnormal: null };
    const v = interpolateLinear(hr.t, hr.v, ex.endS + afterS);
    if (!Number.isFinite(v)) return { m: notDetermined("1/min", prov, `no HR data ${afterS} s into recovery`), abnormal: null };
    const d = pk - v;
    return { m: measured(d, "1/min", { ...prov, inputs: { ...prov.inputs, recoveryHrBpm: v } }), abnormal: d <= abnormalAt };
  };
  const r1 = recovery(60, HR_RECOVERY_1MIN_ABNORMAL_BPM, "cole-1999");
  const r2 = recovery(120, HR_RECOVERY_2MIN_ABNORMAL_BPM, "cole-2000");
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
