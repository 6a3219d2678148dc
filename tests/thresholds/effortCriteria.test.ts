import { describe, it, expect } from "vitest";
import { assessEffort, EFFORT_CRITERIA_SETS, vo2FinalIncrease } from "../../lib/thresholds/effortCriteria";
import { THRESHOLD_SOURCES } from "../../lib/thresholds/sources";
import { CORE_SOURCES } from "../../lib/core";
import { freezeTest, standardRamp } from "./indicesFixture";

const met = (values: Parameters<typeof assessEffort>[0], set: string, id: string) =>
  assessEffort(values, set).criteria.find((c) => c.criterion.id === id)?.met;

describe("effort criteria: boundaries exactly as published", () => {
  it("RER > 1.05 (ERS 2019, confirmed): 1.05 does not meet it, 1.0501 does", () => {
    expect(met({ rerPeak: 1.05 }, "ers-2019", "rer-gt-1.05")).toBe(false);
    expect(met({ rerPeak: 1.0501 }, "ers-2019", "rer-gt-1.05")).toBe(true);
  });
  it("RER ≥ 1.10 (JACC HF 2020, confirmed): 1.10 meets it, 1.0999 does not", () => {
    expect(assessEffort({ rerPeak: 1.1 }, "hf-rer-1.10").maximal).toBe(true);
    expect(assessEffort({ rerPeak: 1.0999 }, "hf-rer-1.10").maximal).toBe(false);
  });
  it("RER ≥ 1.0 (FRIEND treadmill inclusion, confirmed)", () => {
    expect(assessEffort({ rerPeak: 1.0 }, "friend-treadmill").maximal).toBe(true);
    expect(assessEffort({ rerPeak: 0.99 }, "friend-treadmill").maximal).toBe(false);
  });
  it("HR ≥ 85% predicted and HR reserve < 15 bpm (Respir Res 2021 guide, secondary)", () => {
    expect(met({ hrPercentPredicted: 85 }, "ers-2019", "hr-85-percent-predicted")).toBe(true);
    expect(met({ hrPercentPredicted: 84.99 }, "ers-2019", "hr-85-percent-predicted")).toBe(false);
    expect(met({ hrReserveBpm: 15 }, "ers-2019", "hr-reserve-lt-15")).toBe(false);
    expect(met({ hrReserveBpm: 14.9 }, "ers-2019", "hr-reserve-lt-15")).toBe(true);
  });
  it("VE/MVV ≥ 85% (ERS 2019) and VO2 plateau < 2.1 mL/kg/min (ERS 2019 between-stage rule)", () => {
    expect(met({ veMvvPercent: 85 }, "ers-2019", "ve-mvv-85")).toBe(true);
    expect(met({ veMvvPercent: 84.9 }, "ers-2019", "ve-mvv-85")).toBe(false);
    expect(met({ vo2FinalIncreaseMlKgMin: 2.1 }, "ers-2019", "vo2-plateau-2.1-ml-kg")).toBe(false);
    expect(met({ vo2FinalIncreaseMlKgMin: 2.09 }, "ers-2019", "vo2-plateau-2.1-ml-kg")).toBe(true);
  });
  it("composite (Rapp 2018, confirmed): lactate ≥ 8 alone is enough", () => {
    const a = assessEffort({ rerPeak: 1.0, lactatePeakMmolL: 8, hrPercentPredicted: 80 }, "rapp-2018");
    expect(a.metIds).toEqual(["lactate-ge-8"]);
    expect(a.maximal).toBe(true);
  });
});

describe("effort set rules", () => {
  it("default set is labelled and combines by 'any'; missing values are not assessable", () => {
    const a = assessEffort({ rerPeak: 1.02, hrPercentPredicted: 90 });
    expect(a.setId).toBe("ers-2019");
    expect(a.isDefaultSet).toBe(true);
    expect(a.maximal).toBe(true);
    expect(a.metIds).toEqual(["hr-85-percent-predicted"]);
    expect(a.criteria.find((c) => c.criterion.id === "ve-mvv-85")?.met).toBeNull();
  });
  it("nothing assessable → maximal null; all assessed unmet → false", () => {
    expect(assessEffort({}).maximal).toBeNull();
    expect(assessEffort({ rerPeak: 0.95, hrReserveBpm: 40 }).maximal).toBe(false);
  });
  it("every criterion names registered sources", () => {
    const known = new Set([...Object.keys(THRESHOLD_SOURCES), ...Object.keys(CORE_SOURCES)]);
    for (const set of Object.values(EFFORT_CRITERIA_SETS)) {
      for (const id of set.ruleSourceIds) expect(known.has(id), id).toBe(true);
      for (const c of set.criteria) for (const id of c.sourceIds) expect(known.has(id), id).toBe(true);
    }
  });
  it("unknown set id is a programming mistake", () => {
    expect(() => assessEffort({}, "nope")).toThrow(/unknown effort criteria set/);
  });
});

describe("vo2FinalIncrease on the invented ramp", () => {
  it("final 30 s minus the 30 s before", () => {
    const r = vo2FinalIncrease(freezeTest(standardRamp()), { windowS: 30, weightKg: 70 });
    // earlier window [720, 750]: 11 breaths, mean t = 735 → 1000 + 2·555 = 2110
    // final window (750, 780]: 10 breaths 753..780, mean t = 766.5 → 1000 + 2·586.5 = 2173; rise 63 mL/min
    expect(r.increaseMlMin.value).toBeCloseTo(63, 9);
    expect(r.increaseMlKgMin.value).toBeCloseTo(0.9, 9);
    // work (t − 180)/3: 185 → 195.5 W, rise 10.5 W
    expect(r.workIncreaseW.value).toBeCloseTo(10.5, 9);
  });
});
