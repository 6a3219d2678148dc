import { describe, it, expect } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { measured } from "../../lib/core";
import type { PhaseSpan } from "../../lib/signal";
import { heartRateIndices, HR_RECOVERY_MAX_ROW_INTERVAL_S } from "../../lib/thresholds/heartRateIndices";
import { buildRows, EX_END_S, freezeTest, makeTest } from "./indicesFixture";

// Cut-offs: HR recovery at 1 min ≤ 12 bpm abnormal (Cole CR, Blackstone EH, Pashkow FJ, Snader CE, Lauer MS, N Engl J Med
// 1999;341:1351-7 — confirmed ["cole-1999"]); at 2 min ≤ 42 bpm (Cole CR et al., Ann Intern Med 2000;132:552-5 —
// confirmed ["cole-2000"]). Rows ≥ 15 s apart are not read (our choice, measured: see HR_RECOVERY_MAX_ROW_INTERVAL_S).

const peak = (v: number) => measured(v, "1/min", { method: "test", label: "peak HR", sourceIds: [] });
const TRUE_END_S = 783;

/**
 * INVENTED test exported as time bins of `binS` s: HR 150 bpm and 200 W until the true end of exercise at 783 s, then
 * HR falling `dropPerMin` bpm per minute and 0 W. Each row holds the exact mean of its bin; `labelAt` says whether the
 * row's time marks the bin's end or centre. As HR is linear in recovery, a bin mean equals HR at the bin centre, so
 * HR 60 s after the true end is 150 − dropPerMin and the recovery at 1 min is dropPerMin, by construction.
 */
function binned(binS: number, dropPerMin: number, labelAt: "end" | "centre" = "end") {
  const hrAt = (t: number) => (t <= TRUE_END_S ? 150 : 150 - (dropPerMin * (t - TRUE_END_S)) / 60);
  const mean = (f: (t: number) => number, a: number, b: number) => {
    const n = 600;
    let s = 0;
    for (let k = 0; k < n; k++) s += f(a + ((k + 0.5) * (b - a)) / n);
    return s / n;
  };
  const rows: BreathRow[] = [];
  for (let a = 0; a + binS <= 1100; a += binS) {
    const b = a + binS;
    const phase = b <= 180 ? "rest" : b <= TRUE_END_S ? "exercise" : "recovery";
    const hrBpm = phase === "rest" ? 70 : mean(hrAt, a, b);
    const workW = phase === "rest" ? 0 : mean((t) => (t <= TRUE_END_S ? 200 : 0), a, b);
    rows.push({ timeS: labelAt === "end" ? b : a + binS / 2, phase, hrBpm, workW, vo2MlMin: 1000 });
  }
  const shift = labelAt === "end" ? 0 : -binS / 2;
  const lastEx = Math.floor(TRUE_END_S / binS) * binS + shift;
  const phases: PhaseSpan[] = [
    { phase: "rest", startS: 0, endS: 180 + shift, source: "markers" },
    { phase: "exercise", startS: 180 + binS + shift, endS: lastEx, source: "markers" },
    { phase: "recovery", startS: lastEx + binS, endS: 1100, source: "markers" },
  ];
  return makeTest(rows, { phases, exercise: { startS: 180 + binS + shift, endS: lastEx } });
}

