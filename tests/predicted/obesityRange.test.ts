/**
 * A per-kg equation carried far beyond its cohort's weights: FRIEND 2018 (de Souza e Silva CG, Kaminsky LA, Arena R et al.,
 * Eur J Prev Cardiol 2018;25:742-750; equation confirmed from the abstract) on actual weight in severe obesity. The
 * expected values are hand calculations from the published equation; the patients are INVENTED (a woman of 50 y, 160 cm).
 */
import { describe, expect, it } from "vitest";
import { assessWeightBasis, evaluateEquation, PEAK_VO2_FLOOR_ML_KG_MIN, predictAll } from "../../lib/predicted";

const woman = (weightKg: number) => ({ sex: "female" as const, ageY: 50, heightCm: 160, weightKg });
// FRIEND 2018, treadmill, woman: 45.2 − 0.35·50 − 10.9·2 − 0.15·(2.20462·W) + 0.68·(160/2.54) − 0.46·1 mL/kg/min
const friendPerKg = (w: number) => 45.2 - 0.35 * 50 - 10.9 * 2 - 0.15 * 2.20462 * w + 0.68 * (160 / 2.54) - 0.46;

describe("FRIEND 2018 in severe obesity (hand calculations from the published equation; invented patients)", () => {
  it("at BMI 40 (102.4 kg) it predicts 14.41 mL/kg/min = 1476 mL/min with its SEE limit (6.6 mL/kg/min)", () => {
    expect(friendPerKg(102.4)).toBeCloseTo(14.412, 2);
    const v = predictAll(woman(102.4), "treadmill").values.vo2PeakMlMin!;
    expect(v.value).toBeCloseTo(friendPerKg(102.4) * 102.4, 6); // 1475.8 mL/min
    expect(v.lln).toBeCloseTo((friendPerKg(102.4) - 1.645 * 6.6) * 102.4, 6); // 364 mL/min = 3.55 mL/kg/min
  });

  it("at 120 kg its limit of normal falls below resting VO2 (1 MET, 3.5 mL/kg/min) and is not given", () => {
    const pv = evaluateEquation("friend-2018", { patient: woman(120), ergometer: "treadmill" });
    expect(pv.value).toBeCloseTo(friendPerKg(120), 6); // 8.59 mL/kg/min
    expect(friendPerKg(120) - 1.645 * 6.6).toBeLessThan(0);
    expect(pv.lln).toBeUndefined();
    expect(pv.issues.map((i) => i.code)).toContain("lln-below-rest");
  });

  it("at 140 kg it predicts 2.0 mL/kg/min, below twice resting VO2: withheld with a warning, so no % predicted is read", () => {
    expect(friendPerKg(140)).toBeCloseTo(1.98, 1);
    expect(friendPerKg(140)).toBeLessThan(PEAK_VO2_FLOOR_ML_KG_MIN);
    const v = predictAll(woman(140), "treadmill").values.vo2PeakMlMin!;
    expect(v.value).toBeNull();
    expect(v.issues).toEqual(
      expect.arrayContaining([expect.objectContaining({ severity: "warning", code: "equation-outside-its-range" })]),
    );
    expect(v.reason).toMatch(/predicts a peak VO2 of 2\.0 mL\/kg\/min .* below twice resting VO2/);
    // at 160 kg the published equation turns negative (−4.6 mL/kg/min): withheld the same way
    expect(predictAll(woman(160), "treadmill").values.vo2PeakMlMin!.value).toBeNull();
  });

  it("when actual and predicted weight read peak VO2 differently, that is a warning (it decides the reading)", () => {
    // INVENTED: woman 45 y, 165 cm, 115 kg (BMI 42), measured 1400 mL/min. FRIEND 2018 on actual weight: 13.33 mL/kg/min
    // × 115 = 1533 → 91 %; on predicted weight (Hansen women 0.65·165 − 42.8 = 64.45 kg): 45.2 − 15.75 − 21.8 − 21.31 + 44.17 − 0.46 = 30.05 × 64.45 = 1937 → 72 %
    const a = assessWeightBasis(1400, { sex: "female", ageY: 45, heightCm: 165, weightKg: 115 }, "treadmill");
    expect(a.actual!.percentPredicted).toBeCloseTo(91.3, 0);
    expect(a.ideal!.percentPredicted).toBeCloseTo(72.3, 0);
    expect(a.changesConclusion).toBe(true);
    expect(a.issues.find((i) => i.code === "weight-basis-changes-conclusion")?.severity).toBe("warning");
  });
});
