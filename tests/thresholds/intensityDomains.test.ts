import { describe, it, expect } from "vitest";
import { measured } from "../../lib/core";
import { intensityDomains } from "../../lib/thresholds/intensityDomains";
import { measurePeaks } from "../../lib/thresholds/measurePeaks";
import { valuesAtThreshold } from "../../lib/thresholds/valuesAtThreshold";
import { standardRamp } from "./indicesFixture";

describe("intensity domains (invented ramp, VT1 at 420 s, VT2 at 660 s)", () => {
  const test = standardRamp();
  const peaks = measurePeaks(test);
  const a1 = valuesAtThreshold(test, { timeS: 420, vo2MlMin: 1480 }, { name: "VT1" });
  const a2 = valuesAtThreshold(test, { timeS: 660, vo2MlMin: 1960 }, { name: "VT2" });

  it("moderate < VT1 ≤ heavy < VT2 ≤ severe ≤ peak, in HR and work rate", () => {
    const r = intensityDomains(a1, a2, peaks);
    expect(r.domains.map((d) => d.id)).toEqual(["moderate", "heavy", "severe"]);
    const [mod, heavy, severe] = r.domains;
    // HR at 420 s: 108; at 660 s: 60 + 0.2·480 = 156; peak HR 177. Work: 80, 160, 200 W
    expect(mod.hrBpm.lower).toBeNull();
    expect(mod.hrBpm.upper?.value).toBeCloseTo(108, 9);
    expect(heavy.hrBpm.lower?.value).toBeCloseTo(108, 9);
    expect(heavy.hrBpm.upper?.value).toBeCloseTo(156, 9);
    expect(severe.hrBpm.upper?.value).toBeCloseTo(177, 9);
    expect(heavy.workW.upper?.value).toBeCloseTo(160, 9);
    expect(severe.workW.upper?.value).toBe(200);
    expect(severe.speedKmh.lower).toBeNull();
    expect(r.sourceIds).toEqual(["intensity-domains"]);
    expect(r.issues.map((i) => i.code)).toEqual(["ramp-work-rates"]);
  });

  it("with a measured VO2 lag, the constant-load work rates are the ramp's one lag earlier", () => {
    // the invented ramp rises 1/3 W per s (20 W/min); an invented 60-s lag moves each bound 20 W down: VT1 80 → 60 W,
    // VT2 160 → 140 W, and the severe domain has no constant-load top (a peak is not held)
    const lag = {
      lagS: measured(60, "s", { method: "ramp-vo2-lag", label: "invented lag", sourceIds: ["whipp-1981-ramp"] }),
      rampWPerS: 1 / 3,
    };
    const [mod, heavy, severe] = intensityDomains(a1, a2, peaks, lag).domains;
    expect(mod.workConstantLoadW.lower).toBeNull();
    expect(mod.workConstantLoadW.upper?.value).toBeCloseTo(60, 9);
    expect(heavy.workConstantLoadW.lower?.value).toBeCloseTo(60, 9);
    expect(heavy.workConstantLoadW.upper?.value).toBeCloseTo(140, 9);
    expect(severe.workConstantLoadW.lower?.value).toBeCloseTo(140, 9);
    expect(severe.workConstantLoadW.upper).toBeNull();
    const r = intensityDomains(a1, a2, peaks, lag);
    expect(r.lag.value).toBe(60);
    expect(r.issues.find((i) => i.code === "ramp-work-rates")?.message).toMatch(
      /about 60 s, so the work rate held at constant load for the same intensity is about 20 W lower/,
    );
    // without a lag, no constant-load work rate and the issue says the lag was not measured
    const none = intensityDomains(a1, a2, peaks);
    expect(none.domains.every((d) => d.workConstantLoadW.lower === null && d.workConstantLoadW.upper === null)).toBe(true);
    expect(none.issues.find((i) => i.code === "ramp-work-rates")?.message).toMatch(/could not be measured/);
  });

  it("only VT1 → moderate domain only, with an issue", () => {
    const r = intensityDomains(a1, null, peaks);
    expect(r.domains.map((d) => d.id)).toEqual(["moderate"]);
    expect(r.issues.map((i) => i.code)).toContain("domains-incomplete");
  });
});

describe("intensity domains when the thresholds are out of order (invented ramp)", () => {
  const test = standardRamp();
  const peaks = measurePeaks(test);
  it("gives no domain, and a warning, when VT2 lies at or below VT1 or before it — never a range that runs backwards", () => {
    // as seen on a smoothed export: VT1 739 mL/min at 626 s, VT2 631 mL/min at 552 s gave "VT1 to VT2: 102–95 bpm"
    const a1 = valuesAtThreshold(test, { timeS: 660, vo2MlMin: 1960 }, { name: "VT1" });
    const a2 = valuesAtThreshold(test, { timeS: 420, vo2MlMin: 1480 }, { name: "VT2" });
    const r = intensityDomains(a1, a2, peaks);
    expect(r.domains).toEqual([]);
    expect(r.issues.map((i) => [i.severity, i.code])).toEqual([["warning", "domains-thresholds-out-of-order"]]);
    // equal VO2 is not "above" either
    const same = valuesAtThreshold(test, { timeS: 700, vo2MlMin: 1960 }, { name: "VT2" });
    expect(intensityDomains(a1, same, peaks).domains).toEqual([]);
  });
});

describe("intensity domains on a treadmill (invented walk: speed 4 → 8 km/h and grade 0 → 16 % over the exercise)", () => {
  // speed and grade rise linearly with time, so at each threshold time they are known by construction
  const test = standardRamp();
  const frac = (t: number) =>
    Math.min(1, Math.max(0, (t - test.exercise!.startS) / (test.exercise!.endS - test.exercise!.startS)));
  const rows = test.clean.map((r) => ({ ...r, workW: undefined, speedKmh: 4 + 4 * frac(r.timeS), gradePct: 16 * frac(r.timeS) }));
  const tm = { ...test, clean: rows, averaged: rows };
  const peaks = measurePeaks(tm);
  const a1 = valuesAtThreshold(tm, { timeS: 420, vo2MlMin: 1480 }, { name: "VT1" });
  const a2 = valuesAtThreshold(tm, { timeS: 660, vo2MlMin: 1960 }, { name: "VT2" });

  it("gives each domain its grade beside its speed: the grade at VT1, at VT2 and at peak", () => {
    const [mod, heavy, severe] = intensityDomains(a1, a2, peaks).domains;
    // a centred window over a straight line reads the line at its centre (mean of a linear function)
    expect(mod.gradePct.upper?.value).toBeCloseTo(16 * frac(420), 6);
    expect(mod.speedKmh.upper?.value).toBeCloseTo(4 + 4 * frac(420), 6);
    expect(heavy.gradePct.lower?.value).toBeCloseTo(16 * frac(420), 6);
    expect(heavy.gradePct.upper?.value).toBeCloseTo(16 * frac(660), 6);
    expect(severe.gradePct.upper?.value).toBeCloseTo(16, 6);
    expect(severe.workW.upper).toBeNull();
  });
});
