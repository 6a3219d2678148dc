import type { AnalysisResult, ReferralQuestion, TestRecord } from "../analysis";
import { EVIDENCE_LABEL, type Measured, type Source } from "../core";
import { thresholdMethodWords } from "../analysis";
import { ATRIAL_FIBRILLATION_HR_NOTE, heartRateNotes, hrReserveNote } from "../interpret";
import { analysisCharts } from "./analysisCharts";
import { ALL_SOURCES } from "./sources";
import { formatClock, formatNumber } from "../units";
import { CLINICAL_CAUTION, DRAFT_CAUTION } from "./caution";
import { PREDICTED_QUANTITIES, type PredictedQuantity } from "../predicted";
import {
  BAND_MEANING,
  IMPLAUSIBLE_DVO2_DWR_ML_MIN_W,
  LACTATE_METHOD_NAMES,
  slopeToVt2Name,
  stageLengthS,
  veVco2BandEndsWords,
  type LineIndex,
  type LactateThresholdsResult,
} from "../thresholds";
import { bandNote } from "./bandNote";
import { formatComparisonCutoff, formatComparisonValue } from "./formatComparison";
import type { ReportModel, ReportRow, ReportSection } from "./reportModel";

/** The stored state of the report text: from `lib/store/reports` (or a new, unsaved draft). */
export interface ReportDraftState {
  status: "draft" | "signed";
  sections: ReportSection[];
  signedBy?: string | null;
  signedAt?: string | null;
  /** The attestation the signer confirmed. */
  attestation?: string | null;
  /** A signed version that amends an earlier signed one: which, and why. */
  amendment?: { revisesVersion: number; reason: string } | null;
  /** The account the signer was signed in with; null or absent for a name typed without log-in. */
  signerAccount?: string | null;
}

export interface BuildReportModelOptions {
  /** Source registry to resolve cited ids. @default ALL_SOURCES (every registry) */
  sources?: Record<string, Source>;
}

const REFERRAL_WORDS: Record<ReferralQuestion, string> = {
  general: "General assessment / unexplained breathlessness",
  "heart-failure": "Heart failure assessment",
  "pre-operative": "Pre-operative risk assessment",
  "lung-resection": "Lung resection work-up",
  "pulmonary-hypertension": "Pulmonary hypertension",
  transplant: "Heart transplant listing",
  training: "Training prescription",
};

const unique = <T>(items: readonly T[]): T[] => [...new Set(items)];

/** Heart rates (and HR differences) are written in whole beats per minute, spelled "bpm" (common practice). */
const isHeartRate = (label: string, unit: string) => unit === "1/min" && /heart[- ]rate|\bHR\b/i.test(label);

/** Plain words for a predicted quantity, e.g. "predicted peak VO2" (never the internal field name). */
export function predictedQuantityWords(quantity: string): string {
  const q = PREDICTED_QUANTITIES[quantity as PredictedQuantity];
  return `predicted ${q ? q.label : quantity}`;
}

/**
 * A measured value as a table row: formatted value or "not determinable" with the reason. Heart
 * rates are whole bpm whatever `decimals` says; source ids are listed once each.
 */
function measuredRow(label: string, m: Measured, decimals: number, format?: (v: number) => string): ReportRow {
  const hr = isHeartRate(label, m.unit);
  const d = hr ? 0 : decimals;
  const row: ReportRow = {
    label,
    value: m.value === null ? "not determinable" : format ? format(m.value) : formatNumber(m.value, d),
    unit: hr ? "bpm" : m.unit,
    method: m.provenance.label,
    sourceIds: unique(m.provenance.sourceIds),
  };
  if (m.value === null && m.reason) row.note = m.reason;
  return row;
}

/**
 * The lactate thresholds as rows of the thresholds table, named as the page names them (`LACTATE_METHOD_NAMES`; the
 * method column carries the page's full label): value on the samples' axis, lactate, heart rate and VO2 at the
 * threshold, where it lies against the VT it estimates (`LACTATE_METHOD_ESTIMATES`) with the verdict, and the caution
 * of a method that reads across a suspect sample; then peak lactate (recovery samples included).
 */
