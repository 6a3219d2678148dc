import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { syntheticRecord } from "./syntheticRecord";
import { vo2PlateauPresent } from "../../lib/thresholds";

// Invented synthetic tests (main model, no noise) built with and without a VO2 plateau at the end of the ramp.
function resultFor(plateau: boolean) {
  const { record } = syntheticRecord({ noise: "none", plateau }, 3);
  return analyse(record, { bootstrap: 0 });
}

describe("one VO2-plateau determination for the effort set and the interpretation", () => {
  for (const plateau of [true, false]) {
    it(`built ${plateau ? "with" : "without"} a plateau: the interpretation reads the same plateau as the effort criteria`, () => {
      const r = resultFor(plateau);
      const own = vo2PlateauPresent(r.indices.vo2FinalIncrease);
      expect(r.interpretInput.values.vo2Plateau).toBe(own);
      // by construction the plateau test levels off and the other keeps rising at 10.3 mL/min/W
      if (plateau) expect(own).toBe(true);
      else expect(own).not.toBe(true);
    });
  }
});

describe("a value the engine could not give carries its reason into the interpretation", () => {
  it("no spirometry: VE/MVV is 'not available (no spirometry …)' in the effort line; the plateau reason only when it is null", () => {
    const r = resultFor(true);
    // the record has no MVV and no FEV1, so the breathing reserve has no denominator
    expect(r.interpretInput.values.veMvvPct).toBeNull();
    expect(r.interpretInput.reasons?.veMvvPct).toMatch(/spirometry/);
    expect(r.interpretation.effort.text).toMatch(/VE\/MVV \(%\) not available \([^)]*spirometry/);
    // noise-free plateau built in: assessed (true), so no plateau reason
    expect(r.interpretInput.values.vo2Plateau).toBe(true);
    expect(r.interpretInput.reasons?.vo2Plateau).toBeUndefined();
  });
});