describe("HR recovery from time-averaged rows", () => {
  it("10-s bins: the end of exercise is placed inside the mixed row from its load → 1-min recovery 20 bpm, 2-min 40 bpm", () => {
    const r = heartRateIndices(freezeTest(binned(10, 20)), { peakHr: peak(150) });
    expect(r.recovery1MinBpm.value).toBeCloseTo(20, 6);
    expect(r.recovery2MinBpm.value).toBeCloseTo(40, 6);
    expect(r.recovery1MinAbnormal).toBe(false);
    // mixed row 780–790 s holds 3 s of 200 W: 30 % of the way in; the reading starts at label 780 + 5 + 3 = 788 s
    expect(r.recovery1MinBpm.provenance.window).toEqual({ startS: 788, endS: 848 });
    const note = r.issues.find((i) => i.code === "hr-recovery-from-averaged-rows");
    expect(note?.message).toContain("about 10 s apart");
    expect(note?.message).toContain("30 % of the way into the row");
  });

  it("the same bins labelled at their centres give the same recovery (the reading does not depend on the label convention)", () => {
    const r = heartRateIndices(binned(10, 20, "centre"), { peakHr: peak(150) });
    expect(r.recovery1MinBpm.value).toBeCloseTo(20, 6);
  });

  it("the abnormal call is withheld when 12 bpm lies within the margin of one row's HR fall (13 ± 13/6 bpm on 10-s rows)", () => {
    const r = heartRateIndices(binned(10, 13), { peakHr: peak(150) });
    expect(r.recovery1MinBpm.value).toBeCloseTo(13, 6);
    expect(r.recovery1MinBpm.provenance.inputs?.marginBpm).toBeCloseTo(13 / 6, 6);
    expect(r.recovery1MinAbnormal).toBeNull();
    expect(r.issues.find((i) => i.code === "hr-recovery-from-averaged-rows")?.message).toContain("call is withheld");
  });

  it(`rows ${HR_RECOVERY_MAX_ROW_INTERVAL_S} s apart or more: HR recovery not determinable, with the reason`, () => {
    expect(HR_RECOVERY_MAX_ROW_INTERVAL_S).toBe(15);
    const r = heartRateIndices(binned(15, 20), { peakHr: peak(150) });
    expect(r.recovery1MinBpm.value).toBeNull();
    expect(r.recovery1MinAbnormal).toBeNull();
    expect(r.recovery1MinBpm.reason).toContain("time averages about 15 s apart");
    expect(r.recovery2MinBpm.value).toBeNull();
  });
});

describe("HR indices: reasons when not determinable", () => {
  // INVENTED: rest 70 bpm, ramp 70 → 150 bpm, recovery falling 20 bpm/min (indicesFixture timeline).
  const test = () =>
    makeTest(
      buildRows((t, phase) => ({
        hrBpm: phase === "rest" ? 70 : phase === "exercise" ? 70 + ((t - 180) / 600) * 80 : 150 - (20 * (t - EX_END_S)) / 60,
      })),
    );

  it("no recovery rows → 'no recovery recorded'", () => {
    const t = test();
    const r = heartRateIndices({ ...t, clean: t.clean.filter((x) => x.timeS <= EX_END_S) }, { peakHr: peak(150) });
    expect(r.recovery1MinBpm.reason).toBe("no recovery recorded: the record ends with exercise");
  });

  it("recovery shorter than 60 s → how long it was", () => {
    const t = test();
    const r = heartRateIndices({ ...t, clean: t.clean.filter((x) => x.timeS <= EX_END_S + 30) }, { peakHr: peak(150) });
    expect(r.recovery1MinBpm.reason).toBe("recovery HR recorded for only 30 s after the end of exercise (60 s needed)");
  });

  it("no rest phase → chronotropic index not determinable: 'no resting HR: the recording has no rest phase'", () => {
    const t = test();
    const r = heartRateIndices(
      { ...t, phases: t.phases.filter((p) => p.phase !== "rest") },
      { peakHr: peak(150), predictedHrMaxBpm: 170, ageY: 50 },
    );
    expect(r.chronotropicIndex.value).toBeNull();
    expect(r.chronotropicIndex.reason).toBe("no resting HR: the recording has no rest phase");
  });

  it("HR missing from 699 s to the end of exercise → HR recovery not determinable (HR at the end of exercise unknown)", () => {
    const t = test();
    const clean = t.clean.map((x) => (x.timeS >= 702 && x.timeS <= EX_END_S ? { ...x, hrBpm: undefined, vo2MlMin: 1000 } : x));
    const r = heartRateIndices({ ...t, clean }, { peakHr: peak(150) });
    expect(r.recovery1MinBpm.reason).toBe(
      "HR missing from 699 s to the end of exercise (780 s; 81 s): HR at the end of exercise is unknown",
    );
  });

  it("the chosen HRmax equation gives no value → no 220 − age in its place; HR reserve and % predicted say why", () => {
    const r = heartRateIndices(test(), {
      peakHr: peak(150),
      ageY: 50,
      predictedHrMaxEquationId: "ers-2019-hrmax-cycle",
      predictedHrMaxNotDeterminedReason: "needs sex",
    });
    expect(r.predictedMaxBpm.value).toBeNull();
    expect(r.predictedMaxBpm.reason).toBe("predicted HRmax not determinable: needs sex");
    expect(r.percentPredicted.reason).toBe("no predicted HRmax: predicted HRmax not determinable: needs sex");
    expect(r.reserveBpm.value).toBeNull();
    expect(r.issues.map((i) => i.code)).not.toContain("hrmax-default-equation");
  });
});
