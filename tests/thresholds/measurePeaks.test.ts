import { describe, it, expect } from "vitest";
import { detectThresholds } from "../../lib/thresholds/detectThresholds";
import { measurePeaks } from "../../lib/thresholds/measurePeaks";
import { buildRows, freezeTest, makeTest, standardRamp, STEP_S } from "./indicesFixture";

// Invented ramp (see indicesFixture.standardRamp); answers by hand below.
describe("measurePeaks on an invented ramp", () => {
  const test = freezeTest(standardRamp());
  const p = measurePeaks(test, { windowS: 30, weightKg: 70, vt1: { timeS: 420, vo2MlMin: 1480 } });

  it("peak VO2 is the mean of the last 30-s window", () => {
    // window [750, 780]: breaths 750..780 every 3 s (11), mean t = 765 → VO2 = 1000 + 2·585 = 2170
    expect(p.vo2MlMin.value).toBeCloseTo(2170, 9);
    expect(p.vo2MlMin.provenance.window).toEqual({ startS: 750, endS: 780 });
    expect(p.vo2MlMin.provenance.sourceIds).toContain("peak-rolling-average");
    // 2170 / 70 = 31.0
    expect(p.vo2MlKgMin.value).toBeCloseTo(31, 9);
  });

  it("RER at the peak-VO2 window is the ratio of window means", () => {
    // VCO2 = 1.2·VO2 − 300 → mean VCO2 = 1.2·2170 − 300 = 2304; 2304/2170 = 1.0617511...
    expect(p.rerAtPeakVo2.value).toBeCloseTo(2304 / 2170, 9);
    // RER = 1.2 − 300/meanVO2 rises with VO2, so the highest window is the last one
    expect(p.rerMax.value).toBeCloseTo(2304 / 2170, 9);
  });

  it("HR, work, O2 pulse, VE, VCO2", () => {
    // HR mean over the last window: 60 + 0.2·585 = 177
    expect(p.hrBpm.value).toBeCloseTo(177, 9);
    // highest work reached: (780 − 180)/3 = 200 W
    expect(p.workW.value).toBe(200);
    // O2 pulse = 2170/177 = 12.2598870...
    expect(p.o2PulseMlBeat.value).toBeCloseTo(2170 / 177, 9);
    expect(p.vco2MlMin.value).toBeCloseTo(2304, 9);
    // VE = 25·2.304 + 3 = 60.6
    expect(p.veLMin.value).toBeCloseTo(60.6, 9);
    expect(p.speedKmh.value).toBeNull();
    expect(p.speedKmh.reason).toMatch(/no speed/);
  });

  it("PETCO2 at rest, peak, rise and at VT1", () => {
    expect(p.petco2RestMmHg.value).toBeCloseTo(36, 9);
    // best window [465, 495] centred on the tent's top: mean |t − 480| = 2·(15+12+9+6+3)/11 = 90/11
    // → 42 − 0.02·90/11 = 41.836363...
    expect(p.petco2PeakMmHg.value).toBeCloseTo(42 - (0.02 * 90) / 11, 9);
    // at VT1 (420 s), centred 30-s window [405, 435]: symmetric on the rising limb → 42 − 0.02·60 = 40.8
    expect(p.petco2AtVt1MmHg.value).toBeCloseTo(40.8, 9);
    // the rise is from rest to VT1 (Guazzi et al. 2012, recalled), not to the highest window: 40.8 − 36 = 4.8
    expect(p.petco2RiseMmHg.value).toBeCloseTo(40.8 - 36, 9);
    expect(p.petco2RiseMmHg.provenance.label).toBe("PETCO2 rise: PETCO2 at VT1 minus resting mean");
    // without VT1 there is no rise to read
    expect(measurePeaks(test, {}).petco2RiseMmHg).toMatchObject({ value: null, reason: "VT1 not determined" });
  });

  it("lowest SpO2 and durations", () => {
    // lowest window is the last: 97 − 0.01·585 = 91.15
    expect(p.spo2LowestPct.value).toBeCloseTo(91.15, 9);
    expect(p.testDurationS.value).toBe(960);
    expect(p.exerciseDurationS.value).toBe(600);
  });

  it("a longer window lowers the peak of a rising signal (60-s: mean t = 750 → 2140)", () => {
    const p60 = measurePeaks(test, { windowS: 60 });
    expect(p60.vo2MlMin.value).toBeCloseTo(2140, 9);
    expect(p60.vo2MlMin.provenance.method).toBe("peak-rolling-60s");
    expect(p60.vo2MlKgMin.value).toBeNull();
    expect(p60.vo2MlKgMin.reason).toBe("body mass not given");
  });

  it("VO2 given only per kg and no body mass: peak VO2 per kg from that column, peak VO2 in mL/min not determinable", () => {
    // the same ramp with VO2 as the file gave it per kg of an invented 70 kg: 2170 / 70 = 31.0 over [750, 780]
    const base = standardRamp();
    const perKg = (rows: typeof base.clean) =>
      rows.map(({ vo2MlMin, ...r }) => (vo2MlMin === undefined ? r : { ...r, vo2MlKgMin: vo2MlMin / 70 }));
    const q = measurePeaks({ ...base, clean: perKg(base.clean), averaged: perKg(base.averaged) }, { windowS: 30 });
    expect(q.vo2MlMin.value).toBeNull();
    expect(q.vo2MlKgMin.value).toBeCloseTo(31, 9);
    expect(q.vo2MlKgMin.provenance.window).toEqual({ startS: 750, endS: 780 });
    // the thresholds need VO2 in mL/min beside VCO2: not determinable, and the reason names the missing body mass
    const t = detectThresholds({ ...base, clean: perKg(base.clean), averaged: perKg(base.averaged) });
    expect(t.vt1.vo2MlMin.value).toBeNull();
    expect(t.vt1.reason).toMatch(/per kg.*enter the weight/);
  });

  it("no exercise phase: whole record used, with a warning; empty test is not determinable", () => {
    const q = measurePeaks({ ...standardRamp(), exercise: null });
    expect(q.issues.map((i) => i.code)).toContain("exercise-phase-unknown");
    const empty = measurePeaks({ ...standardRamp(), clean: [], averaged: [], exercise: null });
    expect(empty.vo2MlMin.value).toBeNull();
    expect(empty.testDurationS.value).toBeNull();
  });

  it("VO2 given per kg only, no body mass: the peak per kg from that column, and peak VO2 in mL/min says the weight is missing", () => {
    const base = standardRamp();
    const rows = base.clean.map(({ vo2MlMin, ...r }) => ({ ...r, vo2MlKgMin: vo2MlMin! / 70 }));
    const perKg = measurePeaks({ ...base, clean: rows, averaged: rows }, { windowS: 30 });
    // the same last 30-s window as above: 2170 / 70 = 31.0 mL/kg/min
    expect(perKg.vo2MlKgMin.value).toBeCloseTo(2170 / 70, 6);
    expect(perKg.vo2MlMin.value).toBeNull();
    expect(perKg.vo2MlMin.reason).toMatch(/given per kg only and the body mass is not known; enter the weight/);
  });

  it("peak RER carries the standard error of its window's breaths (by construction: breath RER alternating 1.0 / 1.1)", () => {
    // VO2 1000 mL/min on every breath; VCO2 alternating 1000 / 1100 from breath to breath: in any window the breath RERs
    // are k values of 1.1 and m of 1.0, whose SD and standard error follow from k and m alone
    const rows = buildRows((t, phase) => ({
      vo2MlMin: 1000,
      vco2MlMin: phase === "exercise" && Math.round(t / STEP_S) % 2 === 0 ? 1100 : 1000,
    }));
    const p2 = measurePeaks(makeTest(rows), { windowS: 30 });
    const win = p2.rerMax.provenance.window!;
    const inWin = rows.filter((r) => r.timeS >= win.startS && r.timeS <= win.endS);
    const k = inWin.filter((r) => r.vco2MlMin === 1100).length;
    const m = inWin.length - k;
    expect(k).toBeGreaterThan(0);
    expect(m).toBeGreaterThan(0);
    const mean = (1.1 * k + 1.0 * m) / (k + m);
    const sd = Math.sqrt((k * (1.1 - mean) ** 2 + m * (1.0 - mean) ** 2) / (k + m - 1));
    expect(p2.rerMax.provenance.inputs?.rerBreaths).toBe(k + m);
    expect(p2.rerMax.provenance.inputs?.rerSe as number).toBeCloseTo(sd / Math.sqrt(k + m), 12);
    // about 0.05 / √10: a 30-s window of 3-s breaths
    expect(p2.rerMax.provenance.inputs?.rerSe as number).toBeGreaterThan(0.012);
    expect(p2.rerMax.provenance.inputs?.rerSe as number).toBeLessThan(0.02);
  });

  it("treadmill: speed and grade are read together at the end of exercise (invented protocol that trades grade for speed)", () => {
    // invented: 6 km/h at 16 % until 600 s, then 12 km/h at 2 % to the end of exercise (780 s). The last stage reached is
    // 12 km/h at 2 %: never "12 km/h and 16 %", which was not run, and not the walking stage a walking-cost equation
    // would rank first (ACSM walking 0.1·S + 1.8·S·G, S in m/min: 6 km/h at 16 % 38.8 against 27.2 mL/kg/min)
    const rows = buildRows((t, phase) =>
      phase === "exercise"
        ? { vo2MlMin: 1500, vco2MlMin: 1400, speedKmh: t <= 600 ? 6 : 12, gradePct: t <= 600 ? 16 : 2 }
        : { vo2MlMin: 500, vco2MlMin: 420 },
    );
    const q = measurePeaks(makeTest(rows), { windowS: 30 });
    expect(q.speedKmh.value).toBe(12);
    expect(q.gradePct.value).toBe(2);
    expect(q.speedKmh.provenance.method).toBe("treadmill-end-of-exercise");
    expect(q.speedKmh.provenance.window?.startS).toBe(q.gradePct.provenance.window?.startS);
    expect(q.speedKmh.provenance.window!.startS).toBe(780);
    // a usual protocol (speed and grade rising together): the last and highest stage, as before
    const rising = buildRows((t, phase) =>
      phase === "exercise" ? { vo2MlMin: 1500, vco2MlMin: 1400, speedKmh: 2.7 + (t - 180) / 200, gradePct: (t - 180) / 50 } : {},
    );
    const r = measurePeaks(makeTest(rising), { windowS: 30 });
    expect(r.speedKmh.value).toBeCloseTo(2.7 + 3, 9);
    expect(r.gradePct.value).toBeCloseTo(12, 9);
  });
});
