import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  BAND_CALIBRATION,
  bandScore,
  calibrateBand,
  conformalFactor,
  autocorrelatedSlopeScale,
  bandFromScale,
  indexBand,
  MAX_RESIDUAL_LAG1,
  slopeBand,
  slopeRelativeScale,
} from "../../lib/thresholds/bandCalibration";

// Answers known by construction (the arithmetic of a locally scaled split-conformal band, Lei et al. 2018, J Am Stat
// Assoc — confirmed abstract); the values below are invented.
describe("calibrated threshold band", () => {
  it("widens each side about the value, from at least the floor", () => {
    // value 1000, raw 950–1100, factor 1.5, floor 10 %: below max(50, 100) = 100 → 150; above max(100, 100) = 100 → 150
    expect(calibrateBand({ lowMlMin: 950, highMlMin: 1100 }, 1000, { factor: 1.5, floorFraction: 0.1 })).toEqual({
      lowMlMin: 850,
      highMlMin: 1150,
    });
    // floor 0: the sides keep their own lengths, ×2
    expect(calibrateBand({ lowMlMin: 950, highMlMin: 1100 }, 1000, { factor: 2, floorFraction: 0 })).toEqual({
      lowMlMin: 900,
      highMlMin: 1200,
    });
  });

  it("takes the ⌈(n + 1)·coverage⌉-th smallest score as the factor", () => {
    const scores = [10, 1, 9, 2, 8, 3, 7, 4, 6, 5]; // n = 10 → rank ⌈11 × 0.8⌉ = 9
    expect(conformalFactor(scores, 0.8)).toBe(9);
    expect(conformalFactor([1, 2, 3], 0.8)).toBe(Infinity); // rank ⌈4 × 0.8⌉ = 4 > 3: too few scores
  });

  it("scores the truth so that the calibrated band holds it exactly when score ≤ factor", () => {
    // the case a random run found: zero-width raw band, floor 0, truth one rounding step below the value
    const raw0 = { lowMlMin: 500, highMlMin: 500 };
    const truth0 = 500 * (1 - 5.551115123125784e-17);
    const b0 = calibrateBand(raw0, 500, { factor: 0.5120000010000001, floorFraction: 0 });
    expect(b0.lowMlMin <= truth0 && truth0 <= b0.highMlMin).toBe(bandScore(raw0, 500, truth0, 0) <= 0.5120000010000001);
    fc.assert(
      fc.property(
        fc.double({ min: 500, max: 4000, noNaN: true }),
        fc.double({ min: 0, max: 0.3, noNaN: true }),
        fc.double({ min: 0, max: 0.3, noNaN: true }),
        fc.double({ min: -0.4, max: 0.4, noNaN: true }),
        fc.double({ min: 0.5, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 0.1, noNaN: true }),
        (v, lo, hi, off, factor, floorFraction) => {
          const raw = { lowMlMin: v * (1 - lo), highMlMin: v * (1 + hi) };
          const truth = v * (1 + off);
          const b = calibrateBand(raw, v, { factor, floorFraction });
          const s = bandScore(raw, v, truth, floorFraction);
          const inside = b.lowMlMin <= truth && truth <= b.highMlMin;
          // away from the band's edges (rounding steps of the value), membership and score agree
          const nearEdge = Math.min(Math.abs(truth - b.lowMlMin), Math.abs(truth - b.highMlMin)) <= 1e-9 * v;
          if (!nearEdge) expect(inside).toBe(s <= factor);
        },
      ),
      // seeded so every run checks the same cases (a raw band of zero width at floor 0 once split the two; both now
      // take the same least side length)
      { seed: 7, numRuns: 500 },
    );
  });

  it("only ever widens: the calibrated band holds the raw band", () => {
    for (const which of ["vt1", "vt2"] as const) {
      const k = BAND_CALIBRATION[which];
      expect(k.factor).toBeGreaterThanOrEqual(1);
      const b = calibrateBand({ lowMlMin: 1400, highMlMin: 1550 }, 1500, k);
      expect(b.lowMlMin).toBeLessThanOrEqual(1400);
      expect(b.highMlMin).toBeGreaterThanOrEqual(1550);
    }
  });
});

