import { describe, it, expect } from "vitest";
import { generateVariantTest, variantSpec } from "../../lib/synthetic";

// The variant synthetic model (invented data): checks of its CO2 washout above VT2, which exists so that the
// threshold methods are measured on a model where hyperventilation above the RCP releases CO2 from the stores (the
// reason Beaver et al. 1986, confirmed, stop the V-slope at the RCP).
describe("variant model: CO2 washout above VT2", () => {
  const cases = [1, 4, 7, 10].map((i) => {
    const spec = { ...variantSpec(i, 2024, ["moderate"]), co2WashoutMlPerMmHg: 20 };
    return {
      spec,
      withWashout: generateVariantTest(spec, 5000 + i),
      without: generateVariantTest({ ...spec, co2WashoutMlPerMmHg: 0 }, 5000 + i),
    };
  });

  it("is deterministic for a spec and seed", () => {
    const { spec, withWashout } = cases[0];
    expect(generateVariantTest(spec, 5001).table.rows).toEqual(withWashout.table.rows);
  });

  it("leaves everything below VT1 unchanged and adds CO2 only once ventilation outpaces VCO2", () => {
    for (const { withWashout, without } of cases) {
      const vt1S = withWashout.truth.vt1.timeS;
      const vt2S = withWashout.truth.vt2!.timeS;
      let maxBelowVt1 = 0;
      let maxAboveVt2 = 0;
      withWashout.noiseFree.rows.forEach((r, k) => {
        const extra = r.vco2MlMin! - without.noiseFree.rows[k].vco2MlMin!;
        expect(extra).toBeGreaterThanOrEqual(0);
        if (r.timeS < vt1S) maxBelowVt1 = Math.max(maxBelowVt1, extra);
        if (r.timeS > vt2S && r.timeS <= withWashout.truth.phases.rampEndS) maxAboveVt2 = Math.max(maxAboveVt2, extra);
      });
      expect(maxBelowVt1).toBeLessThan(0.5);
      expect(maxAboveVt2).toBeGreaterThan(1);
      // an invented magnitude of the order of tens of mL/min (20 mL per mmHg of PCO2 fall)
      expect(maxAboveVt2).toBeLessThan(300);
      // the truth does not move: VT1 and VT2 are defined from the metabolic crossings
      expect(withWashout.truth.vt1.timeS).toBe(without.truth.vt1.timeS);
      expect(withWashout.truth.vt2!.timeS).toBe(without.truth.vt2!.timeS);
    }
  });

  it("a spec without the field behaves as no washout", () => {
    const { spec, without } = cases[1];
    const { co2WashoutMlPerMmHg: _drop, ...rest } = spec;
    void _drop;
    expect(generateVariantTest(rest, 5004).noiseFree.rows).toEqual(without.noiseFree.rows);
  });
});

// The load column is the ergometer's command: it leads VO2. (It was once derived from the lagging metabolic VO2, which
// made it negative and late at the start of the ramp; files without phase markers then started the ramp too late.)
describe("variant model: load column", () => {
  for (const i of [0, 2, 3, 4, 8]) {
    it(`case ${i}: never negative, 0 W before the ramp, rising from its first breath and ending at peak work`, () => {
      const spec = variantSpec(i, 2024, ["moderate"]);
      const syn = generateVariantTest(spec, 5000 + i);
      const rows = syn.noiseFree.rows;
      const loads = rows.map((r) => r.workW!);
      expect(Math.min(...loads)).toBeGreaterThanOrEqual(0);
      const ex = rows.filter((r) => r.phase === "exercise");
      for (const r of rows) if (r.phase === "rest" || r.phase === "warmup") expect(r.workW).toBe(0);
      // peak work = (peak − unloaded VO2) / 10 mL/min/W, the model's own gain (invented), whole watts
      const peakW = Math.floor((spec.peakVo2MlMin - spec.vo2UnloadedMlMin) / 10);
      // (1-min steps: the last step starts one step below, at (k − 1)/k of the span for k steps)
      const topW = spec.protocol === "steps" ? peakW * (1 - 60 / spec.rampS) : peakW;
      expect(Math.max(...ex.map((r) => r.workW!))).toBeGreaterThanOrEqual(topW - 1);
      // non-decreasing through the ramp
      for (let k = 1; k < ex.length; k++) expect(ex[k].workW!).toBeGreaterThanOrEqual(ex[k - 1].workW!);
      // for a ramp, 2 W is reached within 2 W / rate of the first exercise breath (plus one breath)
      if (spec.protocol === "ramp") {
        const rate = syn.truth.rampWPerMin / 60;
        const first2W = ex.find((r) => r.workW! >= 2)!;
        expect(first2W.timeS - ex[0].timeS).toBeLessThanOrEqual(2 / rate + 8);
      }
    });
  }
});
