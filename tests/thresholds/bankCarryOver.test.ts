import { describe, expect, it } from "vitest";
import { runThresholdBank, type BankStats } from "../../scripts/threshold-bank";

// Thresholds on breath noise like the real ACTES recordings (Chabert et al. 2022, PhysioNet, ODC-By 1.0): their
// late-ramp VO2 spread (2.0–7.2 %, median 4.2 %) is that of the models' "low" level, and their residuals carry over
// from breath to breath (lag-1 correlation 0.43–0.67; tests/synthetic/noiseRealism.test.ts). The main model's tests
// (invented data, thresholds known by construction) at low noise re-coloured to lag-1 correlation 0.5 (`recolourNoise`),
// 120 tests, 20 resamples. Measured: VT1 3.18 / 8.95 % (median / P90), no no-calls; VT2 2.92 %; VE/VCO2 slope to the RCP
// within ±5 % in 85.8 %; the same tests without re-colouring 2.26 / 6.19 %, 2.27 %, 95.0 % (README-thresholds.md round 19).
// The goals are the (our project's targets, not published values); the slope guard is at the level reached.
const stats = runThresholdBank({ size: 120, seed: 2024, bootstrap: 20, noiseLevels: ["low"], noiseRho: 0.5 }).stats;
const stat = (s: BankStats[], method: string) => s.find((x) => x.method === method && x.noise === "low")!;

describe("thresholds on breath noise that carries over, at the real recordings' spread (main model, 120 tests)", () => {
  it("meets the VT1 goals (median ≤ 4 %, P90 ≤ 10 %, no-calls ≤ 5 %) and the VT2 median goal (≤ 5 %)", () => {
    const vt1 = stat(stats, "vt1-consensus");
    expect(vt1.n).toBe(120);
    expect(vt1.medianPct).toBeLessThanOrEqual(4);
    expect(vt1.p90Pct).toBeLessThanOrEqual(10);
    expect(vt1.noCallPct).toBeLessThanOrEqual(5);
    expect(stat(stats, "vt2-consensus").medianPct).toBeLessThanOrEqual(5);
  });

  it("keeps the VE/VCO2 slope to the RCP within ±5 % of truth in at least 80 % (level reached: 85.8 %)", () => {
    expect(stat(stats, "ve-vco2-slope-to-vt2").within5Pct).toBeGreaterThanOrEqual(80);
  });
});
