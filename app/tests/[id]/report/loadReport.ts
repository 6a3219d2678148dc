import "server-only";
import { analyse, ENGINE_VERSION, type AnalysisResult } from "@/lib/analysis";
import { buildReportModel } from "@/lib/report/buildReportModel";
import { initialDraftSections } from "@/lib/report/initialDraftSections";
import { carryForwardDraft } from "@/lib/report/carryForwardDraft";
import { describeSchemeChanges, describeValueChanges } from "@/lib/report/describeValueChanges";
import type { ReportModel } from "@/lib/report/reportModel";
import { getOrCreateDraft, getReport, listReports, type StoredReport } from "@/lib/store/reports";
import { getLabDefaults } from "@/lib/store/labSettings";
import {
  analysisRecord,
  getTest,
  latestSettings,
  listAnalysisVersions,
  saveAnalysisVersion,
  type StoredTest,
} from "@/lib/store/tests";
import type { TestRecord } from "@/lib/analysis";
import { formatUtcMinute } from "@/lib/units";

export interface LoadedReport {
  test: StoredTest;
  /** The record this report version's analysis was made on (pinned by its analysis version); absent when frozen. */
  record?: TestRecord;
  /** The analysis the report shows; absent for a version kept as signed (its model is read, not recomputed). */
  result?: AnalysisResult;
  report: StoredReport;
  versions: StoredReport[];
  model: ReportModel;
}

/** The record an analysis version pinned; versions saved before records were pinned fall back to the current one. */
function recordOf(test: StoredTest & { record: TestRecord }, analysisId: number): TestRecord {
  return analysisRecord(analysisId) ?? test.record;
}

/**
 * The text a new draft for analysis `analysisId` starts with: the generated text, or, when an
 * earlier report version exists (the analysis or its inputs changed after the reviewer edited or signed), the
 * reviewer's edited sections carried forward with a re-check note (`carryForwardDraft`), the changes read between the
 * earlier version's record and settings and these. Only computed when that analysis has no report yet.
 */
function firstDraftText(
  test: StoredTest & { record: TestRecord },
  analysisId: number,
  result: AnalysisResult,
  record: TestRecord,
) {
  const reports = listReports(test.id);
  if (reports.some((r) => r.analysisId === analysisId)) return [];
  const generated = initialDraftSections(result);
  const previous = reports[0];
  if (!previous) return generated;
  const previousSettings = listAnalysisVersions(test.id).find((v) => v.id === previous.analysisId)?.settings;
  if (!previousSettings) return generated;
  const text = { reportId: previous.id, version: previous.version, status: previous.status, sections: previous.sections };
  return carryForwardDraft(text, analyse(recordOf(test, previous.analysisId), previousSettings), result, record).sections;
}

/**
 * The report of a test: a given version (`reportId`), rebuilt from the record and settings its analysis version pinned
 * (a signed report never changes when the test's inputs are corrected later), or the current one for the latest
 * analysis version (created as a draft with neutral text on first view). Null when the test does not exist, was
 * refused on import, or `reportId` belongs to another test.
 */
export function loadReport(testId: number, reportId?: number): LoadedReport | null {
  const found = getTest(testId);
  if (!found?.record) return null;
  const test = found as StoredTest & { record: TestRecord };
  let report: StoredReport | null;
  let result: AnalysisResult;
  let record: TestRecord;
  if (reportId !== undefined) {
    report = getReport(reportId);
    if (!report || report.testId !== testId) return null;
    // a version kept as signed is shown as it was signed, whatever the engine or data files are now
    if (report.status === "signed" && report.signedModelJson) {
      const versions = listReports(testId);
      const model = withVersionNotes(JSON.parse(report.signedModelJson) as ReportModel, report, versions, changesOf(testId));
      return { test, report, versions, model };
    }
    const analysisId = report.analysisId;
    const settings = listAnalysisVersions(testId).find((v) => v.id === analysisId)?.settings ?? {};
    record = recordOf(test, analysisId);
    result = analyse(record, settings);
  } else {
    let latest = latestSettings(testId);
    const pinned = latest ? listAnalysisVersions(testId)[0].recordSha256 : null;
    // no version yet, or the record changed without one (a database from before records were pinned): pin it now
    if (!latest || (pinned !== null && pinned !== test.recordSha256)) {
      const note = latest ? "test record changed since the last analysis version" : "first analysis, lab default settings";
      saveAnalysisVersion(testId, latest?.settings ?? getLabDefaults(), ENGINE_VERSION, "system", note);
      latest = latestSettings(testId)!;
    }
    record = test.record;
    result = analyse(record, latest.settings);
    report = getOrCreateDraft(testId, latest.id, firstDraftText(test, latest.id, result, record));
    if (report.status === "signed" && report.signedModelJson) {
      const versions = listReports(testId);
      const model = withVersionNotes(JSON.parse(report.signedModelJson) as ReportModel, report, versions, changesOf(testId));
      return { test, record, result, report, versions, model };
    }
  }
  const versions = listReports(testId); // newest first
  // only a version signed before signed reports were kept reaches here signed (the others returned above)
  const rebuiltBy = report.status === "signed" ? ENGINE_VERSION : undefined;
  const model = withVersionNotes(
    buildReportModel(result, record, test.label, report),
    report,
    versions,
    changesOf(testId),
    rebuiltBy,
  );
  return { test, record, result, report, versions, model };
}

