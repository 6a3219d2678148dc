import { measured, notDetermined, reasonWithoutLeadIn, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { linearRegression } from "../numeric/linearRegression";
import { exerciseSpan, fieldSeries, provenanceOf, WindowMeans } from "./indexSeries";

/** Quantities an effort criterion can test. */
export type EffortQuantity =
  | "rerPeak"
  | "hrPercentPredicted"
  | "hrReserveBpm"
  | "veMvvPercent"
  | "vo2FinalIncreaseMlKgMin"
  | "vo2FinalIncreaseMlMin"
  | "lactatePeakMmolL";

export type Comparator = ">=" | ">" | "<" | "<=";

export interface EffortCriterion {
  id: string;
  label: string;
  quantity: EffortQuantity;
  comparator: Comparator;
  cutoff: number;
  sourceIds: string[];
}

/** A named set of criteria; `rule` says how criteria combine into "maximal effort". */
export interface EffortCriteriaSet {
  id: string;
  label: string;
  /** `any`: at least one criterion met; `all`: every assessable criterion met. */
  rule: "any" | "all";
  criteria: EffortCriterion[];
  /** Sources for the combination rule. */
  ruleSourceIds: string[];
}

const RER_GT_105: EffortCriterion = {
  id: "rer-gt-1.05",
  label: "peak RER > 1.05",
  quantity: "rerPeak",
  comparator: ">",
  cutoff: 1.05,
  sourceIds: ["radtke-2019", "mehra-2016-ishlt"],
};
const HR_85: EffortCriterion = {
  id: "hr-85-percent-predicted",
  label: "peak HR ≥ 85% of predicted",
  quantity: "hrPercentPredicted",
  comparator: ">=",
  cutoff: 85,
  sourceIds: ["respir-res-2021-guide"],
};
const HRR_15: EffortCriterion = {
  id: "hr-reserve-lt-15",
  label: "HR reserve < 15 bpm",
  quantity: "hrReserveBpm",
  comparator: "<",
  cutoff: 15,
  sourceIds: ["respir-res-2021-guide"],
};
const VE_MVV_85: EffortCriterion = {
  id: "ve-mvv-85",
  label: "VE/MVV ≥ 85%",
  quantity: "veMvvPercent",
  comparator: ">=",
  cutoff: 85,
  sourceIds: ["radtke-2019"],
};
/**
 * VO2 plateau: ΔVO2 < 2 mL/kg/min for a 5–10 % work increase (Radtke et al., ERS statement, Eur Respir Rev
 * 2019, Table 3 — confirmed). ERS 2019 also gives < 2.1 mL/kg/min between stages; one cut-off (2) is applied
 * to ramps and stage tables alike so that a single determination (`vo2PlateauPresent`) serves the effort
 * criteria and the interpretation (implementation choice). `vo2FinalIncrease` measures the rise over a work
 * increase of at least 5 % (the value is "not determined" otherwise).
 */
export const VO2_PLATEAU_CRITERION: EffortCriterion = {
  id: "vo2-plateau-2-ml-kg",
  label: "VO2 plateau: rise < 2 mL/kg/min over a 5–10 % work increase at the end of exercise (ERS 2019)",
  quantity: "vo2FinalIncreaseMlKgMin",
  comparator: "<",
  cutoff: 2,
  sourceIds: ["radtke-2019", "implementation-choice"],
};

/**
 * Guard band of a criterion whose value carries a standard error: a value that meets the cut-off is counted as met only
 * when it still meets it moved this many SE towards the cut-off; within the band the criterion is not assessable (null).
 * A decision rule with measurement uncertainty (guarded acceptance, JCGM 106:2012 — recalled); 1.28 SE (one-sided 90 %)
 * is our choice. On 240 synthetic main tests at moderate breath noise (invented data) the VO2-plateau criterion, which
 * is the only one with an SE, called a plateau in 32 of 132 assessable tests without one; with the band, in 12.
 */
export const CRITERION_GUARD_SE = 1.28;

/**
 * Whether one criterion is met by a value; null when the value is missing or not finite, or when it meets the cut-off
 * by less than `CRITERION_GUARD_SE` standard errors (`se` given).
 */
export function criterionMet(criterion: EffortCriterion, value: number | null | undefined, se?: number | null): boolean | null {
  if (typeof value !== "number" || !Number.isFinite(value)) return null;
  const met = compare(value, criterion.comparator, criterion.cutoff);
  if (!met || typeof se !== "number" || !Number.isFinite(se) || se <= 0) return met;
  const towards = criterion.comparator === "<" || criterion.comparator === "<=" ? 1 : -1;
  return compare(value + towards * CRITERION_GUARD_SE * se, criterion.comparator, criterion.cutoff) ? true : null;
}

/**
 * Named criteria sets. Peak RER cut-offs differ between sources (clinical-reference §2, §7 item 7):
 * ≥1.10 (HF prognosis, JACC HF 2020, confirmed; FRIEND cycle inclusion, confirmed), >1.05 (ERS 2019 and
 * ISHLT 2016 — ERS confirmed, ISHLT secondary), ≥1.0 (FRIEND treadmill inclusion, confirmed; the primary abstract page
 * prints "maximal RER >1.0", a secondary page "1.00 or higher": ≥ is kept, the difference is below the RER's resolution).
 */
export const EFFORT_CRITERIA_SETS: Record<string, EffortCriteriaSet> = {
  "ers-2019": {
    id: "ers-2019",
    label:
      "ERS 2019 and practical-guide markers: RER > 1.05, VE/MVV ≥ 85%, VO2 plateau (ERS 2019); HR ≥ 85% predicted or HR reserve < 15 bpm (Respir Res 2021 practical guide) (any one)",
    rule: "any",
    criteria: [RER_GT_105, HR_85, HRR_15, VE_MVV_85, VO2_PLATEAU_CRITERION],
    ruleSourceIds: ["ats-accp-2003", "implementation-choice"],
  },
  "hf-rer-1.10": {
    id: "hf-rer-1.10",
    label: "Heart-failure prognosis: peak RER ≥ 1.10",
    rule: "all",
    criteria: [
      {
        id: "rer-ge-1.10",
        label: "peak RER ≥ 1.10",
        quantity: "rerPeak",
        comparator: ">=",
        cutoff: 1.1,
        sourceIds: ["jacc-hf-2020-peak-rer"],
      },
    ],
    ruleSourceIds: ["jacc-hf-2020-peak-rer"],
  },
  "ishlt-2016": {
    id: "ishlt-2016",
    label: "ISHLT 2016 listing: peak RER > 1.05",
    rule: "all",
    criteria: [RER_GT_105],
    ruleSourceIds: ["mehra-2016-ishlt"],
  },
  "friend-treadmill": {
    id: "friend-treadmill",
    label: "FRIEND treadmill inclusion: peak RER ≥ 1.0",
    rule: "all",
    criteria: [
      {
        id: "rer-ge-1.00",
        label: "peak RER ≥ 1.0",
        quantity: "rerPeak",
        comparator: ">=",
        cutoff: 1.0,
        sourceIds: ["myers-2017-friend"],
      },
    ],
    ruleSourceIds: ["myers-2017-friend"],
  },
  "friend-cycle": {
    id: "friend-cycle",
    label: "FRIEND cycle inclusion: peak RER ≥ 1.10",
    rule: "all",
    criteria: [
      {
        id: "rer-ge-1.10",
        label: "peak RER ≥ 1.10",
        quantity: "rerPeak",
        comparator: ">=",
        cutoff: 1.1,
        sourceIds: ["kaminsky-2017-friend-cycle"],
      },
    ],
    ruleSourceIds: ["kaminsky-2017-friend-cycle"],
  },
  "rapp-2018": {
    id: "rapp-2018",
    label: "Composite: RER ≥ 1.1 or lactate ≥ 8 mmol/L or HR ≥ 90% predicted",
    rule: "any",
    criteria: [
      {
        id: "rer-ge-1.10",
        label: "peak RER ≥ 1.1",
        quantity: "rerPeak",
        comparator: ">=",
        cutoff: 1.1,
        sourceIds: ["rapp-2018"],
      },
      {
        id: "lactate-ge-8",
        label: "peak lactate ≥ 8 mmol/L",
        quantity: "lactatePeakMmolL",
        comparator: ">=",
        cutoff: 8,
        sourceIds: ["rapp-2018"],
      },
      {
        id: "hr-ge-90-percent",
        label: "peak HR ≥ 90% of predicted",
        quantity: "hrPercentPredicted",
        comparator: ">=",
        cutoff: 90,
        sourceIds: ["rapp-2018"],
      },
    ],
    ruleSourceIds: ["rapp-2018"],
  },
};

/** The default set (labelled as such in the result). */
export const DEFAULT_EFFORT_SET = "ers-2019";

/** Values the criteria read; null when not measured. */
export type EffortValues = Partial<Record<EffortQuantity, number | null>>;
/** Standard errors of those values, where known (see `CRITERION_GUARD_SE`). */
export type EffortUncertainty = Partial<Record<EffortQuantity, number | null>>;

export interface EffortCriterionResult {
  criterion: EffortCriterion;
  value: number | null;
  /** Standard error of the value, where known. */
  se: number | null;
  /** null when the value is not available, or meets the cut-off only within its guard band. */
  met: boolean | null;
}

export interface EffortAssessment {
  setId: string;
  setLabel: string;
  isDefaultSet: boolean;
  rule: "any" | "all";
  criteria: EffortCriterionResult[];
  metIds: string[];
  /** Whether the set's rule is satisfied; null when no criterion could be assessed. */
  maximal: boolean | null;
  ruleSourceIds: string[];
}

function compare(value: number, comparator: Comparator, cutoff: number): boolean {
  switch (comparator) {
    case ">=":
      return value >= cutoff;
    case ">":
      return value > cutoff;
    case "<":
      return value < cutoff;
    case "<=":
      return value <= cutoff;
  }
}

/**
 * Effort (maximality) criteria: each criterion of the chosen set is tested against its cut-off at the
 * boundary exactly as published (e.g. RER exactly 1.05 does not meet "> 1.05"; exactly 1.10 meets "≥ 1.10").
 * Criteria whose value is missing are "not assessable" (met = null) and do not count either way; so are criteria whose
 * value meets the cut-off by less than `CRITERION_GUARD_SE` of its standard error (`uncertainty`).
 *
 * @param values measured quantities
 * @param set a set id from EFFORT_CRITERIA_SETS, or a custom set @default "ers-2019"
 * @param uncertainty standard errors of the values, where known
 * @param countOnlyWhenMet quantities read on one side only: a criterion on them that is not met is "not assessable"
 *   instead (a beta-blocked heart rate short of the predicted maximum; common practice)
 */
export function assessEffort(
  values: EffortValues,
  set: string | EffortCriteriaSet = DEFAULT_EFFORT_SET,
  uncertainty: EffortUncertainty = {},
  countOnlyWhenMet: readonly EffortQuantity[] = [],
): EffortAssessment {
  const s = typeof set === "string" ? EFFORT_CRITERIA_SETS[set] : set;
  if (!s) throw new Error(`unknown effort criteria set ${String(set)}`);
  const criteria = s.criteria.map((criterion): EffortCriterionResult => {
    const v = values[criterion.quantity];
    const value = typeof v === "number" && Number.isFinite(v) ? v : null;
    const e = uncertainty[criterion.quantity];
    const se = typeof e === "number" && Number.isFinite(e) ? e : null;
    const met = criterionMet(criterion, value, se);
    return { criterion, value, se, met: met === false && countOnlyWhenMet.includes(criterion.quantity) ? null : met };
  });
  const assessed = criteria.filter((c) => c.met !== null);
  const maximal = assessed.length === 0 ? null : s.rule === "any" ? assessed.some((c) => c.met) : assessed.every((c) => c.met);
  return {
    setId: s.id,
    setLabel: s.label,
    isDefaultSet: s.id === DEFAULT_EFFORT_SET,
    rule: s.rule,
    criteria,
    metIds: criteria.filter((c) => c.met).map((c) => c.criterion.id),
    maximal,
    ruleSourceIds: s.ruleSourceIds,
  };
}

export interface Vo2FinalIncrease {
  /** VO2 rise between the two windows (stages); "not determined" when the work increase is < 5 % or unknown. */
  increaseMlMin: Measured;
  increaseMlKgMin: Measured;
  /**
   * Standard error of the rise from the breath scatter in the two windows (residuals about each window's straight line
   * in time, variance inflated by (1 + r)/(1 − r) for their lag-1 autocorrelation r, clipped to 0–0.9); not determined
   * for stage tables or when a window holds fewer than 4 breaths.
   */
  seMlMin: Measured;
  seMlKgMin: Measured;
  /** Work-rate change between the two windows (W), for judging the "5–10 % work increase" of the ERS wording. */
  workIncreaseW: Measured;
}

/**
 * Shortest exercise phase (ramp or time-averaged rows) over which a plateau is assessed, s. In the first minutes of a ramp
 * VO2 lags the work rate (first-order on-kinetics, time constant about 20–80 s, longer when unfit or ill: Whipp, Ward,
 * Lamarra, Davis & Wasserman 1982, J Appl Physiol 52:1506 — recalled), so a small rise over the final window is the lag,
 * not a plateau. 180 s is our choice, measured on invented tests (six synthetic models × 120 tests at low, moderate and
 * high noise, cut 60–480 s into the ramp and at least 60 s before its end, so no cut test holds a plateau by
 * construction): a plateau was called on 51 % of the tests cut at 90 s, 7.8 % at 120 s, 6.9 % at
 * 150 s, then 1.8 % at 180 s, 2.0 % at 240 s and 1.3–2.3 % at 300–480 s (the rate the guard band leaves on long rising
 * ramps). No complete test of the six models has an exercise phase under 262 s, so none changes its determination.
 */
export const MIN_PLATEAU_EXERCISE_S = 180;

/** Smallest work increase (fraction of the earlier work rate) over which the plateau rule is read (ERS 2019). */
const MIN_WORK_INCREASE = 0.05;
/** Work increase aimed at on a ramp: the upper end of the ERS 5–10 % (the largest expected VO2 rise). */
const TARGET_WORK_INCREASE = 0.1;

/**
 * VO2 rise over the end of exercise, for the plateau criterion (ERS 2019, Radtke et al., Eur Respir Rev
 * 2019, confirmed: ΔVO2 < 2 mL/kg/min for a 5–10 % work increase).
 * - Ramp (breath or time-averaged rows): mean VO2 of the final `windowS` s of exercise minus the mean over a
 *   `windowS`-s window centred where the work rate was 10 % lower than in the final window (the two windows
 *   never overlap; when 10 % is reached within one window the windows are consecutive).
 * - Stage tables: last stage minus the stage before.
 * The rise is "not determined" when the work increase between the windows is below 5 % or unknown (a
 * treadmill without work rate), or when the test's own earlier VO2–work slope predicts a rise below the
 * cut-off for that work increase (low work rates): then a steady rise could not be told from a plateau.
 * Implementation choice: window placement. Degenerate: no exercise, fewer than two VO2 values, exercise
 * shorter than two windows → not determined with the reason. A ramp whose exercise phase is shorter than
 * `MIN_PLATEAU_EXERCISE_S` is not determined either (VO2 on-kinetics); stage tables are read as given.
 */
export function vo2FinalIncrease(test: ConditionedTest, options: { windowS?: number; weightKg?: number } = {}): Vo2FinalIncrease {
  const windowS = options.windowS ?? 30;
  const span = exerciseSpan(test);
  const prov = provenanceOf(
    test.shape === "stage" ? "vo2-last-stage-increase" : `vo2-final-${windowS}s-increase-10pct-work`,
    test.shape === "stage"
      ? "VO2 of the last stage minus the stage before"
      : `mean VO2 of the final ${windowS} s of exercise minus the ${windowS} s centred where work was 10 % lower`,
    ["radtke-2019", "implementation-choice"],
  );
  const nd = (reason: string, p = prov, work?: Measured): Vo2FinalIncrease => ({
    increaseMlMin: notDetermined("mL/min", p, reason),
    increaseMlKgMin: notDetermined("mL/kg/min", p, reason),
    seMlMin: notDetermined("mL/min", p, reason),
    seMlKgMin: notDetermined("mL/kg/min", p, reason),
    workIncreaseW: work ?? notDetermined("W", p, reason),
  });
  if (!span) return nd("no data");
  const vo2 = fieldSeries(test.clean, "vo2MlMin", span);
  if (vo2.v.length < 2) return nd("fewer than two VO2 values in exercise");
  let a: number;
  let b: number;
  let wa: number;
  let wb: number;
  let window: { startS: number; endS: number };
  let earlierWindow = { startS: NaN, endS: NaN };
  // VO2 and work of an earlier point of the exercise, for the test's own VO2–work slope (expected rise).
  let ae = NaN;
  let we = NaN;
  const work = fieldSeries(test.clean, "workW", span);
  const wm = new WindowMeans(work);
  if (test.shape === "stage") {
    const n = vo2.v.length;
    a = vo2.v[n - 2];
    b = vo2.v[n - 1];
    wa = wm.mean(vo2.t[n - 2], vo2.t[n - 2]).mean;
    wb = wm.mean(vo2.t[n - 1], vo2.t[n - 1]).mean;
    window = { startS: vo2.t[n - 2], endS: vo2.t[n - 1] };
    if (n >= 3) {
      ae = vo2.v[n - 3];
      we = wm.mean(vo2.t[n - 3], vo2.t[n - 3]).mean;
    }
  } else {
    const m = new WindowMeans(vo2);
    const end = span.endS;
    if (end - span.startS < 2 * windowS) return nd(`exercise shorter than two ${windowS}-s windows`);
    if (end - span.startS < MIN_PLATEAU_EXERCISE_S)
      return nd(
        `the exercise phase lasted only ${Math.round(end - span.startS)} s (< ${MIN_PLATEAU_EXERCISE_S} s): in the first minutes of a ramp VO2 lags the work rate (on-kinetics), so a small end-exercise rise cannot be told from a plateau`,
      );
    const finalStart = end - windowS;
    b = m.mean(finalStart + 1e-9, end).mean;
    wb = wm.mean(finalStart + 1e-9, end).mean;
    // Centre of the earlier window: the last time the work rate was at most 90 % of the final window's.
    let centre = finalStart - windowS / 2;
    if (Number.isFinite(wb)) {
      const target = (1 - TARGET_WORK_INCREASE) * wb;
      for (let i = work.t.length - 1; i >= 0; i--) {
        if (work.v[i] <= target) {
          centre = Math.min(work.t[i], finalStart - windowS / 2);
          break;
        }
      }
    }
    const lo = Math.max(span.startS, centre - windowS / 2);
    // a fall of VO2 at a held or rising load over these windows (lib/signal/vo2Falls.ts) is a fault or a finding to look
    // at, not the levelling-off the plateau rule reads
    if (test.vo2Fall && test.vo2Fall.lowS >= lo)
      return nd(
        `VO2 fell by ${Math.round(100 * test.vo2Fall.fraction)} % at a held or rising load over the end of exercise (see that warning): a fall is not read as a plateau`,
      );
    a = m.mean(lo, centre + windowS / 2).mean;
    earlierWindow = { startS: lo, endS: centre + windowS / 2 };
    wa = wm.mean(lo, centre + windowS / 2).mean;
    window = { startS: lo, endS: end };
    const earlyCentre = (span.startS + centre) / 2;
    if (earlyCentre - windowS / 2 >= span.startS && earlyCentre + windowS / 2 <= lo) {
      ae = m.mean(earlyCentre - windowS / 2, earlyCentre + windowS / 2).mean;
      we = wm.mean(earlyCentre - windowS / 2, earlyCentre + windowS / 2).mean;
    }
  }
  // inputs that could not be read (no work rate on a treadmill) are left out rather than recorded as NaN
  const inputs = Object.fromEntries(
    Object.entries({ earlierMlMin: a, finalMlMin: b, earlierWorkW: wa, finalWorkW: wb }).filter(([, v]) => Number.isFinite(v)),
  );
  const p = { ...prov, window, inputs };
  const dw = wb - wa;
  const workIncreaseW = Number.isFinite(dw) ? measured(dw, "W", p) : notDetermined("W", p, "no work-rate data");
  if (!Number.isFinite(dw) || !(wa > 0))
    return nd("no work rate to judge the 5–10 % work increase the plateau criterion needs", p, workIncreaseW);
  if (dw / wa < MIN_WORK_INCREASE)
    return nd(
      `work rose only ${(100 * (dw / wa)).toFixed(1)} % between the windows; the plateau criterion needs a 5–10 % increase`,
      p,
      workIncreaseW,
    );
  const inc = b - a;
  const w = options.weightKg;
  // A plateau is a rise below the cut-off although the work increase should have raised VO2 by more. When the
  // test's own earlier VO2–work slope predicts a rise below the cut-off for this work increase (low work
  // rates), a linear rise cannot be told from a plateau: not determined (logical guard, common practice).
  const gain = (a - ae) / (wa - we);
  if (w && w > 0 && Number.isFinite(gain) && wa - we > 0) {
    const expected = (gain * dw) / w;
    if (expected < VO2_PLATEAU_CRITERION.cutoff)
      return nd(
        `at the rise of VO2 with work rate late in this test (${gain.toFixed(1)} mL/min/W between two windows before the end, read without the lag correction of ΔVO2/ΔWR) a rise of ${dw.toFixed(0)} W would raise VO2 by only ${expected.toFixed(2)} mL/kg/min, below the ${VO2_PLATEAU_CRITERION.cutoff} mL/kg/min plateau cut-off; a plateau cannot be told from a steady rise`,
        { ...p, inputs: { ...p.inputs, expectedRiseMlKgMin: expected } },
        workIncreaseW,
      );
  }
  const se =
    test.shape === "stage" ? NaN : riseStandardError(vo2, earlierWindow, { startS: window.endS - windowS, endS: window.endS });
  const seProv = {
    ...p,
    method: `${p.method}-se`,
    label: `standard error of that rise (breath scatter about each window's line, lag-1 autocorrelation allowed for)`,
    sourceIds: ["implementation-choice"],
  };
  const seReason = test.shape === "stage" ? "stage values carry no breath scatter" : "fewer than 4 breaths in a window";
  return {
    increaseMlMin: Number.isFinite(inc) ? measured(inc, "mL/min", p) : notDetermined("mL/min", p, "a window had no VO2 data"),
    increaseMlKgMin:
      Number.isFinite(inc) && w && w > 0
        ? measured(inc / w, "mL/kg/min", { ...p, inputs: { ...p.inputs, weightKg: w } })
        : notDetermined("mL/kg/min", p, w ? "a window had no VO2 data" : "body mass not given"),
    seMlMin: Number.isFinite(se) ? measured(se, "mL/min", seProv) : notDetermined("mL/min", seProv, seReason),
    seMlKgMin:
      Number.isFinite(se) && w && w > 0
        ? measured(se / w, "mL/kg/min", seProv)
        : notDetermined("mL/kg/min", seProv, w ? seReason : "body mass not given"),
    workIncreaseW,
  };
}

/**
 * Standard error of the difference of the mean VO2 in two windows: per window, the residual SD about its OLS line in
 * time (n − 2) and the lag-1 autocorrelation r of those residuals; Var(mean) = SD² / n × (1 + r)/(1 − r), r pooled over
 * both windows and clipped to 0–0.9 (AR(1) variance inflation, common practice). NaN with fewer than 4 breaths in a window.
 */
function riseStandardError(
  vo2: { t: number[]; v: number[] },
  a: { startS: number; endS: number },
  b: { startS: number; endS: number },
): number {
  const stats = (win: { startS: number; endS: number }) => {
    const t: number[] = [];
    const v: number[] = [];
    for (let i = 0; i < vo2.t.length; i++)
      if (vo2.t[i] >= win.startS && vo2.t[i] <= win.endS && Number.isFinite(vo2.v[i])) {
        t.push(vo2.t[i]);
        v.push(vo2.v[i]);
      }
    const n = t.length;
    if (n < 4) return null;
    const f = linearRegression(t, v);
    const res = t.map((x, i) => v[i] - f.intercept - f.slope * x);
    const ss = res.reduce((acc, r) => acc + r * r, 0);
    let lag = 0;
    for (let i = 1; i < n; i++) lag += res[i] * res[i - 1];
    return { n, variance: ss / (n - 2), lag, ss };
  };
  const sa = stats(a);
  const sb = stats(b);
  if (!sa || !sb) return NaN;
  const ss = sa.ss + sb.ss;
  // no scatter at all (noise-free data): SE 0, no autocorrelation to estimate
  const r = ss > 0 ? Math.min(0.9, Math.max(0, (sa.lag + sb.lag) / ss)) : 0;
  const inflate = (1 + r) / (1 - r);
  return Math.sqrt((sa.variance / sa.n) * inflate + (sb.variance / sb.n) * inflate);
}

/**
 * The one VO2-plateau determination of the product: `VO2_PLATEAU_CRITERION` (ERS 2019, confirmed) applied
 * to `vo2FinalIncrease`. The effort criteria set and the interpretation's "VO2 plateau" rule both read it,
 * so they always agree. Null (not assessable) when the rise could not be measured.
 */
export function vo2PlateauPresent(increase: Vo2FinalIncrease): boolean | null {
  return criterionMet(VO2_PLATEAU_CRITERION, increase.increaseMlKgMin.value, increase.seMlKgMin.value);
}

/**
 * Why `vo2PlateauPresent` is null, in words for the report; null when it is not (the plateau was assessed). Either the
 * rise could not be measured (its own reason), or it met the cut-off by less than `CRITERION_GUARD_SE` standard errors.
 */
export function vo2PlateauNotAssessedReason(increase: Vo2FinalIncrease): string | null {
  if (vo2PlateauPresent(increase) !== null) return null;
  const rise = increase.increaseMlKgMin;
  if (rise.value === null || !Number.isFinite(rise.value))
    return reasonWithoutLeadIn(rise.reason) ?? "the end-exercise VO2 rise could not be measured";
  const se = increase.seMlKgMin.value ?? NaN;
  return (
    `end-exercise VO2 rise ${rise.value.toFixed(1)} mL/kg/min lies within ${CRITERION_GUARD_SE} standard errors ` +
    `(SE ${se.toFixed(1)}) of the ${VO2_PLATEAU_CRITERION.comparator} ${VO2_PLATEAU_CRITERION.cutoff} mL/kg/min cut-off`
  );
}
