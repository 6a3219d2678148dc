import { makeIssue, type Issue, type Measured } from "../core";
import { conditionTable } from "../signal";
import {
  detectThresholds,
  measureIndices,
  peakOverWindow,
  type MvvChoice,
  type ThresholdEstimate,
  type ThresholdPoint,
  type ThresholdResult,
} from "../thresholds";
import {
  assessWeightBasis,
  compareWithPredicted,
  DEFAULT_LAB_SETTINGS,
  predictAll,
  type PredictedQuantity,
  type PredictedSet,
} from "../predicted";
import { composeDraft, interpret, peakVo2ReducedLimit } from "../interpret";
import type { AnalysisResult, AnalysisSettings, PredictedComparisonRow, TestRecord } from "./types";
import { toInterpretInput } from "./toInterpretInput";
import { draftExtras } from "./draftExtras";

/**
 * Version of the analysis code; stored with every analysis version and printed on reports. Raised when a change moves
 * what a report states (0.3.0: the threshold bands are calibrated, README-thresholds.md round 17; 0.4.0: the whole-exercise
 * VE/VCO2 slope, OUES and ΔVO2/ΔWR carry calibrated bands, round 18; 0.5.0: an EOV call on breaths whose noise carries
 * over is marked, in the schemes too, round 19, and no intensity domain is drawn from thresholds out of order; 0.6.0:
 * VE/VCO2 at VT1 is read over 60 s of breaths and at the ends of the VT1 band, which the schemes read too; smoothed or
 * averaged exports cap threshold confidence and drop the breath-calibrated bands; short tests show no plateau or
 * whole-exercise slope or OUES; HR gaps, HR recovery from averaged rows and beta-blockers are read as such; an effort
 * verdict near its cut-off and a per-kg class in obesity say so; round 20; 0.7.0: a peak VO2 reduced on predicted body
 * mass only leads the conclusion with both readings; a scheme waiting on a yes/no input says what each answer gives; no
 * SEE-based limit of normal beyond an equation's derivation range; a % predicted not read is bracketed; a ramp lag whose
 * fit needs the longest delay and exceeds 90 s is not used).
 */
export const ENGINE_VERSION = "0.7.0";

/**
 * The whole analysis as one pure, deterministic function of (record, settings):
 * condition → predict → thresholds (consensus or reviewer override) → indices → compare with
 * predicted → interpret → draft. Everything shown anywhere (page, PDF, CLI JSON) derives from it.
 */
