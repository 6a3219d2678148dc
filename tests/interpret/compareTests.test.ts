import { describe, expect, it } from "vitest";
import { compareTests, interpret } from "../../lib/interpret";
import { baseInput, loadFixture } from "./helpers";

// INVENTED before/after pairs; noise bands from the cited test-retest studies (clinical-confirmations §11).
const item = (c: ReturnType<typeof compareTests>, v: string) => c.items.find((i) => i.variable === v)!;

describe("serial comparison against published test-retest variability", () => {
  it("heart failure: Bensimhon 2008 (HF-ACTION) band for peak VO2 is the 90th percentile of retest change, 3.0 mL/kg/min", () => {
    // Bensimhon 2008 (Am J Cardiol, confirmed): mean absolute within-subject change 1.3 mL/kg/min, 10th–90th percentile
    // 0.1–3.0. The mean is no limit (about 4 in 10 stable patients exceed it); the 90th percentile is (our choice).
    const before = loadFixture("heart-failure").input;
    const atMean = compareTests(before, { ...before, values: { ...before.values, peakVo2MlKgMin: 15.4 } }, "heart-failure");
    // 15.4 − 14.0 = +1.4: above the published mean change, yet a change 1 in 2 stable patients could show → within noise
    expect(item(atMean, "peakVo2MlKgMin")).toMatchObject({
      verdict: "within-noise",
      noise: { threshold: 3.0, sourceIds: ["bensimhon-2008"] },
    });
    expect(item(atMean, "peakVo2MlKgMin").change).toBeCloseTo(1.4, 10);
    const within = compareTests(before, { ...before, values: { ...before.values, peakVo2MlKgMin: 16.9 } }, "heart-failure");
    // +2.9 ≤ 3.0 → within noise
    expect(item(within, "peakVo2MlKgMin").verdict).toBe("within-noise");
    const beyond = compareTests(before, { ...before, values: { ...before.values, peakVo2MlKgMin: 17.1 } }, "heart-failure");
    // +3.1 > 3.0 → beyond noise, and the basis names the percentile
    expect(item(beyond, "peakVo2MlKgMin").verdict).toBe("beyond-noise");
    expect(item(beyond, "peakVo2MlKgMin").text).toMatch(/beyond measurement noise/);
    expect(item(beyond, "peakVo2MlKgMin").noise?.basis).toMatch(/90th percentile/);
    // no published band for the HF VE/VCO2 slope → not judged
    expect(item(beyond, "veVco2SlopeWhole").verdict).toBe("not-judged");
  });

  it("a per-kg change across a weight change is judged at the earlier weight, and says so (INVENTED pair)", () => {
    const before = loadFixture("heart-failure").input; // peak VO2 14.0 mL/kg/min
    const w = before.patient.weightKg!;
    // after: 5 kg lighter, 16.6 mL/kg/min. At the earlier weight: 16.6 × (w − 5) / w − 14.0
    const after = {
      ...before,
      patient: { ...before.patient, weightKg: w - 5 },
      values: { ...before.values, peakVo2MlKgMin: 16.6 },
    };
    const atEarlier = (16.6 * (w - 5)) / w - 14.0;
    const item0 = item(compareTests(before, after, "heart-failure"), "peakVo2MlKgMin");
    expect(item0.change).toBeCloseTo(2.6, 10); // the plain change, kept
    expect(item0.text).toMatch(/body weight .* → .* kg, so it is judged at the earlier weight, where the change is \+/);
    // band 3.0 (Bensimhon 2008 90th percentile): the verdict follows the change at the earlier weight
    expect(item0.verdict).toBe(Math.abs(atEarlier) > 3.0 ? "beyond-noise" : "within-noise");
  });

  it("a change that rounds to the band's value shows its unrounded size (INVENTED pair)", () => {
    const before = loadFixture("heart-failure").input;
    const after = { ...before, values: { ...before.values, peakVo2MlKgMin: 17.04 } }; // +3.04 prints as +3.0
    const it0 = item(compareTests(before, after, "heart-failure"), "peakVo2MlKgMin");
    expect(it0.verdict).toBe("beyond-noise");
    expect(it0.text).toMatch(/unrounded 3\.040 > 3\.000/);
  });

  it("heart rate and O2 pulse are not judged when a beta-blocker is recorded in one test only (INVENTED pair)", () => {
    const before = loadFixture("heart-failure").input;
    const after = { ...before, patient: { ...before.patient, betaBlocker: !before.patient.betaBlocker } };
    const c = compareTests(before, after, "heart-failure");
    for (const v of ["o2PulsePeakMlBeat", "peakHrBpm"]) {
      expect(item(c, v).verdict).toBe("not-judged");
      expect(item(c, v).text).toMatch(/not judged, a beta-blocker is recorded (before|after) only/);
    }
  });

  it("heart rate and O2 pulse are not judged when either test was recorded in atrial fibrillation (INVENTED pair)", () => {
    const before = loadFixture("heart-failure").input;
    const after = {
      ...before,
      patient: { ...before.patient, atrialFibrillation: true },
      values: { ...before.values, o2PulsePeakMlBeat: 12, peakHrBpm: 150 },
    };
    const c = compareTests(before, after, "heart-failure");
    for (const v of ["o2PulsePeakMlBeat", "peakHrBpm"]) {
      expect(item(c, v).verdict).toBe("not-judged");
      expect(item(c, v).text).toMatch(/not judged, atrial fibrillation recorded after/);
    }
    // peak VO2 itself is still compared
    expect(item(c, "peakVo2MlKgMin").verdict).not.toBe("not-judged");
  });

  it("healthy: VT1 moved after training? Decato 2018 CoV 10.4 % → SDC = 1.96·√2·CoV·mean (standard statistics)", () => {
    const before = baseInput({ vt1Vo2MlKgMin: 15, vt1Vo2MlMin: 1200 });
    const after = baseInput({ vt1Vo2MlKgMin: 20, vt1Vo2MlMin: 1600 });
    const c = compareTests(before, after, "healthy");
    // mean 17.5; SEM = 0.104 × 17.5 = 1.82; SDC = 2.7719 × 1.82 = 5.045 → change +5.0 is within noise
    const kg = item(c, "vt1Vo2MlKgMin");
    expect(kg.noise!.threshold!).toBeCloseTo(1.96 * Math.SQRT2 * 0.104 * 17.5, 10);
    expect(kg.noise!.threshold!).toBeCloseTo(5.045, 3);
    expect(kg.verdict).toBe("within-noise");
    expect(kg.noise!.basis).toMatch(/standard statistics/);
    // absolute: Decato 95 % meaningful change 0.52 L/min; +400 mL/min is within
    expect(item(c, "vt1Vo2MlMin")).toMatchObject({ verdict: "within-noise", noise: { threshold: 520 } });
    const big = compareTests(before, baseInput({ vt1Vo2MlKgMin: 21, vt1Vo2MlMin: 1750 }), "healthy");
    expect(item(big, "vt1Vo2MlMin").verdict).toBe("beyond-noise"); // +550 > 520
    expect(item(big, "vt1Vo2MlKgMin").verdict).toBe("beyond-noise"); // +6.0 > 1.96·√2·0.104·18 = 5.19
  });

  it("ICC-only populations (Coeckelberghs 2016, CAD) are shown but not judged", () => {
    const c = compareTests(baseInput({ peakVo2MlKgMin: 20 }), baseInput({ peakVo2MlKgMin: 26 }), "coronary");
    expect(item(c, "peakVo2MlKgMin").verdict).toBe("not-judged");
    expect(item(c, "peakVo2MlKgMin").text).toMatch(/ICC 0\.95/);
  });

  it("peak values are not judged when either test was submaximal", () => {
    const c = compareTests(
      baseInput({ peakVo2MlKgMin: 20 }),
      baseInput({ peakVo2MlKgMin: 26, peakRer: 0.95, hrPctPred: 70, hrReserveBpm: 50 }),
      "heart-failure",
    );
    expect(c.effort.comparable).toBe(false);
    // the verdicts in words, as each test's own page says them (no keys such as "limit-without-rer" on the page)
    expect(c.effort.beforeLabel).toBe(interpret(baseInput({ peakVo2MlKgMin: 20 })).effort.label);
    expect(c.effort.afterLabel).not.toMatch(/-/);
    expect(item(c, "peakVo2MlKgMin").verdict).toBe("not-judged");
    expect(c.issues.map((i) => i.code)).toContain("serial-effort-not-comparable");
  });

  it("unknown population → issue, nothing judged", () => {
    const c = compareTests(baseInput(), baseInput(), "astronauts");
    expect(c.issues[0].code).toBe("unknown-variability-population");
    expect(c.items.every((i) => i.verdict === "not-judged")).toBe(true);
  });
});

