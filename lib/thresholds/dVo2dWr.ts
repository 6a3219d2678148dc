import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import { PrefixSums } from "../numeric/linearRegression";
import type { ConditionedTest } from "../signal";
import { breathLevelBands, exerciseSpan, pairedSeries, provenanceOf } from "./indexSeries";
import type { ThresholdPoint } from "./valuesAtThreshold";
import { lineIndexFromFit, withIndexBand, type LineIndex } from "./veVco2Slope";

export interface DVo2dWrOptions {
  /** Start of the ramp excluded for the VO2 response lag, seconds (method detail recalled). Stage tables: 0. @default 60 */
  lagS?: number;
  vt1?: ThresholdPoint | null;
  vt2?: ThresholdPoint | null;
  /** End the fit at VT2 instead of end of exercise. @default false */
  stopAtVt2?: boolean;
  /** Flattening flag when the upper-segment slope is below this fraction of the lower one (implementation choice). @default 0.8 */
  flatteningRatio?: number;
  /**
   * Below this r² the whole-ramp line is still reported, with a warning that VO2 follows the work rate loosely. 0.5 is our
   * choice, as for the VE/VCO2 slope (`minToVt2R2`). On the six synthetic models (invented data, 240 tests each) it warns
   * on 10 of 390 tests with a work rate at moderate noise (median error 4.2–11.6 % against 1.2–2.8 % for the others) and
   * 60 of 393 at high noise (5.6–15.3 % against 2.0–4.6 %), none at low noise; on the 18 real ACTES recordings on one
   * (r² 0.28, 3.0 mL/min/W, VO2 about 1.4 L/min at 170 W). @default 0.5
   */
  looseFitR2?: number;
}

/**
 * Whole-ramp ΔVO2/ΔWR (mL/min/W) below which VO2 is doubted: 8.29 − 2 × 1.17 ≈ 6.0, the lower end of the men with
 * circulatory disorders in Hansen 1987 (confirmed, `hansen-1987-vo2-wr`; 4 SD below its normal men, 10.29 ± 1.01). Below
 * it a warning asks for the cart and the ergometer to be checked, and the value is still read: severe oxygen-delivery
 * limitation can reach it. The 2 SD is our choice.
 */
export const SUSPECT_DVO2_DWR_ML_MIN_W = 6.0;

/**
 * Whole-ramp ΔVO2/ΔWR (mL/min/W) below which VO2-based values are shown but not interpreted: 8.29 − 3 × 1.17 ≈ 4.8, more
 * than 3 SD below the mean of Hansen 1987's men with circulatory disorders (confirmed; a small series, so no tail
 * fraction is claimed), where a leak, a calibration fault or a wrong work-rate record is far likelier than disease. The
 * 3 SD is our choice. A reviewer who checked the cart can have the values read (`AnalysisSettings.vo2Checked`).
 */
export const IMPLAUSIBLE_DVO2_DWR_ML_MIN_W = 4.8;

export interface DVo2dWrResult {
  /** OLS of VO2 (mL/min) on work rate (W) over the ramp after the lag window. */
  whole: LineIndex;
  /** Lower and upper segments, split at VT1 when given, else at two-thirds of the fitted span. */
  lower: LineIndex;
  upper: LineIndex;
  splitS: number | null;
  splitBy: "vt1" | "two-thirds" | null;
  /** Upper slope / lower slope. */
  upperToLowerRatio: Measured;
  /** true when the ratio is below `flatteningRatio`; null when not determinable. */
  flattening: boolean | null;
  /**
   * true when the whole-ramp slope is below `IMPLAUSIBLE_DVO2_DWR_ML_MIN_W`: VO2 rose too little with the work rate to be
   * believed (issue `vo2-too-low-for-work`, a warning), and VO2-based values are not interpreted; null when not
   * determinable. Between that and `SUSPECT_DVO2_DWR_ML_MIN_W` the issue `vo2-low-for-work` asks for a check only.
   */
  implausiblyLow: boolean | null;
  /** Reference: 10.29 ± 1.01 mL/min/W in 54 normal men (Am J Cardiol 1987;59:669, confirmed). */
  reference: { meanMlMinW: number; sdMlMinW: number; sourceId: string };
  issues: Issue[];
}