export function analyse(record: TestRecord, settings: AnalysisSettings = {}): AnalysisResult {
  const test = conditionTable(record.table, settings.conditioning);
  const labSettings = settings.labSettings ?? DEFAULT_LAB_SETTINGS;
  const predicted = predictAll(record.patient, record.ergometer, labSettings, { spirometry: record.spirometry });
  const thresholds = detectThresholds(test, {
    overrides: settings.overrides ?? [],
    bootstrap: settings.bootstrap ?? 20,
    seed: 1,
  });
  thresholds.issues.push(...movedBySetAside(record, settings, thresholds));
  const hrMax = predicted.values.hrMaxBpm;
  const mvvChoice = settings.mvvChoice ?? defaultMvvChoice(record);
  // the MVV estimated from FEV1 says "prefer a measured value": not said when a measured MVV is the one used
  const mvvEstimateUnused = mvvChoice === "measured" && record.spirometry?.mvvLMin !== undefined;
  const indices = measureIndices(test, {
    patient: record.patient,
    spirometry: record.spirometry,
    predictedHrMaxBpm: hrMax?.value ?? undefined,
    predictedHrMaxEquationId: hrMax?.equationId,
    // one predicted HRmax per result: when the lab's equation cannot give one, no other stands in for it
    predictedHrMaxNotDeterminedReason: hrMax && hrMax.value === null ? (hrMax.reason ?? "not determinable") : undefined,
    vt1: thresholdPoint(thresholds.vt1),
    vt2: thresholdPoint(thresholds.vt2),
    peakWindowS: settings.peakWindowS ?? 30,
    mvvChoice,
    lactate: record.lactate,
    bloodGases: record.bloodGases,
    ...(record.conduct?.apparatusDeadSpaceMl !== undefined ? { apparatusDeadSpaceMl: record.conduct.apparatusDeadSpaceMl } : {}),
    ...(record.conduct?.barometricPressureMmHg !== undefined
      ? { barometricPressureMmHg: record.conduct.barometricPressureMmHg }
      : {}),
  });
  const comparisons = compareAll(indices, predicted);
  const peakVo2 = indices.peaks.vo2MlMin.value;
  // "reduced" in the weight-basis note is read with the same limit as the conclusion's rule peak-vo2-reduced
  const reducedBelow = peakVo2ReducedLimit(settings.interpret ?? {}) ?? undefined;
  const weightBasis =
    peakVo2 !== null ? assessWeightBasis(peakVo2, record.patient, record.ergometer, { labSettings, reducedBelow }) : null;
  const peakRr = peakOverWindow(test.clean, "rrBrMin", { unit: "1/min", windowS: settings.peakWindowS ?? 30 });
  const vo2Checked = settings.vo2Checked !== undefined && indices.dVo2dWr.implausiblyLow === true ? settings.vo2Checked : null;
  const interpretInput = toInterpretInput(
    record,
    thresholds,
    indices,
    predicted,
    comparisons,
    peakRr.value,
    weightBasis,
    vo2Checked,
  );
  const interpretation = interpret(interpretInput, settings.interpret ?? {});
  const draft = composeDraft(interpretInput, interpretation, draftExtras(record, thresholds, indices));
  const issues: Issue[] = [
    ...record.importIssues,
    ...test.issues,
    ...predicted.issues,
    // each predicted value's own cautions (a patient outside the equation's derivation population, an input missing):
    // on the page and in the report as in the CLI; a missing detail stops one predicted value, not the analysis
    ...Object.entries(predicted.values)
      .filter(([quantity]) => !(quantity === "mvvLMin" && mvvEstimateUnused))
      .flatMap(([, pv]) => (pv?.issues ?? []).map((i): Issue => (i.severity === "error" ? { ...i, severity: "warning" } : i))),
    ...thresholds.issues,
    // read at a reviewer's word: the warning says so instead of "not interpreted"
    ...(vo2Checked
      ? indices.issues.map((i) => (i.code === "vo2-too-low-for-work" ? vo2ReadAtReview(i, vo2Checked) : i))
      : indices.issues),
    ...interpretation.issues,
    ...(weightBasis?.issues ?? []),
    ...peakHrAbovePrediction(indices.peaks.hrBpm.value, hrMax?.value ?? null, record.patient.atrialFibrillation === true),
  ];
  return {
    engineVersion: ENGINE_VERSION,
    settings,
    conditioned: test,
    thresholds,
    indices,
    predicted,
    comparisons,
    weightBasis,
    interpretInput,
    interpretation,
    draft,
    issues: dedupeIssues(issues),
  };
}

function thresholdPoint(t: ThresholdEstimate): ThresholdPoint | null {
  return t.timeS !== null && t.vo2MlMin.value !== null
    ? { timeS: t.timeS, vo2MlMin: t.vo2MlMin.value, bandTimes: t.bandTimes ?? null }
    : null;
}

/** Measured MVV when given; otherwise FEV1 × 40 (the choice is named on the result). */
function defaultMvvChoice(record: TestRecord): MvvChoice | undefined {
  if (record.spirometry?.mvvLMin) return "measured";
  if (record.spirometry?.fev1L) return "fev1x40";
  return undefined;
}

function compareAll(indices: AnalysisResult["indices"], predicted: PredictedSet): PredictedComparisonRow[] {
  const p = indices.peaks;
  const rows: [string, string, Measured, PredictedQuantity][] = [
    ["peakVo2", "Peak VO2", p.vo2MlMin, "vo2PeakMlMin"],
    ["peakVo2PerKg", "Peak VO2 per kg", p.vo2MlKgMin, "vo2PeakMlKgMin"],
    ["peakWork", "Peak work rate", p.workW, "workMaxW"],
    ["peakHr", "Peak heart rate", p.hrBpm, "hrMaxBpm"],
    ["peakO2Pulse", "Peak O2 pulse", p.o2PulseMlBeat, "o2PulseMaxMlBeat"],
    ["veVco2Nadir", "Lowest VE/VCO2", indices.veVco2.nadir, "veVco2NadirRatio"],
  ];
  return rows.map(([key, label, measured, quantity]) => {
    const pv = predicted.values[quantity] ?? null;
    if (!pv || pv.value === null)
      return { key, label, measured, predicted: pv, percentPredicted: null, zScore: null, beyondLimit: null };
    const c = compareWithPredicted(measured.value, pv);
    return {
      key,
      label,
      measured,
      predicted: pv,
      percentPredicted: c.percentPredicted,
      zScore: c.zScore ?? null,
      beyondLimit: c.beyondLimit ?? null,
    };
  });
}

