import type { AnalysisResult } from "../analysis";
import type { ReportSection } from "./reportModel";

/**
 * The first text of a new report draft: the sections composed by the interpretation layer from
 * the findings (referral, conduct and effort, results against predicted, thresholds, limitation
 * pattern, schemes, prescription, conclusion). The clinician edits them; they stay a DRAFT until signed.
 */
export function initialDraftSections(result: AnalysisResult): ReportSection[] {
  // The DRAFT status is shown by the report itself (mark, watermark), not as an editable section.
  return result.draft.sections
    .filter((s) => s.id !== "status")
    .map((s) => ({ id: s.id, title: s.title, paragraphs: [...s.paragraphs] }));
}
