import { describe, expect, it } from "vitest";
import type { ComparisonTrace } from "../../lib/interpret";
import { formatComparisonCutoff, formatComparisonValue } from "../../lib/report/formatComparison";

/** A comparison as the interpretation layer traces it (values invented; cut-offs cited beside each). */
const trace = (t: Omit<ComparisonTrace, "outcome" | "text">): ComparisonTrace =>
  Object.freeze({ ...t, outcome: null, text: "" }) as ComparisonTrace;

describe("formatComparisonValue / formatComparisonCutoff", () => {
  it("rounds the patient's value to the variable's display precision and adds its unit", () => {
    // Raw values as an unrounded analysis gives them; hand rounding: 1.0670094854521774 → 1.07 (2 decimals);
    // 100.92107814620907 → 101 (whole); 18.2857 → 18.3 (1 decimal).
    const rer = trace({ variable: "peakRer", label: "Peak RER", unit: "", value: 1.0670094854521774, op: ">", cutoff: 1.05 });
    const hr = trace({ variable: "peakHrBpm", label: "Peak HR", unit: "bpm", value: 100.92107814620907, op: ">=", cutoff: 150 });
    const hrPct = trace({
      variable: "hrPctPred",
      label: "Peak HR",
      unit: "% predicted",
      value: 82.43628029724286,
      op: ">=",
      cutoff: 85,
    });
    const vo2kg = trace({
      variable: "peakVo2MlKgMin",
      label: "Peak VO2",
      unit: "mL/kg/min",
      value: 18.2857,
      op: "<",
      cutoff: 20,
    });
    expect(formatComparisonValue(rer)).toBe("Peak RER 1.07");
    expect(formatComparisonValue(hr)).toBe("Peak HR 101 bpm");
    expect(formatComparisonValue(hrPct)).toBe("Peak HR 82 % predicted");
    expect(formatComparisonValue(vo2kg)).toBe("Peak VO2 18.3 mL/kg/min");
  });

  it("says which side of a cut-off a value lies when its display rounds to it (Peak RER > 1.05, Radtke et al. 2019, confirmed)", () => {
    // invented peak RER 1.054: at its two display decimals "1.05", the cut-off itself; the side is said in words
    const near = trace({ variable: "peakRer", label: "Peak RER", unit: "", value: 1.054, op: ">", cutoff: 1.05 });
    expect(formatComparisonValue(near)).toBe("Peak RER 1.05 (just above the cut-off)");
    expect(formatComparisonValue({ ...near, value: 1.046 })).toBe("Peak RER 1.05 (just below the cut-off)");
    expect(formatComparisonValue({ ...near, value: 1.05 })).toBe("Peak RER 1.05");
    // SpO2 fall ≥ 4 percentage points (Hadeli et al. 2001, as cited in choices.json, confirmed); invented fall 4.01
    const fall = trace({
      variable: "spo2Fall",
      label: "SpO2 fall from rest",
      unit: "% points",
      value: 4.01,
      op: ">=",
      cutoff: 4,
    });
    expect(formatComparisonValue(fall)).toBe("SpO2 fall from rest 4.0 % points (just above the cut-off)");
  });

  it("writes cut-offs as a clinician reads them, keeping the published decimals", () => {
    // Peak RER > 1.05: ERS statement, Radtke et al. 2019, Eur Respir Rev 28:180101, Table 3 (confirmed).
    expect(
      formatComparisonCutoff(trace({ variable: "peakRer", label: "Peak RER", unit: "", value: 1.2, op: ">", cutoff: 1.05 })),
    ).toBe("Peak RER > 1.05");
    // Peak RER ≥ 1.10: JACC Heart Fail 2020 peak-RER subgroups (confirmed); 1.1 keeps two decimals → "1.10".
    expect(
      formatComparisonCutoff(trace({ variable: "peakRer", label: "Peak RER", unit: "", value: 1.2, op: ">=", cutoff: 1.1 })),
    ).toBe("Peak RER ≥ 1.10");
    // Peak HR ≥ 85 % predicted: practical guide to CPET in adults, Respir Res 2021, Table 1 (secondary).
    expect(
      formatComparisonCutoff(
        trace({ variable: "hrPctPred", label: "Peak HR", unit: "% predicted", value: 80, op: ">=", cutoff: 85 }),
      ),
    ).toBe("Peak HR ≥ 85 % predicted");
    // Peak VD/VT ≥ 0.28 keeps its two decimals (common practice for VD/VT).
    expect(
      formatComparisonCutoff(trace({ variable: "vdvtPeak", label: "Peak VD/VT", unit: "", value: null, op: ">=", cutoff: 0.28 })),
    ).toBe("Peak VD/VT ≥ 0.28");
  });

  it("says yes/no findings and missing values in words, never as code", () => {
    const plateau = trace({ variable: "vo2Plateau", label: "VO2 plateau", unit: "", value: null, op: "==", cutoff: true });
    expect(formatComparisonValue(plateau)).toBe("VO2 plateau: not available");
    expect(formatComparisonCutoff(plateau)).toBe("VO2 plateau present");
    const vt1 = trace({ variable: "vt1Determined", label: "VT1 determined", unit: "", value: true, op: "==", cutoff: false });
    expect(formatComparisonValue(vt1)).toBe("VT1 determined");
    expect(formatComparisonCutoff(vt1)).toBe("VT1 not determined");
    const sex = trace({ variable: "sex", label: "Sex", unit: "", value: "male", op: "in", cutoff: ["male", "female"] });
    expect(formatComparisonValue(sex)).toBe("Sex: male");
    expect(formatComparisonCutoff(sex)).toBe("Sex: male or female");
    for (const s of [formatComparisonCutoff(plateau), formatComparisonCutoff(vt1), formatComparisonValue(plateau)])
      expect(s).not.toMatch(/==|>=|<=|!=|\btrue\b|\bfalse\b|n\/a/);
  });
});
