/**
 * A child read against adult equations (INVENTED: the normal-adult demo file with the details of a 12-year-old boy,
 * 150 cm, 40 kg): Hansen 1984 (derived in adults) and the ERS 2019 adult cycle HRmax (20–80 y) are not read for him, and
 * the draft says so beside every % predicted and in the conclusion; an 88-year-old is read, with the extrapolation said.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import type { Patient } from "../../lib/core";

/** The INVENTED normal-adult demo file analysed with other patient details. */
async function normalAdultAs(patient: Patient) {
  const built = await buildRecord({
    bytes: new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/normal-adult.csv"))),
    fileName: "normal-adult.csv",
    patient,
    ergometer: "cycle",
    referral: "general",
  });
  return Object.assign(analyse(built.record!, {}), { record: built.record! });
}

describe("predictions outside the derivation population (invented)", () => {
  it("every % predicted from an extrapolated equation says so, and the conclusion says how to read them", async () => {
    const r = await normalAdultAs({ sex: "male", ageY: 12, heightCm: 150, weightKg: 40 });
    expect(r.issues.some((i) => i.code === "outside-derivation-population")).toBe(true);
    const results = r.draft.sections.find((s) => s.id === "results")!.paragraphs;
    // a child is not read against equations derived in adults (Hansen 1984 from 18 y, ERS 2019 HRmax from 20 y): the
    // % is not graded, and the draft says so beside each value and in the conclusion
    for (const start of ["Peak VO2", "Peak heart rate", "Peak O2 pulse"])
      expect(results.find((l) => l.startsWith(start))).toMatch(
        /% of predicted not read: .+ was derived in adults \(from (18|20) y\); a patient of 12 y is not read against it/,
      );
    const conclusion = r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ");
    expect(conclusion).toMatch(/The predicted peak VO2, maximal heart rate and O2 pulse come from equations derived in adults/);
    // nothing is graded on them: no flow step, pattern feature or scheme reads a % predicted as a finding
    const steps = r.interpretation.path.steps.filter((s) => s.nodeId === "peak-vo2");
    expect(steps.map((s) => s.outcome)).toEqual(["not-assessable"]);
    const effortHr = r.interpretation.effort.criteria.find((c) => c.ruleId === "hr-reached")!;
    expect(effortHr.outcome).toBeNull();
    for (const p of r.interpretation.patterns)
      for (const f of [...p.for, ...p.against]) expect(f.text).not.toMatch(/% predicted .*(≥|<|>|≤)/);
    // deconditioning is defined by a reduced capacity or a low VT1, neither read here: normal findings elsewhere do not
    // support it on their own
    const deconditioning = r.interpretation.patterns.find((p) => p.patternId === "deconditioning")!;
    expect(deconditioning.support).toBe("not-assessable");
    // the report's key-values rows show the % and say on the row that it is not read
    const model = buildReportModel(r, r.record, "Child (invented)", {
      status: "draft",
      sections: r.draft.sections,
    });
    for (const label of ["Peak VO2", "Peak VO2 per kg", "Peak heart rate", "Peak O2 pulse"])
      expect([label, model.keyValues.find((x) => x.label === label)!.note]).toEqual([
        label,
        expect.stringMatching(/not read: .+ was derived in adults \(from (18|20) y\); a patient of 12 y is not read against it$/),
      ]);
  });

  it("an adult outside an equation's age range is still read, with the extrapolation said", async () => {
    const r = await normalAdultAs({ sex: "male", ageY: 88, heightCm: 175, weightKg: 75 });
    const hr = r.draft.sections.find((s) => s.id === "results")!.paragraphs.find((l) => l.startsWith("Peak heart rate"))!;
    expect(hr).toMatch(/\d+ % of predicted, .*extrapolated: the patient is outside its derivation population/);
    expect(r.interpretation.effort.criteria.find((c) => c.ruleId === "hr-reached")!.outcome).not.toBeNull();
  });
});

describe("the MVV estimate's cautions (invented normal-adult demo case)", () => {
  it("are given when FEV1 × 40 is used, and not when a measured MVV is the one used", async () => {
    const { caseRecord } = await import("../fixtures/caseRecord");
    const base = await caseRecord("normal-adult");
    const estimated = analyse({ ...base, spirometry: { fev1L: 3.5 } }, {});
    expect(estimated.indices.breathingReserve.mvvLMin.value).toBeCloseTo(140, 9); // 3.5 L × 40
    expect(estimated.issues.some((i) => i.code === "capacity-estimate" && /FEV1 × 40/.test(i.message))).toBe(true);
    const measured = analyse({ ...base, spirometry: { fev1L: 3.5, mvvLMin: 150 } }, {});
    expect(measured.indices.breathingReserve.mvvLMin.value).toBe(150);
    expect(measured.issues.some((i) => /FEV1 × 40/.test(i.message))).toBe(false);
  });
});
