import { describe, it, expect } from "vitest";
import { eov } from "../../lib/thresholds/eov";
import { buildRows, EX_START_S, freezeTest, makeTest } from "./indicesFixture";

// Invented: resting VE 12 L/min; exercise VE = 20 + 0.05·(t − 180) + A·sin(2π(t − 180)/60), breaths every 3 s.
function oscillating(amplitude: number) {
  return makeTest(
    buildRows((t, phase) => ({
      veLMin:
        phase === "exercise" ? 20 + 0.05 * (t - EX_START_S) + amplitude * Math.sin((2 * Math.PI * (t - EX_START_S)) / 60) : 12,
    })),
  );
}

describe("exercise oscillatory ventilation", () => {
  it("a 60-s oscillation of ±6 L/min is found by both rules, with measured cycle lengths and amplitudes", () => {
    const r = eov(freezeTest(oscillating(6)));
    expect(r.restingVeLMin.value).toBeCloseTo(12, 9);
    expect(r.cycles.length).toBeGreaterThanOrEqual(8);
    for (const c of r.cycles) {
      expect(c.lengthS).toBeGreaterThan(57);
      expect(c.lengthS).toBeLessThan(63);
      // peak-to-nadir of the sine = 12 L/min; a 15-point 1-s moving average keeps
      // sin(π·15/60)/(15·sin(π/60)) = 0.7071/0.7850 = 0.9007 of it, linear interpolation of 3-s breaths
      // keeps ≈ 0.99 → ≈ 10.7 L/min
      expect(c.amplitudeLMin).toBeGreaterThan(10.3);
      expect(c.amplitudeLMin).toBeLessThan(11.2);
    }
    const [leite, corra] = r.definitions;
    expect(leite.id).toBe("leite-2003");
    expect(leite.detected).toBe(true);
    expect(leite.cycles).toHaveLength(3);
    expect(corra.id).toBe("corra-aha");
    expect(corra.detected).toBe(true);
    // oscillation spans most of the 600-s exercise
    expect(corra.detail.value).toBeGreaterThan(0.8);
  });

  it("±2 L/min: Corrà/AHA (≥ 15% of resting 12 = 1.8 L/min) yes, Leite (mean amplitude > 5 L/min) no", () => {
    const r = eov(oscillating(2));
    expect(r.definitions[0].detected).toBe(false);
    expect(r.definitions[1].detected).toBe(true);
  });

  it("no oscillation → no cycles, neither rule", () => {
    const r = eov(oscillating(0));
    expect(r.cycles).toHaveLength(0);
    expect(r.definitions.map((d) => d.detected)).toEqual([false, false]);
  });

  it("persistence below 60% of exercise is not EOV by the Corrà/AHA rule", () => {
    // oscillation only in the first 240 s of the 600-s exercise (≤ 40%)
    const t = makeTest(
      buildRows((s, phase) => ({
        veLMin: phase === "exercise" ? 20 + (s - EX_START_S < 240 ? 6 * Math.sin((2 * Math.PI * (s - EX_START_S)) / 60) : 0) : 12,
      })),
    );
    const r = eov(t);
    expect(r.definitions[1].detected).toBe(false);
    expect(r.definitions[1].detail.value).toBeLessThan(0.6);
  });

  it("without a rest phase the Corrà/AHA rule is not assessable", () => {
    const t = { ...oscillating(6), phases: [] };
    const r = eov(t);
    expect(r.definitions[1].detected).toBeNull();
    expect(r.definitions[0].detected).toBe(true);
  });
});
