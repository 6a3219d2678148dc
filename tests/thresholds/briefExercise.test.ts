/**
 * Indices read from brief, submaximal exercise (lib/thresholds/briefExercise.ts). The rule's arithmetic is checked by
 * construction; its figures against tests cut from the six synthetic models (invented data, the complete test's
 * noise-free OUES as truth); the warning and the interpretation's borderline note on the invented demo cases cut short.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";
import { quantile } from "../../lib/numeric";
import { conditionTable } from "../../lib/signal";
import {
  BRIEF_EXERCISE_LOW_READING,
  BRIEF_EXERCISE_MAXIMAL_RER,
  BRIEF_EXERCISE_S,
  briefExerciseIssue,
  briefExerciseReading,
} from "../../lib/thresholds/briefExercise";
import { measurePeaks } from "../../lib/thresholds/measurePeaks";
import { oues } from "../../lib/thresholds/oues";
import { ouesTruth } from "../../scripts/index-bank";
import { bankCases, type BankGenerator } from "../../scripts/threshold-bank";

describe("briefExerciseReading (by construction)", () => {
  it("reads the bin of the exercise phase and undoes its median: 1300 at 270 s, −19.5 % → 1300 / 0.805", () => {
    const r = briefExerciseReading("oues", 1300, 270, 0.98)!;
    expect(r.medianLowPct).toBe(-19.5);
    expect(r.likelyValue).toBeCloseTo(1300 / 0.805, 9);
    expect(briefExerciseReading("veVco2SlopeWhole", 30, 270, 0.98)!.likelyValue).toBeCloseTo(30 / 0.852, 9);
    expect(briefExerciseReading("veVco2SlopeToRcp", 30, 179.9, null)).toBeNull(); // under 180 s the slope is withheld
    expect(briefExerciseReading("veVco2SlopeToRcp", 30, 200, null)!.medianLowPct).toBe(-5.8); // no RER: still brief
  });

  it("says nothing from 8 min of exercise on, at peak RER 1.10 or more, or without a value", () => {
    expect(briefExerciseReading("oues", 1300, BRIEF_EXERCISE_S, 0.9)).toBeNull();
    expect(briefExerciseReading("oues", 1300, 300, BRIEF_EXERCISE_MAXIMAL_RER)).toBeNull();
    expect(briefExerciseReading("oues", null, 300, 0.9)).toBeNull();
    expect(briefExerciseIssue([])).toBeNull();
  });

  it("the table covers 180–480 s without gaps, each index reading lower the earlier the test stopped", () => {
    BRIEF_EXERCISE_LOW_READING.forEach((row, i) => {
      if (i > 0) {
        const prev = BRIEF_EXERCISE_LOW_READING[i - 1];
        expect(row.fromS).toBe(prev.toS);
        expect(row.ouesMedianPct).toBeGreaterThan(prev.ouesMedianPct);
        expect(row.slopeWholeMedianPct).toBeGreaterThan(prev.slopeWholeMedianPct);
        expect(row.slopeToRcpMedianPct).toBeGreaterThan(prev.slopeToRcpMedianPct);
      }
      expect(row.ouesQuartilePct).toBeLessThan(row.ouesMedianPct);
    });
    expect(BRIEF_EXERCISE_LOW_READING[0].fromS).toBe(180);
    expect(BRIEF_EXERCISE_LOW_READING.at(-1)!.toS).toBe(BRIEF_EXERCISE_S);
  });
});

describe("OUES of tests stopped 4–5 min into the ramp (six synthetic models, invented data)", () => {
  it("reads low as the table says (its 240–300 s median −19.5 %), while the complete tests read within 2 %", () => {
    const cut: number[] = [];
    const complete: number[] = [];
    const generators: BankGenerator[] = ["main", "variant", "holdout", "audit", "crosscheck", "secondopinion"];
    for (const g of generators)
      for (const c of bankCases(g, 10, undefined, ["moderate"])) {
        const syn = c.make();
        const truth = ouesTruth(syn.noiseFree, syn.truth, 1);
        if (!(truth > 0) || syn.truth.phases.rampEndS - syn.truth.phases.warmupEndS < 330) continue;
        const end = syn.truth.phases.warmupEndS + 270;
        const test = conditionTable({ ...syn.table, rows: syn.table.rows.filter((r) => r.timeS <= end) });
        const exS = test.exercise ? test.exercise.endS - test.exercise.startS : NaN;
        const value = oues(test).fits[0].slope.value;
        const rer = measurePeaks(test, { windowS: 30 }).rerMax.value;
        if (value !== null && exS >= 240 && exS < 300 && (rer ?? 0) < BRIEF_EXERCISE_MAXIMAL_RER)
          cut.push((100 * (value - truth)) / truth);
        const whole = oues(conditionTable(syn.table)).fits[0].slope.value;
        if (whole !== null) complete.push((100 * (whole - truth)) / truth);
      }
    expect(cut.length).toBeGreaterThanOrEqual(30);
    const med = quantile(cut, 0.5);
    // 60 tests rather than the table's 231: the median within 7 points of −19.5 %
    expect(med).toBeGreaterThan(-26.5);
    expect(med).toBeLessThan(-12.5);
    expect(Math.abs(quantile(complete, 0.5))).toBeLessThan(2);
  });
});

describe("the demo cases cut short (invented data)", () => {
  const dir = path.resolve(__dirname, "../fixtures/cases");
  async function analyseDemo(id: string, cutAtS: number | null) {
    const meta = JSON.parse(fs.readFileSync(path.join(dir, `${id}.json`), "utf8"));
    const lines = fs.readFileSync(path.join(dir, `${id}.csv`), "utf8").split("\n");
    const header = lines.findIndex((l) => !l.startsWith("#"));
    const kept =
      cutAtS === null
        ? lines
        : [...lines.slice(0, header + 1), ...lines.slice(header + 1).filter((l) => l && Number(l.split(",")[0]) <= cutAtS)];
    const built = await buildRecord({
      bytes: new TextEncoder().encode(kept.join("\n")),
      fileName: `${id}.csv`,
      patient: meta.patient,
      ergometer: meta.ergometer,
      referral: meta.referral,
    });
    return analyse({ ...built.record!, spirometry: meta.spirometry, conduct: meta.conduct }, { bootstrap: 0 });
  }

  it("the pre-operative demo stopped 279 s into its ramp warns once, and the OUES step says the median-undone OUES is not low", async () => {
    const r = await analyseDemo("preop-low-at", 640);
    const warnings = r.issues.filter((i) => i.code === "indices-brief-exercise");
    expect(warnings).toHaveLength(1);
    expect(warnings[0].message).toMatch(/lasted 27\d s and ended at peak RER 0\.\d\d/);
    expect(warnings[0].message).toMatch(/OUES \d+ \(19\.5 % low, a quarter of them 30 % or more; \d+ with that undone\)/);
    const step = r.interpretation.path.steps.find((s) => s.checks.some((c) => /OUES/.test(c.text)));
    expect(step?.outcome).toBe("abnormal");
    expect(step?.borderline).toMatch(
      /the OUES \d+ from 27\d s of exercise ending at peak RER 0\.\d\d \(brief, submaximal exercise reads a median 20 % low: \d+\) reaches/,
    );
    const ouesFit = r.indices.oues.fits.find((f) => f.fraction === 1)!;
    expect(ouesFit.briefExercise!.likelyValue).toBeGreaterThan(1400); // the rule's cut-off (myers-cpx-2014, confirmed)
    expect(ouesFit.slope.value!).toBeLessThanOrEqual(1400);
  });

  it("the complete demo (an exercise phase over 8 min) has no such warning and no brief reading", async () => {
    const r = await analyseDemo("preop-low-at", null);
    expect(r.issues.some((i) => i.code === "indices-brief-exercise")).toBe(false);
    expect(r.indices.oues.fits.every((f) => !f.briefExercise)).toBe(true);
    expect(r.indices.veVco2.slopeWholeExercise.briefExercise ?? null).toBeNull();
  });
});
