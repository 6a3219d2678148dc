import type { AnalysisResult, ReferralQuestion, TestRecord } from "../analysis";
import { CORE_SOURCES, type Measured, type Source } from "../core";
import { THRESHOLD_SOURCES } from "../thresholds";
import { formatClock, formatNumber } from "../units";
import { CLINICAL_CAUTION, DRAFT_CAUTION } from "./caution";
import type { ChartSpec } from "./charts/chartSpec";
import { timeCourseChart } from "./charts/timeCourseChart";
import { vSlopeChart } from "./charts/vSlopeChart";
import type { ReportModel, ReportRow, ReportSection } from "./reportModel";

/** The stored state of the report text: from `lib/store/reports` (or a new, unsaved draft). */
export interface ReportDraftState {
  status: "draft" | "signed";
  sections: ReportSection[];
  signedBy?: string | null;
  signedAt?: string | null;
}

export interface BuildReportModelOptions {
  /** Source registry to resolve cited ids. @default CORE_SOURCES + THRESHOLD_SOURCES */
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

/** A measured value as a table row: formatted value or "not determinable" with the reason. */
function measuredRow(label: string, m: Measured, decimals: number, format?: (v: number) => string): ReportRow {
  const row: ReportRow = {
    label,
    value: m.value === null ? "not determinable" : format ? format(m.value) : formatNumber(m.value, decimals),
    unit: m.unit,
    method: m.provenance.label,
    sourceIds: m.provenance.sourceIds,
  };
  if (m.value === null && m.reason) row.note = m.reason;
  return row;
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

function testLine(result: AnalysisResult, record: TestRecord): string {
  const parts = [`${record.ergometer} ergometer`];
  if (result.conditioned.rampRateWPerMin !== null)
    parts.push(`ramp ${formatNumber(result.conditioned.rampRateWPerMin, 0)} W/min`);
  if (result.durationS.value !== null) parts.push(`recording ${formatClock(result.durationS.value)} min:s`);
  parts.push(`${record.table.rows.length} ${record.table.shape === "breath" ? "breaths" : "rows"}`);
  if (record.upload?.fileName) parts.push(`file ${record.upload.fileName}`);
  return parts.join(", ");
}

/** Charts available from the record alone (the analysis will add threshold markers and fits). */
function recordCharts(result: AnalysisResult, record: TestRecord): ChartSpec[] {
  const rows = record.table.rows;
  const has = (f: "vo2MlMin" | "vco2MlMin" | "hrBpm" | "workW") => rows.some((r) => typeof r[f] === "number");
  if (!has("vo2MlMin")) return [];
  const ex = result.conditioned.exercise;
  const charts: ChartSpec[] = [
    timeCourseChart({
      timeS: rows.map((r) => r.timeS),
      vo2MlMin: rows.map((r) => r.vo2MlMin),
      vco2MlMin: has("vco2MlMin") ? rows.map((r) => r.vco2MlMin) : undefined,
      hrBpm: has("hrBpm") ? rows.map((r) => r.hrBpm) : undefined,
      workW: has("workW") ? rows.map((r) => r.workW) : undefined,
      spans: ex ? [{ startS: ex.startS, endS: ex.endS, label: "incremental exercise" }] : [],
    }),
  ];
  if (has("vco2MlMin")) {
    const inExercise = ex ? rows.filter((r) => r.timeS >= ex.startS && r.timeS <= ex.endS) : rows;
    charts.push(vSlopeChart({ vo2MlMin: inExercise.map((r) => r.vo2MlMin), vco2MlMin: inExercise.map((r) => r.vco2MlMin) }));
  }
  return charts;
}

/**
 * Map an analysis result, its record and the stored report text into the display model shown by
 * the report page and written to the PDF. Numbers are rounded here (display only). Sources are
 * those cited by the rows, in order of first citation; an id missing from the registry is listed
 * as "not in the registry" (status recalled) so it is never silently dropped.
 *
 * Today the analysis gives peak VO2, duration and issues; thresholds, predicted values,
 * interpretation path and schemes are empty until the analysis provides them.
 */
export function buildReportModel(
  result: AnalysisResult,
  record: TestRecord,
  label: string,
  draft: ReportDraftState,
  options: BuildReportModelOptions = {},
): ReportModel {
  const registry = options.sources ?? { ...CORE_SOURCES, ...THRESHOLD_SOURCES };
  const peak = result.peak;
  const keyValues: ReportRow[] = [
    measuredRow("Peak VO2", peak.vo2MlMin, 0),
    measuredRow("Peak VO2 per kg", peak.vo2MlKgMin, 1),
    measuredRow("Recording duration", result.durationS, 0, formatClock),
  ];
  keyValues[2].unit = "min:s";
  const thresholds: ReportRow[] = [];
  const path: ReportModel["path"] = [];
  const schemes: ReportModel["schemes"] = [];

  const cited: string[] = [];
  for (const ids of [...keyValues, ...thresholds, ...path, ...schemes].map((r) => r.sourceIds))
    for (const id of ids) if (!cited.includes(id)) cited.push(id);
  const sources: Source[] = cited.map(
    (id) => registry[id] ?? { id, citation: `Source "${id}" (not in the registry)`, status: "recalled" },
  );

  const methods: string[] = [];
  for (const [name, m] of [
    ["Peak VO2", peak.vo2MlMin],
    ["Recording duration", result.durationS],
  ] as const) {
    methods.push(`${name}: ${m.provenance.label}${m.provenance.averaging ? ` (${m.provenance.averaging})` : ""}.`);
  }
  methods.push(
    `Averaging used by the analysis: ${result.conditioned.averaging.label}. Charts show the recorded rows unaveraged.`,
  );
  if (result.conditioned.removed.length > 0)
    methods.push(`${result.conditioned.removed.length} breaths were removed as artefacts before analysis.`);

  return {
    title: `Cardiopulmonary exercise test report: ${label}`,
    patientLine: patientLine(record),
    testLine: testLine(result, record),
    referral: REFERRAL_WORDS[record.referral] ?? record.referral,
    engineVersion: result.engineVersion,
    status: draft.status,
    ...(draft.status === "signed" && draft.signedBy ? { signedBy: draft.signedBy } : {}),
    ...(draft.status === "signed" && draft.signedAt ? { signedAt: draft.signedAt } : {}),
    caution: CLINICAL_CAUTION,
    draftMark: DRAFT_CAUTION,
    keyValues,
    thresholds,
    charts: recordCharts(result, record),
    sections: draft.sections,
    path,
    schemes,
    issues: result.issues,
    sources,
    methods,
  };
}
