import { describe, it, expect } from "vitest";
import { slopeToVt2Name, veVco2Slope } from "../../lib/thresholds/veVco2Slope";
import { buildRows, EX_START_S, freezeTest, makeTest } from "./indicesFixture";

// Invented: VCO2 = 800 + 2·(t − 180) mL/min in exercise; VE = 25·VCO2(L) + 3 up to VT2 (600 s), then
// 40 L/min per L/min steeper: VE = 25·VCO2 + 3 + 40·(VCO2 − VCO2(600)).
const VT2_S = 600;
const vco2At = (t: number) => 800 + 2 * (t - EX_START_S);
function rampWithRcp() {
  return makeTest(
    buildRows((t, phase) => {
      const vco2 = phase === "exercise" ? vco2At(t) : 300;
      const l = vco2 / 1000;
      const extra = phase === "exercise" && t > VT2_S ? 40 * (l - vco2At(VT2_S) / 1000) : 0;
      return { vco2MlMin: vco2, vo2MlMin: vco2, veLMin: 25 * l + 3 + extra };
    }),
  );
}

describe("VE/VCO2 slope", () => {
  const test = freezeTest(rampWithRcp());
  const r = veVco2Slope(test, { vt1: { timeS: 420, vo2MlMin: 1280 }, vt2: { timeS: VT2_S, vo2MlMin: 1640 } });

  it("to VT2 without the rolling mean: slope 25.00, intercept 3 L/min, r² 1 (by construction)", () => {
    const q = veVco2Slope(test, { vt2: { timeS: VT2_S, vo2MlMin: 1640 }, toVt2RollingBins: 1 });
    expect(q.slopeToVt2.slope.value).toBeCloseTo(25, 9);
    expect(q.slopeToVt2.intercept.value).toBeCloseTo(3, 9);
    expect(q.slopeToVt2.r2.value).toBeCloseTo(1, 12);
    // breaths 180..600 every 3 s: 141
    expect(q.slopeToVt2.n).toBe(141);
    expect(q.slopeToVt2.slope.provenance.sourceIds).toContain("ward-2021");
  });

  it("to VT2 with the default 3-bin rolling mean: the straight part is kept, the corner rounded (within 0.5 % of 25)", () => {
    // the same weights on VE and VCO2 keep VE = 25·VCO2 + 3 exactly; only the bins within one bin of the corner mix the
    // two lines, which moves the lower line by 0.2 % here
    expect(Math.abs(r.slopeToVt2.slope.value! - 25) / 25).toBeLessThan(0.005);
    expect(Math.abs(r.slopeToVt2.intercept.value! - 3)).toBeLessThan(0.1);
    expect(r.slopeToVt2.r2.value).toBeGreaterThan(0.9999);
    expect(Math.abs((r.slopeToVt2.slope.provenance.inputs?.cornerS as number) - VT2_S)).toBeLessThanOrEqual(5);
  });

  it("the rolling mean keeps a straight line exactly: no corner below VT2 + 60 s gives 25 and 3 to 9 digits", () => {
    // VT2 set at 480 s: the fit runs to 540 s, all on the lower line; the corner search finds no steeper upper line and
    // the plain binned OLS on the smoothed bins is used
    const q = veVco2Slope(test, { vt2: { timeS: 480, vo2MlMin: 1400 } });
    expect(q.slopeToVt2.slope.value).toBeCloseTo(25, 9);
    expect(q.slopeToVt2.intercept.value).toBeCloseTo(3, 9);
  });

  it("whole exercise is steeper once the post-RCP breaths are included", () => {
    expect(r.slopeWholeExercise.slope.value).toBeGreaterThan(25.5);
    expect(r.slopeWholeExercise.r2.value).toBeLessThan(1);
    expect(r.slopeWholeExercise.slope.provenance.sourceIds).toContain("friend-ve-vco2-slope");
  });

  it("lowest 30-s VE/VCO2 (Sun 2002) sits in the window ending at VT2", () => {
    // ratio of means = 25 + 3/mean VCO2 (L) for windows before VT2; window [570, 600] mean VCO2 = vco2At(585) = 1610
    expect(r.nadir.value).toBeCloseTo(25 + 3 / 1.61, 9);
    expect(r.nadir.provenance.window).toEqual({ startS: 570, endS: 600 });
  });

  it("VE/VCO2 at VT1 (centred 30-s window on raw breaths): 25 + 3/1.28", () => {
    expect(r.atVt1.value).toBeCloseTo(25 + 3 / 1.28, 9);
  });

  it("without VT2 the to-RCP slope is the lower line below the break the fit finds (25 by construction), flagged", () => {
    const q = veVco2Slope(test, {});
    // the break of this invented ramp is at 600 s (exercise 180–780 s: in the second half searched); the 3-bin rolling
    // mean rounds the corner (0.5 % here), without it the lower line is exact
    expect(Math.abs(q.slopeToVt2.slope.value! - 25) / 25).toBeLessThan(0.006);
    expect(veVco2Slope(test, { toVt2RollingBins: 1 }).slopeToVt2.slope.value).toBeCloseTo(25, 6);
    expect(q.slopeToVt2.slope.provenance.method).toBe("ve-vco2-slope-below-fitted-break");
    expect(slopeToVt2Name(q.slopeToVt2)).toBe("VE/VCO2 slope to a fitted break (RCP not determinable)");
    expect(Math.abs((q.slopeToVt2.slope.provenance.inputs?.cornerS as number) - VT2_S)).toBeLessThanOrEqual(5);
    expect(q.issues.map((i) => i.code)).toContain("ve-vco2-slope-below-fitted-break");
    expect(q.atVt1.value).toBeNull();
  });

  it("without VT2 and with the fitted break off, the to-RCP slope is not determinable, with the reason", () => {
    const q = veVco2Slope(test, { fittedBreakWhenNoVt2: false });
    expect(q.slopeToVt2.slope.value).toBeNull();
    expect(q.slopeToVt2.slope.reason).toMatch(/VT2/);
  });

  it("no VE column → issues, nothing determinable", () => {
    const q = veVco2Slope(makeTest(buildRows(() => ({ vco2MlMin: 1000 }))), {});
    expect(q.slopeWholeExercise.slope.value).toBeNull();
    expect(q.issues.map((i) => i.code)).toContain("no-ve-vco2");
  });
});

