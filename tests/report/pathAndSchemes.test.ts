import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { UNCOMBINED_SCHEME_TEXT } from "../../lib/interpret";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { demoLabel, demoRecord } from "./demoRecord";

// INVENTED demo cases (synthetic generator presets, fixed seeds): wording checks on the report model.
describe("report: interpretation path and schemes in words", () => {
  it("each value is listed once per step and category conditions (sex) are not shown as cut-offs", async () => {
    const record = await demoRecord("heart-failure");
    const result = analyse(record);
    const model = buildReportModel(result, record, demoLabel("heart-failure"), {
      status: "draft",
      sections: initialDraftSections(result),
    });
    for (const step of model.path) {
      const values = step.value.split("; ");
      expect(new Set(values).size).toBe(values.length);
      expect(step.cutoff).not.toMatch(/^Sex |; Sex /);
    }
  });

  it("a scheme without a combined category says so in its own words, not 'not assessable'", async () => {
    const record = await demoRecord("pulmonary-vascular");
    const result = analyse(record);
    const model = buildReportModel(result, record, demoLabel("pulmonary-vascular"), {
      status: "draft",
      sections: initialDraftSections(result),
    });
    const uncombined = result.interpretation.schemes.filter((s) => s.overallText === UNCOMBINED_SCHEME_TEXT).map((s) => s.name);
    expect(uncombined.length).toBeGreaterThan(0);
    for (const name of uncombined) expect(model.schemes.find((s) => s.name === name)!.category).toBe(UNCOMBINED_SCHEME_TEXT);
  });
});
