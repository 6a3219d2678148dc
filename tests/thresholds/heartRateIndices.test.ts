import { describe, it, expect } from "vitest";
import { measured } from "../../lib/core";
import { heartRateIndices } from "../../lib/thresholds/heartRateIndices";
import { buildRows, EX_END_S, freezeTest, makeTest } from "./indicesFixture";

const peak = (v: number) => measured(v, "1/min", { method: "test", label: "peak HR", sourceIds: [] });
// Invented: rest 70 bpm; recovery HR falls from 150 at 780 s by `dropPerMin` bpm per minute.
function withRecovery(dropPerMin: number) {
  return makeTest(
    buildRows((t, phase) => ({
      hrBpm:
        phase === "rest" ? 70 : phase === "exercise" ? 70 + ((t - 180) / 600) * 80 : 150 - (dropPerMin * (t - EX_END_S)) / 60,
    })),
  );
}

describe("heart-rate indices", () => {
  // Cut-offs (lib source ids in brackets):
  // - chronotropic index impaired < 0.80, HRpred = 220 − age, and HR recovery at 1 min abnormal ≤ 12 bpm: Cole CR,
  //   Blackstone EH, Pashkow FJ, Snader CE, Lauer MS, N Engl J Med 1999;341:1351-7 — confirmed ["cole-1999"];
  // - HR recovery at 2 min abnormal ≤ 42 bpm after a submaximal test: Cole CR et al., Ann Intern Med
  //   2000;132:552-5 — confirmed ["cole-2000"];
  // - chronotropic index impaired < 0.62 on beta-blockers: Brubaker & Kitzman — recalled (no year or journal
  //   recorded) ["brubaker-kitzman-beta-blocker"];
  // - HRmax = 220 − age: Fox (history in Robergs & Landwehr, JEPonline 2002) — confirmed ["fox-hrmax"].
  it("chronotropic index exactly 0.80 is not impaired (Cole et al., N Engl J Med 1999, confirmed: impaired < 0.80)", () => {
    // (150 − 70)/(170 − 70) = 0.80 with HRpred = 220 − 50 y = 170 (Cole 1999's form)
    const r = heartRateIndices(freezeTest(withRecovery(12)), {
      peakHr: peak(150),
      predictedHrMaxBpm: 170,
      predictedHrMaxEquationId: "jones-1985-hrmax",
      ageY: 50,
    });
    expect(r.restingBpm.value).toBeCloseTo(70, 9);
    expect(r.chronotropicIndex.value).toBeCloseTo(0.8, 12);
    expect(r.chronotropicImpaired).toBe(false);
    expect(r.reserveBpm.value).toBe(20);
    expect(r.percentPredicted.value).toBeCloseTo((100 * 150) / 170, 9);
    expect(r.predictedMaxBpm.provenance.sourceIds).toEqual(["jones-1985-hrmax"]);
  });

  it("the chronotropic index uses 220 − age, the form its 0.80 cut-off was derived with (Cole 1999), not the lab's HRmax", () => {
    // lab equation 160 bpm, age 50 → index (150 − 70)/(170 − 70) = 0.80, not (150 − 70)/(160 − 70) = 0.89
    const r = heartRateIndices(withRecovery(12), { peakHr: peak(150), predictedHrMaxBpm: 160, ageY: 50 });
    expect(r.chronotropicIndex.value).toBeCloseTo(0.8, 12);
    expect(r.chronotropicIndex.provenance.label).toMatch(/HRpred = 220 − age/);
    expect(r.reserveBpm.value).toBe(10); // HR reserve stays on the lab's equation: 160 − 150
    const noAge = heartRateIndices(withRecovery(12), { peakHr: peak(150), predictedHrMaxBpm: 160 });
    expect(noAge.chronotropicIndex.reason).toBe("no age: HRpred = 220 − age needs it");
  });

  it("chronotropic index 0.79 is impaired; on beta-blockers the 0.62 cut-off (Brubaker & Kitzman, recalled) applies", () => {
    // (149 − 70)/(170 − 70) = 0.79 with HRpred = 220 − 50 y
    const r = heartRateIndices(withRecovery(12), { peakHr: peak(149), predictedHrMaxBpm: 170, ageY: 50 });
    expect(r.chronotropicImpaired).toBe(true);
    const b = heartRateIndices(withRecovery(12), { peakHr: peak(149), predictedHrMaxBpm: 170, betaBlocker: true, ageY: 50 });
    expect(b.chronotropicCutoff).toBe(0.62);
    expect(b.chronotropicImpaired).toBe(false);
    expect(b.chronotropicIndex.provenance.sourceIds).toContain("brubaker-kitzman-beta-blocker");
  });

  it("HR recovery exactly 12 bpm at 1 min is abnormal (Cole et al., N Engl J Med 1999, confirmed: ≤ 12); 13 is not", () => {
    const r = heartRateIndices(withRecovery(12), { peakHr: peak(150), predictedHrMaxBpm: 170 });
    expect(r.recovery1MinBpm.value).toBeCloseTo(12, 9);
    expect(r.recovery1MinAbnormal).toBe(true);
    const s = heartRateIndices(withRecovery(13), { peakHr: peak(150), predictedHrMaxBpm: 170 });
    expect(s.recovery1MinBpm.value).toBeCloseTo(13, 9);
    expect(s.recovery1MinAbnormal).toBe(false);
  });

  it("breath-by-breath HR that scatters about its course: a value within its margin of the cut-off is not called", () => {
    // INVENTED: the recovery line of withRecovery plus ±3 bpm alternating from breath to breath (residual SD ≈ 3 by
    // construction, so the margin 1.28 × SD is about 3.8 bpm)
    let k = 0;
    const noisy = (dropPerMin: number) =>
      makeTest(
        buildRows((t, phase) => {
          const base =
            phase === "rest" ? 70 : phase === "exercise" ? 70 + ((t - 180) / 600) * 80 : 150 - (dropPerMin * (t - EX_END_S)) / 60;
          return { hrBpm: phase === "recovery" ? base + (k++ % 2 === 0 ? 3 : -3) : base };
        }),
      );
    const near = heartRateIndices(noisy(13), { peakHr: peak(150) });
    const margin = near.recovery1MinBpm.provenance.inputs?.marginBpm as number;
    expect(margin).toBeGreaterThan(3);
    expect(margin).toBeLessThan(4.5);
    expect(Math.abs(near.recovery1MinBpm.value! - 12)).toBeLessThan(margin);
    expect(near.recovery1MinAbnormal).toBeNull();
    expect(near.issues.map((i) => i.code)).toContain("hr-recovery-near-cutoff");
    // 25 bpm/min: far from the cut-off, the call stands
    const far = heartRateIndices(noisy(25), { peakHr: peak(150) });
    expect(far.recovery1MinAbnormal).toBe(false);
    expect(far.issues.map((i) => i.code)).not.toContain("hr-recovery-near-cutoff");
  });

  it("HR recovery at 2 min: 21 bpm/min → 42 is abnormal (Cole et al., Ann Intern Med 2000, confirmed: ≤ 42); 22 bpm/min → 44 is not", () => {
    expect(heartRateIndices(withRecovery(21), { peakHr: peak(150) }).recovery2MinAbnormal).toBe(true);
    const r = heartRateIndices(withRecovery(22), { peakHr: peak(150) });
    expect(r.recovery2MinBpm.value).toBeCloseTo(44, 9);
    expect(r.recovery2MinAbnormal).toBe(false);
  });

  it("without an equation: 220 − age (Fox, confirmed; as used by Cole et al., N Engl J Med 1999) with an info issue", () => {
    const r = heartRateIndices(withRecovery(12), { peakHr: peak(150), ageY: 50 });
    expect(r.predictedMaxBpm.value).toBe(170);
    expect(r.issues.map((i) => i.code)).toContain("hrmax-default-equation");
    const none = heartRateIndices(withRecovery(12), { peakHr: peak(150) });
    expect(none.chronotropicIndex.value).toBeNull();
    expect(none.chronotropicImpaired).toBeNull();
  });

  it("no recovery data → HR recovery not determinable", () => {
    const t = withRecovery(12);
    const cut = { ...t, clean: t.clean.filter((r) => r.timeS <= EX_END_S) };
    const r = heartRateIndices(cut, { peakHr: peak(150), predictedHrMaxBpm: 170 });
    expect(r.recovery1MinBpm.value).toBeNull();
    expect(r.recovery1MinAbnormal).toBeNull();
  });
});
