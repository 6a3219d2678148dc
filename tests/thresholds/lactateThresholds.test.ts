import { describe, it, expect } from "vitest";
import { lactatePointsFromTest, lactateThresholds, type LactatePoint } from "../../lib/thresholds/lactateThresholds";
import { buildRows, makeTest, rampW } from "./indicesFixture";

const byId = (r: ReturnType<typeof lactateThresholds>, id: string) => r.thresholds.find((t) => t.id === id)!;

// Methods and cut-offs under test (lib source ids in brackets):
// - OBLA at 4 mmol/L: Sjödin B, Jacobs I, Int J Sports Med 1981;2:23-26 — confirmed ["sjodin-jacobs-1981"];
// - baseline + 1 mmol/L: Bishop D, Jenkins DG, Mackinnon LT, Med Sci Sports Exerc 1998;30:1270-5 — confirmed
//   ["bishop-1998"]; baseline = lowest value is our choice ["implementation-choice"];
// - Dmax: Cheng B et al., Int J Sports Med 1992;13:518 — secondary (citation recalled) ["cheng-1992-dmax"];
// - modified Dmax: named in Bishop et al. 1998 (confirmed); chord start "point before the first rise > 0.4 mmol/L"
//   recalled ["bishop-1998-mod-dmax-rule"];
// - log-log: Beaver WL, Wasserman K, Whipp BJ, J Appl Physiol 1985;59:1936 — secondary (citation recalled)
//   ["beaver-1985-loglog"];
// - concordance tolerance: the larger of 10 W (0.5 km/h on the speed axis) and half the median sample spacing, the
//   lib's default concordanceTolerance, our choice ["implementation-choice"], not a published value.

describe("fixed-level methods (invented four-point curve)", () => {
  const pts: LactatePoint[] = Object.freeze([
    { x: 100, lactateMmolL: 1.0 },
    { x: 150, lactateMmolL: 1.5 },
    { x: 200, lactateMmolL: 3.0 },
    { x: 250, lactateMmolL: 5.0 },
  ]) as LactatePoint[];
  const r = lactateThresholds(pts, "workW", { vt1: 170, vt2: 220 });

  it("OBLA 4 mmol/L (Sjödin & Jacobs, Int J Sports Med 1981, confirmed): 200 + (4 − 3)/(5 − 3)·50 = 225 W", () => {
    expect(byId(r, "obla-4").intensity.value).toBeCloseTo(225, 9);
    expect(byId(r, "obla-4").lactateMmolL.value).toBeCloseTo(4, 9);
  });
  it("baseline + 1 (Bishop et al., Med Sci Sports Exerc 1998, confirmed): 2.0 mmol/L at 150 + (0.5/1.5)·50 = 166.67 W", () => {
    expect(byId(r, "baseline-plus-1").intensity.value).toBeCloseTo(150 + 50 / 3, 9);
  });
  it("states where each threshold sits against the VT it estimates; samples 50 W apart cannot tell them apart", () => {
    const obla = r.relations.find((x) => x.id === "obla-4")!;
    expect(obla.comparedWith).toBe("VT2");
    expect(obla.difference).toBeCloseTo(5, 9);
    // 5/220 = 2.27%; samples 50 W apart → tolerance max(10, 50/2) = 25 W (our choice, not a published value); the
    // spacing is wider than 20 W (our choice), so within it the two cannot be told apart — not "concordant"
    expect(obla.reading).toBe("not-separable");
    expect(obla.concordant).toBe(false);
    expect(obla.statement).toBe(
      "OBLA (4 mmol/L) at 225 W lies 5 W (2.3%) above VT2 (220 W): cannot be told apart at this sampling: the samples lie a median 50 W apart, so a threshold is placed only to within 25 W.",
    );
    expect(r.concordance).toMatchObject({ value: 25, basis: "sample-spacing", sampleSpacing: 50 });
    const b1 = r.relations.find((x) => x.id === "baseline-plus-1")!;
    expect(b1.comparedWith).toBe("VT1");
    expect(b1.difference).toBeCloseTo(-10 / 3, 9);
    expect(b1.verdictShort).toBe("cannot be told apart at this sampling (within 25 W)");
  });
  it("never reaching 4 mmol/L → not determinable", () => {
    const low = lactateThresholds(
      pts.map((p) => ({ ...p, lactateMmolL: p.lactateMmolL / 2 })),
      "workW",
    );
    expect(byId(low, "obla-4").intensity.value).toBeNull();
    expect(byId(low, "obla-4").intensity.reason).toMatch(/never reached 4/);
  });
});