const day = (iso: string | null) => (iso ? formatUtcMinute(iso) : "an unknown time");

/**
 * What the version history says about this version, on the page and on every PDF page: its number; the signed version
 * it revises; and, when a newer version exists, that it was amended (a newer signed version) or is being revised (a
 * newer draft), or, for an older draft, that it must not be used. Written at load time: it tells what happened after
 * signing and changes nothing that was signed.
 */
/**
 * What changed in a test between two of its analysis versions, from their notes ("patient details changed: weight
 * 80 kg → 85 kg", "VT1 override: …"): the versions after `fromId` up to and including `toId`, oldest first.
 */
function changesOf(testId: number): (fromId: number, toId: number) => string[] {
  const analyses = listAnalysisVersions(testId);
  return (fromId, toId) =>
    analyses
      .filter((a) => a.id > fromId && a.id <= toId)
      .sort((a, b) => a.id - b.id)
      .map((a) => a.note ?? `analysis version ${a.version}`);
}

function withVersionNotes(
  model: ReportModel,
  report: StoredReport,
  versions: readonly StoredReport[],
  changes: (fromAnalysisId: number, toAnalysisId: number) => string[],
  rebuiltBy?: string,
): ReportModel {
  const newest = versions[0];
  const newerSigned = versions.find((v) => v.id > report.id && v.status === "signed");
  const earlierSigned = versions.find((v) => v.id < report.id && v.status === "signed");
  const notes = [`Version ${report.version} of ${versions.length}.`];
  if (earlierSigned) {
    const since = changes(earlierSigned.analysisId, report.analysisId);
    notes.push(
      `Revises version ${earlierSigned.version}, signed by ${earlierSigned.signedBy} on ${day(earlierSigned.signedAt)}` +
        (since.length
          ? `; changed since then: ${since.join("; ")}.`
          : "; the test's data and settings are those it was signed on."),
    );
  }
  // what a reader of the amended report must be told: which reported values it changes (both versions as signed, or
  // the draft as it reads now); a version signed before reports were kept has no model to compare with
  const valueChanges = earlierSigned?.signedModelJson
    ? { sinceVersion: earlierSigned.version, lines: reportChanges(JSON.parse(earlierSigned.signedModelJson), model) }
    : undefined;
  let draftMark = model.draftMark;
  if (report.status === "signed" && newerSigned)
    notes.push(
      `Superseded: version ${newerSigned.version} (the amended report), signed by ${newerSigned.signedBy} on ${day(newerSigned.signedAt)}, replaces this report.`,
    );
  else if (report.status === "signed" && newest && newest.id !== report.id)
    notes.push(
      newest.analysisId !== report.analysisId
        ? `Changed after this version was signed: ${changes(report.analysisId, newest.analysisId).join("; ") || "the test's data or settings"}. The values here are those at signing; version ${newest.version}, for the changed test, is an unsigned draft, and until it is signed this version remains the signed report.`
        : `A revision (version ${newest.version}) is in progress as an unsigned draft; this signed version stands until it is signed.`,
    );
  // signed before signed reports were kept whole: what is shown is rebuilt, and may read differently from what was signed
  if (report.status === "signed" && rebuiltBy)
    notes.push(
      `Signed before signed reports were kept as signed: rebuilt by engine ${rebuiltBy} from the record and settings it was signed on; its wording and any engine change since may differ from the version signed.`,
    );
  if (report.status === "draft" && newest && newest.id !== report.id)
    draftMark = `${draftMark} Superseded: version ${newest.version} of this report is newer; do not use this draft.`;
  return { ...model, draftMark, versionNote: notes.join(" "), ...(valueChanges ? { valueChanges } : {}) };
}

/** The key values, thresholds and scheme results that differ between two reports, one sentence each. */
function reportChanges(before: ReportModel, after: ReportModel): string[] {
  return [
    ...describeValueChanges([...before.keyValues, ...before.thresholds], [...after.keyValues, ...after.thresholds]),
    ...describeSchemeChanges(before.schemes, after.schemes),
  ];
}

/**
 * The function that turns a draft, as it will read once signed, into the report kept with the signature: built from
 * the record and settings the draft's analysis version pinned; with the test's label, printed as the report's title.
 * Null when the version does not exist or is of another test.
 */
export function freezeReport(
  testId: number,
  reportId: number,
): { freeze: (signed: StoredReport) => string; label: string } | null {
  const found = getTest(testId);
  const report = getReport(reportId);
  if (!found?.record || !report || report.testId !== testId || report.status !== "draft") return null;
  const test = found as StoredTest & { record: TestRecord };
  const settings = listAnalysisVersions(testId).find((v) => v.id === report.analysisId)?.settings ?? {};
  const record = recordOf(test, report.analysisId);
  const result = analyse(record, settings);
  return { freeze: (signed) => JSON.stringify(buildReportModel(result, record, test.label, signed)), label: test.label };
}
