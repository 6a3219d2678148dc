import { describe, it, expect } from "vitest";
import type { BreathRow, Phase } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";
import { generateHoldoutTest, generateSyntheticTest, holdoutSpec } from "../../lib/synthetic";
import { detectThresholds } from "../../lib/thresholds/detectThresholds";
import { initialStep } from "../../lib/thresholds/initialStep";

// Hand-built VO2 (invented numbers), breaths every 2 s; the answers follow by arithmetic.
function table(vo2: (t: number) => number, phase: (t: number) => Phase) {
  const rows: BreathRow[] = [];
  for (let t = 0; t <= 900; t += 2)
    rows.push({ timeS: t, vo2MlMin: vo2(t), vco2MlMin: 0.9 * vo2(t), veLMin: 0.03 * vo2(t), phase: phase(t) });
  return conditionTable({ shape: "breath", rows, fields: ["timeS", "vo2MlMin", "vco2MlMin", "veLMin", "phase"] });
}

describe("initialStep", () => {
  it("a ramp after unloaded pedalling: ratio 1 (rise over the first 75 s = what the ramp adds)", () => {
    // 800 mL/min unloaded to 360 s, then +5 mL/min per s to 840 s: before 800, 60–90-s window 800 + 5·75 = 1175,
    // jump 375; the ramp's mean rate 5 per s adds 375 over 75 s → ratio 1
    const test = table(
      (t) => (t < 360 ? 800 : t <= 840 ? 800 + 5 * (t - 360) : 800),
      (t) => (t < 360 ? "warmup" : t <= 840 ? "exercise" : "recovery"),
    );
    const s = initialStep(test)!;
    expect(s.jumpMlMin).toBeCloseTo(375, 0);
    expect(s.ratio).toBeCloseTo(1, 1);
  });

  it("a jump of 1 500 mL/min at the start: ratio 5", () => {
    // 400 at rest to 180 s, then 1 900 + 5·(t − 180) to 780 s: before 400, early window 1 900 + 375 = 2 275, jump
    // 1 875; the ramp's rate 5 per s adds 375 → ratio 1 875 / 375 = 5
    const test = table(
      (t) => (t < 180 ? 400 : t <= 780 ? 1900 + 5 * (t - 180) : 600),
      (t) => (t < 180 ? "rest" : t <= 780 ? "exercise" : "recovery"),
    );
    const s = initialStep(test)!;
    expect(s.jumpMlMin).toBeCloseTo(1875, 0);
    expect(s.ratio).toBeCloseTo(5, 1);
  });

  it("no incremental phase, or one shorter than 3 minutes: null", () => {
    const test = table(
      () => 500,
      () => "rest",
    );
    expect(initialStep(test)).toBeNull();
  });
});

describe("detectThresholds warns about a large initial step", () => {
  it("a treadmill test that jumps from walking to running (hold-out model, invented): warning, early VT1 low confidence", () => {
    const syn = generateHoldoutTest(holdoutSpec(23, 31, ["moderate"]), 31 + 23);
    expect(syn.table.fields).not.toContain("workW"); // treadmill by construction
    const r = detectThresholds(conditionTable(syn.table), { bootstrap: 0 });
    const issue = r.issues.find((x) => x.code === "thresholds-large-initial-step");
    expect(issue).toBeDefined();
    expect(issue!.severity).toBe("warning");
  });

  it("a cycle ramp after unloaded pedalling (main model, noise-free): no warning", () => {
    const syn = generateSyntheticTest({ noise: "none" }, 2);
    const r = detectThresholds(conditionTable(syn.table), { bootstrap: 0 });
    expect(r.issues.map((x) => x.code)).not.toContain("thresholds-large-initial-step");
  });

  it("a VT1 within 3 minutes of the step is marked low confidence, with the reason", () => {
    // exercise from rest (jump) with a VT1 near 120 s of exercise: excess CO2 from 300 s (invented shape)
    const rows: BreathRow[] = [];
    for (let t = 0; t <= 900; t += 2) {
      const ex = t >= 180 && t <= 840;
      const vo2 = t < 180 ? 400 : ex ? 1500 + 4 * (t - 180) : 600;
      const vco2 = 0.88 * vo2 + (ex ? 0.5 * Math.max(0, vo2 - (1500 + 4 * 120)) : 0);
      rows.push({
        timeS: t,
        vo2MlMin: vo2,
        vco2MlMin: vco2,
        veLMin: 3 + (26 * vco2) / 1000,
        peto2MmHg: 100,
        petco2MmHg: 40,
        phase: t < 180 ? "rest" : ex ? "exercise" : "recovery",
      });
    }
    const test = conditionTable({
      shape: "breath",
      rows,
      fields: ["timeS", "vo2MlMin", "vco2MlMin", "veLMin", "peto2MmHg", "petco2MmHg", "phase"],
    });
    const r = detectThresholds(test, { bootstrap: 0 });
    expect(r.issues.map((x) => x.code)).toContain("thresholds-large-initial-step");
    // by construction the excess CO2 starts 120 s into exercise; the estimate lies within the first 3 minutes
    expect(r.vt1.timeS! - 180).toBeLessThan(180);
    expect(r.vt1.confidence).toBe("low");
    expect(r.vt1.reason).toMatch(/large step at the start of exercise/);
    const off = detectThresholds(test, { bootstrap: 0, largeInitialStepRatio: Infinity });
    expect(off.issues.map((x) => x.code)).not.toContain("thresholds-large-initial-step");
  });
});