describe("Dmax and modified Dmax on an exact cubic", () => {
  // Invented: lactate = 1 + 4·u³, u = (x − 100)/200, x = 100..300 W every 25 W (9 points, cubic fit exact)
  const pts = Array.from({ length: 9 }, (_, i) => {
    const x = 100 + 25 * i;
    return { x, lactateMmolL: 1 + 4 * ((x - 100) / 200) ** 3 };
  });
  const r = lactateThresholds(pts, "workW");

  it("Dmax (Cheng et al., Int J Sports Med 1992, secondary): chord slope 4/200 = 0.02/W; y' = 0.06·u² = 0.02 → u = √(1/3) → x = 100 + 200·0.57735 = 215.47 W", () => {
    expect(byId(r, "dmax").intensity.value).toBeCloseTo(100 + 200 * Math.sqrt(1 / 3), 6);
  });

  it("modified Dmax (Bishop et al. 1998; 0.4 mmol/L rule recalled): first rise > 0.4 is 200→225 W (0.5 → 0.977), chord from 200 W (1.5) to 300 W (5): slope 0.035 → u = √(0.035/0.06) → 252.75 W", () => {
    expect(byId(r, "modified-dmax").intensity.value).toBeCloseTo(100 + 200 * Math.sqrt(0.035 / 0.06), 6);
    expect(byId(r, "modified-dmax").intensity.provenance.inputs?.chordStart).toBe(200);
  });

  it("Dmax is where a brute-force grid finds the largest vertical gap below the chord", () => {
    const f = (x: number) => 1 + 4 * ((x - 100) / 200) ** 3;
    let best = { x: 0, d: -Infinity };
    for (let x = 100; x <= 300; x += 0.01) {
      const d = f(100) + ((f(300) - f(100)) / 200) * (x - 100) - f(x);
      if (d > best.d) best = { x, d };
    }
    expect(Math.abs(byId(r, "dmax").intensity.value! - best.x)).toBeLessThan(0.02);
  });

  it("a straight line has no Dmax (the curve never lies below its chord)", () => {
    const line = lactateThresholds(
      pts.map((p) => ({ x: p.x, lactateMmolL: 1 + p.x / 100 })),
      "workW",
    );
    expect(byId(line, "dmax").intensity.value).toBeNull();
  });
});

describe("log-log two-segment (Beaver, Wasserman & Whipp, J Appl Physiol 1985, secondary)", () => {
  it("two power laws meeting at 200 W → threshold 200 W", () => {
    // Invented: L = (x/100)^0.2 up to 200 W, L = 2^0.2·(x/200)^3 above; both lines pass through log10(200)
    const pts = Array.from({ length: 9 }, (_, i) => {
      const x = 100 + 25 * i;
      return { x, lactateMmolL: x <= 200 ? (x / 100) ** 0.2 : 2 ** 0.2 * (x / 200) ** 3 };
    });
    const r = lactateThresholds(pts, "workW");
    expect(byId(r, "log-log").intensity.value).toBeCloseTo(200, 6);
  });
  it("too few points → not determinable", () => {
    const r = lactateThresholds(
      [
        { x: 100, lactateMmolL: 1 },
        { x: 150, lactateMmolL: 2 },
        { x: 200, lactateMmolL: 4 },
        { x: 250, lactateMmolL: 8 },
      ],
      "workW",
    );
    expect(byId(r, "log-log").intensity.value).toBeNull();
  });
});

describe("points from a test", () => {
  it("samples with only a time get the ramp work rate at that time; duplicates at one load are averaged", () => {
    const test = makeTest(buildRows((t, phase) => ({ workW: phase === "exercise" ? rampW(t) : 0 })));
    const got = lactatePointsFromTest(test, [
      { timeS: 330, lactateMmolL: 1.2 },
      { timeS: 480, lactateMmolL: 2 },
      { workW: 100, lactateMmolL: 2.4 },
    ]);
    expect(got.axis).toBe("workW");
    // 330 s → 50 W; 480 s → 100 W
    expect(got.points).toMatchObject([
      { x: 50, lactateMmolL: 1.2 },
      { x: 100, lactateMmolL: 2 },
      { x: 100, lactateMmolL: 2.4 },
    ]);
    const r = lactateThresholds(got.points, got.axis);
    expect(r.points).toMatchObject([
      { x: 50, lactateMmolL: 1.2 },
      { x: 100, lactateMmolL: 2.2 },
    ]);
    expect(r.issues.map((i) => i.code)).toContain("lactate-too-few-points");
  });
  it("samples given by stage number take that stage's work rate", () => {
    const rows = [50, 100, 150].map((w, i) => ({ timeS: 180 * (i + 1), stage: i + 1, workW: w }));
    const got = lactatePointsFromTest(makeTest(rows, { shape: "stage" }), [
      { stage: 2, lactateMmolL: 1.5 },
      { stage: 3, lactateMmolL: 3 },
    ]);
    expect(got.points).toMatchObject([
      { x: 100, lactateMmolL: 1.5 },
      { x: 150, lactateMmolL: 3 },
    ]);
  });
  it("a stage table's lactate column is used when no samples are given; speed axis without work", () => {
    const rows = [8, 10, 12, 14, 16].map((s, i) => ({ timeS: 180 * (i + 1), speedKmh: s, lactateMmolL: [1, 1.3, 2, 3.5, 6][i] }));
    const test = makeTest(rows, { shape: "stage" });
    const got = lactatePointsFromTest(test);
    expect(got.axis).toBe("speedKmh");
    const r = lactateThresholds(got.points, got.axis);
    expect(r.unit).toBe("km/h");
    // 4 mmol/L between 14 (3.5) and 16 (6): 14 + 0.5/2.5·2 = 14.4 km/h
    expect(byId(r, "obla-4").intensity.value).toBeCloseTo(14.4, 9);
  });
});
