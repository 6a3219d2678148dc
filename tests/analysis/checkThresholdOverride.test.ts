import { describe, expect, it } from "vitest";
import { analyse, checkThresholdOverride } from "../../lib/analysis";
import { syntheticRecord } from "./syntheticRecord";

// Synthetic test known by construction (main model, default invented healthy adult, no noise): VT1 at 55 % and VT2 at
// 82 % of its 2600 mL/min peak (DEFAULT_SYNTHETIC_SPEC), so the thresholds and the exercise span are known.
const { record, syn } = syntheticRecord({ noise: "none" }, 7);
const result = analyse(record, { bootstrap: 0 });
const codes = (o: Parameters<typeof checkThresholdOverride>[1]) => checkThresholdOverride(result, o).map((i) => i.code);

describe("checkThresholdOverride (reviewer overrides are checked before they are saved)", () => {
  const vt1 = syn.truth.vt1.vo2MlMin;
  const vt2 = syn.truth.vt2!.vo2MlMin;
  const { rampEndS, warmupEndS } = syn.truth.phases;

  it("accepts a VT1 between the start of the ramp and VT2, by VO2 or by time", () => {
    expect(codes({ which: "vt1", vo2MlMin: vt1 * 1.05 })).toEqual([]);
    expect(codes({ which: "vt1", timeS: syn.truth.vt1.timeS })).toEqual([]);
  });

  it("refuses a VT1 above peak VO2, and says VT1 must lie below VT2", () => {
    const c = codes({ which: "vt1", vo2MlMin: 3500 }); // peak 2600 by construction
    expect(c).toContain("override-above-peak");
    expect(c).toContain("override-order");
    const msg = checkThresholdOverride(result, { which: "vt1", vo2MlMin: 3500 })
      .map((i) => i.message)
      .join(" ");
    expect(msg).toMatch(/above this test's peak VO2/);
    expect(msg).toMatch(/If VT2 is wrong, set VT2 first/);
  });

  it("refuses a VT2 at or below VT1 and a time outside the incremental exercise", () => {
    expect(codes({ which: "vt2", vo2MlMin: vt1 * 0.95 })).toEqual(["override-order"]);
    expect(codes({ which: "vt1", timeS: warmupEndS - 60 })).toEqual(["override-outside-exercise"]);
    expect(codes({ which: "vt2", timeS: rampEndS + 60 })).toEqual(["override-outside-exercise"]);
    expect(codes({ which: "vt2", vo2MlMin: vt2 })).toEqual([]);
  });

  it("refuses a VO2 below the VO2 at the start of the ramp (never reached during the incremental exercise)", () => {
    // unloaded pedalling VO2 600 mL/min by construction
    expect(codes({ which: "vt1", vo2MlMin: 300 })).toEqual(["override-not-reached"]);
  });
});
