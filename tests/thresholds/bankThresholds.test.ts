import { describe, it, expect } from "vitest";
import { runThresholdBank, type BankGenerator, type BankStats } from "../../scripts/threshold-bank";

// Accuracy banks on synthetic tests (invented data, thresholds known by construction), 20-s bins, 20 seeded
// resamples (the reported value is the resampled median). Two independent models: the main generator (used
// to choose the method settings) and the variant model (generateVariantTest: two-compartment CO2 store,
// curvilinear excess-CO2 onset, Student-t duration-scaled noise, breath jitter, other protocols), used only
// to check. Sizes: BANK_SIZE / VARIANT_SIZE env (defaults 240 and 150; about 20–40 s together on a loaded 2-core machine).
// Goals are those of the issue (our project's targets, not published values).
const size = Number(process.env.BANK_SIZE ?? 240);
const variantSize = Number(process.env.VARIANT_SIZE ?? 150);
const main = runThresholdBank({ size, bootstrap: 20 }).stats;
const variant = runThresholdBank({ size: variantSize, bootstrap: 20, generator: "variant" }).stats;
/** A bank of one model written blind, at moderate noise (20 resamples). */
const moderateBank = (generator: BankGenerator, seed: number, size: number) =>
  runThresholdBank({ size, seed, bootstrap: 20, generator, noiseLevels: ["moderate"] }).stats;
const holdoutSize = Number(process.env.HOLDOUT_SIZE ?? 120);
const holdout = moderateBank("holdout", 31, holdoutSize);
const auditSize = Number(process.env.AUDIT_SIZE ?? 120);
const audit = moderateBank("audit", 41, auditSize);
const crossCheckSize = Number(process.env.CROSSCHECK_SIZE ?? 120);
const crossCheck = moderateBank("crosscheck", 53, crossCheckSize);
const secondOpinionSize = Number(process.env.SECOND_OPINION_SIZE ?? 120);
const secondOpinion = moderateBank("secondopinion", 67, secondOpinionSize);
const stat = (stats: BankStats[], method: string, noise: string) => stats.find((s) => s.method === method && s.noise === noise)!;

