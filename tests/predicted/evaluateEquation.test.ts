import { describe, expect, it } from "vitest";
import { compareWithPredicted, evaluateEquation, getEquation, percentPredicted, toQuantity } from "../../lib/predicted";

const man = Object.freeze({ sex: "male" as const, ageY: 50, heightCm: 175, weightKg: 80 });
const woman = Object.freeze({ sex: "female" as const, ageY: 60, heightCm: 162, weightKg: 70 });

describe("evaluateEquation", () => {
  it("names the equation, its status and the steps, and does not mutate the patient", () => {
    const r = evaluateEquation("hansen-1984", { patient: man, ergometer: "cycle" });
    expect(r.equationId).toBe("hansen-1984");
    expect(r.status).toBe("secondary");
    expect(r.provenance.sourceIds).toEqual(["hansen-1984"]);
    // Steps let a reader redo 77.55·32.12 + 6·2.45 = 2505.606 (clinical-reference §1.2).
    expect(r.steps.find((s) => s.label.startsWith("predicted weight, men"))?.value).toBeCloseTo(77.55, 10);
    expect(r.steps.find((s) => s.label === "weight vs predicted weight (men)")?.branch).toBe("greater");
    expect(man).toEqual({ sex: "male", ageY: 50, heightCm: 175, weightKg: 80 });
  });

  it("missing predictor → value null with a missing-input error naming it", () => {
    const r = evaluateEquation("jones-1985", { patient: { sex: "male", ageY: 50 }, ergometer: "cycle" });
    expect(r.value).toBeNull();
    expect(r.reason).toMatch(/height/);
    expect(r.issues.find((i) => i.code === "missing-input")?.severity).toBe("error");
  });

  it("missing sex on a sex-branched equation → null with an error", () => {
    const r = evaluateEquation("hansen-1984", { patient: { ageY: 50, heightCm: 175, weightKg: 80 }, ergometer: "cycle" });
    expect(r.value).toBeNull();
    expect(r.issues.some((i) => i.code === "missing-input" && /sex/.test(i.message))).toBe(true);
  });

  it("age outside the derivation range → warning, value still given (Jones 1985: 15–71 y)", () => {
    const r = evaluateEquation("jones-1985", { patient: { ...man, ageY: 80 }, ergometer: "cycle" });
    // 0.046·175 − 0.021·80 − 4.31 = 8.05 − 1.68 − 4.31 = 2.06 L/min
    expect(r.value).toBeCloseTo(2060, 6);
    const issue = r.issues.find((i) => i.code === "outside-derivation-population");
    expect(issue?.where?.field).toBe("ageY");
  });

  it("height outside the sex-specific range → warning (Jones 1985 women 152–176 cm)", () => {
    const r = evaluateEquation("jones-1985", { patient: { ...woman, heightCm: 180 }, ergometer: "cycle" });
    expect(r.issues.some((i) => i.code === "outside-derivation-population" && i.where?.field === "heightCm")).toBe(true);
    const same = evaluateEquation("jones-1985", { patient: { ...man, heightCm: 180 }, ergometer: "cycle" });
    expect(same.issues.some((i) => i.where?.field === "heightCm")).toBe(false);
  });

  it("sex not in the derivation population → warning (220 − age: men only)", () => {
    const r = evaluateEquation("hrmax-220-age", { patient: woman, ergometer: "cycle" });
    expect(r.value).toBe(160);
    expect(r.issues.some((i) => i.code === "outside-derivation-population" && i.where?.field === "sex")).toBe(true);
  });

  it("ergometer mismatch → warning (FRIEND 2017 is treadmill-derived; Jones is cycle-derived)", () => {
    expect(evaluateEquation("friend-2017", { patient: man, ergometer: "cycle" }).issues.map((i) => i.code)).toContain(
      "ergometer-mismatch",
    );
    expect(evaluateEquation("jones-1985", { patient: man, ergometer: "treadmill" }).issues.map((i) => i.code)).toContain(
      "ergometer-mismatch",
    );
    expect(evaluateEquation("friend-2018", { patient: man, ergometer: "cycle" }).issues.map((i) => i.code)).not.toContain(
      "ergometer-mismatch",
    );
  });

  it("z-score from the SEE when a measured value is given (Jones 1985 SEE 0.458 L/min)", () => {
    // (2232 − 2690) / 458 = −1.0
    const r = evaluateEquation("jones-1985", { patient: man, ergometer: "cycle" }, { measured: 2232 });
    expect(r.zScore).toBeCloseTo(-1, 10);
    expect(r.see).toBe(458);
  });

  it("the performance estimate says it is not a predicted normal", () => {
    const r = evaluateEquation("friend-ergometry-2018", { patient: man, ergometer: "cycle", achieved: { workPeakW: 200 } });
    expect(r.kind).toBe("performance-estimate");
    expect(r.issues.map((i) => i.code)).toContain("performance-estimate");
  });

  it("the derived O2 pulse names the equations it used", () => {
    const r = evaluateEquation("o2pulse-derived", { patient: man, ergometer: "cycle" });
    expect(new Set(r.usedEquationIds)).toEqual(new Set(["o2pulse-derived", "hansen-1984", "ers-2019-hrmax-cycle"]));
    // 2505.606 / 168 = 14.914 (hand calculation, see the file's check values)
    expect(r.value).toBeCloseTo(14.914321, 5);
  });

  it("the derived O2 pulse with a per-kg VO2 equation needs weight, and says so", () => {
    const r = evaluateEquation("o2pulse-derived", { patient: { sex: "male", ageY: 50, heightCm: 175 }, ergometer: "treadmill" });
    expect(r.value).toBeNull();
    expect(r.issues.some((i) => i.severity === "error")).toBe(true);
  });

  it("unknown equation id is a programming mistake", () => {
    expect(() => evaluateEquation("no-such", { patient: man, ergometer: "cycle" })).toThrow(/unknown reference equation/);
    expect(() => getEquation("no-such")).toThrow();
  });
});

