import { describe, expect, it } from "vitest";
import { makeIssue } from "../../lib/core";
import { applyThresholdOverrides, type ThresholdResult } from "../../lib/thresholds";
import { analyse } from "../../lib/analysis";
import { syntheticRecord } from "../analysis/syntheticRecord";
import { deepFreeze } from "../interpret/helpers";

// Synthetic test known by construction (main model, invented healthy adult, no noise): VT1 at 55 % and VT2 at 82 %
// of its 2600 mL/min peak (DEFAULT_SYNTHETIC_SPEC). The automatic doubts below are written by hand into the result,
// so what the override must do with them is known exactly.
const { record, syn } = syntheticRecord({ noise: "none" }, 7);
const base = analyse(record, { bootstrap: 0 });
const test = base.conditioned;

function withDoubts(): ThresholdResult {
  return deepFreeze({
    ...base.thresholds,
    vt1: { ...base.thresholds.vt1, confidence: "low", reason: "only one method could place the threshold; confirm by review" },
    issues: [
      makeIssue(
        "warning",
        "vt1-low-confidence",
        "VT1 (anaerobic threshold) is uncertain (only one method could place the threshold); confirm or set it by review.",
        { timeS: 400 },
      ),
      makeIssue(
        "info",
        "vt2-not-determinable",
        "VT2 (respiratory compensation point) could not be determined: no method succeeded.",
      ),
      makeIssue(
        "warning",
        "thresholds-missing-signal",
        "No VE data in the exercise phase: only the V-slope methods (VCO2 against VO2) can place VT1, and VT2 (read from ventilation) cannot be found.",
        { field: "veLMin" },
      ),
    ],
  });
}

describe("applyThresholdOverrides: a reviewer's threshold settles the engine's doubt about the automatic one", () => {
  it("turns the VT1 uncertainty warning into an info line naming the automatic doubt and the reviewer", () => {
    const r = applyThresholdOverrides(test, withDoubts(), [
      { which: "vt1", vo2MlMin: syn.truth.vt1.vo2MlMin, reason: "V-slope corner read by eye", by: "reviewer A" },
    ]);
    expect(r.issues.filter((i) => i.severity === "warning").map((i) => i.code)).toEqual(["thresholds-missing-signal"]);
    const vt1 = r.issues.find((i) => i.code === "vt1-set-by-review")!;
    expect(vt1.severity).toBe("info");
    expect(vt1.message).toBe(
      "The automatic VT1 (anaerobic threshold) was uncertain (only one method could place the threshold); VT1 was set by the reviewer.",
    );
    // the automatic reason's advice ("confirm by review") is not repeated once the reviewer has acted
    expect(vt1.message).not.toMatch(/by review/);
    // VT2 was not overridden: its note stands unchanged
    expect(r.issues.find((i) => i.code === "vt2-not-determinable")?.severity).toBe("info");
    expect(r.issues).toHaveLength(3);
  });

  it("does the same for VT2 (not determinable automatically, then set by review)", () => {
    const r = applyThresholdOverrides(test, withDoubts(), [
      { which: "vt2", vo2MlMin: syn.truth.vt2!.vo2MlMin, reason: "VE/VCO2 upturn", by: "reviewer B" },
    ]);
    expect(r.issues.map((i) => i.code)).toEqual(["vt1-low-confidence", "vt2-set-by-review", "thresholds-missing-signal"]);
    expect(r.issues[1].message).toMatch(/^The automatic VT2 \(respiratory compensation point\) could not be determined \(/);
    expect(r.issues[1].message).toMatch(/VT2 was set by the reviewer\.$/);
  });

  it("keeps the warning when the override is unusable (the automatic value stands)", () => {
    const r = applyThresholdOverrides(test, withDoubts(), [{ which: "vt1", reason: "no value", by: "reviewer A" }]);
    expect(r.issues.map((i) => i.code)).toContain("vt1-low-confidence");
    expect(r.issues.map((i) => i.code)).toContain("threshold-override-unusable");
  });
});