describe(`threshold accuracy, main generator (${size} tests)`, () => {
  it("has a meaningful bank", () => {
    expect(size).toBeGreaterThanOrEqual(200);
    expect(stat(main, "vt1-consensus", "moderate").n).toBeGreaterThanOrEqual(Math.floor(size / 3));
  });

  it("meets the goals for no-calls (VT1 ≤ 5 %) and the VT2 median (≤ 5 %) at moderate noise", () => {
    expect(stat(main, "vt1-consensus", "moderate").noCallPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(stat(main, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(stat(main, "vt2-consensus", "low").medianPct).toBeLessThanOrEqual(5); // goal from the issue
  });

  // VT1 at moderate noise, 20 resamples: median 4.1 %, P90 10.9 % on this 80-test slice since round 8 (9.4 % after round
  // 7): the joint profile may now fit a rise that steepens above the break, which left the means over six 240-test
  // banks where they were (3.71 / 10.77 → 3.67 / 10.80 %) and this slice one test-width worse, while the blind hold-out
  // model went from 11.8 / 24.0 to 6.6 / 18.4 % (README-thresholds.md, round 8). Goals (median ≤ 4 %, P90 ≤ 10 %) not
  // met on this slice; these bounds guard the level reached.
  it("keeps VT1 at moderate noise at the level reached (median ≤ 4.4 %, P90 ≤ 11.5 %; goal P90 ≤ 10 % not met here)", () => {
    const s = stat(main, "vt1-consensus", "moderate");
    expect(s.medianPct).toBeLessThanOrEqual(4.4); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.p90Pct).toBeLessThanOrEqual(11.5); // our regression bound at the level reached (README-thresholds.md), not a published value
  });

  // The pooled consensus is ahead of every single-signal method and not behind the joint profile alone by more than
  // two points (README-thresholds.md has the per-method tables); it is held against both.
  it("the consensus beats every single-signal VT1 method on P90 at moderate noise", () => {
    const cons = stat(main, "vt1-consensus", "moderate").p90Pct;
    for (const m of ["vt1-v-slope", "vt1-modified-v-slope", "vt1-ventilatory-equivalents"])
      expect(cons).toBeLessThanOrEqual(stat(main, m, "moderate").p90Pct);
    expect(cons).toBeLessThanOrEqual(stat(main, "vt1-joint-profile", "moderate").p90Pct + 2);
  });

  // VT2 no-calls 5.0 → 6.25 % here (one test) since a lone RCP candidate at or below VT1 is no longer reported: on the
  // six 240-test banks at all noise levels every such candidate was 8–49 % early (README-thresholds.md, round 8); and
  // 6.25 → 7.5 % (one more test) since a candidate that no compensation follows is set aside (round 14: of the 9 true-RCP
  // calls so dropped on six 240-test models, 8 were 10–41 % off); 7.5 → 8.75 % (one more test) since compensation needs
  // both signs in the same direction, one clearly (round 15: false RCPs on the 204 tests without one 22 → 13, "moderate"
  // or "high" 7 → 1, for 2 more of 1 202 true calls set aside).
  it("keeps VT2 at the level reached (moderate: median ≤ 4 %, P90 ≤ 10 %, no-calls ≤ 9 %)", () => {
    const s = stat(main, "vt2-consensus", "moderate");
    expect(s.medianPct).toBeLessThanOrEqual(4); // our regression bound at the level reached (README-thresholds.md), not a published value; tighter than the goal ≤ 5 %
    expect(s.p90Pct).toBeLessThanOrEqual(10); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.noCallPct).toBeLessThanOrEqual(9); // our regression bound at the level reached (README-thresholds.md), not a published value
  });

  // Goal: VE/VCO2 slope to the detected RCP within ±5 % of truth in 90 % of tests (no-calls count as misses). Since round
  // 12 (3-bin moving mean of VE and VCO2 alike) the mean of six 240-test main/variant banks is 90.4 %; this 80-test
  // slice reads 88.8 % (87.5 % before): narrow VCO2 ranges and early RCP estimates are the misses. Guarded here.
  it("keeps the VE/VCO2 slope to RCP within ±5 % of truth in ≥ 86 % of tests at moderate noise (≥ 93 % at low)", () => {
    expect(stat(main, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(86); // our regression bound at the level reached (README-thresholds.md, round 12), not a published value; goal ≥ 90 % met on the six-bank mean, not on this slice
    expect(stat(main, "ve-vco2-slope-to-vt2", "low").within5Pct).toBeGreaterThanOrEqual(93); // our regression bound at the level reached (README-thresholds.md), not a published value
  });

  it("meets the VT1 median goal (≤ 4 %) at low noise", () => {
    expect(stat(main, "vt1-consensus", "low").medianPct).toBeLessThanOrEqual(4); // goal from the issue
  });

  // The band reported is calibrated to hold the truth in 8 of 10 tests (lib/thresholds/bandCalibration.ts, fitted on
  // main seeds 99 and 5 and variant seeds 2024 and 99 at moderate noise). This bank (seed 2024) is not in that set.
  // Round 17 (README-thresholds.md): before calibration the band held VT1 in 66 % and VT2 in 48 % of main/variant
  // moderate tests; here, after it, VT1 91 / 71 / 64 % and VT2 88 / 78 / 56 % at low / moderate / high noise.
  it("gives bands that hold the true threshold in about 3 of 4 tests over all noise levels, and stay under 25 % wide", () => {
    for (const which of ["vt1", "vt2"]) {
      const all = stat(main, `${which}-consensus`, "all");
      expect(all.bandCoverPct).toBeGreaterThanOrEqual(70); // our regression bound at the level reached (README-thresholds.md, round 17), not a published value
      expect(stat(main, `${which}-consensus`, "moderate").bandCoverPct).toBeGreaterThanOrEqual(65); // our regression bound, as above
      expect(stat(main, `${which}-consensus`, "moderate").bandWidthPct).toBeLessThanOrEqual(25); // our bound: a band as wide as the error range of the single-signal methods would say nothing
    }
  });

  // The VE/VCO2 slope to VT2 has its band too (SLOPE_BAND_FACTOR, calibrated on main seeds 99 and 5 and variant seeds
  // 2024 and 99); round 17 on this bank: held in 78 / 79 / 84 % at low / moderate / high noise (80 tests per level).
  it("gives the VE/VCO2 slope to VT2 a band that holds the true slope in about 3 of 4 tests and stays under 12 % wide", () => {
    const all = stat(main, "ve-vco2-slope-to-vt2", "all");
    expect(all.bandCoverPct).toBeGreaterThanOrEqual(72); // our regression bound at the level reached (README-thresholds.md, round 17), not a published value
    expect(stat(main, "ve-vco2-slope-to-vt2", "moderate").bandWidthPct).toBeLessThanOrEqual(12); // our bound: wider would span two ventilatory classes at a typical slope
  });
});

describe(`threshold accuracy, independent variant model (${variantSize} tests)`, () => {
  it("meets the no-call goal and the VT2 median goal at moderate noise", () => {
    expect(stat(variant, "vt1-consensus", "moderate").noCallPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(stat(variant, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(4); // our regression bound at the level reached (README-thresholds.md), not a published value; tighter than the goal ≤ 5 %
  });

  // 92 % on this 150-test bank; 90 % on the 240-test bank of scripts/threshold-bank.ts (borderline).
  it("meets the VE/VCO2 slope goal: within ±5 % of truth in ≥ 90 % of tests at moderate noise", () => {
    expect(stat(variant, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(90); // goal from the issue
  });

  // The variant model now releases CO2 from the stores above VT2 (washout, round 7), which makes it harder: on this
  // 150-test bank VT1 went to 4.3 / 14.3 % with the washout and the previous method, and is 4.0 / 13.1 % with excess
  // CO2 read over the whole span (4.4 / 11.2 % on the 240-test bank of the script). Goal P90 ≤ 10 % not met here.
  it("keeps VT1 at moderate noise at the level reached (median ≤ 4.2 %, P90 ≤ 13.5 %; goal P90 ≤ 10 % not met)", () => {
    const s = stat(variant, "vt1-consensus", "moderate");
    expect(s.medianPct).toBeLessThanOrEqual(4.2); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.p90Pct).toBeLessThanOrEqual(13.5); // our regression bound at the level reached (README-thresholds.md), not a published value
  });

  // Bands on the variant model (its seed 2024 is also one of the calibration banks, so this is not an independent check;
  // main seed 2024 above and the blind models in README-thresholds.md are): VT1 held in 88 / 88 / 74 %, VT2 in 94 / 74 / 69 % at low / moderate / high noise (round 17).
  it("gives bands that hold the true threshold in about 3 of 4 tests over all noise levels", () => {
    for (const which of ["vt1", "vt2"])
      expect(stat(variant, `${which}-consensus`, "all").bandCoverPct).toBeGreaterThanOrEqual(72); // our regression bound at the level reached (README-thresholds.md, round 17), not a published value
  });
});

describe(`threshold accuracy, hold-out model (${holdoutSize} tests, moderate noise)`, () => {
  // Thresholds there are the onsets of processes that start gently (excess CO2 from lactate rising exponentially above
  // its threshold; compensation growing with the acidosis), so every break-finding method reads them late: noise-free,
  // the published V-slope is +7.5 % (median signed) and our consensus was +11 % before round 8. On this bank (seed 31,
  // 20 resamples) VT1 measures 7.5 / 19.9 % (11.5 / 19.8 % on its 80-test slice before round 8), VT2 4.9 %, the slope
  // 87 % within ±5 %. Goals for VT1 not met on this model; guarded at the level reached.
  it("has no more than 5 % VT1 no-calls and keeps VT1 at the level reached (median ≤ 8.5 %, P90 ≤ 21 %)", () => {
    const s = stat(holdout, "vt1-consensus", "moderate");
    expect(s.n).toBe(holdoutSize);
    expect(s.noCallPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(s.medianPct).toBeLessThanOrEqual(8.5); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.p90Pct).toBeLessThanOrEqual(21); // our regression bound at the level reached (README-thresholds.md), not a published value
  });
  it("meets the VT2 median goal (≤ 5 %) and keeps the slope within ±5 % in ≥ 85 % of tests", () => {
    expect(stat(holdout, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5); // goal from the issue
    // round 13 (VE's exponential departure in the VT2 joint profile, which then gives the value): 4.86 → 3.61 % on this bank
    expect(stat(holdout, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(4.3); // our regression bound at the level reached (README-thresholds.md, round 13), not a published value
    expect(stat(holdout, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(85); // our regression bound at the level reached (README-thresholds.md), not a published value
  });
});

describe(`threshold accuracy, audit model (${auditSize} tests, moderate noise)`, () => {
  // A fourth model, also written without sight of the methods (generateAuditTest: thresholds set in muscle VO2 and
  // carried to the mouth by delay + lag, excess CO2 that may bend upward above VT1, PaCO2-target hyperventilation,
  // oscillatory ventilation, cycle and treadmill ramps and 1–3-min stages). Measured after round 8 and not used to
  // choose anything until round 10 (the exponential rise was measured on it too, so it is no longer blind): VT1
  // 5.3 / 14.7 % on this bank after round 8 (seed 41, 20 resamples), VT2 2.4 %, slope 87 % within ±5 %.
  // Stepped protocols are its hardest part (3-min stages read late; the engine warns about them). Goals for VT1 and the
  // slope not met on this model; guarded at the level reached.
  it("meets the VT1 no-call and VT2 median goals and keeps VT1 at the level reached (median ≤ 6 %, P90 ≤ 16.5 %)", () => {
    const s = stat(audit, "vt1-consensus", "moderate");
    expect(s.n).toBe(auditSize);
    expect(s.noCallPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(s.medianPct).toBeLessThanOrEqual(6); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.p90Pct).toBeLessThanOrEqual(16.5); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(stat(audit, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5); // goal from the issue
  });
  // slope on this bank: 87.9 % before round 12, 91.6 % after
  it("keeps the slope within ±5 % in ≥ 88 % of tests", () => {
    expect(stat(audit, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(88); // our regression bound at the level reached (README-thresholds.md), not a published value
  });
});

describe(`threshold accuracy, cross-check model (${crossCheckSize} tests, moderate noise)`, () => {
  // A fifth model written without sight of the methods (generateCrossCheckTest: blood lactate flat to VT1 and
  // exponential above it, La0 + c·(e^z − 1 − z); excess CO2 from its buffering through the CO2 stores; VT1 truth at the
  // metabolic onset; six groups, cycle and treadmill ramps and stages). Blind figures with the round-9 method (three
  // banks of 240): VT1 15.7 / 35.6 %, VT2 4.1 %, slope 80 % within ±5 %; noise-free VT1 10.8 / 27.2 %. Its onset is
  // below what breath data show: excess CO2 rises by a few mL/min in the first minute above VT1 (README-thresholds.md,
  // round 10). Every goal but VT2 and (on this bank) VT1 no-calls is missed here; guarded at the level reached.
  it("meets the VT2 median goal and keeps VT1 at the level reached (median ≤ 17 %, P90 ≤ 40 %, no-calls ≤ 7 %)", () => {
    const s = stat(crossCheck, "vt1-consensus", "moderate");
    expect(s.n).toBe(crossCheckSize);
    expect(s.noCallPct).toBeLessThanOrEqual(7); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.medianPct).toBeLessThanOrEqual(17); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(s.p90Pct).toBeLessThanOrEqual(40); // our regression bound at the level reached (README-thresholds.md), not a published value
    expect(stat(crossCheck, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5); // goal from the issue
    // round 13: 4.50 → 3.53 % on this bank
    expect(stat(crossCheck, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(4.2); // our regression bound at the level reached (README-thresholds.md, round 13), not a published value
  });
  // slope on this bank: 78.8 % before round 12, 84.7 % after
  it("keeps the slope within ±5 % in ≥ 80 % of tests", () => {
    expect(stat(crossCheck, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(80); // our regression bound at the level reached (README-thresholds.md), not a published value
  });
});

describe(`threshold accuracy, second-opinion model (${secondOpinionSize} tests, moderate noise)`, () => {
  // A sixth model written without sight of the methods or the other models (generateSecondOpinionTest: lactate-driven
  // bicarbonate buffering, VT1 truth at the onset of excess CO2 at the mouth, a two-line corner 3-10 % above it by
  // construction; VE/VT/breath-duration noise that moves VO2, VCO2 and VE together; eight clinical groups). Blind
  // figures with the round-10 method (three banks of 240): VT1 3.93 / 11.11 %, VT2 2.14 %, slope 81.4 % within ±5 %
  // (README-thresholds.md, round 11).
  // This bank of 120 (seed 67) after round 11: VT1 2.98 / 8.40 %, no-calls 0 %; VT2 2.15 %; slope 81.8 % (77 tests with an RCP),
  // 88.3 % after round 12.
  it("meets the VT1 goals (median ≤ 4 %, P90 ≤ 10 %, no-calls ≤ 5 %) and the VT2 median goal on this bank", () => {
    const s = stat(secondOpinion, "vt1-consensus", "moderate");
    expect(s.n).toBe(secondOpinionSize);
    expect(s.noCallPct).toBeLessThanOrEqual(5); // goal from the issue
    expect(s.medianPct).toBeLessThanOrEqual(4); // goal from the issue
    expect(s.p90Pct).toBeLessThanOrEqual(10); // goal from the issue (met on this bank; the three-bank mean is 11.1 %)
    expect(stat(secondOpinion, "vt2-consensus", "moderate").medianPct).toBeLessThanOrEqual(5); // goal from the issue
  });
  it("keeps the slope within ±5 % in ≥ 84 % of tests", () => {
    expect(stat(secondOpinion, "ve-vco2-slope-to-vt2", "moderate").within5Pct).toBeGreaterThanOrEqual(84); // our regression bound at the level reached (README-thresholds.md), not a published value
  });
});
