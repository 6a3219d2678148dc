import { describe, it, expect } from "vitest";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest } from "../../lib/synthetic";
import { veVco2Slope } from "../../lib/thresholds/veVco2Slope";

// Synthetic data (invented; truth known by construction): a low-fitness test (narrow VCO2 range) at moderate breath
// noise. Breath noise in VCO2, the regressor, flattens a breath-by-breath OLS slope (regression dilution); the
// default 20-s bin means should land closer to the noise-free slope to the true RCP, on average over seeds.
describe("VE/VCO2 slope to VT2 on 20-s bin means", () => {
  const spec = { noise: "moderate" as const, peakVo2MlMin: 1300, vo2RestMlMin: 250, vo2UnloadedMlMin: 420, rampWPerMin: 10 };
  const seeds = [1, 2, 3, 4, 5, 6, 7, 8];
  const runs = seeds.map((seed) => {
    const syn = generateSyntheticTest(spec, seed);
    const test = conditionTable(syn.table);
    const vt2 = { timeS: syn.truth.vt2!.timeS, vo2MlMin: syn.truth.vt2!.vo2MlMin };
    const truth = syn.truth.veVco2SlopeToVt2;
    const binned = veVco2Slope(test, { vt2 }).slopeToVt2;
    const breath = veVco2Slope(test, { vt2, toVt2BinS: 0 }).slopeToVt2;
    const span = test.exercise!;
    const times = test.clean
      .filter((b) => b.timeS >= span.startS && b.timeS <= span.endS && Number.isFinite(b.veLMin) && Number.isFinite(b.vco2MlMin))
      .map((b) => b.timeS);
    return { truth, binned, breath, vt2S: vt2.timeS, times };
  });

  it("is less biased than breath-by-breath OLS (mean signed error closer to 0, breath OLS flattened)", () => {
    const meanErr = (k: "binned" | "breath") =>
      runs.reduce((s, r) => s + ((r[k].slope.value as number) - r.truth) / r.truth, 0) / runs.length;
    expect(meanErr("breath")).toBeLessThan(0);
    expect(Math.abs(meanErr("binned"))).toBeLessThan(Math.abs(meanErr("breath")));
  });

  it("keeps the breath count as n and says how it averaged", () => {
    for (const r of runs) {
      // n = breaths up to the refined corner of the two-line fit (searched within ±30 s of VT2)
      const corner = r.binned.slope.provenance.inputs?.cornerS as number;
      expect(Math.abs(corner - r.vt2S)).toBeLessThanOrEqual(30);
      expect(r.binned.n).toBe(r.times.filter((t) => t <= corner).length);
      expect(r.binned.slope.provenance.averaging).toMatch(/20-s time-bin means/);
      expect(r.binned.slope.provenance.sourceIds).toContain("robergs-2010");
    }
  });
});
