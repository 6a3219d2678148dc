import { describe, it, expect } from "vitest";
import { firstUpwardCrossing, interpolateLinear } from "../../lib/numeric/interpolate";

describe("interpolateLinear", () => {
  const xs = Object.freeze([0, 10, 20, 40]);
  const ys = Object.freeze([0, 100, 50, 50]);
  it("reads between points and at points", () => {
    expect(interpolateLinear(xs, ys, 2.5)).toBe(25);
    expect(interpolateLinear(xs, ys, 15)).toBe(75);
    expect(interpolateLinear(xs, ys, 20)).toBe(50);
    expect(interpolateLinear(xs, ys, 40)).toBe(50);
  });
  it("does not extrapolate", () => {
    expect(interpolateLinear(xs, ys, -1)).toBeNaN();
    expect(interpolateLinear(xs, ys, 41)).toBeNaN();
    expect(interpolateLinear([], [], 0)).toBeNaN();
  });
});

describe("firstUpwardCrossing", () => {
  it("interpolates the first upward crossing: (200, 3) → (300, 5) crosses 4 at 250", () => {
    expect(firstUpwardCrossing([100, 200, 300], [2, 3, 5], 4)).toBe(250);
  });
  it("a later dip and re-crossing is ignored; starting at or above the level gives NaN", () => {
    expect(firstUpwardCrossing([0, 1, 2, 3], [0, 2, 0, 2], 1)).toBe(0.5);
    expect(firstUpwardCrossing([0, 1], [5, 6], 4)).toBeNaN();
    expect(firstUpwardCrossing([0, 1], [1, 2], 4)).toBeNaN();
    expect(firstUpwardCrossing([0, 1, 2, 3], [0, 2, 0, 2], 1, 2)).toBe(2.5);
  });
});
