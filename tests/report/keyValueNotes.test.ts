/**
 * Notes on key-value rows. A heart-rate reserve of zero or less (predicted maximum − peak HR) is said as "no reserve left", with how far the peak
 * passed the prediction, on the page and in the report. Input: the INVENTED demo case "normal-adult" (synthetic preset,
 * fixed seed), given an older age so that its peak heart rate passes the age-predicted maximum.
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { hrReserveNote } from "../../lib/interpret";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { demoLabel, demoRecord } from "./demoRecord";

describe("heart-rate reserve at or below zero", () => {
  it("words by construction: positive reserve has no note, zero and negative say how far the peak passed", () => {
    expect(hrReserveNote(12)).toBeNull();
    expect(hrReserveNote(null)).toBeNull();
    expect(hrReserveNote(0.4)).toBe("peak heart rate at the predicted maximum: no heart-rate reserve left");
    expect(hrReserveNote(-7.6)).toMatch(/^peak heart rate 8 bpm above the predicted maximum: no heart-rate reserve left/);
  });

  it("the report row of a peak HR above the predicted maximum carries the note, and the reserve is predicted − peak", async () => {
    const base = await demoRecord("normal-adult");
    const record = { ...base, patient: { ...base.patient, ageY: 85 } };
    const result = analyse(record, { bootstrap: 0 });
    const reserve = result.indices.heartRate.reserveBpm.value!;
    const predicted = result.predicted.values.hrMaxBpm?.value;
    expect(predicted).toBeTypeOf("number");
    expect(reserve).toBeCloseTo(predicted! - result.indices.peaks.hrBpm.value!, 6);
    expect(reserve).toBeLessThan(0);
    const model = buildReportModel(result, record, demoLabel("normal-adult"), { status: "draft", sections: [] });
    const row = model.keyValues.find((r) => r.label === "Heart-rate reserve")!;
    expect(row.note).toContain(`peak heart rate ${-Math.round(reserve)} bpm above the predicted maximum`);
    // more than two SEE of HRmax (Jones 1985: 10.3 bpm, confirmed) above the prediction: check the age and the signal
    expect(-reserve).toBeGreaterThan(2 * 10.3);
    expect(result.issues.find((i) => i.code === "peak-hr-far-above-predicted")?.message).toMatch(
      /check the age entered and the heart-rate signal/,
    );
    // at the demo's own age (45 y) the peak lies within the scatter: no such warning
    const own = analyse(base, { bootstrap: 0 });
    expect(own.indices.peaks.hrBpm.value! - own.predicted.values.hrMaxBpm!.value!).toBeLessThan(2 * 10.3);
    expect(own.issues.some((i) => i.code === "peak-hr-far-above-predicted")).toBe(false);
  });
});

describe("a % predicted the interpretation does not read is bracketed beside its reason", () => {
  it("the INVENTED heart-failure demo on a beta-blocker: O2 pulse % predicted in brackets, 'not read' on its row", async () => {
    const record = await demoRecord("heart-failure");
    expect(record.patient.betaBlocker).toBe(true);
    const result = analyse(record, { bootstrap: 0 });
    const model = buildReportModel(result, record, demoLabel("heart-failure"), { status: "draft", sections: [] });
    const row = model.keyValues.find((r) => r.label.startsWith("Peak O2 pulse"))!;
    const pct = result.comparisons.find((c) => c.key === "peakO2Pulse")!.percentPredicted!;
    expect(row.pctPredicted).toBe(`(${pct.toFixed(0)})`);
    expect(row.note).toMatch(/not read: .*beta-blocker/);
    // peak VO2 % predicted is read: no brackets
    const vo2 = model.keyValues.find((r) => r.label === result.comparisons.find((c) => c.key === "peakVo2")!.label)!;
    expect(vo2.pctPredicted).toMatch(/^\d+$/);
  });
});
