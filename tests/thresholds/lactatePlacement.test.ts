import { describe, expect, it } from "vitest";
import { lactatePointsFromTest } from "../../lib/thresholds/lactateThresholds";
import { buildRows, makeTest, rampW } from "./indicesFixture";

// Lactate samples that cannot be placed on a work rate or speed are never dropped silently (synthetic ramp, invented).
describe("lactate samples that cannot be placed", () => {
  const ramp = () => makeTest(buildRows((t, phase) => ({ workW: phase === "exercise" ? rampW(t) : 0 })));

  it("samples by stage number on a breath file without stages: no points and a warning that says why", () => {
    const got = lactatePointsFromTest(ramp(), [
      { stage: 1, lactateMmolL: 1.1 },
      { stage: 2, lactateMmolL: 2.5 },
      { stage: 3, lactateMmolL: 4.8 },
    ]);
    expect(got.points).toHaveLength(0);
    expect(got.issues).toHaveLength(1);
    expect(got.issues[0].code).toBe("lactate-not-placed");
    expect(got.issues[0].severity).toBe("warning");
    expect(got.issues[0].message).toMatch(/None of the 3 lactate sample\(s\) could be placed: they name a stage/);
  });

  it("one sample out of three without a place: the other two are kept and the one left out is counted", () => {
    const got = lactatePointsFromTest(ramp(), [
      { timeS: 330, lactateMmolL: 1.2 },
      { timeS: 480, lactateMmolL: 2 },
      { stage: 9, lactateMmolL: 5 },
    ]);
    expect(got.points).toHaveLength(2);
    expect(got.issues.map((i) => i.code)).toEqual(["lactate-without-intensity"]);
    expect(got.issues[0].message).toMatch(/^1 lactate sample/);
  });
});
