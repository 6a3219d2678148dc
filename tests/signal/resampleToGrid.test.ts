import { describe, expect, it } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { resampleToGrid } from "../../lib/signal";

describe("resampleToGrid (1-s linear interpolation)", () => {
  it("interpolates linearly between breaths (hand arithmetic)", () => {
    // INVENTED: breaths at 0.5 s (VO2 100), 3.5 s (400), 5 s (100)
    const rows: BreathRow[] = [
      { timeS: 0.5, vo2MlMin: 100, phase: "rest" },
      { timeS: 3.5, vo2MlMin: 400, phase: "exercise" },
      { timeS: 5, vo2MlMin: 100 },
    ];
    const out = resampleToGrid(Object.freeze(rows));
    expect(out.map((r) => r.timeS)).toEqual([1, 2, 3, 4, 5]);
    // slope 100 per s from 0.5 to 3.5: t=1 → 150, 2 → 250, 3 → 350; then −200 per s: t=4 → 300, 5 → 100
    expect(out.map((r) => r.vo2MlMin)).toEqual([150, 250, 350, 300, 100]);
    // phase from the latest breath at or before each grid point (the breath at 5 s carries none)
    expect(out.map((r) => r.phase)).toEqual(["rest", "rest", "rest", "exercise", undefined]);
  });

  it("does not bridge gaps longer than maxGapS; other step sizes", () => {
    const rows: BreathRow[] = [
      { timeS: 0, vo2MlMin: 0 },
      { timeS: 20, vo2MlMin: 2000 },
    ];
    expect(
      resampleToGrid(rows, { maxGapS: 10 })
        .filter((r) => r.vo2MlMin !== undefined)
        .map((r) => r.timeS),
    ).toEqual([0, 20]);
    expect(resampleToGrid(rows, { stepS: 5 }).map((r) => r.vo2MlMin)).toEqual([0, 500, 1000, 1500, 2000]);
    expect(resampleToGrid([])).toEqual([]);
  });
});
