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
