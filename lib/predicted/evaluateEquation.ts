import { makeIssue, type Ergometer, type Issue, type Patient, type Provenance, type Spirometry } from "../core";
import { bodySize } from "./bodySize";
import { convertPredictedUnit } from "./convertPredictedUnit";
import type { PredictorInput, ReferenceEquation } from "./equationSchema";
import { getEquation } from "./equations";
import { evaluateForm, FormError, type EvaluationStep, type FormContext, type FormFailure } from "./evaluateForm";
import { DEFAULT_LAB_SETTINGS, resolveEquationId, type LabSettings } from "./labSettings";
import { PREDICTED_QUANTITIES, type LabQuantity, type PredictedQuantity } from "./quantities";

export type { EvaluationStep } from "./evaluateForm";

/** What an equation may read. Patient details in canonical units (years, cm, kg). */
export interface EquationInputs {
  patient: Patient;
  ergometer: Ergometer;
  /** Needed only by capacity estimates (MVV from FEV1). */
  spirometry?: Spirometry;
  /** Needed only by performance estimates (VO2 from achieved watts). */
  achieved?: { workPeakW?: number };
}

export interface EvaluateOptions {
  /** Measured value in the equation's unit: gives `zScore` where the equation has an SEE. */
  measured?: number;
  /** Equation choices for `ref` nodes by quantity (derived predictions). @default DEFAULT_LAB_SETTINGS */
  labSettings?: LabSettings;
}

/** A predicted value with the equation named, its limit of normal where published, and its issues. */
export interface PredictedValue {
  quantity: PredictedQuantity;
  /** `null` = not determinable; `reason` says why. */
  value: number | null;
  unit: string;
  equationId: string;
  equationLabel: string;
  status: ReferenceEquation["status"];
  kind: ReferenceEquation["kind"];
  /** Lower limit of normal, same unit (quantities where low is abnormal). */
  lln?: number;
  /** Upper limit of normal, same unit (quantities where high is abnormal, e.g. lowest VE/VCO2). */
  uln?: number;
  /** How the limit was found, e.g. "predicted − 1.645·SEE (SEE 0.458 L/min)". */
  limitMethod?: string;
  /** Standard error of the estimate, same unit, when the source gives one. */
  see?: number;
  /** (measured − predicted) / SEE, when a measured value was given and the equation has an SEE. */
  zScore?: number;
  reason?: string;
  issues: Issue[];
  steps: EvaluationStep[];
  /** This equation and every equation it drew on (derived predictions). */
  usedEquationIds: string[];
  provenance: Provenance;
}

/**
 * Lowest predicted peak VO2 kept: twice resting VO2, 2 × 3.5 mL/kg/min (1 MET = 3.5 mL/kg/min: Jetté M, Sidney K,
 * Blümchen G, Clin Cardiol 1990;13:555-565, recalled; "twice rest" as the floor is this product's choice).
 */
export const PEAK_VO2_FLOOR_ML_KG_MIN = 7;

const INPUT_LABEL: Record<PredictorInput, string> = {
  sex: "sex",
  ageY: "age",
  heightCm: "height",
  weightKg: "weight",
  ergometer: "ergometer",
  fev1L: "FEV1",
  workPeakW: "peak work rate",
};

function rawInput(from: PredictorInput, inputs: EquationInputs): number | string | undefined {
  switch (from) {
    case "sex":
      return inputs.patient.sex;
    case "ergometer":
      return inputs.ergometer;
    case "fev1L":
      return inputs.spirometry?.fev1L;
    case "workPeakW":
      return inputs.achieved?.workPeakW;
    default:
      return inputs.patient[from];
  }
}

/**
 * The range of one characteristic in an equation's derivation population, the patient's sex's own range when the file
 * gives one by sex; undefined when the source states none.
 */
export function populationRange(
  eq: ReferenceEquation,
  key: "ageY" | "heightCm" | "weightKg" | "bmi",
  sex: "male" | "female" | undefined,
): { min?: number; max?: number } | undefined {
  const pop = eq.population;
  return (sex ? pop.bySex?.[sex]?.[key] : undefined) ?? pop[key];
}

/**
 * Where an equation records no bound for a predictor it uses (no range, or no upper age), a patient beyond these is named as a possible
 * extrapolation: most adult reference cohorts hold few people over 80 y or outside 150-200 cm (this product's choice,
 * common practice; review: an 88-year-old and a 205-cm man had no warning on peak VO2).
 */
const UNRECORDED_RANGE_EDGES = { ageY: { min: 18, max: 80 }, heightCm: { min: 150, max: 200 } } as const;

