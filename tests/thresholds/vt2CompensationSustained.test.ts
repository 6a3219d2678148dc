import { describe, expect, it } from "vitest";
import type { BreathTable } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";
import {
  auditSpec,
  crossCheckSpec,
  generateAuditTest,
  generateCrossCheckTest,
  generateHoldoutTest,
  generateSecondOpinionTest,
  holdoutSpec,
  secondOpinionSpec,
  type SyntheticTruth,
} from "../../lib/synthetic";
import { compensationAfter, compensationFollows, detectThresholds } from "../../lib/thresholds/detectThresholds";
import { handBuiltSeries } from "./handBuiltSeries";

// Past the respiratory compensation point VE/VCO2 rises and PETCO2 falls to the end of exercise (common practice). An
// RCP candidate that neither follows is set aside.

describe("compensation after an RCP candidate, on a hand-built series (invented numbers)", () => {
  // 20-s bins from 0 to 600 s; VCO2 1000 + 2·t mL/min; VE/VCO2 = 30 to 480 s, then 30·(1 + 0.001·(t − 480));
  // PETCO2 40 mmHg to 480 s, then 40 − 0.02·(t − 480) mmHg
  const timeS = Float64Array.from({ length: 31 }, (_, i) => 20 * i);
  const vco2 = timeS.map((t) => 1000 + 2 * t);
  const ratio = (t: number) => (t <= 480 ? 30 : 30 * (1 + 0.001 * (t - 480)));
  const withRcp = handBuiltSeries({
    timeS,
    vo2MlMin: timeS.map((t) => 1100 + 2 * t),
    vco2MlMin: vco2,
    veLMin: timeS.map((t, i) => (ratio(t) * vco2[i]) / 1000),
    petco2MmHg: timeS.map((t) => (t <= 480 ? 40 : 40 - 0.02 * (t - 480))),
  });

  it("reads the rise of VE/VCO2 and the fall of PETCO2 from the candidate's ±30 s to the last 30 s", () => {
    const c = compensationAfter(withRcp, 480)!;
    // bins within ±30 s of 480: 460, 480, 500; last 30 s of a span ending at 600: 580, 600
    const sum = (ts: number[], f: (t: number) => number) => ts.reduce((a, t) => a + f(t), 0);
    const veAt = (t: number) => (ratio(t) * (1000 + 2 * t)) / 1000;
    const vco2At = (t: number) => 1000 + 2 * t;
    const expected =
      sum([580, 600], veAt) / sum([580, 600], vco2At) / (sum([460, 480, 500], veAt) / sum([460, 480, 500], vco2At)) - 1;
    expect(c.ratioRise).toBeCloseTo(expected, 12);
    expect(c.ratioRise).toBeGreaterThan(0.1);
    // PETCO2 at 460, 480, 500 s: 40, 40, 39.6; at 580, 600 s: 38.0, 37.6
    expect(c.petco2FallMmHg!).toBeCloseTo((40 + 40 + 39.6) / 3 - (38.0 + 37.6) / 2, 12);
  });

  it("finds neither sign on a flat stretch, and no PETCO2 fall when PETCO2 is missing", () => {
    const flat = handBuiltSeries({
      timeS,
      vo2MlMin: timeS.map((t) => 1100 + 2 * t),
      vco2MlMin: vco2,
      veLMin: vco2.map((v) => (30 * v) / 1000),
      petco2MmHg: timeS.map(() => 40),
    });
    const c = compensationAfter(flat, 300)!;
    expect(c.ratioRise).toBeCloseTo(0, 12);
    expect(c.petco2FallMmHg).toBeCloseTo(0, 12);
    const noPet = handBuiltSeries({
      timeS,
      vo2MlMin: timeS.map((t) => 1100 + 2 * t),
      vco2MlMin: vco2,
      veLMin: vco2.map((v) => v / 33),
    });
    expect(compensationAfter(noPet, 300)!.petco2FallMmHg).toBeNull();
  });
});

describe("RCPs on synthetic tests with and without one by construction (models written blind; invented data)", () => {
  type Case = { table: BreathTable; truth: SyntheticTruth };
  const models: [string, (i: number) => Case][] = [
    ["hold-out", (i) => generateHoldoutTest(holdoutSpec(i, 31, ["moderate"]), 31 + i)],
    ["audit", (i) => generateAuditTest(auditSpec(i, 41, ["moderate"]), 41 + i)],
    ["cross-check", (i) => generateCrossCheckTest(crossCheckSpec(i, 53, ["moderate"]), 53 + i)],
    ["second-opinion", (i) => generateSecondOpinionTest(secondOpinionSpec(i, 67, ["moderate"]), 67 + i)],
  ];
  const counts = { falseOn: 0, falseOff: 0, noRcp: 0, trueLost: 0, trueLostWithin10: 0, withRcp: 0 };
  for (const [, make] of models)
    for (let i = 0; i < 60; i++) {
      const syn = make(i);
      const test = conditionTable(syn.table);
      const on = detectThresholds(test, { bootstrap: 0 });
      const off = detectThresholds(test, { bootstrap: 0, dropUnsustainedVt2: false });
      if (!syn.truth.vt2) {
        counts.noRcp++;
        if (on.vt2.vo2MlMin.value !== null) counts.falseOn++;
        if (off.vt2.vo2MlMin.value !== null) counts.falseOff++;
      } else {
        counts.withRcp++;
        const before = off.vt2.vo2MlMin.value;
        if (before !== null && on.vt2.vo2MlMin.value === null) {
          counts.trueLost++;
          if (Math.abs(before - syn.truth.vt2.vo2MlMin) / syn.truth.vt2.vo2MlMin <= 0.1) counts.trueLostWithin10++;
          expect(on.issues.map((x) => x.code)).toContain("vt2-compensation-not-sustained");
        }
      }
    }

  it("reports far fewer RCPs where there is none, and loses almost no good call where there is one", () => {
    expect(counts.noRcp).toBeGreaterThanOrEqual(30);
    // measured on these 240 tests: README-thresholds round 14 gives the figures on 1 440
    expect(counts.falseOn).toBeLessThanOrEqual(Math.floor(counts.falseOff / 2));
    expect(counts.trueLost).toBeLessThanOrEqual(Math.ceil(0.02 * counts.withRcp));
    expect(counts.trueLostWithin10).toBeLessThanOrEqual(1);
  });
});

describe("the compensation rule (both signs the same way, one of them clearly)", () => {
  it("takes a clear PETCO2 fall alone, or a clear VE/VCO2 rise with PETCO2 falling at all", () => {
    expect(compensationFollows(0, 0.5)).toBe(true); // PETCO2 falls by the cut-off, VE/VCO2 flat
    expect(compensationFollows(0.02, 0.1)).toBe(true); // VE/VCO2 rises by the cut-off, PETCO2 falls a little
  });
  it("refuses a VE/VCO2 rise with PETCO2 flat or rising, and small changes of both", () => {
    expect(compensationFollows(0.065, 0)).toBe(false); // the round-15 false RCPs: VE/VCO2 up 2–7 %, PETCO2 not falling
    expect(compensationFollows(0.065, -0.6)).toBe(false);
    expect(compensationFollows(0.019, 0.49)).toBe(false);
  });
});
