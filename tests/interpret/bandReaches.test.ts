import { describe, expect, it } from "vitest";
import { INTERPRETATION_DATA, interpret, type InterpretInput, type InterpretValues } from "../../lib/interpret";
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
    // named in the unit the class is graded in: 731/80 = 9.1, 902/80 = 11.3 mL/kg/min
    expect(at.bandReaches).toBe(
      "the VT1 band 731–902 mL/min (VO2 at VT1 9.1–11.3 mL/kg/min) reaches Class B (AT 11.0-14.0 mL/kg/min)",
    );
  });
});

describe("VE/VCO2 at VT1 moves with the VT1 band", () => {
  // Cut-offs: VE/VCO2 at the AT > 34 and AT ≤ 10.9 mL/kg/min (Wilson et al. 2010, Br J Anaesth — confirmed, clinical-confirmations C25b) and the
  // three-tier scheme (AT 8–10.9 mL/kg/min, VE/VCO2 at AT > 34; clinical-reference S34, confirmed). Values invented:
  // 70 kg, VT1 840 mL/min = 12.0 mL/kg/min with VE/VCO2 33.2; where the VO2 trend reached the band's low end (770 mL/min
  // = 11.0) VE/VCO2 reads 34.6, at its high end (910 mL/min) 32.8.
  const band = {
    words: "VT1 band 770–910 mL/min",
    low: { vt1Vo2MlMin: 770, vt1Vo2MlKgMin: 11, veVco2AtVt1: 34.6 },
    high: { vt1Vo2MlMin: 910, vt1Vo2MlKgMin: 13, veVco2AtVt1: 32.8 },
    detail: { variables: ["veVco2AtVt1" as const], words: "VE/VCO2 34.6 and 32.8 at its ends" },
  };
  const values = { vt1Vo2MlMin: 840, vt1Vo2MlKgMin: 12, veVco2AtVt1: 33.2, peakVo2MlKgMin: 19 };

  it("the axis grading VE/VCO2 at the AT says which side of 34 the band's ends read, and why", () => {
    const s = schemeWith("preop-published-thresholds", values, [band]);
    const axis = s.axes.find((a) => a.axisId === "wilson-2010-vevco2")!;
    expect(axis.category?.key).toBe("within");
    expect(axis.bandReaches).toBe("the VT1 band 770–910 mL/min (VE/VCO2 34.6 and 32.8 at its ends) reaches Beyond the threshold");
  });

  it("an axis that grades the AT alone names the band without the VE/VCO2 words", () => {
    const s = schemeWith("preop-published-thresholds", { ...values, vt1Vo2MlKgMin: 11.2 }, [
      { ...band, low: { ...band.low, vt1Vo2MlKgMin: 10.9 } },
    ]);
    // Wilson 2010 AT cut-off ≤ 10.9 mL/kg/min: 11.2 is not beyond it, the band's low end 10.9 is
    const at = s.axes.find((a) => a.axisId === "wilson-2010-at")!;
    expect(at.bandReaches).toMatch(/^the VT1 band 770–910 mL\/min \(VO2 at VT1 10\.9–13\.0 mL\/kg\/min\) reaches /);
    expect(at.bandReaches).not.toContain("VE/VCO2");
  });

  it("without the VE/VCO2 reading at the band's ends the ratio stays put and the axis says nothing", () => {
    const s = schemeWith("preop-published-thresholds", values, [
      { words: band.words, low: { vt1Vo2MlMin: 770, vt1Vo2MlKgMin: 11 }, high: { vt1Vo2MlMin: 910, vt1Vo2MlKgMin: 13 } },
    ]);
    expect(s.axes.find((a) => a.axisId === "wilson-2010-vevco2")!.bandReaches).toBeUndefined();
  });
});

