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

  it("takes noise that neighbouring points share (lag 2 by default); differences of neighbours miss half of it", () => {
    // MA(1) noise in x, e_i = u_i + u_{i−1}: variance 2σᵤ², neighbours share σᵤ². Half the mean square difference of
    // neighbours is σᵤ² (half the noise), of points two apart 2σᵤ² (all of it).
    const rng = seededRandom(29);
    const n = 6000;
    const x: number[] = [];
    const y: number[] = [];
    let prev = 0.12 * rng.normal();
    for (let i = 0; i < n; i++) {
      const u = 0.12 * rng.normal();
      const xTrue = i / n;
      x.push(xTrue + u + prev);
      y.push(2 + 30 * xTrue + 0.5 * rng.normal());
      prev = u;
    }
    // var(x_true) = 1/12, noise 2 × 0.0144 = 0.0288: plain slope 30 × 0.0833/0.1121 ≈ 22.3
    expect(linearRegression(x, y).slope).toBeLessThan(23.5);
    const lag2 = dilutionCorrectedSlope(x, y, 0, n);
    expect(Math.abs(lag2.slope - 30)).toBeLessThan(1.2);
    const lag1 = dilutionCorrectedSlope(x, y, 0, n, 0.5, 1);
    expect(lag1.slope).toBeLessThan(27.5); // ≈ 30 × 0.0833/(0.0833 + 0.0144) ≈ 25.6: under-corrected
  });

  it("leaves a noise-free line as it is", () => {
    const x = Array.from({ length: 50 }, (_, i) => i);
    const y = x.map((v) => 3 + 0.5 * v);
    const c = dilutionCorrectedSlope(x, y, 0, 50);
    // the differences of a ramp are its trend steps, in x and y alike: both moments lose the same share (reliability
    // 1 − n·(2²/2)/Sxx at lag 2, close to 1) and the slope stays exact
    expect(c.reliability).toBeGreaterThan(0.98);
    expect(c.slope).toBeCloseTo(0.5, 12);
  });

  it("declines when the noise is most of x, or there are too few points", () => {
    const { x, y } = series(500, 3, 1, 1);
    const c = dilutionCorrectedSlope(x, y, 0, x.length);
    expect(c.reliability).toBeLessThan(0.5);
    expect(c.slope).toBeNaN();
    expect(dilutionCorrectedSlope([1, 2, 3], [1, 2, 3], 0, 3).slope).toBeNaN(); // lag 2 needs 4 points
    expect(dilutionCorrectedSlope([1, 1, 1, 1], [1, 2, 3, 4], 0, 4).slope).toBeNaN();
    expect(() => dilutionCorrectedSlope([1, 2, 3, 4], [1, 2, 3, 4], 0, 4, 0.5, 0)).toThrow();
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
