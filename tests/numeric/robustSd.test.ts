import { describe, it, expect } from "vitest";
import { robustSd, seededRandom } from "../../lib/numeric";

describe("robustSd (1.4826 × median absolute deviation)", () => {
  it("hand-worked values: [1..5] about its median 3 → 1.4826; about 0 → 1.4826 × 3", () => {
    expect(robustSd([1, 2, 3, 4, 5])).toBeCloseTo(1.4826, 12);
    expect(robustSd([1, 2, 3, 4, 5], 0)).toBeCloseTo(4.4478, 12);
  });
  it("skips non-finite values; none finite → NaN", () => {
    expect(robustSd([1, NaN, 2, 3, Infinity, 4, 5])).toBeCloseTo(1.4826, 12);
    expect(robustSd([NaN])).toBeNaN();
  });
  it("equals the SD for normal data (known by construction: 20 000 draws of SD 2, within 3 %) and ignores outliers", () => {
    const rng = seededRandom(7);
    const xs = Array.from({ length: 20000 }, () => 10 + 2 * rng.normal());
    expect(robustSd(xs)).toBeGreaterThan(1.94);
    expect(robustSd(xs)).toBeLessThan(2.06);
    // 5 % of gross outliers move it by little (a plain SD would grow many-fold)
    const spoiled = xs.map((x, i) => (i % 20 === 0 ? x + 1000 : x));
    expect(robustSd(spoiled)).toBeLessThan(2.2);
  });
});