function lactateRows(lac: LactateThresholdsResult): ReportRow[] {
  const d = lac.axis === "speedKmh" ? 1 : 0;
  const rows: ReportRow[] = lac.thresholds.map((t) => {
    const row = measuredRow(LACTATE_METHOD_NAMES[t.id], t.intensity, d);
    const rel = lac.relations.find((r) => r.id === t.id);
    const bits = [
      t.lactateMmolL.value !== null ? `lactate ${formatNumber(t.lactateMmolL.value, 1)} mmol/L` : "",
      t.hrBpm?.value != null ? `heart rate ${formatNumber(t.hrBpm.value, 0)} bpm` : "",
      t.vo2MlMin?.value != null ? `VO2 ${formatNumber(t.vo2MlMin.value, 0)} mL/min` : "",
      rel ? `${rel.where}: ${rel.verdictShort}` : "",
      t.caution ? `caution: ${t.caution}` : "",
    ];
    row.note = [row.note, ...bits].filter(Boolean).join("; ");
    return row;
  });
  if (lac.peakMmolL !== null) {
    const rec = lac.recoveryPoints.length;
    rows.push({
      label: "Peak lactate",
      value: formatNumber(lac.peakMmolL, 1),
      unit: "mmol/L",
      method: "highest blood lactate sample",
      sourceIds: [],
      ...(rec
        ? {
            note: `${rec} sample${rec === 1 ? "" : "s"} drawn in recovery included here; not on the lactate curve, so no threshold is read from ${rec === 1 ? "it" : "them"}`,
          }
        : {}),
    });
  }
  return rows;
}

/** One methods sentence for the lactate thresholds: samples, axis, methods, recovery samples and the concordance rule. */
function lactateMethods(lac: LactateThresholdsResult): string {
  const n = lac.points.length;
  const rec = lac.recoveryPoints.length;
  const axis = lac.axis === "speedKmh" ? "speed" : "work rate";
  const labels = unique(lac.thresholds.map((t) => t.intensity.provenance.label));
  const rest = lac.points.filter((p) => p.rest).length;
  return [
    `Lactate thresholds from ${n} point${n === 1 ? "" : "s"} of blood lactate against ${axis}${rest ? ` (${rest} at rest, not on the exercise curve the methods read)` : ""}: ${labels.join("; ")}.`,
    rec ? `${rec} sample${rec === 1 ? "" : "s"} drawn in recovery counted as peak lactate only.` : "",
    lac.relations.length ? lac.concordance.note : "",
  ]
    .filter(Boolean)
    .join(" ");
}

function patientLine(record: TestRecord): string {
  const p = record.patient;
  return [
    p.sex ?? "sex not given",
    p.ageY !== undefined ? `${formatNumber(p.ageY, 0)} y` : "age not given",
    p.heightCm !== undefined ? `${formatNumber(p.heightCm, 0)} cm` : "height not given",
    p.weightKg !== undefined ? `${formatNumber(p.weightKg, 1)} kg` : "weight not given",
  ].join(", ");
}

/** The interpretation values each key-value row stands for (`InterpretInput.notRead` keys), by comparison key. */
const NOT_READ_KEYS: Record<string, readonly (keyof NonNullable<AnalysisResult["interpretInput"]["notRead"]>)[]> = {
  peakVo2: ["peakVo2MlMin", "peakVo2PctPred"],
  peakVo2PerKg: ["peakVo2MlKgMin", "peakVo2PctPred"],
  peakHr: ["hrPctPred"],
  peakO2Pulse: ["o2PulsePeakMlBeat", "o2PulsePctPred"],
};

/**
 * Why the interpretation does not read a key-value row's value or its % predicted (a beta-blocker under an O2 pulse
 * predicted from an age-predicted maximal heart rate, a child's % of an adult equation, a doubted VO2); undefined when it
 * reads them. The page and the report put it beside the % predicted, which is then shown in brackets.
 */
