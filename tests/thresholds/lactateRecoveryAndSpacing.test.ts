import { describe, expect, it } from "vitest";
import {
  LACTATE_METHOD_NAMES,
  lactatePointsFromTest,
  lactateThresholds,
  type LactatePoint,
} from "../../lib/thresholds/lactateThresholds";
import { EX_END_S, buildRows, makeTest, rampW } from "./indicesFixture";

// INVENTED lactate curves on the invented ramp of indicesFixture (rest 0-177 s, ramp 180-780 s at 20 W/min from 0 W,
// work = (t − 180)/3 W, recovery from 783 s). Answers are known by construction.
// Methods: OBLA 4 mmol/L (Sjödin & Jacobs, Int J Sports Med 1981, confirmed); baseline + 1 mmol/L (Bishop, Jenkins &
// Mackinnon, Med Sci Sports Exerc 1998, confirmed); Dmax (Cheng et al. 1992, secondary). Recovery samples kept off the
// curve, the 10-s end-of-exercise grace, the lowest-value check (≥ 4 mmol/L) and the concordance tolerance (the larger
// of 10 W and half the median sample spacing) are our choices, not published values.

const ramp = () => makeTest(buildRows((t, phase) => ({ workW: phase === "exercise" ? rampW(t) : 0 })));
const byId = (r: ReturnType<typeof lactateThresholds>, id: string) => r.thresholds.find((t) => t.id === id)!;

/** Rest at 100 s (0 W) then 50, 100, 150, 200 W at 330, 480, 630, 780 s. */
const CURVE = [
  { timeS: 100, lactateMmolL: 1.0 },
  { timeS: 330, lactateMmolL: 1.1 },
  { timeS: 480, lactateMmolL: 1.5 },
  { timeS: 630, lactateMmolL: 3.0 },
  { timeS: 780, lactateMmolL: 5.0 },
];

describe("a lactate sample drawn in recovery (3 min after exercise, the routine peak-lactate draw)", () => {
  const withRecovery = lactatePointsFromTest(ramp(), [...CURVE, { timeS: EX_END_S + 180, lactateMmolL: 8.5 }]);
  const without = lactatePointsFromTest(ramp(), CURVE);
  const r = lactateThresholds(withRecovery.points, withRecovery.axis, { vt1: 120, vt2: 180 });
  const r0 = lactateThresholds(without.points, without.axis, { vt1: 120, vt2: 180 });

  it("is not on the curve and never averaged with the resting sample at 0 W", () => {
    // without the rule it was read at 0 W (the work rate at 960 s) and averaged with rest: (1.0 + 8.5)/2 = 4.75
    expect(r.points).toMatchObject([
      { x: 0, lactateMmolL: 1.0, rest: true },
      { x: 50, lactateMmolL: 1.1 },
      { x: 100, lactateMmolL: 1.5 },
      { x: 150, lactateMmolL: 3.0 },
      { x: 200, lactateMmolL: 5.0 },
    ]);
    expect(r.recoveryPoints).toHaveLength(1);
    expect(r.recoveryPoints[0].recoveryS).toBe(180);
  });

  it("leaves every threshold where it is without it; counts only as peak lactate", () => {
    for (const t of r0.thresholds) expect(byId(r, t.id).intensity.value).toBe(t.intensity.value);
    // OBLA between 150 W (3.0) and 200 W (5.0): 150 + (4 − 3)/(5 − 3) · 50 = 175 W
    expect(byId(r, "obla-4").intensity.value).toBeCloseTo(175, 9);
    expect(r.peakMmolL).toBe(8.5);
    expect(r0.peakMmolL).toBe(5.0);
    const note = withRecovery.issues.find((i) => i.code === "lactate-recovery-sample")!;
    expect(note.message).toMatch(
      /^1 lactate sample\(s\) drawn in recovery \(16:00, 3:00 after the end of exercise: 8\.5 mmol\/L\)/,
    );
    expect(note.message).toMatch(/counts only towards peak lactate \(8\.5 mmol\/L\)/);
  });

  it("a sample given with 0 W in recovery is a recovery sample too; one with its own work rate above 0 is not", () => {
    const got = lactatePointsFromTest(ramp(), [
      ...CURVE,
      { timeS: EX_END_S + 120, workW: 0, lactateMmolL: 7.9 },
      { timeS: EX_END_S + 120, workW: 200, lactateMmolL: 5.2 },
    ]);
    expect(got.points.filter((p) => p.recoveryS !== undefined).map((p) => p.lactateMmolL)).toEqual([7.9]);
    expect(got.points.some((p) => p.x === 200 && p.lactateMmolL === 5.2)).toBe(true);
  });

  it("a sample drawn within 10 s after the end of exercise is read at the end of exercise (200 W), not at 0 W", () => {
    const got = lactatePointsFromTest(ramp(), [...CURVE.slice(0, 4), { timeS: EX_END_S + 5, lactateMmolL: 5.0 }]);
    expect(got.points.at(-1)).toMatchObject({ x: 200, lactateMmolL: 5.0 });
    expect(got.issues.map((i) => i.code)).toContain("lactate-at-end-of-exercise");
  });
});