describe("slope band", () => {
  // The relative standard error from r² and n equals the textbook OLS standard error of the slope divided by the slope,
  // SE(b) = √(SSE/(n − 2) / Sxx), computed here directly on invented points (answer known by construction).
  it("matches the OLS standard error of the slope computed from the residuals", () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    const y = x.map((v, i) => 4 + 30 * v + [0.5, -1.2, 0.8, 0.1, -0.6, 1.4, -0.9, 0.3, -0.2, 0.7][i]);
    const n = x.length;
    const mx = x.reduce((a, b) => a + b, 0) / n;
    const my = y.reduce((a, b) => a + b, 0) / n;
    const sxx = x.reduce((a, v) => a + (v - mx) ** 2, 0);
    const sxy = x.reduce((a, v, i) => a + (v - mx) * (y[i] - my), 0);
    const syy = y.reduce((a, v) => a + (v - my) ** 2, 0);
    const b = sxy / sxx;
    const a0 = my - b * mx;
    const sse = y.reduce((acc, v, i) => acc + (v - a0 - b * x[i]) ** 2, 0);
    const se = Math.sqrt(sse / (n - 2) / sxx);
    const r2 = (sxy * sxy) / (sxx * syy);
    expect(slopeRelativeScale(r2, n)).toBeCloseTo(se / b, 12);
  });

  it("is symmetric about the slope, widens with the scale, and is absent when it cannot be formed", () => {
    const band = slopeBand(30, 0.99, 27, 2)!;
    const scale = Math.sqrt(0.01 / (0.99 * 25));
    expect(band.low).toBeCloseTo(30 * (1 - 2 * scale), 12);
    expect(band.high).toBeCloseTo(30 * (1 + 2 * scale), 12);
    expect(slopeBand(30, 0.9, 27, 2)!.high).toBeGreaterThan(band.high); // looser fit, wider band
    expect(slopeBand(30, 1, 27)).toBeNull(); // a perfect line has no scale
    expect(slopeBand(30, 0.99, 2)).toBeNull();
    expect(slopeBand(30, null, 27)).toBeNull();
  });
});

// The effective number of independent points of a serially correlated series, n·(1 − ρ)/(1 + ρ) (Santer et al. 2008, Int J
// Climatol — secondary; formula recalled): the standard error grows by √((1 + ρ)/(1 − ρ)). Arithmetic by construction.
describe("slope scale with serially correlated residuals", () => {
  it("is the plain scale at ρ ≤ 0, twice it at ρ = 0.6, and stops growing at the clamp", () => {
    const plain = slopeRelativeScale(0.98, 300)!;
    expect(autocorrelatedSlopeScale(0.98, 300, 0)).toBeCloseTo(plain, 15);
    expect(autocorrelatedSlopeScale(0.98, 300, -0.4)).toBeCloseTo(plain, 15);
    expect(autocorrelatedSlopeScale(0.98, 300, 0.6)).toBeCloseTo(2 * plain, 12); // √(1.6/0.4) = 2
    const top = Math.sqrt((1 + MAX_RESIDUAL_LAG1) / (1 - MAX_RESIDUAL_LAG1));
    expect(autocorrelatedSlopeScale(0.98, 300, 0.999)).toBeCloseTo(top * plain, 12);
    expect(autocorrelatedSlopeScale(0.98, 300, null)).toBeCloseTo(plain, 15);
    expect(autocorrelatedSlopeScale(1, 300, 0.5)).toBeNull();
  });

  it("gives a band low ≤ high for either sign of the value, none without a scale", () => {
    expect(bandFromScale(10, 0.1, 2)).toEqual({ low: 8, high: 12 });
    expect(bandFromScale(-10, 0.1, 2)).toEqual({ low: -12, high: -8 });
    expect(bandFromScale(10, null, 2)).toBeNull();
    expect(bandFromScale(NaN, 0.1, 2)).toBeNull();
  });

  it("centres an index band on its centre and stretches it to hold the reported value", () => {
    expect(indexBand(42, 41, 0.05, 1)).toEqual({ low: 39.9, high: 44.1 }); // 42 × (1 ± 0.05), holds 41 already
    expect(indexBand(44, 40, 0.02, 1)).toEqual({ low: 40, high: 44.88 }); // 44 × 0.98 = 43.12 > 40: stretched down
    expect(indexBand(44, 40, null, 1)).toBeNull();
  });
});