function dedupeIssues(issues: Issue[]): Issue[] {
  const seen = new Set<string>();
  return issues.filter((i) => {
    const key = `${i.severity}|${i.code}|${i.message}|${JSON.stringify(i.where ?? {})}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

/**
 * The `vo2-too-low-for-work` warning when a reviewer chose to read VO2-based values after checking the cart: the first
 * sentence (the measured ΔVO2/ΔWR and why it is doubted) kept, the "not interpreted" part replaced by the reviewer's word.
 */
function vo2ReadAtReview(issue: Issue, checked: { reason: string }): Issue {
  const measuredPart = issue.message.split(" VO2-based values are shown but not interpreted")[0];
  return {
    ...issue,
    code: "vo2-read-at-review",
    message: `${measuredPart} VO2-based values are read all the same, at a reviewer's word: ${checked.reason}. Read capacity, O2 pulse and the patterns with that doubt in mind.`,
  };
}

/** A threshold that moves more than this fraction when a reviewer sets breaths aside is said (our choice). */
export const SET_ASIDE_MOVE_FRACTION = 0.05;

/**
 * Thresholds that a reviewer's set-aside gas spans moved: the reported consensus differs from the one found the same way
 * (same resampling and seed) without the spans by more than `SET_ASIDE_MOVE_FRACTION` of the latter. Said as a warning per threshold (`vt1-moved-by-set-aside`), for the reviewer to check on the charts: a span far
 * from the threshold's time can still move it, through the fits either side. A reviewer's own threshold is not checked.
 */
function movedBySetAside(record: TestRecord, settings: AnalysisSettings, thresholds: ThresholdResult): Issue[] {
  const spans = (settings.conditioning?.setAside ?? []).filter((s) => s.channel !== "heart-rate");
  if (spans.length === 0) return [];
  const without = detectThresholds(
    conditionTable(record.table, {
      ...settings.conditioning,
      setAside: (settings.conditioning?.setAside ?? []).filter((s) => s.channel === "heart-rate"),
    }),
    { bootstrap: settings.bootstrap ?? 20, seed: 1 },
  );
  const out: Issue[] = [];
  for (const which of ["vt1", "vt2"] as const) {
    if (thresholds[which].overridden) continue;
    const a = without[which].vo2MlMin.value;
    const b = thresholds[which].vo2MlMin.value;
    const name = which === "vt1" ? "VT1" : "VT2";
    if (a !== null && b !== null && Math.abs(b - a) > SET_ASIDE_MOVE_FRACTION * a)
      out.push(
        makeIssue(
          "warning",
          `${which}-moved-by-set-aside`,
          `${name} moved from ${Math.round(a)} to ${Math.round(b)} mL/min (${b > a ? "+" : "−"}${Math.round((100 * Math.abs(b - a)) / a)} %) when breaths were set aside by review: check it on the charts, and set it by review if the breaths either side do not show it.`,
          { field: which },
        ),
      );
    else if ((a === null) !== (b === null))
      out.push(
        makeIssue(
          "warning",
          `${which}-moved-by-set-aside`,
          `${name} ${a === null ? "was found only" : "is not determinable"} once breaths were set aside by review: check it on the charts.`,
          { field: which },
        ),
      );
  }
  return out;
}

/**
 * Scatter of measured maximal heart rate about an age-predicted one, bpm: the SEE of Jones et al. 1985 HRmax = 202 −
 * 0.72·age, 10.3 bpm (Jones NL, Makrides L, Hitchcock C, Chypchar T, McCartney N. Am Rev Respir Dis 1985;131:700-708 —
 * confirmed, clinical-reference §1.2 [S4]).
 */
export const HR_MAX_SEE_BPM = 10.3;

/**
 * A peak heart rate more than two SEE (about 21 bpm) above the predicted maximum is rare in a correctly entered age with a
 * clean heart-rate signal (about 1 in 40 by the normal scatter): a warning to check the age and the signal (an R-wave
 * double count, an artefact). Not raised in atrial fibrillation, where the ventricular rate is not read against a
 * prediction.
 */
function peakHrAbovePrediction(peakHrBpm: number | null, predictedBpm: number | null, atrialFibrillation: boolean): Issue[] {
  if (atrialFibrillation || peakHrBpm === null || predictedBpm === null || !(predictedBpm > 0)) return [];
  const over = peakHrBpm - predictedBpm;
  if (!(over > 2 * HR_MAX_SEE_BPM)) return [];
  return [
    makeIssue(
      "warning",
      "peak-hr-far-above-predicted",
      `Peak heart rate ${Math.round(peakHrBpm)} bpm is ${Math.round(over)} bpm above the predicted maximum (${Math.round(predictedBpm)} bpm), more than twice the usual scatter of maximal heart rate about its prediction (${HR_MAX_SEE_BPM} bpm): check the age entered and the heart-rate signal (a doubled count or an artefact) before reading heart-rate criteria.`,
      { field: "hrBpm" },
    ),
  ];
}
