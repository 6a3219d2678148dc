/**
 * An equation whose cohort's range for a predictor is not recorded says so beyond 18-80 y and 150-200 cm (this
 * product's choice, common practice), as the equations with a recorded range already warn. Patients INVENTED.
 */
import { describe, expect, it } from "vitest";
import { evaluateEquation } from "../../lib/predicted";

const codes = (
  id: string,
  patient: Parameters<typeof evaluateEquation>[1]["patient"],
  ergometer: "cycle" | "treadmill" = "cycle",
) => evaluateEquation(id, { patient, ergometer }).issues.map((i) => i.code);

describe("derivation range not recorded", () => {
  it("Hansen 1984 (77 men, mean age 54; no age or height range recorded) warns at 88 y and at 205 cm, not at 50 y and 175 cm", () => {
    expect(codes("hansen-1984", { sex: "male", ageY: 88, heightCm: 170, weightKg: 70 })).toContain(
      "derivation-range-not-recorded",
    );
    expect(codes("hansen-1984", { sex: "male", ageY: 40, heightCm: 205, weightKg: 100 })).toContain(
      "derivation-range-not-recorded",
    );
    expect(codes("hansen-1984", { sex: "male", ageY: 50, heightCm: 175, weightKg: 80 })).not.toContain(
      "derivation-range-not-recorded",
    );
  });
  it("an equation with a recorded range keeps its own warning instead (Jones 1985 maximal work rate, 15-71 y)", () => {
    const c = codes("jones-1985-wmax", { sex: "male", ageY: 88, heightCm: 170, weightKg: 70 });
    expect(c).toContain("outside-derivation-population");
    expect(c).not.toContain("derivation-range-not-recorded");
  });
  it("a predictor the equation does not use is not checked (MVV = FEV1 × 40 at 88 y)", () => {
    expect(
      evaluateEquation("mvv-fev1x40", {
        patient: { sex: "male", ageY: 88 },
        ergometer: "cycle",
        spirometry: { fev1L: 2 },
      }).issues.map((i) => i.code),
    ).not.toContain("derivation-range-not-recorded");
  });
});

describe("no limit of normal beyond the derivation range", () => {
  // Jones et al. 1985 maximal work rate (jones-1985-wmax, confirmed): women 152-176 cm in the cohort, SEE 216 kpm/min
  // (35.29 W). Patients INVENTED: a woman of 60 y at 165 cm (inside) and at 140 cm (outside).
  it("inside: LLN = predicted − 1.645·SEE and a z-score; outside: % predicted only, with the reason", () => {
    const inside = evaluateEquation(
      "jones-1985-wmax",
      { patient: { sex: "female", ageY: 60, heightCm: 165, weightKg: 60 }, ergometer: "cycle" },
      { measured: 100 },
    );
    // by hand: (20.4·165 − 8.74·60 − 288·1 − 1909) / 6.12 = (3366 − 524.4 − 288 − 1909) / 6.12 = 105.327 W
    expect(inside.value).toBeCloseTo(105.327, 3);
    expect(inside.lln).toBeCloseTo(105.327 - 1.645 * 35.294, 2);
    expect(inside.zScore).toBeCloseTo((100 - 105.327) / 35.294, 3);
    const outside = evaluateEquation(
      "jones-1985-wmax",
      { patient: { sex: "female", ageY: 60, heightCm: 140, weightKg: 50 }, ergometer: "cycle" },
      { measured: 100 },
    );
    expect(outside.value).toBeCloseTo((20.4 * 140 - 8.74 * 60 - 288 - 1909) / 6.12, 3);
    expect(outside.lln).toBeUndefined();
    expect(outside.zScore).toBeUndefined();
    const note = outside.issues.find((i) => i.code === "limit-not-given-outside-range");
    expect(note?.message).toMatch(/no lower limit of normal or z-score .* \(height\)/);
  });
});