export function keyValueNotRead(result: AnalysisResult, comparisonKey: string): string | undefined {
  return (NOT_READ_KEYS[comparisonKey] ?? []).map((k) => result.interpretInput.notRead?.[k]).find(Boolean);
}

/** Key-value rows computed from VO2 (marked when VO2-based values are read at a reviewer's word). */
const VO2_BASED_ROWS = new Set(["peakVo2", "peakVo2PerKg", "peakO2Pulse"]);

function testLine(result: AnalysisResult, record: TestRecord): string {
  const parts = [`${record.ergometer} ergometer`];
  const rate = result.conditioned.rampRateWPerMin;
  // a stepped protocol is named by its steps (its mean rate beside them), not called a ramp
  const stage = stageLengthS(result.conditioned);
  // a table of steady-state stage means has no ramp rate worth a number (irregular steps read as a slow ramp)
  if (stage !== null && record.table.shape === "stage") parts.push(`stages of ${formatNumber(stage, 0)} s`);
  else if (rate !== null && stage !== null)
    parts.push(`stages of ${formatNumber(stage, 0)} s (about ${formatNumber(rate, 0)} W/min)`);
  else if (rate !== null) parts.push(`ramp ${formatNumber(rate, 0)} W/min`);
  const d = result.indices.peaks.testDurationS.value;
  if (d !== null) parts.push(`recording ${formatClock(d)} min:s`);
  parts.push(`${record.table.rows.length} ${record.table.shape === "breath" ? "breaths" : "rows"}`);
  // one test of a file holding several: which one is the patient's identity
  if (record.upload?.selected) parts.push(`the test where ${record.upload.selected} in a file holding several`);
  // the upload's file name is not printed: carts and sites often put the patient's name, birth date or number in it
  return parts.join(", ");
}

/**
 * Map an analysis result, its record and the stored report text into the display model shown by
 * the report page and written to the PDF. Numbers are rounded here (display only). Sources are
 * those cited by the rows, in order of first citation; an id missing from the registry is listed
 * as "not in the registry" (status recalled) so it is never silently dropped.
 *
 */
