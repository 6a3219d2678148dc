import { describe, it, expect } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { readAtTime, valuesAtThreshold } from "../../lib/thresholds/valuesAtThreshold";
import { freezeTest, makeTest, standardRamp } from "./indicesFixture";

describe("values at a threshold (invented ramp)", () => {
  const test = freezeTest(standardRamp());
  const vt1 = { timeS: 420, vo2MlMin: 1480 };
  const v = valuesAtThreshold(test, vt1, { name: "VT1", weightKg: 80, peakVo2MlMin: 2170 });

  it("VO2 as given, per kg and as % of peak", () => {
    expect(v.vo2MlMin.value).toBe(1480);
    expect(v.vo2MlKgMin.value).toBeCloseTo(18.5, 12);
    // 100·1480/2170 = 68.2028%
    expect(v.vo2PercentPeak.value).toBeCloseTo((100 * 1480) / 2170, 9);
    expect(v.timeS.value).toBe(420);
  });

  it("HR, work, RER, VE/VCO2 and PETCO2 at 420 s (centred 30-s window on raw breaths, symmetric → the value at 420 s)", () => {
    // HR 60 + 0.2·240 = 108; work 240/3 = 80 W; VO2 1480 → VCO2 1.2·1480 − 300 = 1476 → RER 1476/1480
    expect(v.hrBpm.value).toBeCloseTo(108, 9);
    expect(v.workW.value).toBeCloseTo(80, 9);
    expect(v.rer.value).toBeCloseTo(1476 / 1480, 9);
    // VE/VCO2 = (25·1.476 + 3)/1.476
    expect(v.veVco2.value).toBeCloseTo((25 * 1.476 + 3) / 1.476, 9);
    expect(v.petco2MmHg.value).toBeCloseTo(40.8, 9);
    expect(v.speedKmh.value).toBeNull();
    expect(v.hrBpm.provenance.method).toBe("centred-30s-mean");
  });

  it("on averaged data the value is interpolated between rows", () => {
    const rows: BreathRow[] = [
      { timeS: 400, hrBpm: 100 },
      { timeS: 430, hrBpm: 130 },
    ];
    const t = makeTest(rows, { averaging: { kind: "time-bin", seconds: 30, label: "30-s bins" } });
    // 100 + (20/30)·30 = 120
    const hr = readAtTime(t, "hrBpm", 420, "1/min");
    expect(hr.value).toBeCloseTo(120, 12);
    expect(hr.provenance.method).toBe("interpolate-at-time");
    expect(hr.provenance.averaging).toBe("30-s bins");
  });

  it("a threshold outside exercise raises a warning; no body mass → per-kg not determinable", () => {
    const w = valuesAtThreshold(test, { timeS: 100, vo2MlMin: 500 }, { name: "VT2" });
    expect(w.issues.map((i) => i.code)).toEqual(["vt2-outside-exercise"]);
    expect(w.vo2MlKgMin.reason).toBe("body mass not given");
    expect(w.vo2PercentPeak.value).toBeNull();
  });
});
