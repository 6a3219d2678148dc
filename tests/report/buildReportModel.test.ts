import fs from "node:fs";
import path from "node:path";
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
  it("maps the analysis result into display rows with predicted values, thresholds, sources and the composed draft", async () => {
    const record = await rampRecord();
    const result = analyse(record);
    const sections = initialDraftSections(result);
    const model = buildReportModel(result, record, "Synthetic ramp", { status: "draft", sections });
    // Known by construction (e2e/fixtures/plain-ramp.csv.ts): highest 30-s average 2500 mL/min;
    // 2500 / 80 kg = 31.25 → "31.3" at one decimal; recording 0-660 s = 11:00.
    const row = (label: string) => model.keyValues.find((r) => r.label === label)!;
    expect([row("Peak VO2").value, row("Peak VO2").unit]).toEqual(["2500", "mL/min"]);
    expect([row("Peak VO2 per kg").value, row("Peak VO2 per kg").unit]).toEqual(["31.3", "mL/kg/min"]);
    expect([row("Recording duration").value, row("Recording duration").unit]).toEqual(["11:00", "min:s"]);
    expect(row("Peak VO2").method).toBe("VO2: highest 30-s rolling average in exercise");
    // Hansen 1984 cycle, man 50 y 175 cm 80 kg: 2505.6 mL/min (clinical-reference §1.2 worked example)
    // → 2500 / 2505.6 = 99.8 % → "100".
    expect(row("Peak VO2").predicted).toBe("2506");
    expect(row("Peak VO2").pctPredicted).toBe("100");
    expect(model.sources.map((s) => s.id)).toContain("peak-rolling-average");
    expect(model.sources.map((s) => s.id)).toContain("hansen-1984");
    expect(model.thresholds.map((t) => t.label)).toEqual(["VT1 (AT)", "VT2 (RCP)"]);
    expect(model.caution).toBe(CLINICAL_CAUTION);
    expect(model.status).toBe("draft");
    expect(model.signedBy).toBeUndefined();
    expect(model.patientLine).toBe("male, 50 y, 175 cm, 80.0 kg");
    expect(model.charts.map((c) => c.id)).toContain("time-course");
    // The first draft is the interpretation layer's composed text, marked as a draft.
    expect(sections.length).toBeGreaterThan(3);
    expect(sections.map((x) => x.paragraphs.join(" ")).join(" ")).toMatch(/2500 mL\/min/);
  });

  it("never prints the upload's file name, which often holds the patient's name, birth date or number", async () => {
    // an INVENTED identifying file name
    const record = {
      ...(await rampRecord()),
      upload: { fileName: "INVENTED_Doe_Jane_DOB1950-01-02_ID777.csv", sha256: "0", sizeBytes: 1 },
    };
    const model = buildReportModel(analyse(record), record, "Teaching case 7", { status: "draft", sections: [] });
    expect(JSON.stringify(model)).not.toMatch(/Doe|DOB1950|ID777/);
    expect(model.testLine).toMatch(/^cycle ergometer/);
  });

  it("writes each slope's calibrated band beside it, at the slope's own precision", async () => {
    const record = await rampRecord();
    const result = analyse(record);
    const model = buildReportModel(result, record, "Synthetic ramp", { status: "draft", sections: initialDraftSections(result) });
    const row = (label: string) => model.keyValues.find((r) => r.label === label)!;
    const oues = result.indices.oues.fits.find((f) => f.fraction === 1)!;
    // the invented ramp's VO2 is not log-linear in VE, so OUES has a band of some width; shown to whole units like OUES
    expect(row("OUES (whole exercise)").note).toContain(`band ${Math.round(oues.band!.low)}–${Math.round(oues.band!.high)}`);
    const whole = result.indices.veVco2.slopeWholeExercise;
    // the noise-free ramp's VE/VCO2 line is exact to the last digit shown: its band (28.0–28.0) says so in words
    expect([whole.band!.low.toFixed(1), whole.band!.high.toFixed(1)]).toEqual(["28.0", "28.0"]);
    expect(row("VE/VCO2 slope, whole exercise").note).toContain("band narrower than the last digit shown");
    // the band's centre, the slope corrected for breath noise in VCO2, is written beside it
    const corrected = whole.slope.provenance.inputs!.dilutionCorrected as number;
    expect(row("VE/VCO2 slope, whole exercise").note).toContain(`corrected for breath noise ${corrected.toFixed(1)}`);
    // a perfect line (this ramp's VO2 against work) has no scale, so no band is written
    expect(result.indices.dVo2dWr.whole.band).toBeNull();
    expect(row("ΔVO2/ΔWR").note ?? "").not.toContain("band");
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

describe("the test line names a stepped protocol by its stages", () => {
  it("ACTES: +15 W every minute (the set's README) reads as stages of 60 s, about 15 W/min, not a ramp", async () => {
    // Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded cycloergometer exercise
    // testing, v1.0.0, PhysioNet 2022, doi:10.13026/2qs3-kh43 (ODC-By 1.0); test 13, details from actes_subject-info.csv
    const built = await buildRecord({
      bytes: new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/open-data/actes/actes_test_measure.csv"))),
      fileName: "actes_test_measure.csv",
      patient: { sex: "male", ageY: 18, heightCm: 183, weightKg: 83.9 },
      ergometer: "cycle",
      referral: "general",
      importOptions: { select: { ID: "13" } },
    });
    const r = analyse(built.record!);
    const model = buildReportModel(r, built.record!, "ACTES 13", { status: "draft", sections: initialDraftSections(r) });
    expect(model.testLine).toMatch(/^cycle ergometer, stages of 60 s \(about 15 W\/min\), recording /);
  }, 30_000);
});