describe("VE/VCO2 slope to an early VT2 where ventilation has not yet settled", () => {
  // Invented: an anxious start — VE falls from 45 to 25 L/min over the first 120 s of exercise while VCO2 rises on the
  // ramp (VE = 25·VCO2 + 3 after 300 s). A VT2 set at 280 s leaves only the falling part below it: the fitted line
  // falls, which is not a VE/VCO2 slope (ventilation rises with CO2 output in exercise, common practice).
  const test = freezeTest(
    makeTest(
      buildRows((t, phase) => {
        const vco2 = phase === "exercise" ? vco2At(t) : 300;
        const settled = 25 * (vco2 / 1000) + 3;
        const anxious = phase === "exercise" && t < 300 ? 45 - (20 * (t - EX_START_S)) / 120 : settled;
        return { vco2MlMin: vco2, vo2MlMin: vco2, veLMin: phase === "exercise" && t < 300 ? anxious : settled };
      }),
    ),
  );
  const r = veVco2Slope(test, { vt2: { timeS: 280, vo2MlMin: vco2At(280) } });
  it("is not determinable, with the fitted slope and a check-VT2 reason, and a warning", () => {
    expect(r.slopeToVt2.slope.value).toBeNull();
    expect(r.slopeToVt2.slope.reason).toMatch(/does not rise \(slope -\d+\.\d\).*check VT2 by review/);
    expect(r.issues.find((i) => i.code === "ve-vco2-slope-not-rising")?.severity).toBe("warning");
  });
  it("the whole-exercise slope is still given (it rises over the whole test)", () => {
    expect(r.slopeWholeExercise.slope.value).toBeGreaterThan(0);
  });
});

describe("lineIndexFromFit: a line with no points at all", () => {
  it("names the missing pairing instead of 'only 0 points'", async () => {
    const { lineIndexFromFit } = await import("../../lib/thresholds/veVco2Slope");
    const { PrefixSums } = await import("../../lib/numeric/linearRegression");
    const prov = { method: "invented", label: "invented line", sourceIds: [] };
    const empty = new PrefixSums(new Float64Array(0), new Float64Array(0));
    const slope = (unit: string) => lineIndexFromFit(empty, 0, 0, { slope: unit, intercept: "x" }, prov, 10).slope.reason;
    expect(slope("1")).toBe("no VE with VCO2 in the span it reads");
    expect(slope("mL/min/W")).toBe("no VO2 with a work rate in the span it reads");
    expect(slope("mL/min per log10(L/min)")).toBe("no VO2 with VE in the span it reads");
    // a short series keeps its count
    const three = new PrefixSums(Float64Array.from([1, 2, 3]), Float64Array.from([2, 4, 6]));
    expect(lineIndexFromFit(three, 0, 3, { slope: "1", intercept: "L/min" }, prov, 10).slope.reason).toBe(
      "only 3 points (need 10)",
    );
  });
});
