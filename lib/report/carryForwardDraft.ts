import type { AnalysisResult, TestRecord } from "../analysis";
import { buildReportModel } from "./buildReportModel";
import { carryForwardSections, type CarryForwardResult, type PreviousReportText } from "./carryForwardSections";
import { describeInterpretationChanges } from "./describeInterpretationChanges";
import { describeValueChanges } from "./describeValueChanges";
import { initialDraftSections } from "./initialDraftSections";

/**
 * The first text of the draft for a new analysis version of a test, given the newest earlier report
 * version: the reviewer's edited sections carried forward with a re-check note listing what changed
 * between the two analyses: the section's generated text, the interpretation steps, patterns and
 * scheme grades (`describeInterpretationChanges`), then the displayed values
 * (`describeValueChanges` over key values and thresholds); the other sections newly generated. See `carryForwardSections`.
 *
 * @param previousResult the analysis the previous report version was written for
 * @param nextResult the new analysis
 */
export function carryForwardDraft(
  previous: PreviousReportText,
  previousResult: AnalysisResult,
  nextResult: AnalysisResult,
  record: TestRecord,
): CarryForwardResult {
  const before = buildReportModel(previousResult, record, "", { status: "draft", sections: [] });
  const after = buildReportModel(nextResult, record, "", { status: "draft", sections: [] });
  return carryForwardSections({
    previous,
    previousGenerated: initialDraftSections(previousResult),
    nextGenerated: initialDraftSections(nextResult),
    changes: [
      ...describeInterpretationChanges(previousResult, nextResult),
      ...describeValueChanges([...before.keyValues, ...before.thresholds], [...after.keyValues, ...after.thresholds]),
    ],
  });
}
