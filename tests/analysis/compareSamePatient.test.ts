import { describe, expect, it } from "vitest";
import { samePatientCheck } from "../../app/compare/samePatientCheck";
import type { Patient } from "../../lib/core";

// Invented patients. Limits under test are the check's documented defaults: ages may rise by at most
// 3 y (implementation choice) plus 1 y whole-year rounding (common practice); heights may differ by at
// most 5 cm (implementation choice).
const man45: Patient = Object.freeze({ sex: "male", ageY: 45, heightCm: 178, weightKg: 75 });

describe("samePatientCheck", () => {
  it("accepts a repeat test of the same man a year later with a different weight", () => {
    const r = samePatientCheck(man45, { sex: "male", ageY: 46, heightCm: 177, weightKg: 70 });
    expect(r.differences).toEqual([]);
    expect(r.unchecked).toEqual([]);
    // 46 − 45 = 1 y ≤ 3 + 1 y; |177 − 178| = 1 cm ≤ 5 cm: both differ, within their limits, and are still named
    expect(r.withinLimits.map((d) => d.field)).toEqual(["age", "height"]);
    expect(r.withinLimits[1].text).toBe("height differs by 1 cm (178 cm, then 177 cm) (within the limit: 5 cm, our choice)");
  });

  it("lists every detail beyond its limit and names the ones within it: 45 → 62 y and 178 → 174 cm", () => {
    const r = samePatientCheck(man45, { sex: "male", ageY: 62, heightCm: 174, weightKg: 80 });
    // 62 − 45 = 17 y > 3 + 1 y → a difference; |174 − 178| = 4 cm ≤ 5 cm → within the limit, still shown
    expect(r.differences.map((d) => d.field)).toEqual(["age"]);
    expect(r.differences[0].text).toContain("age differs by 17 y (45 y, then 62 y)");
    expect(r.differences[0].text).toContain("(our choice)");
    expect(r.withinLimits).toEqual([
      { field: "height", text: "height differs by 4 cm (178 cm, then 174 cm) (within the limit: 5 cm, our choice)" },
    ]);
  });

  it("names nothing when every detail is identical", () => {
    const r = samePatientCheck(man45, { ...man45 });
    expect(r.differences).toEqual([]);
    expect(r.withinLimits).toEqual([]);
  });

  it("flags a man of 45 y against a woman of 50 y (sex; 50 − 45 = 5 y > 3 + 1 y)", () => {
    const r = samePatientCheck(man45, { sex: "female", ageY: 50, heightCm: 165, weightKg: 65 });
    expect(r.differences.map((d) => d.field)).toEqual(["sex", "age", "height"]);
    expect(r.differences[0].text).toBe("sex differs: male in the earlier test, female in the later one");
    expect(r.differences[1].text).toContain("age differs by 5 y");
    // |165 − 178| = 13 cm > 5 cm
    expect(r.differences[2].text).toContain("height differs by 13 cm");
  });

  it("treats the age limits at their boundaries as written: +4 y passes, +4.5 y does not; −1 y passes, −2 y does not", () => {
    expect(samePatientCheck(man45, { ...man45, ageY: 49 }).differences).toEqual([]); // 4 = 3 + 1, not more
    expect(samePatientCheck(man45, { ...man45, ageY: 49.5 }).differences.map((d) => d.field)).toEqual(["age"]);
    expect(samePatientCheck(man45, { ...man45, ageY: 44 }).differences).toEqual([]); // rounding
    const younger = samePatientCheck(man45, { ...man45, ageY: 43 });
    expect(younger.differences[0].text).toBe(
      "the patient of the later test is 2 y younger (45 y, then 43 y), more than the 1 y allowed for ages written in whole years",
    );
  });

  it("treats the height limit at its boundary as written: 5 cm passes, 5.5 cm does not", () => {
    const atLimit = samePatientCheck(man45, { ...man45, heightCm: 183 });
    expect(atLimit.differences).toEqual([]);
    expect(atLimit.withinLimits.map((d) => d.field)).toEqual(["height"]); // 183 − 178 = 5 cm, not more
    expect(samePatientCheck(man45, { ...man45, heightCm: 172.5 }).differences[0].text).toContain("height differs by 5.5 cm");
  });

  it("lists missing details as unchecked, not as differences", () => {
    const r = samePatientCheck({ ageY: 45 }, { sex: "female", heightCm: 170 });
    expect(r.differences).toEqual([]);
    expect(r.withinLimits).toEqual([]);
    expect(r.unchecked).toEqual(["sex", "age", "height"]);
  });

  it("honours other limits given as options", () => {
    const r = samePatientCheck(man45, { ...man45, ageY: 47, heightCm: 181 }, { maxIntervalY: 0, maxHeightDiffCm: 2 });
    // 47 − 45 = 2 > 0 + 1; |181 − 178| = 3 > 2
    expect(r.differences.map((d) => d.field)).toEqual(["age", "height"]);
  });
});