describe("percentPredicted, compareWithPredicted, toQuantity", () => {
  it("percentPredicted: 100·measured/predicted; degenerate cases null", () => {
    expect(percentPredicted(2000, 2500)).toBe(80);
    expect(percentPredicted(2000, 0)).toBeNull();
    expect(percentPredicted(null, 2500)).toBeNull();
    expect(percentPredicted(2000, Number.NaN)).toBeNull();
  });

  it("compareWithPredicted: below the LLN (Jones 1985 man, LLN 1936.59 mL/min)", () => {
    const pv = evaluateEquation("jones-1985", { patient: man, ergometer: "cycle" });
    const c = compareWithPredicted(1900, pv);
    expect(c.percentPredicted).toBeCloseTo((100 * 1900) / 2690, 10);
    expect(c.beyondLimit).toBe(true);
    expect(c.zScore).toBeCloseTo((1900 - 2690) / 458, 10);
    expect(compareWithPredicted(2000, pv).beyondLimit).toBe(false);
  });

  it("toQuantity: FRIEND mL/kg/min × weight, with LLN and SEE converted together", () => {
    const pv = evaluateEquation("friend-2017", { patient: man, ergometer: "treadmill" });
    const ml = toQuantity(pv, "vo2PeakMlMin", 80);
    // 38.00106·80 = 3040.085; LLN 26.15706·80 = 2092.565; SEE 7.2·80 = 576
    expect(ml.value).toBeCloseTo(3040.085, 2);
    expect(ml.lln).toBeCloseTo(2092.565, 2);
    expect(ml.see).toBeCloseTo(576, 6);
    expect(ml.unit).toBe("mL/min");
    expect(toQuantity(pv, "vo2PeakMlMin", undefined).value).toBeNull();
  });
});
