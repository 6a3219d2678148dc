import { describe, it, expect } from "vitest";
import { evaluatePolynomialFit, polynomialFit, polynomialFitSlope } from "../../lib/numeric/polynomialFit";

describe("polynomialFit (least squares)", () => {
  it("recovers an exact cubic y = x³ + 1 and its slope 3x²", () => {
    const x = Object.freeze([0, 1, 2, 3, 4]);
    const y = Object.freeze([1, 2, 9, 28, 65]);
    const f = polynomialFit(x, y, 3);
    expect(evaluatePolynomialFit(f, 5)).toBeCloseTo(126, 9);
    expect(polynomialFitSlope(f, 2)).toBeCloseTo(12, 9);
    expect(f.sse).toBeCloseTo(0, 12);
    expect(f.r2).toBeCloseTo(1, 12);
  });

  it("stays well conditioned for watts (x up to 400)", () => {
    const x = [100, 150, 200, 250, 300, 350, 400];
    const y = x.map((w) => 0.8 + 2e-8 * w ** 3);
    const f = polynomialFit(x, y, 3);
    for (const w of x) expect(evaluatePolynomialFit(f, w)).toBeCloseTo(0.8 + 2e-8 * w ** 3, 10);
  });

  it("a straight line through noisy points matches the textbook OLS: (0,1),(1,3),(2,2),(3,5) → slope 1.1, intercept 1.1", () => {
    // x̄ = 1.5, ȳ = 2.75; Sxy = (−1.5)(−1.75)+(−0.5)(0.25)+(0.5)(−0.75)+(1.5)(2.25) = 5.5; Sxx = 5 → slope 1.1; 2.75 − 1.65 = 1.1
    const f = polynomialFit([0, 1, 2, 3], [1, 3, 2, 5], 1);
    expect(polynomialFitSlope(f, 0)).toBeCloseTo(1.1, 12);
    expect(evaluatePolynomialFit(f, 0)).toBeCloseTo(1.1, 12);
  });

  it("degenerate: too few distinct x → NaN coefficients", () => {
    expect(polynomialFit([1, 1, 1, 2], [1, 2, 3, 4], 3).coefficients.every(Number.isNaN)).toBe(true);
    expect(polynomialFit([1, 2], [1, 2], 3).coefficients.every(Number.isNaN)).toBe(true);
    expect(() => polynomialFit([1], [1, 2], 1)).toThrow(/equal length/);
  });
});
