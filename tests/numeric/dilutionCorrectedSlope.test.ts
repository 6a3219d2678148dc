import { describe, expect, it } from "vitest";
import { dilutionCorrectedSlope, linearRegression, residualLag1, seededRandom } from "../../lib/numeric";

// Answers known by construction: invented series whose noise is drawn from a seeded generator. Regression dilution: noise
// of variance σ² in x scales the least-squares slope by var(x_true)/(var(x_true) + σ²) (Fuller 1987, Measurement Error
// Models — recalled); the successive-difference estimate of σ² is von Neumann's (1941, Ann Math Stat — secondary).
function series(n: number, seed: number, noiseX: number, noiseY: number, sharedInY = 0) {
  const rng = seededRandom(seed);
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const xTrue = i / n; // a ramp from 0 to 1: var = 1/12
    const ex = noiseX * rng.normal();
    x.push(xTrue + ex);
    y.push(2 + 30 * xTrue + sharedInY * ex + noiseY * rng.normal());
  }
  return { x, y };
}

describe("dilution-corrected slope", () => {
  it("recovers the true slope that noise in x flattens", () => {
    // σ = 0.2 on a ramp of variance 1/12: the plain slope is 30 × (1/12)/(1/12 + 0.04) ≈ 20.3
    const { x, y } = series(4000, 11, 0.2, 1);
    const plain = linearRegression(x, y).slope;
    expect(plain).toBeGreaterThan(18.5);
    expect(plain).toBeLessThan(22);
    const c = dilutionCorrectedSlope(x, y, 0, x.length);
    expect(c.slope).toBeGreaterThan(28.5);
    expect(c.slope).toBeLessThan(31.5);
    expect(c.reliability).toBeCloseTo(1 / 12 / (1 / 12 + 0.04), 1); // ≈ 0.68
  });

  it("removes noise that x and y share", () => {
    // y carries +20 × the noise of x: the plain slope is pulled towards 20 from both sides, the corrected one is not
    const { x, y } = series(4000, 5, 0.15, 0.5, 20);
    const c = dilutionCorrectedSlope(x, y, 0, x.length);
    expect(Math.abs(c.slope - 30)).toBeLessThan(1.5);
  });

  it("leaves a noise-free line as it is", () => {
    const x = Array.from({ length: 50 }, (_, i) => i);
    const y = x.map((v) => 3 + 0.5 * v);
    const c = dilutionCorrectedSlope(x, y, 0, 50);
    // the successive differences of a ramp are its trend steps, in x and y alike: both moments lose the same share
    // (reliability 1 − n·(1/2)/Sxx, close to 1) and the slope stays exact
    expect(c.reliability).toBeGreaterThan(0.99);
    expect(c.slope).toBeCloseTo(0.5, 12);
  });

  it("declines when the noise is most of x, or there are too few points", () => {
    const { x, y } = series(500, 3, 1, 1);
    const c = dilutionCorrectedSlope(x, y, 0, x.length);
    expect(c.reliability).toBeLessThan(0.5);
    expect(c.slope).toBeNaN();
    expect(dilutionCorrectedSlope([1, 2], [1, 2], 0, 2).slope).toBeNaN();
    expect(dilutionCorrectedSlope([1, 1, 1], [1, 2, 3], 0, 3).slope).toBeNaN();
  });

  it("works on a sub-range", () => {
    const { x, y } = series(3000, 8, 0.05, 0.5);
    const xs = [100, 100, ...x, -50];
    const ys = [-9, 9, ...y, 7];
    expect(dilutionCorrectedSlope(xs, ys, 2, 2 + x.length).slope).toBeCloseTo(dilutionCorrectedSlope(x, y, 0, x.length).slope, 9);
  });
});

describe("lag-1 autocorrelation of residuals", () => {
  it("reads AR(1) noise about the line at its coefficient", () => {
    const rng = seededRandom(21);
    const x: number[] = [];
    const y: number[] = [];
    let e = 0;
    for (let i = 0; i < 20000; i++) {
      e = 0.6 * e + rng.normal();
      x.push(i);
      y.push(1 + 0.01 * i + e);
    }
    const f = linearRegression(x, y);
    expect(residualLag1(x, y, 0, x.length, f.slope, f.intercept)).toBeCloseTo(0.6, 1);
  });

  it("is −1 for residuals that alternate in sign, NaN without residuals or points", () => {
    const x = [0, 1, 2, 3, 4, 5];
    const y = [1, -1, 1, -1, 1, -1];
    // about the line y = 0: Σ rᵢrᵢ₋₁ = −5, Σ rᵢ² = 6
    expect(residualLag1(x, y, 0, 6, 0, 0)).toBeCloseTo(-5 / 6, 12);
    expect(residualLag1(x, x, 0, 6, 1, 0)).toBeNaN();
    expect(residualLag1(x, y, 0, 2, 0, 0)).toBeNaN();
  });
});
