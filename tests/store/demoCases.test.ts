/**
 * Heart-rate recovery of the INVENTED demo cases. The generator's recovery HR is invented kinetics
 * (lib/synthetic/generateSyntheticTest.ts): a first-order fall from the end-of-ramp HR towards rest, with the
 * fraction of the HR reserve recovered in the first minute f = 0.065 + 0.0075 × peak VO2 (mL/kg/min), kept
 * within 0.10–0.30, so τ = −60 / ln(1 − f). Published context for the targets: 1-min HR recovery is typically
 * ~15–40 bpm in healthy adults and ≤ 12 bpm is abnormal (Cole et al., N Engl J Med 1999;341:1351, confirmed).
 */
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { DEMO_CASES, demoCsv } from "../../lib/store/demoCases";
import { DEFAULT_SYNTHETIC_SPEC, generateSyntheticTest, SYNTHETIC_PRESETS } from "../../lib/synthetic";

const preset = (id: string) => ({ ...DEFAULT_SYNTHETIC_SPEC, ...SYNTHETIC_PRESETS.find((p) => p.id === id)!.spec });

/** τ of the recovery fall estimated from two noise-free recovery breaths: (hr2 − rest)/(hr1 − rest) = e^(−Δt/τ). */
function recoveryTauS(id: string): number {
  const spec = preset(id);
  const test = generateSyntheticTest({ ...spec, noise: "none" }, 1);
  const end = test.truth.phases.rampEndS;
  const rest = spec.hrRestBpm;
  const rows = test.noiseFree.rows.filter((r) => r.timeS > end + 5 && r.timeS < end + 170);
  const a = rows[0];
  const b = rows[rows.length - 1];
  return (b.timeS - a.timeS) / Math.log((a.hrBpm! - rest) / (b.hrBpm! - rest));
}

describe("demo generator: recovery heart rate (invented kinetics)", () => {
  it("falls with the time constant the model states", () => {
    // normal adult: 2800 mL/min ÷ 75 kg = 37.33 mL/kg/min → f = 0.065 + 0.28 = 0.345 → capped at 0.30
    //   τ = −60 / ln(0.70) = 168.2 s
    expect(Math.abs(recoveryTauS("normal-adult") - 168.2) / 168.2).toBeLessThan(0.02);
    // heart failure: 1150 ÷ 80 = 14.375 mL/kg/min → f = 0.065 + 0.1078 = 0.1728 → τ = −60 / ln(0.8272) = 316.4 s
    expect(Math.abs(recoveryTauS("heart-failure") - 316.4) / 316.4).toBeLessThan(0.02);
  });

  it("the analysed demos recover ~20–35 bpm in the first minute when healthy, 8–15 bpm in heart failure on a beta-blocker", async () => {
    const hrr = new Map<string, number>();
    for (const d of DEMO_CASES) {
      const built = await buildRecord({
        bytes: new TextEncoder().encode(demoCsv(d)),
        fileName: d.fileName,
        patient: d.patient,
        ergometer: d.ergometer,
        referral: d.referral,
      });
      hrr.set(d.presetId, analyse(built.record!).indices.heartRate.recovery1MinBpm.value!);
    }
    // expected from the model: f × (end-of-ramp HR − rest) ± breath noise (HR SD 2 bpm) and the 30-s peak average
    //   normal adult 0.30 × (~173 − 68) ≈ 31; deconditioning (1800/85 = 21.2 → f = 0.224) × (~175 − 88) ≈ 19.5
    //   heart failure 0.173 × (~132 − 72) ≈ 10.4
    expect(hrr.get("normal-adult")).toBeGreaterThanOrEqual(20);
    expect(hrr.get("normal-adult")).toBeLessThanOrEqual(35);
    expect(hrr.get("deconditioning")).toBeGreaterThanOrEqual(18);
    expect(hrr.get("deconditioning")).toBeLessThanOrEqual(35);
    expect(hrr.get("heart-failure")).toBeGreaterThanOrEqual(8);
    expect(hrr.get("heart-failure")).toBeLessThanOrEqual(15);
    // no demo drops HR by more than 40 bpm in the first minute (the old generator gave 33–79)
    for (const v of hrr.values()) expect(v).toBeLessThanOrEqual(40);
  }, 60_000);
});
