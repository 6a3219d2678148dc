import { describe, it, expect } from "vitest";
import { oues } from "../../lib/thresholds/oues";
import { buildRows, EX_START_S, freezeTest, makeTest } from "./indicesFixture";

// Invented: VE = 10 + 0.1·(t − 180) L/min, VO2 = 800·log10(VE) + 200 mL/min exactly → OUES 800 (Baba 1996 form).
describe("OUES", () => {
  const test = freezeTest(
    makeTest(
      buildRows((t, phase) => {
        const ve = phase === "exercise" ? 10 + 0.1 * (t - EX_START_S) : 8;
        return { veLMin: ve, vo2MlMin: 800 * Math.log10(ve) + 200 };
      }),
    ),
  );
  const r = oues(test);

  it("is 800 over 100%, 90% and 75% of exercise", () => {
    expect(r.fits.map((f) => f.fraction)).toEqual([1, 0.9, 0.75]);
    for (const f of r.fits) {
      expect(f.slope.value).toBeCloseTo(800, 8);
      expect(f.intercept.value).toBeCloseTo(200, 7);
      expect(f.r2.value).toBeCloseTo(1, 12);
      expect(f.slope.provenance.sourceIds).toEqual(["baba-1996"]);
    }
  });

  it("the 75% fit ends at 180 + 0.75·600 = 630 s and uses breaths 180..630 (151)", () => {
    const f75 = r.fits[2];
    expect(f75.slope.provenance.window).toEqual({ startS: 180, endS: 630 });
    expect(f75.n).toBe(151);
  });

  it("a curve that is not log-linear gives different slopes by fraction", () => {
    const q = oues(
      makeTest(
        buildRows((t, phase) => {
          const ve = phase === "exercise" ? 10 + 0.1 * (t - EX_START_S) : 8;
          return { veLMin: ve, vo2MlMin: 30 * ve };
        }),
      ),
    );
    expect(q.fits[0].slope.value).toBeGreaterThan(q.fits[2].slope.value!);
  });
});
