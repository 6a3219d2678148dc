/**
 * VD/VT: where each blood gas is read, and that no "peak" VD/VT ever comes from outside exercise. Invented test of known
 * construction (indicesFixture: rest 0–177 s, exercise 180–780 s, recovery 783–960 s, a breath every 3 s) with VE/VCO2
 * set per region, so every VD/VT = 1 − 863/(PaCO2 · VE/VCO2) (Bohr-Enghoff form, recalled) is known by hand:
 * - rest: VCO2 500 mL/min, VE 20 L/min → VE/VCO2 40;
 * - exercise before 750 s: VCO2 2000, VE 60 → 30; exercise 750–780 s: VCO2 2500, VE 70 → 28;
 * - recovery: VCO2 1500, VE 60 → 40.
 * Stages of 120 s from 180 s (stage 2 = 300–417 s) are written on the exercise rows.
 */
import { describe, expect, it } from "vitest";
import type { BloodGasSample } from "../../lib/breath";
import { vdVt } from "../../lib/thresholds/vdVt";
import { buildRows, EX_START_S, makeTest } from "./indicesFixture";

const test = makeTest(
  buildRows((t, phase) => {
    if (phase === "rest") return { vco2MlMin: 500, veLMin: 20 };
    if (phase === "recovery") return { vco2MlMin: 1500, veLMin: 60 };
    const stage = Math.floor((t - EX_START_S) / 120) + 1;
    return t >= 750 ? { vco2MlMin: 2500, veLMin: 70, stage } : { vco2MlMin: 2000, veLMin: 60, stage };
  }),
);
const bohr = (paCO2: number, veVco2: number) => 1 - 863 / (paCO2 * veVco2);
const noTime = (label: string, paCO2MmHg: number): BloodGasSample => ({ timeS: Number.NaN, label, paCO2MmHg });
const codes = (r: ReturnType<typeof vdVt>) => r.issues.map((i) => i.code);

describe("VD/VT from samples placed by their label", () => {
  it("rest → the last minute of rest, peak → the last 30 s of exercise (also after a JSON round trip)", () => {
    const gases = JSON.parse(JSON.stringify([noTime("rest", 40), noTime("peak", 36)])) as BloodGasSample[];
    const r = vdVt(test, gases);
    expect(r.points.map((p) => [p.label, p.phase, p.placedBy, p.atPeak])).toEqual([
      ["rest", "rest", "label", false],
      ["peak", "exercise", "label", true],
    ]);
    // rest window 117–177 s (all VE/VCO2 40); peak window 750–780 s (all 28)
    expect(r.points[0].veVco2.provenance.window).toEqual({ startS: 117, endS: 177 });
    expect(r.points[1].veVco2.provenance.window).toEqual({ startS: 750, endS: 780 });
    expect(r.points[0].vdVt.value).toBeCloseTo(bohr(40, 40), 12); // 1 − 863/1600 = 0.460625
    expect(r.points[1].vdVt.value).toBeCloseTo(bohr(36, 28), 12); // 1 − 863/1008 = 0.143849…
    expect(r.points[1].vdVt.provenance.label).toMatch(/placed by its label at the last 30 s of exercise/);
  });

  it("stage N → the last 30 s of that stage; points come in time order with the peak last", () => {
    const r = vdVt(test, [noTime("peak", 36), noTime("Stage 2", 40), noTime("rest", 40)]);
    expect(r.points.map((p) => p.label)).toEqual(["rest", "Stage 2", "peak"]);
    // stage 2 rows 300–417 s → window 387–417 s, VE/VCO2 30: 1 − 863/1200 = 0.280833…
    expect(r.points[1].veVco2.provenance.window).toEqual({ startS: 387, endS: 417 });
    expect(r.points[1].vdVt.value).toBeCloseTo(bohr(40, 30), 12);
    expect(r.points.map((p) => p.atPeak)).toEqual([false, false, true]);
  });

  it("no time and a label naming no moment: no point, and a warning naming the label", () => {
    const r = vdVt(test, [noTime("sample A", 40), noTime("peak", 36)]);
    expect(r.points.map((p) => p.label)).toEqual(["peak"]);
    const w = r.issues.find((i) => i.code === "blood-gas-not-placed")!;
    expect(w.severity).toBe("warning");
    expect(w.message).toMatch(/"sample A"/);
  });
});

