import { describe, it, expect } from "vitest";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest, SYNTHETIC_PRESETS } from "../../lib/synthetic";
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
      // peak-to-nadir of the sine = 12 L/min; the default 20-s average is a 21-point 1-s moving average, which keeps
      // sin(π·21/60)/(21·sin(π/60)) = 0.8910/1.0991 = 0.8107 of it, linear interpolation of 3-s breaths
      // keeps ≈ 0.99 → ≈ 9.6 L/min
      expect(c.amplitudeLMin).toBeGreaterThan(9.3);
      expect(c.amplitudeLMin).toBeLessThan(10.1);
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

// Known by construction (invented data, generateSyntheticTest): the heart-failure preset carries a 60-s oscillation of
// ±20 % of VE; the same preset without it, and the normal-adult preset, carry none. Breath noise at the moderate level
// (8 % shared breath-size factor, 5 % VE) made "cycles" of its own: before the noise-scaled hysteresis and the 30-140 s
// cycle range, either rule called EOV in 20-32 % of tests without it (README-thresholds.md, round 12).
describe("exercise oscillatory ventilation under breath noise (synthetic, moderate noise)", () => {
  const hf = SYNTHETIC_PRESETS.find((p) => p.id === "heart-failure")!.spec;
  const normal = SYNTHETIC_PRESETS.find((p) => p.id === "normal-adult")!.spec;
  const calls = (spec: typeof hf, seeds: number[]) =>
    seeds.map((seed) => eov(conditionTable(generateSyntheticTest({ ...spec, noise: "moderate" }, seed).table)).definitions);
  const seeds = Array.from({ length: 12 }, (_, i) => 100 + i);

  it("finds the oscillation that is there: both rules in at least 10 of 12 heart-failure tests", () => {
    const defs = calls(hf, seeds);
    expect(hf.eov).not.toBeNull();
    expect(defs.filter((d) => d[0].detected === true).length).toBeGreaterThanOrEqual(10);
    expect(defs.filter((d) => d[1].detected === true).length).toBeGreaterThanOrEqual(10);
  });

  it("does not make one out of noise: at most 1 of 24 tests without an oscillation is called EOV by either rule", () => {
    const defs = [...calls({ ...hf, eov: null }, seeds), ...calls(normal, seeds)];
    expect(normal.eov ?? null).toBeNull();
    expect(defs.filter((d) => d[0].detected === true || d[1].detected === true).length).toBeLessThanOrEqual(1);
  });

  it("names the noise rule and the cycle range in the provenance of each rule", () => {
    const [leite, corra] = calls(hf, [100])[0];
    for (const d of [leite, corra]) {
      expect(d.detail.provenance.averaging).toMatch(/3 SD of the breath noise/);
      expect(d.detail.provenance.averaging).toMatch(/cycles of 30-140 s/);
      expect(d.sourceIds).toContain("eov-cycle-range");
    }
  });
});
