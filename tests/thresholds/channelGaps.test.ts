import { describe, it, expect } from "vitest";
import { channelGaps, CHANNEL_GAP_MIN_S, hrGapIssues } from "../../lib/thresholds/channelGaps";
import { o2Pulse } from "../../lib/thresholds/o2Pulse";
import { measurePeaks } from "../../lib/thresholds/measurePeaks";
import { buildRows, EX_START_S, freezeTest, makeTest } from "./indicesFixture";

// INVENTED synthetic test (indicesFixture: a breath every 3 s, exercise 180–780 s): HR 100 bpm, VO2 = 100 × an O2 pulse
// rising 0.6 mL/beat per min, and HR dropped from the breaths in `missing` while VO2 keeps coming. Gaps, bins and
// reasons are known by construction.
const pulse = (t: number) => 8 + 0.01 * (t - EX_START_S);
function withHrMissing(missing: (t: number) => boolean) {
  return makeTest(
    buildRows((t, phase) => {
      const vo2MlMin = phase === "exercise" ? 100 * pulse(t) : 400;
      return missing(t) ? { vo2MlMin } : { vo2MlMin, hrBpm: phase === "exercise" ? 100 : 70 };
    }),
  );
}

describe("gaps in the HR channel inside exercise (minimum 30 s: our choice, the length of the peak and O2 pulse windows)", () => {
  it("HR missing on the breaths 603–699 s → one gap from the last HR at 600 s to the next at 702 s, 33 breaths", () => {
    const gaps = channelGaps(freezeTest(withHrMissing((t) => t >= 603 && t <= 699)), "hrBpm");
    expect(gaps).toEqual([{ field: "hrBpm", startS: 600, endS: 702, rowsWithout: 33, reachesExerciseEnd: false }]);
    const issues = hrGapIssues(withHrMissing((t) => t >= 603 && t <= 699));
    expect(issues.map((i) => [i.severity, i.code])).toEqual([["warning", "hr-missing-in-exercise"]]);
    expect(issues[0].message).toContain("HR missing from 600 to 702 s of exercise (102 s)");
    expect(issues[0].where).toEqual({ field: "hrBpm", timeS: 600 });
  });

  it("a hole shorter than 30 s (600 → 627 s, 27 s) is not a gap; one of exactly 30 s (600 → 630 s) is", () => {
    expect(CHANNEL_GAP_MIN_S).toBe(30);
    expect(
      channelGaps(
        withHrMissing((t) => t >= 603 && t <= 624),
        "hrBpm",
      ),
    ).toEqual([]);
    expect(
      channelGaps(
        withHrMissing((t) => t >= 603 && t <= 627),
        "hrBpm",
      ),
    ).toHaveLength(1);
  });

  it("HR missing from 702 s to the end of exercise, back in recovery → the gap reaches the end of exercise (clipped at 780 s)", () => {
    const gaps = channelGaps(
      withHrMissing((t) => t >= 702 && t <= 780),
      "hrBpm",
    );
    expect(gaps).toEqual([{ field: "hrBpm", startS: 699, endS: 780, rowsWithout: 27, reachesExerciseEnd: true }]);
    expect(hrGapIssues(withHrMissing((t) => t >= 702 && t <= 780))[0].message).toContain(
      "HR missing from 699 s to the end of exercise (780 s; 81 s)",
    );
  });

  it("no HR anywhere in exercise is a missing signal, not a gap", () => {
    expect(
      channelGaps(
        withHrMissing((t) => t >= EX_START_S),
        "hrBpm",
      ),
    ).toEqual([]);
  });
});

describe("O2 pulse pattern and peak O2 pulse across an HR gap", () => {
  it("without a gap the rising pulse reads 'rising'; with HR missing 603–699 s the pattern is not assessed, with the reason", () => {
    expect(o2Pulse(withHrMissing(() => false)).pattern).toBe("rising");
    const r = o2Pulse(freezeTest(withHrMissing((t) => t >= 603 && t <= 699)));
    expect(r.pattern).toBeNull();
    expect(r.patternReason).toBe(
      "HR missing from 600 to 702 s of exercise (102 s): the O2 pulse trajectory is not assessed across a gap in HR",
    );
    // final third starts at 780 − 200 = 580 s: the gap lies in it, not in the earlier part
    expect(r.finalSlope.value).toBeNull();
    expect(r.earlierSlope.value).toBeCloseTo(0.6, 9);
    // 30-s bins from 180 s: [600, 630) … [690, 720) touch the gap and are left out, 16 of 20 remain
    expect(r.trajectory).toHaveLength(16);
    expect(r.issues.map((i) => i.code)).toContain("o2-pulse-pattern-not-assessed");
  });

  it("no HR in the peak VO2 window (VO2 highest at the end of the ramp, HR missing 702–780 s) → peak O2 pulse not determinable", () => {
    const p = measurePeaks(withHrMissing((t) => t >= 702 && t <= 780));
    expect(p.vo2MlMin.provenance.window).toEqual({ startS: 750, endS: 780 });
    expect(p.o2PulseMlBeat.value).toBeNull();
    expect(p.o2PulseMlBeat.reason).toBe("no HR in the peak VO2 window (12:30–13:00)");
    // the highest HR may lie in the gap: no peak HR is claimed (by construction HR is 100 bpm before it)
    expect(p.hrBpm.value).toBeNull();
    expect(p.hrBpm.reason).toBe("HR missing from 699 s to the end of exercise (780 s; 81 s): the highest HR may lie in the gap");
    // HR back before the end of exercise: the peak is read as usual
    expect(measurePeaks(withHrMissing((t) => t >= 603 && t <= 699)).hrBpm.value).toBeCloseTo(100, 9);
  });
});
