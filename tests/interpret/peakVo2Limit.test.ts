import { describe, expect, it } from "vitest";
import { peakVo2ReducedLimit } from "../../lib/interpret";

// The limits are the options of choices.json "peak-vo2-normal", each with its source: < 85 % (Respir Res 2021 practical
// guide, secondary), ≤ 84 % (ATS/ACCP 2003, recalled), < 80 % (Cleveland Clin J Med patterns, secondary).
describe("the lab's limit for a reduced peak VO2, shared by the conclusion and the weight-basis note", () => {
  it("default and each option", () => {
    expect(peakVo2ReducedLimit()).toMatchObject({ op: "<", pct: 85 });
    expect(peakVo2ReducedLimit({ choices: { "peak-vo2-normal": "at-or-below-84" } })).toMatchObject({ op: "<=", pct: 84 });
    expect(peakVo2ReducedLimit({ choices: { "peak-vo2-normal": "below-80" } })).toMatchObject({ op: "<", pct: 80 });
    // an unknown option falls back to the documented default, as in the interpretation
    expect(peakVo2ReducedLimit({ choices: { "peak-vo2-normal": "nope" } })).toMatchObject({ op: "<", pct: 85 });
  });
});
