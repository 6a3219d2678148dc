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
