/**
 * Steady-state stage means are not the breath-by-breath ramp the VE/VCO2-slope and ΔVO2/ΔWR cut-offs were set on: the
 * values are shown, not graded. Real data: Sylta et al., Med Sci Sports Exerc 2016;48:2165–2174, as curated in the
 * exscidata R package by D. Hammarström (CC0): subject 1, pre, five 5-min stages.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { analyse, buildRecord } from "../../lib/analysis";

/** Sylta subject 1, pre, read with the stage length given (or the 60-s default), and analysed. */
async function syltaSubject1(stageDurationS?: number) {
  const built = await buildRecord({
    bytes: new Uint8Array(
      fs.readFileSync(path.resolve(__dirname, "../fixtures/open-data/sylta2016-cycling/cyclingstudy_stages_long.csv")),
    ),
    fileName: "cyclingstudy_stages_long.csv",
    patient: { sex: "male", ageY: 33, heightCm: 183, weightKg: 80.3 },
    ergometer: "cycle",
    referral: "general",
    importOptions: { select: { subject: "1", timepoint: "pre" }, ...(stageDurationS ? { stageDurationS } : {}) },
  });
  return { built, r: analyse(built.record!) };
}

describe("stage tables: slopes shown, not graded", () => {
  it("Sylta subject 1: a supra-RCP last stage steepens the whole-exercise line; no 'abnormal efficiency' is read from it", async () => {
    const { built, r } = await syltaSubject1(300);
    expect(built.record!.table.shape).toBe("stage");
    // OLS of VE on VCO2 over the 5 stages (file: VCO2 2113…4411 mL/min, VE 55…133 L/min) is above the 34 cut-off …
    const slope = r.indices.veVco2.slopeWholeExercise.slope.value!;
    expect(slope).toBeGreaterThan(34);
    // … but it is not read: the flow's efficiency step and every pattern feature leave it out
    const step = r.interpretation.path.steps.find((s) => s.nodeId === "normal-peak-efficiency");
    expect(step?.outcome).toBe("not-assessable");
    for (const p of r.interpretation.patterns)
      for (const f of [...p.for, ...p.against]) expect(f.text).not.toMatch(/VE\/VCO2 slope \(whole exercise\) [\d.]+ (≥|<|>|≤)/);
    const results = r.draft.sections.find((s) => s.id === "results")!.paragraphs;
    expect(results).toContain(
      "The VE/VCO2 slope is shown but not interpreted: read from steady-state stage means; its published cut-offs were set on breath-by-breath ramp tests.",
    );
    expect(r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ")).not.toMatch(/disease is possible/);
  });

  it("read at the assumed 60 s per stage, the 5-min recording is too short for a test, and the effort verdict says so", async () => {
    const { built, r } = await syltaSubject1();
    // 5 stages × 60 s < 8 min, the incremental phase alone (ERS statement, Radtke et al. 2019, confirmed)
    expect(built.issues.map((i) => i.code)).toContain("short-recording");
    const conduct = r.draft.sections.find((s) => s.id === "conduct")!.paragraphs;
    // 5 stages at the assumed 60 s: the duration says what it rests on
    expect(conduct[0]).toMatch(
      /Exercise lasted \d+ min \d+ s \(stages assumed 60 s apart; set the stage length if they were not\)\./,
    );
    const effort = conduct.findIndex((p) => p.startsWith("Effort:"));
    expect(conduct[effort + 1]).toBe(
      "The recording is shorter than a complete test (see the data-quality issues): the effort verdict and the peak values are not reliable.",
    );
  });
});