describe("an effort verdict resting on a value near its cut-off", () => {
  // Peak RER > 1.05 (ERS statement, Radtke et al. 2019 — confirmed) is the default RER criterion; values invented.
  const effortWith = (peakRer: number, band: [number, number]) =>
    interpret({
      ...baseInput({ peakRer }),
      uncertainty: [
        {
          words: `peak RER ${band[0].toFixed(2)}–${band[1].toFixed(2)} (±2 standard errors over its window)`,
          low: { peakRer: band[0] },
          high: { peakRer: band[1] },
        },
      ],
    });

  it("1.055 with a band 1.035–1.075: the verdict stands, and says which other verdict the band reaches", () => {
    const r = effortWith(1.055, [1.035, 1.075]);
    const plain = interpret(baseInput({ peakRer: 1.055 })).effort;
    expect(r.effort.verdict).toBe(plain.verdict);
    expect(r.effort.borderline).toMatch(/^the peak RER 1\.03–1\.07 \(±2 standard errors over its window\) reaches /);
    expect(r.effort.borderline).not.toContain(plain.label);
    expect(r.effort.text).toContain("; borderline: the peak RER");
    expect(r.issues.map((i) => i.code)).toContain("effort-verdict-borderline");
  });

  it("1.12 with a band 1.10–1.14: nothing borderline", () => {
    const r = effortWith(1.12, [1.1, 1.14]);
    expect(r.effort.borderline).toBeUndefined();
    expect(r.issues.map((i) => i.code)).not.toContain("effort-verdict-borderline");
  });
});

describe("a flow step resting on a value near its cut-off", () => {
  // (peak VO2 70 % of predicted: reduced, so the flow reads the AT next) AT low below 40 % of predicted peak VO2 (Hansen, Sue & Wasserman 1984 via the ATS/ACCP 2003 flow — secondary, as
  // flow.json marks it); the values and bands are invented.
  const atStep = (pct: number, uncertainty: InterpretInput["uncertainty"]) =>
    interpret({ ...baseInput({ peakVo2PctPred: 70, vt1PctPredPeakVo2: pct, vt1Determined: true }), uncertainty }).path.steps.find(
      (s) => s.nodeId === "at",
    )!;

  it("VT1 at 38 % with a band reaching 45 %: the step stays 'low' and says the band reaches 'VT1 not low'", () => {
    const step = atStep(38, [
      { words: "VT1 band 731–902 mL/min", low: { vt1PctPredPeakVo2: 34 }, high: { vt1PctPredPeakVo2: 45 } },
    ]);
    expect(step.outcome).toBe("low");
    expect(step.borderline).toBe('the VT1 band 731–902 mL/min reaches "VT1 not low"');
    expect(step.text).toMatch(
      /⇒ low VT1: oxygen delivery or utilisation limitation \(borderline: the VT1 band 731–902 mL\/min reaches "VT1 not low"\)$/,
    );
  });

  it("says nothing when the band stays on one side, or when its end only makes the step not assessable", () => {
    expect(
      atStep(30, [{ words: "VT1 band", low: { vt1PctPredPeakVo2: 28 }, high: { vt1PctPredPeakVo2: 33 } }]).borderline,
    ).toBeUndefined();
    const missing = atStep(38, [{ words: "VT1 band", low: { vt1PctPredPeakVo2: 36 }, high: { vt1PctPredPeakVo2: null } }]);
    expect(missing.outcome).toBe("low");
    expect(missing.borderline).toBeUndefined();
  });
});

