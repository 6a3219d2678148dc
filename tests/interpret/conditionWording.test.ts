import { describe, expect, it } from "vitest";
import { evaluateCondition, evaluateRule } from "../../lib/interpret/evaluateCondition";
import { interpret, makeContext } from "../../lib/interpret";
import type { Condition } from "../../lib/interpret/schema";
import { baseInput } from "./helpers";

// Conditions are rendered in clinical words. Expected lines are known by construction from the rule data:
// hb-low = (men and Hb < 13 g/dL) or (women and Hb < 12 g/dL) — WHO anaemia cut-offs as cited in rules.json.
describe("condition wording", () => {
  const hbRule = (sex: "male" | "female", haemoglobinGDl: number | null) =>
    evaluateRule(
      "hb-low",
      makeContext(baseInput({}, { patient: { sex, ageY: 50, heightCm: 170, weightKg: 70, haemoglobinGDl } })).ctx,
    );

  it("names the patient group instead of comparing the sex category, and leaves the other sex's branch out", () => {
    expect(hbRule("male", null).text).toBe("men: Haemoglobin (g/dL) not available → not assessable");
    expect(hbRule("female", null).text).toBe("women: Haemoglobin (g/dL) not available → not assessable");
    // 11.0 < 12.0 (women's cut-off): low
    expect(hbRule("female", 11).text).toBe("women: Haemoglobin 11.0 g/dL < 12.0 g/dL → Haemoglobin low");
    // 15.0 ≥ 13.0 (men's cut-off): not low; the women's branch is beside the point
    expect(hbRule("male", 15).text).toBe("men: Haemoglobin 15.0 g/dL ≥ 13.0 g/dL → Haemoglobin not low");
  });

  it("states a category test in words, never with = or ≠", () => {
    const ctx = makeContext(baseInput()).ctx;
    expect(evaluateCondition({ var: "sex", op: "==", value: "female" }, ctx).text).toBe("Sex: male, not female");
    expect(evaluateCondition({ var: "referral", op: "in", values: ["heart-failure", "transplant"] }, ctx).text).toBe(
      "Referral question: general, not heart failure or transplant",
    );
    expect(evaluateCondition({ var: "referral", op: "!=", value: "general" }, ctx).text).toBe("Referral question: general");
  });

  it("a false 'any' failed on every part, so its parts read with 'and'; a true one names the part that held", () => {
    // invented values: peak VO2 18.3 mL/kg/min against 10 (ERS/ESTS 2009 lung-resection step, confirmed) and 66 % against 35 %
    const ctx = makeContext(baseInput({ peakVo2MlKgMin: 18.3, peakVo2PctPred: 66 })).ctx;
    const cond: Condition = {
      any: [
        { var: "peakVo2MlKgMin", op: "<", value: 10 },
        { var: "peakVo2PctPred", op: "<", value: 35 },
      ],
    };
    const no = evaluateCondition(cond, ctx);
    expect(no.outcome).toBe(false);
    expect(no.text).toMatch(/18\.3 mL\/kg\/min ≥ 10\.0 mL\/kg\/min and .*66 % predicted ≥ 35/);
    expect(no.text).not.toMatch(/ or /);
    const yes = evaluateCondition(cond, makeContext(baseInput({ peakVo2MlKgMin: 9, peakVo2PctPred: 66 })).ctx);
    expect(yes.outcome).toBe(true);
    expect(yes.text).not.toMatch(/ and /);
  });

  it("'at least n of' names the items that were met (n of m) and, when short, the ones that were not", () => {
    const ctx = makeContext(baseInput({ vt1Vo2MlKgMin: 9, veVco2AtVt1: 36, ischaemicHeartDisease: false })).ctx;
    const cond: Condition = {
      atLeast: 2,
      of: [
        { var: "vt1Vo2MlKgMin", op: "<", value: 11 },
        { var: "veVco2AtVt1", op: ">", value: 34 },
        { var: "ischaemicHeartDisease", op: "==", value: true },
      ],
    };
    // 9.0 < 11.0 true; 36 > 34 true; IHD false → 2 of 3 met
    expect(evaluateCondition(cond, ctx).text).toBe(
      "2 of 3 criteria met (at least 2 needed): VO2 at VT1 9.0 mL/kg/min < 11.0 mL/kg/min; VE/VCO2 at VT1 36.0 > 34.0",
    );
    const short = makeContext(baseInput({ vt1Vo2MlKgMin: 12, veVco2AtVt1: 36, ischaemicHeartDisease: false })).ctx;
    expect(evaluateCondition(cond, short).text).toBe(
      "1 of 3 criteria met (at least 2 needed); met: VE/VCO2 at VT1 36.0 > 34.0; not met: VO2 at VT1 12.0 mL/kg/min ≥ 11.0 mL/kg/min; Ischaemic heart disease: no",
    );
  });

  it("an 'any' shows only the parts that decided it", () => {
    const ctx = makeContext(baseInput({ vt1Vo2MlKgMin: 7 })).ctx;
    const r = evaluateCondition(
      {
        any: [
          { var: "vt1Vo2MlKgMin", op: "<", value: 8 },
          { var: "veVco2AtVt1", op: ">", value: 34 },
        ],
      },
      ctx,
    );
    // 7.0 < 8.0 decides; VE/VCO2 at VT1 (not given) is left out
    expect(r.outcome).toBe(true);
    expect(r.text).toBe("VO2 at VT1 7.0 mL/kg/min < 8.0 mL/kg/min");
  });

  it("schemes without a combined category say so in one overall line", () => {
    const res = interpret(baseInput({}, { referral: "heart-failure" }));
    const table = res.schemes.find((s) => s.schemeId === "hf-prognostic-table")!;
    expect(table.overall).toBeNull();
    expect(table.overallText).toBe("Graded variable by variable (the scheme gives no combined category)");
    const weber = res.schemes.find((s) => s.schemeId === "weber")!;
    expect(weber.overallText).toBe(`${weber.overall!.label} (${weber.overall!.basis})`);
  });
});

