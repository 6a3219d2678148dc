/**
 * A child read against adult equations (INVENTED: the normal-adult demo file with the details of a 12-year-old boy,
 * 150 cm, 40 kg): Hansen 1984 (derived in adults) and the ERS 2019 adult cycle HRmax (20–80 y) are extrapolations, and
 * the draft says so beside every % predicted and in the conclusion, not only among the data-quality issues.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";

describe("predictions outside the derivation population (invented)", () => {
  it("every % predicted from an extrapolated equation says so, and the conclusion says how to read them", async () => {
    const built = await buildRecord({
      bytes: new Uint8Array(fs.readFileSync(path.resolve(__dirname, "../fixtures/cases/normal-adult.csv"))),
      fileName: "normal-adult.csv",
      patient: { sex: "male", ageY: 12, heightCm: 150, weightKg: 40 },
      ergometer: "cycle",
      referral: "general",
    });
    const r = analyse(built.record!, {});
    expect(r.issues.some((i) => i.code === "outside-derivation-population")).toBe(true);
    const results = r.draft.sections.find((s) => s.id === "results")!.paragraphs;
    for (const start of ["Peak VO2", "Peak heart rate", "Peak O2 pulse"])
      expect(results.find((l) => l.startsWith(start))).toMatch(/extrapolated: the patient is outside its derivation population/);
    const conclusion = r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ");
    expect(conclusion).toMatch(/The predicted peak VO2, maximal heart rate and O2 pulse come from equations derived outside/);
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