describe("every scheme row graded on the AT says when the VT1 band crosses one of its cut-offs", () => {
  // Pre-operative three-tier scheme (AT < 8 mL/kg/min, or two of: AT 8–10.9, VE/VCO2 at AT > 34, ischaemic heart
  // disease = high risk; clinical-reference S34, confirmed). INVENTED values shaped like the pre-operative demo: 82 kg,
  // VT1 667 mL/min = 8.1 mL/kg/min with VE/VCO2 42.9; its band 635–826 mL/min = 7.7–10.1 mL/kg/min, VE/VCO2 40.8 and 38.0
  // at its ends. High risk at 8.1 (two risk factors) and at 7.7 (AT < 8 alone): the category stays, the route changes.
  const band = {
    words: "VT1 band 635–826 mL/min",
    low: { vt1Vo2MlMin: 635, vt1Vo2MlKgMin: 635 / 82, veVco2AtVt1: 40.8 },
    high: { vt1Vo2MlMin: 826, vt1Vo2MlKgMin: 826 / 82, veVco2AtVt1: 38.0 },
    detail: { variables: ["veVco2AtVt1" as const], words: "VE/VCO2 40.8 and 38.0 at its ends" },
  };
  const values = {
    vt1Vo2MlMin: 667,
    vt1Vo2MlKgMin: 667 / 82,
    veVco2AtVt1: 42.9,
    peakVo2MlKgMin: 14.9,
    ischaemicHeartDisease: false,
  };

  it("three-tier: a band crossing 8 mL/kg/min inside 'high risk' names the cut-off it crosses, in mL/kg/min", () => {
    const tier = schemeWith("preop-three-tier", values, [band]).axes[0];
    expect(tier.category?.key).toBe("high");
    expect(tier.bandReaches).toBe(
      "the VT1 band 635–826 mL/min (VO2 at VT1 7.7–10.1 mL/kg/min; VE/VCO2 40.8 and 38.0 at its ends) crosses the cut-off VO2 at VT1 8.0 mL/kg/min (same category at both ends)",
    );
    expect(tier.text).toContain("; the VT1 band 635–826 mL/min");
  });

  it("rows whose cut-offs (10.6–11.1 mL/kg/min) lie outside the band 7.7–10.1 say nothing", () => {
    const older = schemeWith("preop-older-1993", values, [band]);
    const published = schemeWith("preop-published-thresholds", values, [band]);
    expect(older.axes.find((a) => a.axisId === "at")!.bandReaches).toBeUndefined();
    for (const id of ["wilson-2010-at", "west-2016-at", "west-2014-rectal-at", "lai-2013"])
      expect(published.axes.find((a) => a.axisId === id)!.bandReaches).toBeUndefined();
  });

  // Every axis of every scheme that grades VO2 at VT1 per kg, at every cut-off it uses (read from schemes.json):
  // the value 0.2 mL/kg/min above the cut-off, its band 0.3 below to 0.5 above, so the band straddles the cut-off by
  // construction. Other inputs invented so that every axis applies (ischaemic heart disease known; VE/VCO2 at AT 30).
  const numericCutoffs = (node: unknown, out: number[] = []): number[] => {
    if (Array.isArray(node)) node.forEach((n) => numericCutoffs(n, out));
    else if (node && typeof node === "object") {
      const o = node as Record<string, unknown>;
      if (o.var === "vt1Vo2MlKgMin" && typeof o.value === "number") out.push(o.value);
      Object.values(o).forEach((v) => numericCutoffs(v, out));
    }
    return out;
  };
  const data = INTERPRETATION_DATA.schemes;
  const bandSetOf = new Map(data.bandSets.map((b) => [b.id, b.bands]));
  const cases = data.schemes.flatMap((s) =>
    (s.axes ?? []).flatMap((a) =>
      [...new Set(numericCutoffs(a.bands ?? bandSetOf.get(a.bandSet!)))].map((cut) => [s.id, a.id, cut] as const),
    ),
  );

  it("finds the AT-graded rows (Weber, Older, three-tier, the published pre-operative thresholds)", () => {
    const schemes = new Set(cases.map((c) => c[0]));
    for (const id of ["weber", "preop-older-1993", "preop-three-tier", "preop-published-thresholds"])
      expect(schemes).toContain(id);
  });

  it.each(cases)("%s / %s: a band across %s mL/kg/min is named beside the category", (schemeId, axisId, cut) => {
    const at = cut + 0.2;
    const s = schemeWith(
      schemeId,
      {
        vt1Vo2MlMin: at * 80,
        vt1Vo2MlKgMin: at,
        veVco2AtVt1: 30,
        peakVo2MlKgMin: 25,
        ischaemicHeartDisease: true,
        vt1Determined: true,
      },
      [
        {
          words: "VT1 band (invented)",
          low: { vt1Vo2MlMin: (cut - 0.3) * 80, vt1Vo2MlKgMin: cut - 0.3 },
          high: { vt1Vo2MlMin: (cut + 0.5) * 80, vt1Vo2MlKgMin: cut + 0.5 },
        },
      ],
    );
    const axis = s.axes.find((a) => a.axisId === axisId)!;
    expect(axis.category).not.toBeNull();
    expect(axis.bandReaches).toMatch(
      /^the VT1 band \(invented\) \(VO2 at VT1 [\d.]+–[\d.]+ mL\/kg\/min\) (reaches|crosses the cut-off)/,
    );
  });
});
