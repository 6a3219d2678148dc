import { describe, it, expect } from "vitest";
import {
  binByTime,
  hingeFit,
  median,
  quantile,
  runningMedian,
  seededRandom,
  solveLinearSystem,
  twoLineFit,
} from "../../lib/numeric";

// All expected values below are hand calculations on data built with a known answer.

describe("hingeFit (continuous two-segment regression, Orr et al. 1982 minimum pooled SSE)", () => {
  it("recovers a breakpoint between data points exactly on noise-free data", () => {
    // y = 2 + 0.5·x + 1.5·max(0, x − 37.3): below slope 0.5, above 2.0, break at 37.3
    const x = Object.freeze(Array.from({ length: 60 }, (_, i) => i));
    const y = Object.freeze(x.map((v) => 2 + 0.5 * v + 1.5 * Math.max(0, v - 37.3)));
    const h = hingeFit(x, y, { refineSteps: 50 });
    expect(h.breakX).toBeCloseTo(37.3, 1);
    expect(h.slopeBelow).toBeCloseTo(0.5, 3);
    expect(h.slopeAbove).toBeCloseTo(2.0, 3);
    // value at the break: 2 + 0.5·37.3 = 20.65
    expect(h.yAtBreak).toBeCloseTo(20.65, 1);
    expect(h.sse).toBeLessThan(1e-3);
  });
  it("fits a flat lower segment and respects the hinge sign", () => {
    const x = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
    const y = x.map((v) => 5 + Math.max(0, v - 4) * 3); // flat 5 until 4, then slope 3
    const h = hingeFit(x, y, { below: "flat", minPointsEachSide: 3, refineSteps: 20 });
    expect(h.breakX).toBeCloseTo(4, 2);
    expect(h.slopeBelow).toBe(0);
    expect(h.slopeAbove).toBeCloseTo(3, 6);
    const down = hingeFit(x, y, { below: "flat", minPointsEachSide: 3, hingeSign: "negative" });
    expect(Number.isNaN(down.breakX) || down.slopeAbove < 0).toBe(true);
  });
  it("handles extra regressors (ratio a + b/z shape below the break)", () => {
    const t = Array.from({ length: 40 }, (_, i) => i * 10);
    const z = t.map((v) => 1 + v / 100);
    const y = t.map((v, i) => 25 + 3 / z[i] + 0.05 * Math.max(0, v - 250));
    const h = hingeFit(t, y, { below: "flat", extra: [z.map((v) => 1 / v)], hingeSign: "positive", refineSteps: 20 });
    expect(h.breakX).toBeCloseTo(250, 0);
  });
  it("gives NaN fields with too few points (degenerate case)", () => {
    expect(Number.isNaN(hingeFit([1, 2, 3], [1, 2, 3]).breakX)).toBe(true);
  });
});

describe("twoLineFit (split in order, intersection (b2 − b1)/(m1 − m2))", () => {
  it("finds the split and intersection of two known lines", () => {
    // lower: y = x (m1 = 1, b1 = 0) for x = 0..9; upper: y = 3x − 20 (m2 = 3, b2 = −20) for x = 10..19
    // intersection: x = (−20 − 0)/(1 − 3) = 10
    const x = Array.from({ length: 20 }, (_, i) => i);
    const y = x.map((v) => (v < 10 ? v : 3 * v - 20));
    const f = twoLineFit(x, y);
    expect(f.split).toBe(10);
    expect(f.lower.slope).toBeCloseTo(1, 9);
    expect(f.upper.slope).toBeCloseTo(3, 9);
    expect(f.intersectionX).toBeCloseTo(10, 9);
    expect(f.intersectionY).toBeCloseTo(10, 9);
  });
  it("only considers accepted splits", () => {
    const x = Array.from({ length: 20 }, (_, i) => i);
    const y = x.map((v) => (v < 10 ? v : 3 * v - 20));
    const f = twoLineFit(x, y, { accept: (lo) => lo.n <= 6 });
    expect(f.split).toBeLessThanOrEqual(6);
  });
});

describe("small numerics", () => {
  it("binByTime averages per bin and skips flagged samples", () => {
    // bins [0,10): 10 and 20 → 15; [10,20): 30 (40 skipped)
    const b = binByTime([1, 2, 11, 12], [[10, 20, 30, 40]], { startS: 0, endS: 20, binS: 10, skip: [false, false, false, true] });
    expect(Array.from(b.means[0])).toEqual([15, 30]);
    expect(Array.from(b.centerS)).toEqual([5, 15]);
  });
  it("quantile type 7 and median by hand", () => {
    // sorted 1,2,3,4: h = 3·0.25 = 0.75 → 1 + 0.75·1 = 1.75
    expect(quantile([4, 1, 3, 2], 0.25)).toBeCloseTo(1.75, 12);
    expect(median([1, 2, 3, 4])).toBe(2.5);
    expect(Number.isNaN(median([]))).toBe(true);
  });
  it("runningMedian resists a spike", () => {
    expect(Array.from(runningMedian([1, 100, 3, 4, 5], 1))).toEqual([50.5, 3, 4, 4, 4.5]);
  });
  it("solveLinearSystem solves and reports singular matrices", () => {
    // 2a + b = 5, a − b = 1 → a = 2, b = 1
    const s = solveLinearSystem(
      [
        [2, 1],
        [1, -1],
      ],
      [5, 1],
    );
    expect(s?.[0]).toBeCloseTo(2, 12);
    expect(s?.[1]).toBeCloseTo(1, 12);
    expect(
      solveLinearSystem(
        [
          [1, 2],
          [2, 4],
        ],
        [1, 2],
      ),
    ).toBeNull();
  });
  it("seededRandom is deterministic with standard-normal moments", () => {
    const a = seededRandom(7);
    const b = seededRandom(7);
    expect([a.uniform(), a.uniform()]).toEqual([b.uniform(), b.uniform()]);
    const r = seededRandom(3);
    const n = 20000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const z = r.normal();
      s += z;
      s2 += z * z;
    }
    // standard error of the mean 1/√20000 ≈ 0.007: 0.03 is > 4 SE
    expect(Math.abs(s / n)).toBeLessThan(0.03);
    expect(Math.sqrt(s2 / n - (s / n) ** 2)).toBeCloseTo(1, 1);
  });
});