function populationIssues(eq: ReferenceEquation, inputs: EquationInputs): Issue[] {
  const issues: Issue[] = [];
  const p = inputs.patient;
  const pop = eq.population;
  if (p.sex && !pop.sexes.includes(p.sex)) {
    issues.push(
      makeIssue(
        "warning",
        "outside-derivation-population",
        `${eq.label}: derived in ${pop.sexes.join(" and ")} only; the patient is ${p.sex}.`,
        { field: "sex" },
      ),
    );
  }
  const bmi = bodySize(p).bmiKgM2 ?? undefined;
  const values = { ageY: p.ageY, heightCm: p.heightCm, weightKg: p.weightKg, bmi };
  const units = { ageY: "y", heightCm: "cm", weightKg: "kg", bmi: "kg/m²" };
  for (const key of ["ageY", "heightCm", "weightKg", "bmi"] as const) {
    const range = populationRange(eq, key, p.sex);
    const v = values[key];
    const edge = UNRECORDED_RANGE_EDGES[key as keyof typeof UNRECORDED_RANGE_EDGES];
    // a derived prediction carries the notes of the equations it is built from
    const uses = eq.kind !== "derived-predicted" && eq.predictors.some((pr) => pr.from === key);
    // a bound the cohort does not record is replaced by the edge: beyond it the value may be an extrapolation
    if (
      v !== undefined &&
      edge &&
      uses &&
      ((range?.min === undefined && v < edge.min) || (range?.max === undefined && v > edge.max))
    )
      issues.push(
        makeIssue(
          "warning",
          "derivation-range-not-recorded",
          `${eq.label}: the ${INPUT_LABEL[key as "ageY" | "heightCm"]} range of its cohort is not recorded here; at ${Math.round(v * 10) / 10} ${units[key]} the prediction may be an extrapolation: read % predicted with caution.`,
          { field: key },
        ),
      );
    if (!range || v === undefined) continue;
    const below = range.min !== undefined && v < range.min;
    const above = range.max !== undefined && v > range.max;
    if (below || above) {
      const span = `${range.min ?? "…"}–${range.max ?? "…"} ${units[key]}`;
      issues.push(
        makeIssue(
          "warning",
          "outside-derivation-population",
          `${eq.label}: ${key === "bmi" ? "BMI" : INPUT_LABEL[key]} ${Math.round(v * 10) / 10} ${units[key]} is outside the derivation range ${span}; the prediction is an extrapolation.`,
          { field: key },
        ),
      );
    }
  }
  if (eq.ergometer !== "both" && eq.ergometer !== inputs.ergometer) {
    issues.push(
      makeIssue(
        "warning",
        "ergometer-mismatch",
        `${eq.label}: derived on a ${eq.ergometer}; this test used a ${inputs.ergometer}.`,
        { field: "ergometer" },
      ),
    );
  }
  if (eq.kind === "performance-estimate") {
    issues.push(
      makeIssue(
        "info",
        "performance-estimate",
        `${eq.label}: estimates VO2 from what the patient achieved; it is not a predicted normal value.`,
      ),
    );
  }
  if (eq.kind === "capacity-estimate") {
    issues.push(
      makeIssue(
        "info",
        "capacity-estimate",
        `${eq.label}: an estimate of the patient's own capacity from another measurement; prefer a measured value.`,
      ),
    );
  }
  if (eq.status === "recalled") {
    issues.push(
      makeIssue(
        "info",
        "recalled-source",
        `${eq.label}: the source was not seen (recalled); verify against the publication before relying on it.`,
      ),
    );
  }
  return issues;
}

/** "height", "age", "body weight", "BMI": the predictor a population issue names. */
function fieldWords(field: string): string {
  return field === "bmi" ? "BMI" : (INPUT_LABEL[field as keyof typeof INPUT_LABEL] ?? field);
}

function failureMessage(eq: ReferenceEquation, f: FormFailure): { code: string; message: string } {
  switch (f.kind) {
    case "missing":
      return { code: "missing-input", message: `${eq.label} needs ${f.what}.` };
    case "not-covered":
      return { code: `${f.what}-not-covered`, message: `${eq.label} has no form for ${f.what} ${f.value}.` };
    case "ref":
      return { code: "derived-input-missing", message: `${eq.label}: ${f.reason}` };
    case "non-finite":
      return { code: "not-finite", message: `${eq.label} gave no finite value for these inputs.` };
  }
}

