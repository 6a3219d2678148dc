import "server-only";
import { analyse, ENGINE_VERSION, type AnalysisResult } from "@/lib/analysis";
import { buildReportModel } from "@/lib/report/buildReportModel";
import { initialDraftSections } from "@/lib/report/initialDraftSections";
import { carryForwardDraft } from "@/lib/report/carryForwardDraft";
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

export interface LoadedReport {
  test: StoredTest;
  /** The record this report version's analysis was made on (pinned by its analysis version). */
  record: TestRecord;
  result: AnalysisResult;
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
  }
  const model = buildReportModel(result, record, test.label, report);
  const versions = listReports(testId); // newest first
  // an older draft, kept in the history, says on every page that a newer analysis of the test replaced it
  const newest = versions[0];
  if (report.status === "draft" && newest && newest.id !== report.id)
    model.draftMark = `${model.draftMark} Superseded: version ${newest.version} of this report is newer; do not use this draft.`;
  return { test, record, result, report, versions, model };
}
