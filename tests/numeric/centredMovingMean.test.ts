import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { centredMovingMean } from "../../lib/numeric/centredMovingMean";

describe("centredMovingMean", () => {
  it("hand calculation: [1, 2, 6, 4, 5] over 3 → [1, 3, 4, 5, 5] (ends kept)", () => {
    expect(Array.from(centredMovingMean([1, 2, 6, 4, 5], 1))).toEqual([1, 3, 4, 5, 5]);
  });
  it("half-width 2: windows shrink symmetrically at the ends (windows of 1, 3, 5, 5, 5, 3, 1 values)", () => {
    // [0..6]: i=0 → 0; i=1 → mean(0,1,2)=1; i=2..4 → mean of 5 centred; i=5 → mean(4,5,6)=5; i=6 → 6
    expect(Array.from(centredMovingMean([0, 1, 2, 3, 4, 5, 6], 2))).toEqual([0, 1, 2, 3, 4, 5, 6]);
    expect(Array.from(centredMovingMean([0, 0, 10, 0, 0, 0, 0], 2))).toEqual([0, 10 / 3, 2, 2, 2, 0, 0]);
  });
  it("half-width 0 is the identity; non-finite values are skipped; an all-NaN window gives NaN", () => {
    expect(Array.from(centredMovingMean([3, 1, 2], 0))).toEqual([3, 1, 2]);
    expect(Array.from(centredMovingMean([1, NaN, 3], 1))).toEqual([1, 2, 3]);
    expect(Number.isNaN(centredMovingMean([NaN, NaN, NaN], 1)[1])).toBe(true);
  });
  it("a bad half-width is a programming mistake", () => {
    expect(() => centredMovingMean([1, 2], -1)).toThrow();
    expect(() => centredMovingMean([1, 2], 1.5)).toThrow();
  });
  it("property: y = a + b·x before smoothing ⇒ the same line after smoothing both (weights sum to one)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 40 }),
        fc.double({ min: -50, max: 50, noNaN: true }),
        fc.double({ min: -50, max: 50, noNaN: true }),
        fc.integer({ min: 0, max: 4 }),
        (x, a, b, h) => {
          const sx = centredMovingMean(x, h);
          const sy = centredMovingMean(
            x.map((v) => a + b * v),
            h,
          );
          for (let i = 0; i < x.length; i++) expect(sy[i]).toBeCloseTo(a + b * sx[i], 6);
        },
      ),
    );
  });
});