describe("no peak VD/VT from a sample outside exercise", () => {
  it("a sample in recovery gives no point; the last exercise sample stays the peak", () => {
    const r = vdVt(test, [
      { timeS: 120, paCO2MmHg: 40, label: "rest" },
      { timeS: 765, paCO2MmHg: 36 },
      { timeS: 900, paCO2MmHg: 38 },
    ]);
    expect(r.points.map((p) => p.timeS)).toEqual([120, 765]);
    expect(r.points[1].atPeak).toBe(true);
    expect(r.points[1].vdVt.value).toBeCloseTo(bohr(36, 28), 12);
    expect(codes(r)).toContain("blood-gas-in-recovery");
  });

  it("'peak' with a time in recovery: not read as peak; with no sample in exercise no VD/VT is given", () => {
    const r = vdVt(test, [
      { timeS: 120, paCO2MmHg: 40, label: "rest" },
      { timeS: 900, paCO2MmHg: 36, label: "peak" },
    ]);
    expect(r.points.map((p) => p.label)).toEqual(["rest"]);
    expect(r.points.some((p) => p.atPeak)).toBe(false);
    expect(r.points[0].vdVt.value).toBeNull();
    expect(r.points[0].vdVt.reason).toMatch(/no blood gas was drawn during exercise/);
    expect(codes(r)).toEqual(expect.arrayContaining(["blood-gas-label-time-conflict", "no-blood-gas-in-exercise"]));
  });

  it("every time before exercise (minutes read as seconds: 2 and 15) → 'are the times in minutes?', no VD/VT", () => {
    const r = vdVt(test, [
      { timeS: 2, paCO2MmHg: 40 },
      { timeS: 15, paCO2MmHg: 36 },
    ]);
    const w = r.issues.find((i) => i.code === "blood-gas-times-before-exercise")!;
    expect(w.severity).toBe("warning");
    expect(w.message).toMatch(/Are the times in minutes\?/);
    expect(r.points.every((p) => p.vdVt.value === null && !p.atPeak)).toBe(true);
    // times that do reach exercise (120 s at rest, 765 s near the end of exercise) are not doubted
    const ok = vdVt(test, [
      { timeS: 120, paCO2MmHg: 40 },
      { timeS: 765, paCO2MmHg: 36 },
    ]);
    expect(ok.points.map((p) => p.atPeak)).toEqual([false, true]);
    expect(codes(ok)).not.toContain("blood-gas-times-before-exercise");
  });

  it("resting samples labelled rest before exercise are not doubted, but give no peak", () => {
    const r = vdVt(test, [{ timeS: 120, paCO2MmHg: 40, label: "rest" }]);
    expect(codes(r)).not.toContain("blood-gas-times-before-exercise");
    expect(codes(r)).toContain("no-blood-gas-in-exercise");
    expect(r.points[0].atPeak).toBe(false);
  });

  it("a sample far from the end of exercise is the peak point, with a note that it may overstate peak VD/VT", () => {
    const r = vdVt(test, [{ timeS: 400, paCO2MmHg: 40 }]);
    expect(r.points[0].atPeak).toBe(true);
    expect(r.points[0].vdVt.value).toBeCloseTo(bohr(40, 30), 12);
    expect(codes(r)).toContain("blood-gas-peak-early");
  });
});

describe("what every VD/VT says", () => {
  it("PaCO2 shown to 0.1 mmHg (5.3 kPa = 39.753286 mmHg → 39.8); apparatus dead space named in provenance and an issue", () => {
    const paCO2 = 5.3 * 7.50062; // 1 kPa = 7.50062 mmHg, standard definition
    const r = vdVt(test, [{ timeS: 765, paCO2MmHg: paCO2 }]);
    expect(r.points[0].paCO2MmHg).toBe(39.8);
    expect(r.points[0].vdVt.value).toBeCloseTo(bohr(paCO2, 28), 12); // computed from the unrounded value
    expect(r.points[0].vdVt.provenance.inputs).toMatchObject({ paCO2MmHg: 39.8, veVco2: 28 });
    expect(r.points[0].vdVt.provenance.label).toMatch(/apparatus\) dead space not subtracted/);
    expect(codes(r)).toContain("vdvt-apparatus-dead-space");
  });
});
