import "server-only";
import { analyse, ENGINE_VERSION, type AnalysisResult } from "@/lib/analysis";
import { buildReportModel } from "@/lib/report/buildReportModel";
import { initialDraftSections } from "@/lib/report/initialDraftSections";
import { carryForwardDraft } from "@/lib/report/carryForwardDraft";
import type { ReportModel } from "@/lib/report/reportModel";
import { getOrCreateDraft, getReport, listReports, type StoredReport } from "@/lib/store/reports";
import { getLabDefaults } from "@/lib/store/labSettings";
import { getTest, latestSettings, listAnalysisVersions, saveAnalysisVersion, type StoredTest } from "@/lib/store/tests";

export interface LoadedReport {
  test: StoredTest;
  result: AnalysisResult;
  report: StoredReport;
  versions: StoredReport[];
  model: ReportModel;
}

/**
 * The text a new draft for analysis `analysisId` starts with: the generated text, or, when an
 * earlier report version exists (the analysis changed after the reviewer edited or signed), the
 * reviewer's edited sections carried forward with a re-check note (`carryForwardDraft`). Only
 * computed when that analysis has no report yet.
 */
function firstDraftText(test: StoredTest, analysisId: number, result: AnalysisResult) {
  const reports = listReports(test.id);
  if (reports.some((r) => r.analysisId === analysisId)) return [];
  const generated = initialDraftSections(result);
  const previous = reports[0];
  if (!previous || !test.record) return generated;
  const previousSettings = listAnalysisVersions(test.id).find((v) => v.id === previous.analysisId)?.settings;
  if (!previousSettings) return generated;
  const text = { reportId: previous.id, version: previous.version, status: previous.status, sections: previous.sections };
  return carryForwardDraft(text, analyse(test.record, previousSettings), result, test.record).sections;
}

/**
 * The report of a test: a given version (`reportId`), or the current one for the latest analysis
 * version (created as a draft with neutral text on first view). Null when the test does not exist,
 * was refused on import, or `reportId` belongs to another test.
 */
export function loadReport(testId: number, reportId?: number): LoadedReport | null {
  const test = getTest(testId);
  if (!test?.record) return null;
  let report: StoredReport | null;
  let result: AnalysisResult;
  if (reportId !== undefined) {
    report = getReport(reportId);
    if (!report || report.testId !== testId) return null;
    const analysisId = report.analysisId;
    const settings = listAnalysisVersions(testId).find((v) => v.id === analysisId)?.settings ?? {};
    result = analyse(test.record, settings);
  } else {
    let latest = latestSettings(testId);
    if (!latest) {
      saveAnalysisVersion(testId, getLabDefaults(), ENGINE_VERSION, "system", "first analysis, lab default settings");
      latest = latestSettings(testId)!;
    }
    result = analyse(test.record, latest.settings);
    report = getOrCreateDraft(testId, latest.id, firstDraftText(test, latest.id, result));
  }
  const model = buildReportModel(result, test.record, test.label, report);
  return { test, result, report, versions: listReports(testId), model };
}
