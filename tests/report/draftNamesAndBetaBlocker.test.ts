import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { BETA_BLOCKER_HR_NOTE } from "../../lib/interpret";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { slopeToVt2Name } from "../../lib/thresholds";
import { demoRecord } from "./demoRecord";

// INVENTED demo case 'heart-failure' (synthetic generator preset, fixed seed): a man of 62 on a beta-blocker whose
// test shows no determinable VT2, so the VE/VCO2 slope "to VT2" is fitted to a break the fit placed itself.
describe("the draft text names the VE/VCO2 slope as the values table does (invented demo case 'heart-failure')", async () => {
  const record = await demoRecord("heart-failure");
  const result = analyse(record);
  const sections = initialDraftSections(result);
  const model = buildReportModel(result, record, "Heart failure (invented)", { status: "draft", sections });
  const results = sections.find((s) => s.id === "results")!.paragraphs.join(" ");
  const line = result.indices.veVco2.slopeToVt2;

  it("precondition: no VT2, and the slope is not fitted to an RCP", () => {
    expect(result.thresholds.vt2.vo2MlMin.value).toBeNull();
    expect(line.slope.value).not.toBeNull();
    expect(line.slope.provenance.method).not.toBe("ve-vco2-slope-to-vt2");
  });

  it("uses the table's name beside the slope, and never says 'to RCP' when no RCP was found", () => {
    const name = slopeToVt2Name(line);
    expect(model.keyValues.map((r) => r.label)).toContain(name);
    expect(results).toContain(`${name} ${line.slope.value!.toFixed(1)}`);
    expect(results).not.toMatch(/\(to RCP\)|start to RCP/);
    expect(result.interpretInput.names?.veVco2SlopeToRcp).toBe(name);
  });

  it("the draft's sections are the analysis' own draft (the name comes from the analysis, not patched in afterwards)", () => {
    const own = result.draft.sections.filter((s) => s.id !== "status");
    for (const s of own) expect(sections.find((x) => x.id === s.id)!.paragraphs).toEqual(s.paragraphs);
  });

  it("on a beta-blocker, HR compared with a predicted maximum carries the note, and the values stay shown", () => {
    expect(record.patient.betaBlocker).toBe(true);
    const peakHr = model.keyValues.find((r) => r.label === "Peak heart rate")!;
    expect(peakHr.value).toMatch(/^\d+$/);
    expect(peakHr.pctPredicted).toMatch(/^\d+$/);
    expect(peakHr.note).toContain(BETA_BLOCKER_HR_NOTE);
    const reserve = model.keyValues.find((r) => r.label === "Heart-rate reserve")!;
    expect(reserve.value).toMatch(/^\d+$/);
    expect(reserve.note).toContain(BETA_BLOCKER_HR_NOTE);
    expect(results).toMatch(new RegExp(`Peak heart rate \\d+ bpm \\(${BETA_BLOCKER_HR_NOTE}\\)`));
    // unrelated rows get no such note
    expect(model.keyValues.find((r) => r.label === "Peak VO2")!.note ?? "").not.toContain("beta-blocker");
  });
});

describe("without a beta-blocker no HR note (invented demo case 'normal-adult')", async () => {
  const record = await demoRecord("normal-adult");
  const result = analyse(record);
  const model = buildReportModel(result, record, "Normal (invented)", {
    status: "draft",
    sections: initialDraftSections(result),
  });
  it("peak HR and HR reserve rows carry no beta-blocker note", () => {
    expect(record.patient.betaBlocker).not.toBe(true);
    for (const label of ["Peak heart rate", "Heart-rate reserve"])
      expect(model.keyValues.find((r) => r.label === label)?.note ?? "").not.toContain("beta-blocker");
  });
});