/**
 * ΔVO2/ΔWR: OLS slope of VO2 (mL/min) on work rate (W) during the incremental ramp, excluding its first
 * `lagS` s for the VO2 response lag (recalled method detail; clinical-reference §5.5), with a linearity check
 * (slope above vs below VT1, or last third vs earlier). Reference 10.29 ± 1.01 mL/min/W (Am J Cardiol
 * 1987;59:669, confirmed). One prefix-sum pass: the three fits cost O(1) after O(n).
 *
 * Degenerate cases: no work-rate signal (treadmill) or no spread in work rate → not determinable.
 */
export function dVo2dWr(test: ConditionedTest, options: DVo2dWrOptions = {}): DVo2dWrResult {
  const issues: Issue[] = [];
  const stage = test.shape === "stage";
  const lagS = stage ? 0 : (options.lagS ?? 60);
  const flatteningRatio = options.flatteningRatio ?? 0.8;
  const span = exerciseSpan(test);
  const endS = span ? (options.stopAtVt2 && options.vt2 ? Math.min(span.endS, options.vt2.timeS) : span.endS) : 0;
  const fitSpan = span ? { startS: span.startS + lagS, endS } : null;
  const pairs = pairedSeries(test.clean, "workW", "vo2MlMin", fitSpan);
  const sums = new PrefixSums(pairs.x, pairs.y);
  const units = { slope: "mL/min/W", intercept: "mL/min" };
  const minPoints = stage ? 3 : 10;
  const sourceIds = ["hansen-1987-vo2-wr", "vo2-lag-exclusion"];
  const averaging = stage ? "stage values" : "breath by breath (artefact-cleaned)";
  const wholeFit = lineIndexFromFit(
    sums,
    0,
    pairs.x.length,
    units,
    provenanceOf(
      "dvo2-dwr",
      `ΔVO2/ΔWR: OLS of VO2 on work rate${lagS ? `, first ${lagS} s of the ramp excluded` : ""}`,
      sourceIds,
      {
        window: fitSpan ?? undefined,
        averaging,
        inputs: { lagS },
      },
    ),
    minPoints,
  );
  // single breaths: the calibrated band (README-thresholds.md round 18); stage tables and time-averaged rows: none
  const whole = breathLevelBands(test) ? withIndexBand(wholeFit, pairs.x, pairs.y, 0, pairs.x.length, "dVo2dWr") : wholeFit;
  let splitS: number | null = null;
  let splitBy: DVo2dWrResult["splitBy"] = null;
  if (fitSpan && pairs.t.length > 0) {
    if (options.vt1 && options.vt1.timeS > fitSpan.startS && options.vt1.timeS < fitSpan.endS) {
      splitS = options.vt1.timeS;
      splitBy = "vt1";
    } else {
      splitS = fitSpan.startS + (2 / 3) * (fitSpan.endS - fitSpan.startS);
      splitBy = "two-thirds";
    }
  }
  let k = 0;
  if (splitS !== null) while (k < pairs.t.length && pairs.t[k] <= splitS) k++;
  const segLabel = splitBy === "vt1" ? "VT1" : "two-thirds of the fitted span";
  const lower = lineIndexFromFit(
    sums,
    0,
    k,
    units,
    provenanceOf("dvo2-dwr-lower", `ΔVO2/ΔWR below ${segLabel}`, [...sourceIds, "implementation-choice"], {
      window: fitSpan && splitS !== null ? { startS: fitSpan.startS, endS: splitS } : undefined,
      averaging,
    }),
    minPoints,
  );
  const upper = lineIndexFromFit(
    sums,
    k,
    pairs.x.length,
    units,
    provenanceOf("dvo2-dwr-upper", `ΔVO2/ΔWR above ${segLabel}`, [...sourceIds, "implementation-choice"], {
      window: fitSpan && splitS !== null ? { startS: splitS, endS: fitSpan.endS } : undefined,
      averaging,
    }),
    minPoints,
  );
  const ratioProv = provenanceOf(
    "dvo2-dwr-linearity",
    `upper/lower ΔVO2/ΔWR; flattening when below ${flatteningRatio}`,
    ["implementation-choice"],
    {
      inputs: { flatteningRatio, lower: lower.slope.value, upper: upper.slope.value },
    },
  );
  const ratio =
    lower.slope.value !== null && upper.slope.value !== null && lower.slope.value > 0
      ? measured(upper.slope.value / lower.slope.value, "1", ratioProv)
      : notDetermined("1", ratioProv, "a segment slope is not determinable (or the lower slope is not positive)");
  const looseFitR2 = options.looseFitR2 ?? 0.5;
  if (whole.slope.value !== null && whole.r2.value !== null && whole.r2.value < looseFitR2)
    issues.push(
      makeIssue(
        "warning",
        "dvo2-dwr-loose-fit",
        `ΔVO2/ΔWR ${whole.slope.value.toFixed(1)} mL/min/W fits the ramp loosely (r² ${whole.r2.value.toFixed(2)} < ${looseFitR2}): VO2 follows the work rate poorly; check the VO2 signal, the load record and the exercise phase before reading it.`,
      ),
    );
  const slope = whole.slope.value;
  const implausiblyLow = slope === null ? null : slope < IMPLAUSIBLE_DVO2_DWR_ML_MIN_W;
  const ranges = "normal men 10.3 ± 1.0, men with circulatory disorders 8.3 ± 1.2 (Hansen 1987)";
  if (slope !== null && implausiblyLow)
    issues.push(
      makeIssue(
        "warning",
        "vo2-too-low-for-work",
        `VO2 rose only ${slope.toFixed(1)} mL/min per W of work rate (ΔVO2/ΔWR; ${ranges}): below ${IMPLAUSIBLE_DVO2_DWR_ML_MIN_W.toFixed(1)}, more than 3 SD below the mean reported even in men with circulatory disorders, a leak at the mask, a gas or flow calibration fault or a wrong work-rate record is far likelier than disease. VO2-based values are shown but not interpreted (capacity, O2 pulse, plateau, VT1 against predicted, patterns, schemes). Check the cart and the ergometer; set the exercise phase by hand if the fit reads the wrong part of the test.`,
        { field: "dVo2dWr" },
      ),
    );
  else if (slope !== null && slope < SUSPECT_DVO2_DWR_ML_MIN_W)
    issues.push(
      makeIssue(
        "warning",
        "vo2-low-for-work",
        `VO2 rose only ${slope.toFixed(1)} mL/min per W of work rate (ΔVO2/ΔWR; ${ranges}): below ${SUSPECT_DVO2_DWR_ML_MIN_W.toFixed(1)}, more than 2 SD below the mean reported in men with circulatory disorders. Severe oxygen-delivery limitation can do this, and so can a leak at the mask, a gas or flow calibration fault or a wrong work-rate record: check the cart and the ergometer before reading VO2-based values (they are read as measured).`,
        { field: "dVo2dWr" },
      ),
    );
  if (pairs.x.length === 0)
    issues.push(
      makeIssue(
        "info",
        "no-work-rate",
        "No work-rate signal with VO2 in the ramp: ΔVO2/ΔWR not determinable (treadmill or missing column).",
      ),
    );
  return {
    whole,
    lower,
    upper,
    splitS,
    splitBy,
    upperToLowerRatio: ratio,
    flattening: ratio.value === null ? null : ratio.value < flatteningRatio,
    implausiblyLow,
    reference: { meanMlMinW: 10.29, sdMlMinW: 1.01, sourceId: "hansen-1987-vo2-wr" },
    issues,
  };
}
