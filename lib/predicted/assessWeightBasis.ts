import { makeIssue, type Ergometer, type Issue, type Patient } from "../core";
import { bodySize, OBESITY_BMI_KG_M2 } from "./bodySize";
import { toQuantity } from "./convertPredictedValue";
import { evaluateEquation } from "./evaluateEquation";
import { DEFAULT_LAB_SETTINGS, resolveEquationId, type LabSettings } from "./labSettings";
import { percentPredicted } from "./percentPredicted";

export interface WeightBasisOptions {
  labSettings?: LabSettings;
  /**
   * When peak VO2 reads as reduced: the lab's own limit, the one the interpretation uses (choice "peak-vo2-normal"), so
   * that the note and the conclusion of one report cannot disagree.
   * @default reduced when < 85 % predicted — "peak VO2 ≥ 85% predicted normal", practical guide to CPET in adults,
   * Respir Res 2021 Table 1 (secondary; source id `glaab-2021-guide`), the choice's default.
   */
  reducedBelow?: { op: "<" | "<="; pct: number; label: string };
}

export interface WeightBasisReading {
  weightKg: number;
  predictedMlMin: number | null;
  percentPredicted: number | null;
  /** Measured peak VO2 per kg of this weight, mL/kg/min. */
  measuredMlKgMin: number;
  /** True when measured peak VO2 reads as reduced on this basis. */
  reduced: boolean | null;
}

export interface WeightBasisAssessment {
  equationId?: string;
  bmiKgM2: number | null;
  predictedWeightKg: number | null;
  actual?: WeightBasisReading;
  ideal?: WeightBasisReading;
  /** True when actual and predicted (ideal) weight lead to different conclusions. */
  changesConclusion: boolean;
  /** Which criterion decided "reduced": the lab's % predicted limit. */
  criterion?: string;
  issues: Issue[];
}

/**
 * Would a predicted- (ideal-) weight basis change the reading of a measured peak VO2?
 * The lab's peak-VO2 equation is evaluated on actual weight and again on predicted weight
 * (Wasserman/Hansen: men 0.79·H − 60.7, women 0.65·H − 42.8; `hansen-1984`, secondary);
 * measured per-kg values are given on both. "Reduced" means below the lab's % predicted limit (`reducedBelow`), the
 * same the interpretation reads (not the equation's LLN, which the conclusion does not use). Raises info `weight-basis-changes-conclusion` when
 * the two bases disagree, and `obesity-weight-basis` when BMI ≥ 30 kg/m² (WHO obesity, common practice).
 * Degenerate cases: no measured value, no height/weight/sex → no readings, `changesConclusion` false.
 */
export function assessWeightBasis(
  measuredVo2MlMin: number,
  patient: Patient,
  ergometer: Ergometer,
  options: WeightBasisOptions = {},
): WeightBasisAssessment {
  const labSettings = options.labSettings ?? DEFAULT_LAB_SETTINGS;
  const limit = options.reducedBelow ?? { op: "<", pct: 85, label: "Reduced if < 85 % predicted" };
  const below = (pct: number) => (limit.op === "<" ? pct < limit.pct : pct <= limit.pct);
  const { bmiKgM2, predictedWeightKg } = bodySize(patient);
  const out: WeightBasisAssessment = { bmiKgM2, predictedWeightKg, changesConclusion: false, issues: [] };
  const resolved = resolveEquationId("vo2PeakMlMin", ergometer, labSettings);
  out.issues.push(...resolved.issues);
  if (!resolved.equationId || !Number.isFinite(measuredVo2MlMin) || predictedWeightKg === null || !patient.weightKg) return out;
  out.equationId = resolved.equationId;

  const read = (weightKg: number): WeightBasisReading => {
    const pv = toQuantity(
      evaluateEquation(resolved.equationId!, { patient: { ...patient, weightKg }, ergometer }, { labSettings }),
      "vo2PeakMlMin",
      weightKg,
    );
    const pct = percentPredicted(measuredVo2MlMin, pv.value);
    let reduced: boolean | null = null;
    if (pv.value !== null) reduced = pct !== null && below(pct);
    out.criterion = `the limit this analysis reads: ${limit.label.charAt(0).toLowerCase()}${limit.label.slice(1)}`;
    return { weightKg, predictedMlMin: pv.value, percentPredicted: pct, measuredMlKgMin: measuredVo2MlMin / weightKg, reduced };
  };
  out.actual = read(patient.weightKg);
  out.ideal = read(predictedWeightKg);
  out.changesConclusion = out.actual.reduced !== null && out.ideal.reduced !== null && out.actual.reduced !== out.ideal.reduced;

  const fmt = (r: WeightBasisReading) =>
    `${r.percentPredicted === null ? "—" : r.percentPredicted.toFixed(0)}% predicted, ${r.measuredMlKgMin.toFixed(1)} mL/kg/min at ${r.weightKg.toFixed(1)} kg`;
  if (bmiKgM2 !== null && bmiKgM2 >= OBESITY_BMI_KG_M2) {
    out.issues.push(
      makeIssue(
        "info",
        "obesity-weight-basis",
        `BMI ${bmiKgM2.toFixed(1)} kg/m²: actual weight ${fmt(out.actual)}; predicted weight ${fmt(out.ideal)}.`,
        { field: "weightKg" },
      ),
    );
  }
  if (out.changesConclusion) {
    out.issues.push(
      makeIssue(
        // a warning, not a note: the reading of peak VO2 turns on it (per-kg equations such as FRIEND read higher on
        // actual weight in obesity; FRIEND 2017 abstract: marked differences in % predicted among overweight and obese)
        "warning",
        "weight-basis-changes-conclusion",
        `Peak VO2 reads as ${out.actual.reduced ? "reduced" : "not reduced"} on actual weight but ${out.ideal.reduced ? "reduced" : "not reduced"} on predicted (ideal) weight (${out.criterion}); state the basis used.`,
        { field: "weightKg" },
      ),
    );
  }
  return out;
}