// A value beside a cut-off keeps its display decimals (lib/interpret/variables.ts), and when the rounding hides which
// side of the cut-off it lies on, the side is said in words (common practice). Peak RER cut-off 1.05 as used in
// rules.json (the effort criterion's value, cited there); SpO2 fall ≥ 4 percentage points (Hadeli et al. 2001, as cited
// in choices.json, confirmed). The values are invented.
describe("a value that rounds to its cut-off", () => {
  const rer = (peakRer: number) =>
    evaluateCondition({ var: "peakRer", op: ">", value: 1.05 }, makeContext(baseInput({ peakRer })).ctx).text;
  const fall = (spo2Fall: number) =>
    evaluateCondition({ var: "spo2Fall", op: ">=", value: 4 }, makeContext(baseInput({ spo2Fall })).ctx).text;

  it("shows the display decimals and says which side of the cut-off the value lies, never a bare '1.05 > 1.05'", () => {
    expect(rer(1.054)).toBe("Peak RER 1.05 (just above the cut-off) > 1.05");
    // a condition that does not hold is written with the operator that does ("≤")
    expect(rer(1.046)).toBe("Peak RER 1.05 (just below the cut-off) ≤ 1.05");
    expect(rer(1.0501)).toBe("Peak RER 1.05 (just above the cut-off) > 1.05");
  });

  it("SpO2 fall 4.01 reads 4.0 (one decimal, as the indices show it) and meets ≥ 4 in words; 3.96 reads 4.0 below it", () => {
    expect(fall(4.01)).toBe("SpO2 fall from rest 4.0 % points (just above the cut-off) ≥ 4.0 % points");
    expect(fall(3.96)).toBe("SpO2 fall from rest 4.0 % points (just below the cut-off) < 4.0 % points");
    // no more decimals than the variable's, however close
    expect(fall(4.0001)).not.toMatch(/4\.00/);
  });

  it("keeps the variable's decimals otherwise, and for a value equal to the cut-off", () => {
    expect(rer(1.12)).toBe("Peak RER 1.12 > 1.05");
    expect(rer(1.05)).toBe("Peak RER 1.05 ≤ 1.05");
    expect(fall(4)).toBe("SpO2 fall from rest 4.0 % points ≥ 4.0 % points");
    expect(fall(4.4)).toBe("SpO2 fall from rest 4.4 % points ≥ 4.0 % points");
  });
});
