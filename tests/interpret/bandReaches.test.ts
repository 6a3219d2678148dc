import { describe, expect, it } from "vitest";
import { interpret, type InterpretInput, type InterpretValues } from "../../lib/interpret";
import { baseInput } from "./helpers";

// A scheme's category is decided by the value; where an end of the value's calibrated band falls in another category
// the axis says so. Cut-offs: Arena ventilatory class (Arena et al. 2007, Circulation — confirmed: VC-III 36.0–44.9,
// VC-IV ≥ 45.0) and the Weber AT sub-class (Janicki, Weber & McElroy 1988 — confirmed: B 11–14, C 8–11 mL/kg/min).
// The values and bands are invented.
function schemeWith(schemeId: string, values: Partial<InterpretValues>, uncertainty: InterpretInput["uncertainty"]) {
  const input = { ...baseInput(values), uncertainty };
  return interpret(input, { addSchemes: [schemeId] }).schemes.find((s) => s.schemeId === schemeId)!;
}

describe("a category near a cut-off", () => {
  it("says which other class the band of the VE/VCO2 slope reaches, and keeps the class of the value", () => {
    const s = schemeWith("arena-ventilatory-class", { veVco2SlopeWhole: 39.8 }, [
      { words: "whole-exercise VE/VCO2 slope band 39.2–46.5", low: { veVco2SlopeWhole: 39.2 }, high: { veVco2SlopeWhole: 46.5 } },
    ]);
    const slope = s.axes.find((a) => a.axisId === "slope")!;
    expect(slope.category?.key).toBe("VC-III");
    expect(slope.bandReaches).toMatch(/^the whole-exercise VE\/VCO2 slope band 39\.2–46\.5 reaches Ventilatory class IV/);
    expect(slope.text).toContain("reaches Ventilatory class IV");
  });

  it("says nothing when the whole band stays in the class, or when the band is of a value the axis does not read", () => {
    const inside = schemeWith("arena-ventilatory-class", { veVco2SlopeWhole: 39.8 }, [
      { words: "whole-exercise VE/VCO2 slope band 38.0–41.0", low: { veVco2SlopeWhole: 38 }, high: { veVco2SlopeWhole: 41 } },
      { words: "OUES band 1200–1500", low: { oues: 1200 }, high: { oues: 1500 } },
    ]);
    const slope = inside.axes.find((a) => a.axisId === "slope")!;
    expect(slope.category?.key).toBe("VC-III");
    expect(slope.bandReaches).toBeUndefined();
  });

  it("moves every value computed from VT1 together (per kg) for the Weber AT sub-class", () => {
    // 80 kg: VT1 816 mL/min = 10.2 mL/kg/min (class C); its band 731–902 mL/min = 9.1–11.3 mL/kg/min reaches class B
    const s = schemeWith("weber", { peakVo2MlKgMin: 13, vt1Vo2MlMin: 816, vt1Vo2MlKgMin: 10.2 }, [
      {
        words: "VT1 band 731–902 mL/min",
        low: { vt1Vo2MlMin: 731, vt1Vo2MlKgMin: 731 / 80 },
        high: { vt1Vo2MlMin: 902, vt1Vo2MlKgMin: 902 / 80 },
      },
    ]);
    const at = s.axes.find((a) => a.category?.key === "C" && /AT/.test(a.category.label))!;
    expect(at.bandReaches).toMatch(/VT1 band 731–902 mL\/min reaches Class B/);
  });
});
