import { describe, it, expect } from "vitest";
import { conditionTable } from "../../lib/signal";
import { crossCheckSpec, generateCrossCheckTest } from "../../lib/synthetic";
import { detectThresholds } from "../../lib/thresholds/detectThresholds";
import { veVco2Slope } from "../../lib/thresholds/veVco2Slope";

// A COPD-like test of the cross-check model (invented data, generateCrossCheckTest: a 77-year-old, peak VO2 about
// 850 mL/min, no respiratory compensation by construction, VT1 truth 614 mL/min; moderate noise). The VT2 methods offer
// an RCP candidate early in the ramp, which left fewer bins below it than any VT1 method needs: VT1 used to be "not
// determinable" and the VE/VCO2 slope "to VT2" came out negative.
const syn = generateCrossCheckTest(crossCheckSpec(31, 91, ["moderate"]), 91 + 31);
const test = conditionTable(syn.table);
// the mechanics below need the candidate reported: the rule that sets aside a candidate no compensation follows
// (round 14) is off here, and its own effect on this case is checked at the end
const r = detectThresholds(test, { bootstrap: 20, seed: 1, dropUnsustainedVt2: false });

describe("VT1 when an early RCP candidate leaves too little data below it", () => {
  it("the case is what it claims: no RCP by construction, an RCP candidate below the true VT1", () => {
    expect(syn.truth.vt2).toBeNull();
    expect(syn.truth.vt1.vo2MlMin).toBeCloseTo(614, -1);
    expect(r.vt2.vo2MlMin.value).not.toBeNull();
    expect(r.vt2.vo2MlMin.value!).toBeLessThan(syn.truth.vt1.vo2MlMin);
  });
  it("VT1 is read over the whole exercise, with low confidence and the reason, within 15 % of the truth", () => {
    expect(r.vt1.vo2MlMin.value).not.toBeNull();
    expect(Math.abs(r.vt1.vo2MlMin.value! - syn.truth.vt1.vo2MlMin) / syn.truth.vt1.vo2MlMin).toBeLessThan(0.15);
    expect(r.vt1.confidence).toBe("low");
    expect(r.vt1.reason).toMatch(/read over the whole exercise/);
  });
  it("a VT1 at or above the RCP candidate puts both in doubt: warning, both low, each with its reason", () => {
    expect(r.vt1.vo2MlMin.value!).toBeGreaterThanOrEqual(r.vt2.vo2MlMin.value!);
    expect(r.issues.map((i) => i.code)).toContain("vt1-not-below-vt2");
    expect(r.vt2.confidence).toBe("low");
    expect(r.vt2.reason).toMatch(/VT2 does not lie above VT1/);
  });
  it("the VE/VCO2 line below that VT2 falls or fits loosely, so the slope is not determinable (never a negative slope)", () => {
    const vt2 = { timeS: r.vt2.timeS!, vo2MlMin: r.vt2.vo2MlMin.value! };
    // without the rolling mean the line falls; with it (the default) it rises to about 11, far below the whole-exercise
    // slope of 20, with r² 0.46: both are refused with the reason
    const raw = veVco2Slope(test, { vt2, toVt2RollingBins: 1 });
    expect(raw.slopeToVt2.slope.value).toBeNull();
    expect(raw.issues.map((i) => i.code)).toContain("ve-vco2-slope-not-rising");
    const s = veVco2Slope(test, { vt2 });
    expect(s.slopeToVt2.slope.value).toBeNull();
    expect(s.slopeToVt2.slope.reason).toMatch(/r² 0\.\d\d < 0\.5/);
    expect(s.issues.map((i) => i.code)).toContain("ve-vco2-slope-loose-fit");
    expect(s.slopeWholeExercise.slope.value).toBeGreaterThan(15);
  });
  it("with the defaults the candidate is not reported, as no compensation follows it; VT1 is the same", () => {
    const d = detectThresholds(test, { bootstrap: 20, seed: 1 });
    expect(d.vt2.vo2MlMin.value).toBeNull();
    expect(d.vt2.reason).toMatch(/no respiratory compensation follows the RCP candidate/);
    expect(d.issues.map((i) => i.code)).toContain("vt2-compensation-not-sustained");
    expect(d.vt1.vo2MlMin.value).toBe(r.vt1.vo2MlMin.value);
  });
});
