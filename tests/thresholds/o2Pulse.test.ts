import { describe, it, expect } from "vitest";
import { o2Pulse } from "../../lib/thresholds/o2Pulse";
import { buildRows, EX_START_S, freezeTest, makeTest } from "./indicesFixture";

// Invented: HR fixed at 100 bpm, VO2 = 100·pulse(t), so each 30-s bin's O2 pulse is the bin mean of pulse(t).
function withPulse(pulse: (t: number) => number) {
  return makeTest(
    buildRows((t, phase) => (phase === "exercise" ? { hrBpm: 100, vo2MlMin: 100 * pulse(t) } : { hrBpm: 70, vo2MlMin: 400 })),
  );
}
const rising = (t: number) => 8 + 0.01 * (t - EX_START_S);

describe("O2 pulse trajectory and final-third flag", () => {
  it("linear rise: 20 bins, slope 0.6 mL/beat/min in both parts → rising", () => {
    const r = o2Pulse(freezeTest(withPulse(rising)));
    expect(r.trajectory).toHaveLength(20);
    // first bin [180, 210): breaths 180..207, mean t = 193.5 → 8 + 0.135 = 8.135; centre 195
    expect(r.trajectory[0].timeS).toBe(195);
    expect(r.trajectory[0].o2PulseMlBeat).toBeCloseTo(8.135, 9);
    // 0.01 mL/beat per s = 0.6 per min
    expect(r.finalSlope.value).toBeCloseTo(0.6, 9);
    expect(r.earlierSlope.value).toBeCloseTo(0.6, 9);
    expect(r.pattern).toBe("rising");
  });

  it("plateau from 540 s → flat", () => {
    const r = o2Pulse(withPulse((t) => rising(Math.min(t, 540))));
    // final third starts at 780 − 200 = 580 s; bins centred 585..765 are all at the plateau
    expect(Math.abs(r.finalSlope.value!)).toBeLessThan(1e-9);
    expect(r.pattern).toBe("flat");
  });

  it("fall from 540 s → falling", () => {
    const r = o2Pulse(withPulse((t) => (t <= 540 ? rising(t) : rising(540) - 0.01 * (t - 540))));
    expect(r.finalSlope.value).toBeCloseTo(-0.6, 9);
    expect(r.pattern).toBe("falling");
  });

  it("no HR → not determinable, with an issue", () => {
    const r = o2Pulse(makeTest(buildRows(() => ({ vo2MlMin: 1000 }))));
    expect(r.pattern).toBeNull();
    expect(r.finalSlope.value).toBeNull();
    expect(r.issues.map((i) => i.code)).toContain("no-o2-pulse");
  });
});
