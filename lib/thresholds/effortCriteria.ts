import { measured, notDetermined, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
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
const PLATEAU_21: EffortCriterion = {
  id: "vo2-plateau-2.1-ml-kg",
  label:
    "VO2 plateau: rise < 2.1 mL/kg/min over the final two windows (ERS 2019 between-stage rule; applied to consecutive windows on a ramp)",
  quantity: "vo2FinalIncreaseMlKgMin",
  comparator: "<",
  cutoff: 2.1,
  sourceIds: ["radtke-2019", "implementation-choice"],
};

/**
 * Named criteria sets. Peak RER cut-offs differ between sources (clinical-reference §2, §7 item 7):
 * ≥1.10 (HF prognosis, JACC HF 2020, confirmed; FRIEND cycle inclusion, confirmed), >1.05 (ERS 2019 and
 * ISHLT 2016, confirmed), ≥1.0 (FRIEND treadmill inclusion, confirmed).
 */
export const EFFORT_CRITERIA_SETS: Record<string, EffortCriteriaSet> = {
  "ers-2019": {
    id: "ers-2019",
    label: "ERS 2019 markers: RER > 1.05, HR ≥ 85% predicted or HR reserve < 15 bpm, VE/MVV ≥ 85%, VO2 plateau (any one)",
    rule: "any",
    criteria: [RER_GT_105, HR_85, HRR_15, VE_MVV_85, PLATEAU_21],
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

export interface EffortCriterionResult {
  criterion: EffortCriterion;
  value: number | null;
  /** null when the value is not available. */
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
 * Criteria whose value is missing are "not assessable" (met = null) and do not count either way.
 *
 * @param values measured quantities
 * @param set a set id from EFFORT_CRITERIA_SETS, or a custom set @default "ers-2019"
 */
export function assessEffort(values: EffortValues, set: string | EffortCriteriaSet = DEFAULT_EFFORT_SET): EffortAssessment {
  const s = typeof set === "string" ? EFFORT_CRITERIA_SETS[set] : set;
  if (!s) throw new Error(`unknown effort criteria set ${String(set)}`);
  const criteria = s.criteria.map((criterion): EffortCriterionResult => {
    const v = values[criterion.quantity];
    const value = typeof v === "number" && Number.isFinite(v) ? v : null;
    return { criterion, value, met: value === null ? null : compare(value, criterion.comparator, criterion.cutoff) };
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
  increaseMlMin: Measured;
  increaseMlKgMin: Measured;
  /** Work-rate change between the two windows (W), for judging the "5-10% work increase" of the ERS wording. */
  workIncreaseW: Measured;
}

/**
 * VO2 rise over the end of exercise, for the plateau criterion: mean VO2 of the final `windowS` s of
 * exercise minus the mean of the `windowS` s before it (stage tables: last stage minus the one before).
 * ERS 2019 (confirmed) states plateau as ΔVO2 < 2 mL/kg/min for a 5-10% work increase, < 2 SD of earlier
 * increases, or < 2.1 mL/kg/min between stages; applying the between-stage rule to consecutive windows of a
 * ramp is an implementation choice.
 */
export function vo2FinalIncrease(test: ConditionedTest, options: { windowS?: number; weightKg?: number } = {}): Vo2FinalIncrease {
  const windowS = options.windowS ?? 30;
  const span = exerciseSpan(test);
  const prov = provenanceOf(
    test.shape === "stage" ? "vo2-last-stage-increase" : `vo2-final-${windowS}s-increase`,
    test.shape === "stage"
      ? "VO2 of the last stage minus the stage before"
      : `mean VO2 of the final ${windowS} s of exercise minus the ${windowS} s before`,
    ["radtke-2019", "implementation-choice"],
  );
  const nd = (reason: string): Vo2FinalIncrease => ({
    increaseMlMin: notDetermined("mL/min", prov, reason),
    increaseMlKgMin: notDetermined("mL/kg/min", prov, reason),
    workIncreaseW: notDetermined("W", prov, reason),
  });
  if (!span) return nd("no data");
  const vo2 = fieldSeries(test.clean, "vo2MlMin", span);
  if (vo2.v.length < 2) return nd("fewer than two VO2 values in exercise");
  let a: number;
  let b: number;
  let wa: number;
  let wb: number;
  let window: { startS: number; endS: number };
  const work = fieldSeries(test.clean, "workW", span);
  if (test.shape === "stage") {
    const n = vo2.v.length;
    a = vo2.v[n - 2];
    b = vo2.v[n - 1];
    const wm = new WindowMeans(work);
    wa = wm.mean(vo2.t[n - 2], vo2.t[n - 2]).mean;
    wb = wm.mean(vo2.t[n - 1], vo2.t[n - 1]).mean;
    window = { startS: vo2.t[n - 2], endS: vo2.t[n - 1] };
  } else {
    const m = new WindowMeans(vo2);
    const wm = new WindowMeans(work);
    const end = span.endS;
    if (end - span.startS < 2 * windowS) return nd(`exercise shorter than two ${windowS}-s windows`);
    a = m.mean(end - 2 * windowS, end - windowS).mean;
    b = m.mean(end - windowS + 1e-9, end).mean;
    wa = wm.mean(end - 2 * windowS, end - windowS).mean;
    wb = wm.mean(end - windowS + 1e-9, end).mean;
    window = { startS: end - 2 * windowS, endS: end };
  }
  const p = { ...prov, window, inputs: { earlierMlMin: a, finalMlMin: b } };
  const inc = b - a;
  const w = options.weightKg;
  return {
    increaseMlMin: Number.isFinite(inc) ? measured(inc, "mL/min", p) : notDetermined("mL/min", p, "a window had no VO2 data"),
    increaseMlKgMin:
      Number.isFinite(inc) && w && w > 0
        ? measured(inc / w, "mL/kg/min", { ...p, inputs: { ...p.inputs, weightKg: w } })
        : notDetermined("mL/kg/min", p, w ? "a window had no VO2 data" : "body mass not given"),
    workIncreaseW: Number.isFinite(wb - wa) ? measured(wb - wa, "W", p) : notDetermined("W", p, "no work-rate data"),
  };
}