function uniqueIssues(issues: Issue[]): Issue[] {
  const seen = new Set<string>();
  return issues.filter((i) => {
    const key = `${i.severity}|${i.code}|${i.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

function evaluateInternal(
  eq: ReferenceEquation,
  inputs: EquationInputs,
  options: EvaluateOptions,
  stack: readonly string[],
): PredictedValue {
  const labSettings = options.labSettings ?? DEFAULT_LAB_SETTINGS;
  const issues: Issue[] = populationIssues(eq, inputs);
  const steps: EvaluationStep[] = [];
  const used: string[] = [eq.id];
  const provenanceInputs: Record<string, number | string | boolean | null> = { ergometer: inputs.ergometer };
  if (inputs.patient.sex) provenanceInputs.sex = inputs.patient.sex;

  const scope = new Map<string, number>();
  const missing: string[] = [];
  for (const pr of eq.predictors) {
    const raw = rawInput(pr.from, inputs);
    if (raw === undefined || (typeof raw === "number" && !Number.isFinite(raw))) {
      missing.push(INPUT_LABEL[pr.from]);
      continue;
    }
    provenanceInputs[pr.from] = raw;
    let v: number;
    if (typeof raw === "string") {
      const code = pr.coding ? (pr.coding as Record<string, number | undefined>)[raw] : undefined;
      if (code === undefined) {
        missing.push(`a ${pr.label} code for ${raw}`);
        continue;
      }
      v = code;
    } else {
      v = pr.convert ? (pr.convert.operation === "multiply" ? raw * pr.convert.factor : raw / pr.convert.factor) : raw;
    }
    scope.set(pr.name, v);
    if (pr.convert || pr.coding)
      steps.push({ label: `${pr.name} = ${pr.label}${pr.convert ? ` (${pr.convert.basis})` : ""}`, value: v, unit: pr.unit });
  }

  const base = {
    quantity: eq.quantity,
    unit: eq.unit,
    equationId: eq.id,
    equationLabel: eq.label,
    status: eq.status,
    kind: eq.kind,
    steps,
    usedEquationIds: used,
  };
  const provenance = (): Provenance => ({
    method: eq.id,
    label: eq.label,
    sourceIds: [...new Set(used)],
    inputs: provenanceInputs,
  });

  if (missing.length > 0) {
    const reason = `${eq.label} needs ${[...new Set(missing)].join(", ")}.`;
    issues.push(makeIssue("error", "missing-input", reason));
    return { ...base, value: null, reason, issues: uniqueIssues(issues), provenance: provenance() };
  }

  const ctx: FormContext = {
    sex: inputs.patient.sex,
    ergometer: inputs.ergometer,
    steps,
    resolveRef: (ref) => {
      let targetId = ref.equation;
      if (!targetId && ref.quantity) {
        const resolved = resolveEquationId(ref.quantity as LabQuantity, inputs.ergometer, labSettings);
        issues.push(...resolved.issues);
        targetId = resolved.equationId;
      }
      if (!targetId) return { kind: "ref", reason: `no equation applies for ${ref.quantity} on a ${inputs.ergometer}` };
      if (stack.includes(targetId) || targetId === eq.id)
        return { kind: "ref", reason: `equation ${targetId} refers back to itself` };
      const sub = evaluateInternal(getEquation(targetId), inputs, { labSettings }, [...stack, eq.id]);
      used.push(...sub.usedEquationIds);
      issues.push(...sub.issues);
      if (sub.value === null)
        return { kind: "ref", reason: `${sub.equationLabel} gave no value${sub.reason ? ` (${sub.reason})` : ""}` };
      const converted = convertPredictedUnit(sub.value, sub.unit, ref.unit, inputs.patient.weightKg);
      if (converted === null)
        return { kind: "ref", reason: `cannot convert ${sub.equationLabel} from ${sub.unit} to ${ref.unit} (needs body weight)` };
      steps.push({
        label: `${sub.equationLabel}${sub.unit !== ref.unit ? ` (converted from ${sub.unit})` : ""}`,
        value: converted,
        unit: ref.unit,
      });
      return converted;
    },
  };

  let value: number;
  try {
    value = evaluateForm(eq.form, scope, ctx);
    if (!Number.isFinite(value)) throw new FormError({ kind: "non-finite" });
  } catch (e) {
    if (!(e instanceof FormError)) throw e;
    const { code, message } = failureMessage(eq, e.failure);
    issues.push(makeIssue("error", code, message));
    return { ...base, value: null, reason: message, issues: uniqueIssues(issues), provenance: provenance() };
  }

  // a predicted PEAK below twice resting VO2 is no longer a prediction of the population the equation was fitted on (a
  // per-kg weight term taken far beyond its cohort gives such values in severe obesity: FRIEND 2018 at 140 kg predicts
  // 2 mL/kg/min): withheld, so no % predicted is read from it
  const perKg =
    eq.quantity === "vo2PeakMlKgMin"
      ? value
      : eq.quantity === "vo2PeakMlMin" && inputs.patient.weightKg
        ? value / inputs.patient.weightKg
        : null;
  if (eq.kind === "predicted-normal" && perKg !== null && perKg < PEAK_VO2_FLOOR_ML_KG_MIN) {
    const reason =
      `${eq.label} predicts a peak VO2 of ${perKg.toFixed(1)} mL/kg/min for this patient, below twice resting VO2 ` +
      `(${PEAK_VO2_FLOOR_ML_KG_MIN} mL/kg/min): outside the range the equation was fitted on` +
      `${eq.predictors.some((p) => p.from === "weightKg") ? " (its weight term, far beyond the cohort's weights)" : ""}; ` +
      `no % predicted is read from it. Choose an equation with a rule for body weight, or read peak VO2 against predicted weight.`;
    issues.push(makeIssue("warning", "equation-outside-its-range", reason, { field: "weightKg" }));
    return { ...base, value: null, reason, issues: uniqueIssues(issues), provenance: provenance() };
  }

  const out: PredictedValue = { ...base, value, issues: [], provenance: provenance() };
  const abnormalHigh = PREDICTED_QUANTITIES[eq.quantity].abnormalWhen === "high";
  let limit: number | undefined;
  if (eq.lln?.method === "see") {
    limit = abnormalHigh ? value + eq.lln.z * eq.lln.see : value - eq.lln.z * eq.lln.see;
    out.limitMethod = eq.lln.label;
    out.see = eq.lln.see;
    if (options.measured !== undefined && Number.isFinite(options.measured)) out.zScore = (options.measured - value) / eq.lln.see;
  } else if (eq.lln?.method === "formula") {
    try {
      limit = evaluateForm(eq.lln.form, scope, { ...ctx, steps: [] });
      out.limitMethod = eq.lln.label;
    } catch (e) {
      if (!(e instanceof FormError)) throw e;
    }
  }
  // a lower limit of peak VO2 below resting VO2 (1 MET) separates nothing: not given
  const perKgLimit = limit === undefined || perKg === null ? null : (limit * perKg) / value;
  if (perKgLimit !== null && !abnormalHigh && perKgLimit < PEAK_VO2_FLOOR_ML_KG_MIN / 2) {
    issues.push(
      makeIssue(
        "info",
        "lln-below-rest",
        `${eq.label}: its lower limit of normal for this patient (${perKgLimit.toFixed(1)} mL/kg/min) lies below resting VO2 (${PEAK_VO2_FLOOR_ML_KG_MIN / 2} mL/kg/min), so it is not given; read % predicted.`,
        { field: "weightKg" },
      ),
    );
    limit = undefined;
  }
  // an SEE describes the scatter inside the cohort; beyond its recorded range (an extrapolation) the scatter is not
  // known, so neither the limit nor a z-score is given from it (common practice: a prediction interval widens away
  // from the data it was fitted on); % predicted stays, with the extrapolation warning beside it
  const outside = issues.find(
    (i) => i.code === "outside-derivation-population" && i.where?.field !== "sex" && i.where?.field !== undefined,
  );
  if (limit !== undefined && outside) {
    issues.push(
      makeIssue(
        "info",
        "limit-not-given-outside-range",
        `${eq.label}: no ${abnormalHigh ? "upper" : "lower"} limit of normal or z-score is given for this patient, who lies outside the range the equation was derived on (${fieldWords(outside.where!.field!)}); read % predicted with caution.`,
        { field: outside.where!.field! },
      ),
    );
    limit = undefined;
    delete out.zScore;
  }
  if (limit !== undefined) {
    if (abnormalHigh) out.uln = limit;
    else out.lln = limit;
  }
  out.issues = uniqueIssues(issues);
  return out;
}

/**
 * Evaluate a reference equation for a patient.
 *
 * The equation is data (`reference-equations/<id>.json`, cited there with its evidence status);
 * this is a generic interpreter. Returns the predicted value in the equation's unit, the limit of
 * normal where the source gives an SEE or a limit formula (LLN = predicted − z·SEE, z = 1.645 for
 * the 5th percentile; for quantities where high is abnormal the mirror upper limit), a z-score
 * when `options.measured` is given, and issues:
 * - `missing-input` (error, value null) when a predictor is not recorded;
 * - `outside-derivation-population` (warning) for sex, age, height, weight or BMI outside the cohort;
 * - `ergometer-mismatch` (warning) when the equation was derived on the other ergometer;
 * - `performance-estimate` / `capacity-estimate` / `recalled-source` (info).
 *
 * @param equation the equation object or its id (unknown id: programming mistake, throws)
 * @example evaluateEquation("hansen-1984", { patient: { sex: "male", ageY: 50, heightCm: 175, weightKg: 80 }, ergometer: "cycle" }).value // 2505.606 mL/min
 */
export function evaluateEquation(
  equation: ReferenceEquation | string,
  inputs: EquationInputs,
  options: EvaluateOptions = {},
): PredictedValue {
  const eq = typeof equation === "string" ? getEquation(equation) : equation;
  return evaluateInternal(eq, inputs, options, []);
}
