import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { CLINICAL_CAUTION } from "../../lib/report/caution";
import { plainRampCsv } from "../../e2e/fixtures/plain-ramp.csv";

async function rampRecord() {
  const bytes = new TextEncoder().encode(plainRampCsv());
  const built = await buildRecord({
    bytes,
    fileName: "plain-ramp.csv",
    patient: { sex: "male", ageY: 50, heightCm: 175, weightKg: 80 },
    ergometer: "cycle",
  });
  return built.record!;
}

describe("buildReportModel", () => {
  it("maps today's analysis result into display rows with sources and neutral draft text", async () => {
    const record = await rampRecord();
    const result = analyse(record);
    const sections = initialDraftSections(result);
    const model = buildReportModel(result, record, "Synthetic ramp", { status: "draft", sections });
    // Known by construction (e2e/fixtures/plain-ramp.csv.ts): highest 30-s average 2500 mL/min;
    // 2500 / 80 kg = 31.25 → "31.3" at one decimal; recording 0-660 s = 11:00.
    expect(model.keyValues.map((r) => [r.label, r.value, r.unit])).toEqual([
      ["Peak VO2", "2500", "mL/min"],
      ["Peak VO2 per kg", "31.3", "mL/kg/min"],
      ["Recording duration", "11:00", "min:s"],
    ]);
    expect(model.keyValues[0].method).toBe("highest 30-s rolling average");
    expect(model.sources.map((s) => s.id)).toEqual(["peak-rolling-average", "common-practice"]);
    expect(model.caution).toBe(CLINICAL_CAUTION);
    expect(model.status).toBe("draft");
    expect(model.signedBy).toBeUndefined();
    expect(model.patientLine).toBe("male, 50 y, 175 cm, 80.0 kg");
    expect(model.charts.map((c) => c.id)).toContain("time-course");
    expect(sections[0].paragraphs[0]).toBe("Peak VO2 was 2500 mL/min (highest 30-s rolling average), 31.3 mL/kg/min.");
  });

  it("shows the signer only for a signed report and never drops an unknown source id", async () => {
    const record = await rampRecord();
    const result = analyse(record);
    const signed = buildReportModel(result, record, "x", {
      status: "signed",
      sections: [],
      signedBy: "Dr A Example",
      signedAt: "2026-12-01T10:00:00.000Z",
    });
    expect(signed).toMatchObject({ status: "signed", signedBy: "Dr A Example", signedAt: "2026-12-01T10:00:00.000Z" });
    const sparse = buildReportModel(result, record, "x", { status: "draft", sections: [] }, { sources: {} });
    expect(sparse.sources[0]).toMatchObject({ id: "peak-rolling-average", status: "recalled" });
    expect(sparse.sources[0].citation).toMatch(/not in the registry/);
  });
});