export function buildReportModel(
  result: AnalysisResult,
  record: TestRecord,
  label: string,
  draft: ReportDraftState,
  options: BuildReportModelOptions = {},
): ReportModel {
  const registry = options.sources ?? ALL_SOURCES;
  const ix = result.indices;
  const pk = ix.peaks;
  const hrNotes = heartRateNotes(record.patient);
  const afNote = record.patient.atrialFibrillation === true ? ATRIAL_FIBRILLATION_HR_NOTE : undefined;
  const keyValues: ReportRow[] = result.comparisons.map((c) => {
    const decimals = c.measured.unit === "mL/min" || c.measured.unit === "W" || c.measured.unit === "1/min" ? 0 : 1;
    const row = measuredRow(c.label, c.measured, decimals);
    if (c.predicted && c.predicted.value !== null) {
      row.predicted = formatNumber(c.predicted.value, decimals);
      row.sourceIds = unique([...row.sourceIds, ...c.predicted.provenance.sourceIds]);
      row.note = [
        row.note,
        `${predictedQuantityWords(c.predicted.quantity)} by ${c.predicted.equationLabel} (evidence: ${EVIDENCE_LABEL[c.predicted.status]})`,
      ]
        .filter(Boolean)
        .join("; ");
    }
    // a value the interpretation does not read (a child's % of an adult equation, a doubted VO2) says so on its row, and
    // its % predicted is bracketed so "62" is not taken for a reading
    const notRead = keyValueNotRead(result, c.key);
    if (c.percentPredicted !== null)
      row.pctPredicted = notRead ? `(${formatNumber(c.percentPredicted, 0)})` : formatNumber(c.percentPredicted, 0);
    if (notRead) row.note = [row.note, `not read: ${notRead}`].filter(Boolean).join("; ");
    // read although VO2 was doubted, at a reviewer's word: said on every VO2-based row, where the reader looks first
    else if (result.interpretInput.vo2ReadAtReview && VO2_BASED_ROWS.has(c.key))
      row.note = [
        row.note,
        `VO2 doubted (ΔVO2/ΔWR below ${IMPLAUSIBLE_DVO2_DWR_ML_MIN_W.toFixed(1)}); read at a reviewer's word, see methods`,
      ]
        .filter(Boolean)
        .join("; ");
    // shown, but not read against the age-predicted maximum on a beta-blocker (common practice)
    if (c.key === "peakHr" && hrNotes.length) row.note = [row.note, ...hrNotes].filter(Boolean).join("; ");
    // O2 pulse is VO2 / HR: in atrial fibrillation it is shown, not interpreted
    if (c.key === "peakO2Pulse" && afNote) row.note = [row.note, afNote].filter(Boolean).join("; ");
    if (c.predicted?.lln !== undefined && c.predicted.lln !== null) row.lln = formatNumber(c.predicted.lln, decimals);
    return row;
  });
  const oues = ix.oues.fits.find((f) => f.fraction === 1);
  const extra: [string, Measured | undefined, number, LineIndex?][] = [
    ["Peak RER", pk.rerMax, 2],
    ["Peak VE", pk.veLMin, 0],
    [slopeToVt2Name(ix.veVco2.slopeToVt2), ix.veVco2.slopeToVt2.slope, 1, ix.veVco2.slopeToVt2],
    ["VE/VCO2 slope, whole exercise", ix.veVco2.slopeWholeExercise.slope, 1, ix.veVco2.slopeWholeExercise],
    ["OUES (whole exercise)", oues?.slope, 0, oues],
    ["ΔVO2/ΔWR", ix.dVo2dWr.whole.slope, 1, ix.dVo2dWr.whole],
    ["Breathing reserve", ix.breathingReserve.reservePercent, 0],
    ["Heart-rate reserve", ix.heartRate.reserveBpm, 0],
    ["HR recovery at 1 min", ix.heartRate.recovery1MinBpm, 0],
    ["Lowest SpO2", ix.spo2.lowestPct, 0],
    // treadmill: speed and grade at the end of exercise, read together (a cycle test has none)
    ...(pk.speedKmh.value !== null
      ? ([
          ["Treadmill speed at the end of exercise", pk.speedKmh, 1],
          ["Treadmill grade at the end of exercise", pk.gradePct, 1],
        ] as [string, Measured, number][])
      : []),
  ];
  for (const [label, m, d, line] of extra) {
    if (!m) continue;
    const row = measuredRow(label, m, d);
    // the slopes carry their calibrated bands (their meaning is stated in the methods)
    row.note = [row.note, bandNote(line, d)].filter(Boolean).join("; ") || row.note;
    // HR reserve is predicted HRmax − peak HR: the same beta-blocker note as the peak HR's % predicted
    if (m === ix.heartRate.reserveBpm && hrNotes.length) row.note = [row.note, ...hrNotes].filter(Boolean).join("; ");
    if (m === ix.heartRate.reserveBpm) row.note = [row.note, hrReserveNote(m.value)].filter(Boolean).join("; ") || row.note;
    // (the cut-off's protocol, a cool-down walk in Cole 1999, is said in the value's method)
    if (m === ix.heartRate.recovery1MinBpm && afNote) row.note = [row.note, afNote].filter(Boolean).join("; ");
    const hrrNotRead = result.interpretInput.notRead?.hrr1Bpm;
    if (m === ix.heartRate.recovery1MinBpm && hrrNotRead && !afNote) row.note = [row.note, hrrNotRead].filter(Boolean).join("; ");
    keyValues.push(row);
  }
  keyValues.push(measuredRow("Recording duration", pk.testDurationS, 0, formatClock));
  keyValues[keyValues.length - 1].unit = "min:s";

  const thresholds: ReportRow[] = [];
  for (const [t, at, name] of [
    [result.thresholds.vt1, ix.atVt1, "VT1 (AT)"],
    [result.thresholds.vt2, ix.atVt2, "VT2 (RCP)"],
  ] as const) {
    const row = measuredRow(name, t.vo2MlMin, 0);
    const atValues: NonNullable<ReportRow["atValues"]> = [];
    if (at && t.vo2MlMin.value !== null) {
      const add = (label: string, m: Measured, d: number, unit: string, before = false) => {
        if (m.value === null) return;
        const v = formatNumber(m.value, d);
        atValues.push({ label, value: before ? `${label} ${v} ${unit}` : `${v} ${unit}` });
      };
      add("VO2/kg", at.vo2MlKgMin, 1, "mL/kg/min");
      add("% of peak VO2", at.vo2PercentPeak, 0, "% of peak VO2");
      add("HR", at.hrBpm, 0, "bpm", true);
      add("work rate", at.workW, 0, "W");
      // VE/VCO2 at the AT enters the pre-operative schemes; said with what it is at the band's ends
      if (t.which === "vt1" && at.veVco2.value !== null) {
        const ends = veVco2BandEndsWords(at, "VT1");
        atValues.push({ label: "VE/VCO2", value: `VE/VCO2 ${formatNumber(at.veVco2.value, 1)}${ends ? ` (${ends})` : ""}` });
      }
    }
    if (atValues.length) row.atValues = atValues;
    const bits: string[] = [];
    if (t.overridden) {
      // A reviewer's threshold: who set it and why, once, as the method; no detection confidence or band
      // (they belong to the automatic estimate, which is named by its value only).
      row.method = thresholdMethodWords(t, result.thresholds);
      if (atValues.length) bits.push(atValues.map((a) => a.value).join(", "));
      const auto = t.overridden.automatic.vo2MlMin;
      bits.push(
        auto !== null ? `automatic estimate was ${formatNumber(auto, 0)} mL/min` : "the automatic estimate was not determinable",
      );
    } else {
      const methodWords = t.vo2MlMin.value !== null ? thresholdMethodWords(t, result.thresholds) : "";
      // The method words usually state confidence and band already; say them once.
      if (!/confidence/.test(methodWords)) bits.push(`confidence ${t.confidence.replace(/-/g, " ")}`);
      if (t.band && !/band/.test(methodWords))
        bits.push(`band ${formatNumber(t.band.lowMlMin, 0)}–${formatNumber(t.band.highMlMin, 0)} mL/min`);
      if (atValues.length) bits.push(atValues.map((a) => a.value).join(", "));
      // When not determinable, the reason is already in the row (from the Measured); do not repeat it.
      if (methodWords) bits.push(methodWords);
    }
    row.note = [row.note, ...bits].filter(Boolean).join("; ");
    thresholds.push(row);
  }
  if (ix.lactate) thresholds.push(...lactateRows(ix.lactate));
  const path: ReportModel["path"] = result.interpretation.path.steps.map((st, i) => {
    // A variable read by two rules of one step is listed once (same value, same cut-off).
    const seen = new Set<string>();
    const comparisons = st.checks
      .flatMap((c) => c.comparisons)
      .filter((x) => {
        const key = `${x.variable}|${x.op}|${String(x.cutoff)}`;
        if (seen.has(key)) return false;
        seen.add(key);
        return true;
      });
    return {
      step: i + 1,
      variable: st.title,
      // each value once; category conditions (sex, ergometer …) choose a branch and are not cut-offs
      value: unique(comparisons.map(formatComparisonValue)).join("; ") || "-",
      cutoff:
        unique(
          comparisons
            .filter((x) => typeof x.cutoff !== "string" && !(Array.isArray(x.cutoff) && typeof x.cutoff[0] === "string"))
            .map(formatComparisonCutoff),
        ).join("; ") || "-",
      outcome: st.text,
      sourceIds: unique(st.sourceIds),
    };
  });
  const schemes: ReportModel["schemes"] = result.interpretation.schemes.map((sc) => ({
    name: sc.name,
    // the scheme's own overall wording: a category, "Graded variable by variable …" or why there is none
    category: sc.overall ? sc.overall.label : sc.overallText,
    severity: sc.overall?.severity ?? -1,
    inputs: [...sc.axes.map((a) => a.text), ...(sc.path?.steps.map((x) => x.text) ?? [])],
    // a scheme's limits travel with its result: the report's reader needs them as much as the page's
    notes: [...sc.notes],
    sourceIds: unique(sc.sourceIds),
  }));

  const cited: string[] = [];
  for (const ids of [...keyValues, ...thresholds, ...path, ...schemes].map((r) => r.sourceIds))
    for (const id of ids) if (!cited.includes(id)) cited.push(id);
  for (const m of result.thresholds.methods) for (const id of m.sourceIds) if (!cited.includes(id)) cited.push(id);
  const sources: Source[] = cited.map(
    (id) => registry[id] ?? { id, citation: `Source "${id}" (not in the registry)`, status: "recalled" },
  );

  const methods: string[] = [
    `Peak values: ${pk.vo2MlMin.provenance.label}.`,
    // no method ran (no VCO2, no exercise phase): the reason, not an empty list
    result.thresholds.methods.length
      ? `VT1 and VT2: ${result.thresholds.methods
          .map((m) => m.label)
          .filter((l, i, a) => a.indexOf(l) === i)
          .join("; ")}; consensus with confidence and band (${result.thresholds.series.averaging}). ${BAND_MEANING}`
      : `VT1 and VT2: no method could run (${result.thresholds.vt1.reason ?? "no data"}).`,
    `Display averaging: ${result.conditioned.averaging.label}.`,
    `Predicted values: ${Object.values(result.predicted.values)
      .flatMap((v) => (v ? [`${predictedQuantityWords(v.quantity)} by ${v.equationLabel}`] : []))
      .join("; ")}.`,
    ...result.interpretation.settingsUsed.map(
      (u) => `Cut-off choice: ${u.label}: ${u.optionLabel}${u.isDefault ? " (default)" : ""}.`,
    ),
  ];
  if (ix.lactate) methods.push(lactateMethods(ix.lactate));
  // spans a reviewer set aside are named with their reasons; the automatic screens are counted apart
  const byReview = result.conditioned.settings?.setAside ?? [];
  const reviewed = result.conditioned.removed.filter((r) => r.byReview).length;
  const automatic = result.conditioned.removed.length - reviewed;
  for (const span of byReview)
    methods.push(
      `Set aside by review before analysis: ${span.channel === "heart-rate" ? "heart rate" : "gas and ventilation values"}, ${formatClock(span.startS)}–${formatClock(span.endS)} (${span.reason}).`,
    );
  if (automatic > 0) methods.push(`${automatic} breath values were set aside as artefacts before analysis.`);
  // a fixed line (not editable draft text): VO2-based values read although VO2 rose implausibly little with work
  if (result.interpretInput.vo2ReadAtReview)
    methods.push(`VO2-based values were read at a reviewer's word, although ${result.interpretInput.vo2ReadAtReview}.`);

  return {
    title: `Cardiopulmonary exercise test report: ${label}`,
    patientLine: patientLine(record),
    testLine: testLine(result, record),
    referral: REFERRAL_WORDS[record.referral] ?? record.referral,
    engineVersion: result.engineVersion,
    status: draft.status,
    ...(draft.status === "signed" && draft.signedBy ? { signedBy: draft.signedBy } : {}),
    ...(draft.status === "signed" && draft.signedAt ? { signedAt: draft.signedAt } : {}),
    ...(draft.status === "signed" && draft.attestation ? { attestation: draft.attestation } : {}),
    ...(draft.status === "signed" && draft.amendment ? { amendment: { ...draft.amendment } } : {}),
    ...(draft.status === "signed" && draft.signerAccount ? { signerAccount: draft.signerAccount } : {}),
    caution: CLINICAL_CAUTION,
    draftMark: DRAFT_CAUTION,
    keyValues,
    thresholds,
    charts: analysisCharts(result),
    sections: draft.sections,
    path,
    schemes,
    issues: result.issues,
    sources,
    methods,
  };
}