describe("lactate times that all fall before exercise (minutes read as seconds)", () => {
  it("places no sample and asks whether the times are minutes", () => {
    // INVENTED: times 2 … 12 meant as minutes; as seconds they all lie in the rest phase (exercise starts at 180 s)
    const got = lactatePointsFromTest(
      ramp(),
      [2, 4, 6, 8, 10, 12].map((t, i) => ({ timeS: t, lactateMmolL: [1, 1.1, 1.3, 2, 3.6, 6.2][i] })),
    );
    expect(got.points).toHaveLength(0);
    expect(got.issues).toHaveLength(1);
    expect(got.issues[0].code).toBe("lactate-all-before-exercise");
    expect(got.issues[0].severity).toBe("warning");
    // read as minutes: 2 min = 2:00, 12 min = 12:00 (within the 16:00 recording)
    expect(got.issues[0].message).toMatch(/All 6 lactate samples fall before exercise starts \(0:02–0:12; exercise 3:00–13:00\)/);
    expect(got.issues[0].message).toMatch(/Are the times in minutes\? Read as minutes they fall at 2:00–12:00/);
    expect(got.issues[0].message).toMatch(/--lactate-time-unit min/);
    expect(got.issues[0].message).not.toMatch(/Give each sample's time, stage or work rate/);
  });
});

describe("a curve whose lowest value is at or above 4 mmol/L (e.g. mg/dL read as mmol/L)", () => {
  it("reads no threshold from a baseline and says why", () => {
    // INVENTED: a normal curve in mg/dL (9.0 … 61.3) kept below 30 by dropping its top, read as if mmol/L
    const pts: LactatePoint[] = [35, 60, 85, 110, 135, 160].map((x, i) => ({
      x,
      lactateMmolL: [9, 9.9, 10.8, 13.5, 18, 24.3][i],
    }));
    const r = lactateThresholds(pts, "workW", { vt1: 115, vt2: 194 });
    expect(r.issues.map((i) => i.code)).toContain("lactate-no-low-part");
    expect(byId(r, "obla-4").intensity.reason).toMatch(/never below 4/);
    for (const id of ["baseline-plus-1", "log-log", "dmax", "modified-dmax"]) {
      expect(byId(r, id).intensity.value).toBeNull();
      expect(byId(r, id).intensity.reason).toMatch(/lowest lactate \(9\.0 mmol\/L\)/);
    }
    // no "concordant" verdict from such a curve
    expect(r.relations).toHaveLength(0);
  });
});

describe("concordance with VT1/VT2 read within the sample spacing (our choice)", () => {
  it("three samples 100 and 75 W apart: tolerance half the median spacing, 88/2 = 44 W", () => {
    // INVENTED (as explore round's lac_few3): 60 W 1.1, 160 W 2.7, 235 W 6.8 mmol/L
    const pts = [
      { x: 60, lactateMmolL: 1.1 },
      { x: 160, lactateMmolL: 2.7 },
      { x: 235, lactateMmolL: 6.8 },
    ];
    const r = lactateThresholds(pts, "workW", { vt1: 115, vt2: 194 });
    // spacings 100 and 75 → median 87.5, shown as 88 W → tolerance 44 W
    expect(r.concordance).toMatchObject({ value: 44, basis: "sample-spacing", sampleSpacing: 88 });
    // baseline 1.1 → 2.1 mmol/L between 60 W (1.1) and 160 W (2.7): 60 + (1.0/1.6)·100 = 122.5 W; 7.5 W above VT1 (6.5%)
    expect(byId(r, "baseline-plus-1").intensity.value).toBeCloseTo(122.5, 9);
    const b1 = r.relations.find((x) => x.id === "baseline-plus-1")!;
    // samples 88 W apart, wider than 20 W (our choice): within the tolerance the two cannot be told apart, which is not
    // a finding of agreement (CLIN7 m3)
    expect(b1.statement).toBe(
      "Baseline + 1 mmol/L at 123 W lies 8 W (6.5%) above VT1 (115 W): cannot be told apart at this sampling: the samples lie a median 88 W apart, so a threshold is placed only to within 44 W.",
    );
    expect(b1.reading).toBe("not-separable");
    expect(b1.verdictShort).toBe("cannot be told apart at this sampling (within 44 W)");
    expect(r.concordance.note).toMatch(
      /median 88 W apart .* half that spacing, 44 W: within that of its VT the two cannot be told apart at this sampling, which is not a finding of agreement \(our choice; at least 10 W, and "concordant" only with samples 20 W apart or closer\)/,
    );
  });

  it("samples 25 W apart: 12.5 W; samples 5 W apart: the 10 W floor; a lab's own tolerance is kept", () => {
    const curve = (step: number) =>
      Array.from({ length: 9 }, (_, i) => ({ x: 100 + step * i, lactateMmolL: 1 + (0.02 * (step * i) ** 1.5) / step }));
    expect(lactateThresholds(curve(25), "workW").concordance).toMatchObject({ value: 12.5, basis: "sample-spacing" });
    expect(lactateThresholds(curve(5), "workW").concordance).toMatchObject({ value: 10, basis: "fixed", sampleSpacing: 5 });
    expect(lactateThresholds(curve(25), "workW", { concordanceTolerance: 15 }).concordance).toMatchObject({
      value: 15,
      basis: "option",
    });
  });

  it("on the speed axis: 1 km/h stages → half of 1.0 = 0.5 km/h, the floor itself (fixed)", () => {
    const pts = [8, 9, 10, 11, 12].map((x, i) => ({ x, lactateMmolL: [1, 1.2, 1.8, 3, 5][i] }));
    expect(lactateThresholds(pts, "speedKmh").concordance).toMatchObject({ value: 0.5, basis: "fixed", sampleSpacing: 1 });
  });
});

describe("method names as the page writes them", () => {
  it("every method label starts with its name (page table, chart legend, report and draft use the name)", () => {
    const r = lactateThresholds(
      CURVE.map((c, i) => ({ x: 50 * i, lactateMmolL: c.lactateMmolL })),
      "workW",
    );
    for (const t of r.thresholds) expect(t.intensity.provenance.label.startsWith(`${LACTATE_METHOD_NAMES[t.id]}:`)).toBe(true);
  });
});
