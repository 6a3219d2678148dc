import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";

describe("analyse: weight basis for an obese patient", () => {
  it("reads peak VO2 on actual and on predicted weight and flags obesity (INVENTED patient on an invented file)", async () => {
    const bytes = new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/normal-adult.csv")));
    // Invented: man 45 y, 170 cm, 120 kg → BMI 120 / 1.70² = 41.5 kg/m² (≥ 30 = obesity, WHO, common practice).
    const built = await buildRecord({
      bytes,
      fileName: "normal-adult.csv",
      patient: { sex: "male", ageY: 45, heightCm: 170, weightKg: 120 },
      ergometer: "cycle",
    });
    const r = analyse(built.record!);
    const wb = r.weightBasis!;
    expect(wb.bmiKgM2).toBeCloseTo(41.52, 2);
    // Predicted (ideal) weight for men 0.79·H − 60.7 (Hansen/Wasserman, secondary): 0.79·170 − 60.7 = 73.6 kg.
    expect(wb.predictedWeightKg).toBeCloseTo(73.6, 6);
    expect(wb.ideal!.measuredMlKgMin).toBeCloseTo(r.indices.peaks.vo2MlMin.value! / 73.6, 6);
    expect(wb.actual!.measuredMlKgMin).toBeCloseTo(r.indices.peaks.vo2MlMin.value! / 120, 6);
    expect(r.issues.map((i) => i.code)).toContain("obesity-weight-basis");
  });
});

describe("analyse: a per-kg class in obesity says where predicted body mass puts it", () => {
  // Weber classes (Janicki, Weber & McElroy 1988, Eur Heart J — confirmed: C 10–16, D < 10 mL/kg/min peak VO2); per-kg values on
  // actual weight understate capacity in obesity (Osman et al. 2000, J Am Coll Cardiol — recalled). INVENTED heart-failure
  // demo file; the patient details are invented: 174 cm, 160 kg (BMI 52.8) and 80 kg (BMI 26.4).
  const run = async (weightKg: number) => {
    const bytes = new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/heart-failure.csv")));
    const patient = { sex: "male" as const, ageY: 62, heightCm: 174, weightKg };
    const built = await buildRecord({ bytes, fileName: "hf.csv", patient, ergometer: "cycle", referral: "heart-failure" });
    return analyse(built.record!, { bootstrap: 0 });
  };

  it("160 kg: the peak-VO2 axis keeps the class of actual weight and names the class on predicted weight", async () => {
    const r = await run(160);
    const ideal = r.weightBasis!.ideal!;
    // predicted weight for men 0.79·H − 60.7 (Hansen/Wasserman, secondary): 0.79·174 − 60.7 = 76.76 kg
    expect(ideal.weightKg).toBeCloseTo(76.76, 6);
    const axis = r.interpretation.schemes
      .find((s) => s.schemeId === "weber")!
      .axes.find((a) => a.bandReaches?.includes("peak VO2") && a.bandReaches.includes("predicted body mass"))!;
    expect(axis.category?.label).toMatch(/^Class D/);
    expect(axis.bandReaches).toBe(
      `the peak VO2 ${ideal.measuredMlKgMin.toFixed(1)} mL/kg/min on predicted body mass (77 kg; BMI 52.8) reaches Class C (peak VO2 10.0-15.99 mL/kg/min)`,
    );
  });

  it("80 kg (not obese): no such reading", async () => {
    const r = await run(80);
    const all = r.interpretation.schemes.flatMap((s) => s.axes).map((a) => a.bandReaches ?? "");
    expect(all.some((t) => t.includes("predicted body mass"))).toBe(false);
  });
});

describe("analyse: a lung-resection step turned by predicted body mass names the criterion that turns it", () => {
  // ERS/ESTS 2009 (Brunelli et al., Eur Respir J — secondary): peak VO2 > 20 mL/kg/min or > 75 % predicted = capacity
  // adequate; < 10 mL/kg/min or < 35 % predicted = high risk. INVENTED pulmonary-vascular demo file; the patient is
  // invented: woman 80 y, 155 cm, 105 kg (BMI 43.7), so peak VO2 is under 10 mL/kg/min on actual weight and between 10
  // and 20 on predicted body mass (0.65·155 − 42.8 = 57.95 kg, Hansen/Wasserman women — secondary), while % predicted
  // stays above 75 %.
  it("the predicted-body-mass reading reaches 'capacity adequate' by its % predicted, not by a per-kg value under 20", async () => {
    const bytes = new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/pulmonary-vascular.csv")));
    const patient = { sex: "female" as const, ageY: 80, heightCm: 155, weightKg: 105 };
    const built = await buildRecord({ bytes, fileName: "pv.csv", patient, ergometer: "cycle", referral: "lung-resection" });
    const r = analyse(built.record!, { bootstrap: 0 });
    const ideal = r.weightBasis!.ideal!;
    expect(ideal.weightKg).toBeCloseTo(57.95, 6);
    expect(ideal.measuredMlKgMin).toBeGreaterThan(10);
    expect(ideal.measuredMlKgMin).toBeLessThan(20);
    const pct = r.weightBasis!.actual!.percentPredicted!;
    expect(pct).toBeGreaterThan(75);
    const step = r.interpretation.schemes
      .find((s) => s.schemeId === "lung-resection-ers-ests-2009")!
      .path!.steps.find((st) => st.borderline?.includes("predicted body mass"))!;
    expect(step.borderline).toContain(
      `the peak VO2 ${ideal.measuredMlKgMin.toFixed(1)} mL/kg/min on predicted body mass (58 kg; BMI 43.7) reaches "capacity adequate" (by Peak VO2 ${pct.toFixed(0)} % predicted`,
    );
    expect(step.borderline).toMatch(/> 75 % predicted\)$/);
  });
});

describe("buildRecord: body mass from the file", () => {
  const file = path.resolve(__dirname, "../fixtures/layouts/aligned_units_row_per_kg.txt");
  const bytes = () => new Uint8Array(fs.readFileSync(file));

  it("stands in when none was entered, so peak VO2 per kg is given and equals mL/min ÷ the file's 72 kg", async () => {
    // The invented layout file states "Body mass: 72 kg" in its details lines (tests/fixtures/layouts/writeLayouts.ts).
    const built = await buildRecord({ bytes: bytes(), fileName: "aligned.txt", patient: {}, ergometer: "cycle" });
    expect(built.record!.patient.weightKg).toBe(72);
    expect(built.issues.map((i) => i.code)).toContain("weight-from-file");
    const r = analyse(built.record!);
    expect(r.indices.peaks.vo2MlKgMin.value).toBeCloseTo(r.indices.peaks.vo2MlMin.value! / 72, 9);
  });

  it("never replaces a body mass the user entered", async () => {
    const built = await buildRecord({ bytes: bytes(), fileName: "aligned.txt", patient: { weightKg: 80 }, ergometer: "cycle" });
    expect(built.record!.patient.weightKg).toBe(80);
  });
});
