import { describe, it, expect } from "vitest";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest, SYNTHETIC_PRESETS } from "../../lib/synthetic";
import { veVco2Slope } from "../../lib/thresholds/veVco2Slope";

// Synthetic tests (invented data; truth known by construction). The ventilatory-limitation preset has no
// respiratory compensation (VE near MVV, truth.vt2 = null), so its VE/VCO2 slope "below the RCP" is the line over
// the whole ramp, and truth.veVco2SlopeToVt2 is the noise-free OLS from ramp start to ramp end. The normal-adult
// preset has an RCP: without a VT2 the slope must stay not determinable (signs of compensation present).
const preset = (id: string) => {
  const p = SYNTHETIC_PRESETS.find((q) => q.id === id);
  if (!p) throw new Error(`preset ${id} missing`);
  return p.spec;
};

describe("VE/VCO2 slope below the RCP when the test shows no compensation", () => {
  // Goal (from the issue, our project's target, not a published value): slope within ±5 % of truth in ≥ 90 % of
  // tests, i.e. ≥ 18/20. Measured on 20 seeds: low noise 20/20 within ±5 % (worst −3.4 %), moderate 18/20 (worst
  // −6.0 %); the rule fired on all 40.
  // - moderate ≥ 18/20 is the goal itself (equal to the measured count; not loosened);
  // - low ≥ 19/20: our regression bound at the level reached (README-thresholds.md), not a published value, with a
  //   margin of one seed below the measured 20/20 (still above the goal);
  // - every seed within ±8 %: our regression bound at the level reached (README-thresholds.md), not a published
  //   value (worst measured 6.0 %).
  for (const [noise, minWithin] of [
    ["low", 19],
    ["moderate", 18],
  ] as const) {
    it(`no RCP (${noise} noise, 20 seeds): whole-exercise slope reported, ≥ ${minWithin}/20 within ±5 % of truth, labelled`, () => {
      let within = 0;
      for (let seed = 1; seed <= 20; seed++) {
        const syn = generateSyntheticTest({ ...preset("ventilatory-limitation"), noise }, seed);
        expect(syn.truth.vt2).toBeNull();
        const s = veVco2Slope(conditionTable(syn.table), { vt2: null }).slopeToVt2.slope;
        expect(s.value).not.toBeNull();
        const err = Math.abs((s.value as number) / syn.truth.veVco2SlopeToVt2 - 1);
        expect(err).toBeLessThanOrEqual(0.08); // our regression bound (see above), not a published value
        if (err <= 0.05) within++;
        expect(s.provenance.method).toBe("ve-vco2-slope-to-vt2-no-compensation");
        expect(s.provenance.label).toContain("no respiratory compensation");
        expect(s.provenance.sourceIds).toContain("common-practice");
      }
      expect(within).toBeGreaterThanOrEqual(minWithin);
    });
  }

  it("with an RCP in the data and no VT2 given: the slope below the break a two-line fit finds, labelled and flagged", () => {
    // measured on 20 seeds each (normal-adult preset, true RCP at 802 s): low noise errors −1.7 to +1.2 %, breaks
    // 791–821 s; moderate −3.9 to +2.8 %, breaks 777–867 s. Bounds: the ±5 % goal of the issue for every seed, and the
    // break within 90 s of the true RCP (our regression bound at the level reached, not a published value)
    for (const noise of ["low", "moderate"] as const)
      for (let seed = 1; seed <= 20; seed++) {
        const syn = generateSyntheticTest({ ...preset("normal-adult"), noise }, seed);
        const r = veVco2Slope(conditionTable(syn.table), { vt2: null });
        const s = r.slopeToVt2.slope;
        expect(Math.abs((s.value as number) / syn.truth.veVco2SlopeToVt2 - 1)).toBeLessThanOrEqual(0.05);
        expect(s.provenance.method).toBe("ve-vco2-slope-below-fitted-break");
        expect(s.provenance.label).toContain("because VT2 was not determinable");
        expect(Math.abs((s.provenance.inputs?.cornerS as number) - syn.truth.vt2!.timeS)).toBeLessThanOrEqual(90);
        expect(r.issues.some((i) => i.code === "ve-vco2-slope-below-fitted-break")).toBe(true);
      }
  });

  it("with an RCP in the data, no VT2 and the fitted break switched off, stays not determinable and says why", () => {
    for (const seed of [1, 2, 3]) {
      const syn = generateSyntheticTest({ ...preset("normal-adult"), noise: "moderate" }, seed);
      expect(syn.truth.vt2).not.toBeNull();
      const s = veVco2Slope(conditionTable(syn.table), { vt2: null, fittedBreakWhenNoVt2: false }).slopeToVt2.slope;
      expect(s.value).toBeNull();
      expect(s.reason).toContain("signs of compensation");
    }
  });

  it("can be switched off", () => {
    const syn = generateSyntheticTest({ ...preset("ventilatory-limitation"), noise: "low" }, 1);
    const s = veVco2Slope(conditionTable(syn.table), { vt2: null, wholeExerciseWhenNoCompensation: false }).slopeToVt2.slope;
    expect(s.value).toBeNull();
  });
});
