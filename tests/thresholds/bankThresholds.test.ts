import { describe, it, expect } from "vitest";
import { runThresholdBank } from "../../scripts/threshold-bank";

// Accuracy bank on synthetic tests (invented data, thresholds known by construction), 20-s bins, no resampling.
// Size: BANK_SIZE env (default 240: about 2 s on a 2-core machine).
const size = Number(process.env.BANK_SIZE ?? 240);
const { stats } = runThresholdBank({ size });
const stat = (method: string, noise: string) => stats.find((s) => s.method === method && s.noise === noise)!;

describe(`threshold accuracy bank (${size} synthetic tests)`, () => {
  it("has a meaningful bank", () => {
    expect(size).toBeGreaterThanOrEqual(200);
    expect(stat("vt1-consensus", "moderate").n).toBeGreaterThanOrEqual(Math.floor(size / 3));
  });

  it("meets the issue goal for VT2 at moderate noise: median absolute error ≤ 5 % of true VO2", () => {
    expect(stat("vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5);
    expect(stat("vt2-consensus", "low").medianPct).toBeLessThanOrEqual(5);
  });

  it("meets the VT1 median goal (≤ 4 %) at low noise", () => {
    expect(stat("vt1-consensus", "low").medianPct).toBeLessThanOrEqual(4);
  });

  // The VT1 goals at moderate noise (median ≤ 4 %, P90 ≤ 10 %, no-calls ≤ 5 %) are NOT met yet
  // (measured: median 6.4 %, P90 19.2 %, no-calls 11.3 % on this bank). These bounds guard the present
  // level against regression; tighten them to the goals when the methods improve.
  it("keeps VT1 at moderate noise at or better than the present level (goal not yet met)", () => {
    const s = stat("vt1-consensus", "moderate");
    expect(s.medianPct).toBeLessThanOrEqual(7);
    expect(s.p90Pct).toBeLessThanOrEqual(21);
    expect(s.noCallPct).toBeLessThanOrEqual(13);
  });

  it("the consensus is no worse than the typical single VT1 method at moderate noise", () => {
    const single = ["vt1-v-slope", "vt1-modified-v-slope", "vt1-ventilatory-equivalents"]
      .map((m) => stat(m, "moderate").medianPct)
      .sort((a, b) => a - b);
    expect(stat("vt1-consensus", "moderate").medianPct).toBeLessThanOrEqual(single[1]);
  });
});
