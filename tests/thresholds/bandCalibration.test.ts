import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { BAND_CALIBRATION, bandScore, calibrateBand, conformalFactor } from "../../lib/thresholds/bandCalibration";

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
          // away from the edge (rounding), membership and score agree
          if (Math.abs(s - factor) > 1e-9) expect(inside).toBe(s <= factor);
        },
      ),
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