describe("serial comparison: what is comparable (invented pairs)", () => {
  const labels = (peakVo2: string) => ({ predictedEquations: { peakVo2 } });

  it("the SDC's working names the SEM and the SDC separately (Decato 2018 CoV 10.4 %, mean 17.5: SEM 1.82, SDC 5.04)", () => {
    const c = compareTests(baseInput({ vt1Vo2MlKgMin: 15 }), baseInput({ vt1Vo2MlKgMin: 20 }), "healthy");
    expect(item(c, "vt1Vo2MlKgMin").noise!.basis).toMatch(/SEM = CoV 10\.4 % × mean 17\.50 = 1\.82, so 5\.04/);
  });

  it("% predicted from different equations is not judged, with a warning naming both; its change is in percentage points", () => {
    const before = baseInput({ peakVo2PctPred: 92 }, labels("FRIEND 2018 (cycle)"));
    const after = baseInput({ peakVo2PctPred: 114 }, labels("Hansen, Sue & Wasserman 1984"));
    const c = compareTests(before, after, "healthy");
    const pct = item(c, "peakVo2PctPred");
    expect(pct.verdict).toBe("not-judged");
    expect(pct.changePct).toBeNull();
    expect(pct.text).toMatch(
      /\+22 percentage points\): not judged, predicted by different equations \(FRIEND 2018 \(cycle\) before, Hansen/,
    );
    expect(c.issues.map((i) => i.code)).toContain("serial-different-equations");
    // the same equation both times: compared as usual, still in points
    const same = compareTests(before, { ...after, ...labels("FRIEND 2018 (cycle)") }, "healthy");
    expect(item(same, "peakVo2PctPred").text).not.toMatch(/different equations/);
    expect(item(same, "peakVo2PctPred").text).toMatch(/\+22 percentage points/);
    expect(same.issues.map((i) => i.code)).not.toContain("serial-different-equations");
  });
});
