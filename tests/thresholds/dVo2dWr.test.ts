import { describe, it, expect } from "vitest";
import { dVo2dWr } from "../../lib/thresholds/dVo2dWr";
import { buildRows, EX_START_S, freezeTest, makeTest, rampW } from "./indicesFixture";

// Invented ramp 20 W/min. During the first 60 s VO2 stays at 500 (lag); afterwards VO2 = 10·W + 500
// exactly, so excluding the lag window gives 10.0 mL/min/W. Reference 10.29 ± 1.01 mL/min/W in 54 normal men:
// Am J Cardiol 1987;59:669-74 (PMID 3825911) — confirmed; author list (Hansen, Sue, Oren, Wasserman) recalled
// ["hansen-1987-vo2-wr"]. Excluding the first ~1 min for the VO2 lag: method detail, recalled ["vo2-lag-exclusion"].
function ramp(upperSlope: number) {
  const vt1S = 480;
  return makeTest(
    buildRows((t, phase) => {
      if (phase !== "exercise") return { vo2MlMin: 500, workW: 0 };
      const w = rampW(t);
      if (t < EX_START_S + 60) return { vo2MlMin: 500, workW: w };
      const vo2 = t <= vt1S ? 10 * w + 500 : 10 * rampW(vt1S) + 500 + upperSlope * (w - rampW(vt1S));
      return { vo2MlMin: vo2, workW: w };
    }),
  );
}

describe("ΔVO2/ΔWR", () => {
  it("is exactly 10.0 after the 60-s lag window on a linear response", () => {
    const r = dVo2dWr(freezeTest(ramp(10)));
    expect(r.whole.slope.value).toBeCloseTo(10, 9);
    expect(r.whole.intercept.value).toBeCloseTo(500, 7);
    expect(r.whole.slope.provenance.window).toEqual({ startS: 240, endS: 780 });
    expect(r.reference).toEqual({ meanMlMinW: 10.29, sdMlMinW: 1.01, sourceId: "hansen-1987-vo2-wr" });
    // no VT1 → split at two-thirds of the fitted span: 240 + (2/3)·540 = 600 s; both halves 10 → ratio 1, no flattening
    expect(r.splitBy).toBe("two-thirds");
    expect(r.splitS).toBeCloseTo(600, 9);
    expect(r.upperToLowerRatio.value).toBeCloseTo(1, 9);
    expect(r.flattening).toBe(false);
  });

  it("without the lag exclusion the flat first minute biases the slope", () => {
    const r = dVo2dWr(ramp(10), { lagS: 0 });
    expect(Math.abs(r.whole.slope.value! - 10)).toBeGreaterThan(0.05);
  });

  it("flattening above VT1: lower 10, upper 7 → ratio 0.7 < 0.8 (implementation choice)", () => {
    const r = dVo2dWr(ramp(7), { vt1: { timeS: 480, vo2MlMin: 1500 } });
    expect(r.splitBy).toBe("vt1");
    expect(r.lower.slope.value).toBeCloseTo(10, 9);
    expect(r.upper.slope.value).toBeCloseTo(7, 9);
    expect(r.upperToLowerRatio.value).toBeCloseTo(0.7, 9);
    expect(r.flattening).toBe(true);
  });

  it("either side of the 0.8 flattening cut-off (lib default flatteningRatio: implementation choice, no published source): 0.81 no, 0.79 yes", () => {
    const vt1 = { timeS: 480, vo2MlMin: 1500 };
    const above = dVo2dWr(ramp(8.1), { vt1 });
    expect(above.upperToLowerRatio.value).toBeCloseTo(0.81, 9);
    expect(above.flattening).toBe(false);
    const below = dVo2dWr(ramp(7.9), { vt1 });
    expect(below.upperToLowerRatio.value).toBeCloseTo(0.79, 9);
    expect(below.flattening).toBe(true);
  });

  it("treadmill (no work rate) → not determinable with an issue", () => {
    const r = dVo2dWr(makeTest(buildRows(() => ({ vo2MlMin: 1000, speedKmh: 6 }))));
    expect(r.whole.slope.value).toBeNull();
    expect(r.issues.map((i) => i.code)).toContain("no-work-rate");
  });
});
