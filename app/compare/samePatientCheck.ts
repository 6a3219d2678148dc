import type { Patient } from "@/lib/core";

/** One detail in which two tests disagree as to who was tested. */
export interface PatientDifference {
  field: "sex" | "age" | "height";
  /** Plain-words reason, e.g. "sex differs: male in the earlier test, female in the later one". */
  text: string;
}

export interface SamePatientCheck {
  /** Details that make it unlikely the two tests are of one patient; empty when nothing disagrees. */
  differences: PatientDifference[];
  /**
   * Details that differ but stay within their limit, e.g. "height differs by 4 cm (174 cm, then 178 cm)
   * (within the limit)": shown beside the differences so a reader sees every detail that is not identical.
   */
  withinLimits: PatientDifference[];
  /** Details that could not be checked because one test lacks them, e.g. ["height"]. */
  unchecked: ("sex" | "age" | "height")[];
}

export interface SamePatientCheckOptions {
  /**
   * Longest plausible interval between two tests of one patient that are compared for change, years.
   * Implementation choice (no published cut-off): serial tests for training, prehabilitation or
   * follow-up are weeks to a few years apart, and the test–retest noise bands come from repeat tests
   * days to weeks apart. @default 3
   */
  maxIntervalY?: number;
  /**
   * Allowance for ages written in whole years, years: a patient aged 45 y 11 mo and re-tested a month
   * later may be written 45 then 46. Common practice. @default 1
   */
  ageRoundingY?: number;
  /**
   * Largest height difference still taken as one adult measured twice, cm. Implementation choice (no
   * published cut-off): a repeat stadiometer reading differs by about a centimetre, so 5 cm is far
   * beyond measuring error. @default 5
   */
  maxHeightDiffCm?: number;
}

const num = (v: number | undefined): v is number => typeof v === "number" && Number.isFinite(v);
const words = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));

/**
 * Do two tests look like one patient? Compares the patient details the tests were entered with: a
 * different sex, an age that went down (beyond whole-year rounding) or rose by more than a plausible
 * interval between tests, or a height that differs by more than `maxHeightDiffCm`. Weight is not
 * checked (it changes with training and illness). A detail missing from either test is listed as
 * unchecked, not as a difference. A detail that differs but stays within its limit is listed in
 * `withinLimits`, so a reader sees every detail that is not identical. The limits are implementation
 * choices and their texts say so ("our choice"). `before` is the earlier test, `after` the later one.
 */
export function samePatientCheck(before: Patient, after: Patient, options: SamePatientCheckOptions = {}): SamePatientCheck {
  const maxIntervalY = options.maxIntervalY ?? 3;
  const ageRoundingY = options.ageRoundingY ?? 1;
  const maxHeightDiffCm = options.maxHeightDiffCm ?? 5;
  const differences: PatientDifference[] = [];
  const withinLimits: PatientDifference[] = [];
  const unchecked: SamePatientCheck["unchecked"] = [];

  if (before.sex && after.sex) {
    if (before.sex !== after.sex)
      differences.push({
        field: "sex",
        text: `sex differs: ${before.sex} in the earlier test, ${after.sex} in the later one`,
      });
  } else unchecked.push("sex");

  if (num(before.ageY) && num(after.ageY)) {
    const d = after.ageY - before.ageY;
    const pair = `(${words(before.ageY)} y, then ${words(after.ageY)} y)`;
    if (d < -ageRoundingY)
      differences.push({
        field: "age",
        text: `the patient of the later test is ${words(-d)} y younger ${pair}, more than the ${ageRoundingY} y allowed for ages written in whole years`,
      });
    else if (d > maxIntervalY + ageRoundingY)
      differences.push({
        field: "age",
        text: `age differs by ${words(d)} y ${pair}, more than the ${maxIntervalY} y accepted between repeat tests (our choice) plus ${ageRoundingY} y for ages written in whole years`,
      });
    else if (d !== 0)
      withinLimits.push({
        field: "age",
        text:
          d < 0
            ? `the patient of the later test is ${words(-d)} y younger ${pair} (within the limit: ${ageRoundingY} y for ages written in whole years)`
            : `age differs by ${words(d)} y ${pair} (within the limit: ${maxIntervalY} y between repeat tests, our choice, plus ${ageRoundingY} y for whole years)`,
      });
  } else unchecked.push("age");

  if (num(before.heightCm) && num(after.heightCm)) {
    const d = Math.abs(after.heightCm - before.heightCm);
    const pair = `(${words(before.heightCm)} cm, then ${words(after.heightCm)} cm)`;
    if (d > maxHeightDiffCm)
      differences.push({
        field: "height",
        text: `height differs by ${words(d)} cm ${pair}, more than ${maxHeightDiffCm} cm (our choice)`,
      });
    else if (d !== 0)
      withinLimits.push({
        field: "height",
        text: `height differs by ${words(d)} cm ${pair} (within the limit: ${maxHeightDiffCm} cm, our choice)`,
      });
  } else unchecked.push("height");

  return { differences, withinLimits, unchecked };
}
