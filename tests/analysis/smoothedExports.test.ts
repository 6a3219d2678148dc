/**
 * Exports a cart smoothed or averaged, and thresholds out of order (INVENTED demo cases, tests/fixtures/cases): what the
 * thresholds may claim about themselves. Why: README-thresholds.md round 20 (found by running the command-line tool on
 * such exports).
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, buildRecord, type AnalysisResult } from "../../lib/analysis";
import { SMOOTHED_ROWS_CODE } from "../../lib/thresholds/detectThresholds";
import { threeBreathMean, timeAverages } from "./smoothedExport";

const dir = path.resolve(__dirname, "../fixtures/cases");
const results = new Map<string, AnalysisResult>();

async function run(key: string, name: string, transform: (csv: string) => string) {
  const meta = JSON.parse(fs.readFileSync(path.join(dir, `${name}.json`), "utf8"));
  expect(meta.invented).toBe(true);
  const csv = transform(fs.readFileSync(path.join(dir, `${name}.csv`), "utf8"));
  const built = await buildRecord({
    bytes: new TextEncoder().encode(csv),
    fileName: `${name}.csv`,
    patient: meta.patient,
    ergometer: meta.ergometer,
    referral: meta.referral,
  });
  results.set(key, analyse({ ...built.record!, conduct: meta.conduct, context: meta.context }, { bootstrap: 10 }));
}

beforeAll(async () => {
  await run("normal", "normal-adult", (c) => c);
  await run("normal 3-breath", "normal-adult", threeBreathMean);
  await run("normal 10-s", "normal-adult", (c) => timeAverages(c, 10));
  await run("heart failure 3-breath", "heart-failure", threeBreathMean);
  await run("pre-operative", "preop-low-at", (c) => c);
}, 120_000);

const confidences = (r: AnalysisResult) => [r.thresholds.vt1.confidence, r.thresholds.vt2.confidence];
const smoothedNote = (r: AnalysisResult) => r.issues.find((i) => i.code === SMOOTHED_ROWS_CODE);

describe("smoothed or averaged exports: confidence at most moderate", () => {
  it("the breaths as generated carry no such note, and the demo reaches high confidence", () => {
    const r = results.get("normal")!;
    expect(smoothedNote(r)).toBeUndefined();
    expect(confidences(r)).toContain("high");
  });

  it("the same test as a 3-breath rolling mean: the note, with its lag-1 correlation, and nothing high", () => {
    const r = results.get("normal 3-breath")!;
    // a 3-breath mean of independent noise has lag-1 correlation 2/3 (common practice); about a running median less
    expect(smoothedNote(r)?.message).toMatch(/breath-to-breath noise carries over: lag-1 correlation 0\.\d\d/);
    expect(confidences(r)).not.toContain("high");
    const lowered = [r.thresholds.vt1, r.thresholds.vt2].filter((t) => t.reason?.includes("at most moderate"));
    expect(lowered.length).toBeGreaterThan(0);
    for (const t of lowered) expect(t.confidence).toBe("moderate");
  });

  it("the same test as 10-s time averages: the note names them, and nothing high", () => {
    const r = results.get("normal 10-s")!;
    expect(smoothedNote(r)?.message).toMatch(/^The rows are about 10-s time averages/);
    expect(confidences(r)).not.toContain("high");
  });
});

describe("time-averaged rows: what was calibrated on breaths is not claimed", () => {
  it("the slope indices keep their values but carry no band and no breath-noise correction; the breaths do", () => {
    const lines = (r: AnalysisResult) => [
      r.indices.veVco2.slopeWholeExercise,
      r.indices.dVo2dWr.whole,
      ...r.indices.oues.fits.filter((f) => f.fraction === 1),
    ];
    for (const l of lines(results.get("normal")!)) expect(l.band).toBeTruthy();
    const averaged = results.get("normal 10-s")!;
    for (const l of lines(averaged)) {
      expect(l.slope.value).not.toBeNull();
      expect(l.band ?? null).toBeNull();
      expect(l.slope.provenance.inputs?.dilutionCorrected).toBeUndefined();
    }
    expect(averaged.conditioned.averaging.label).toBe("rows as exported: about 10-s time averages (no further averaging)");
  });

  it("HR recovery from 10-s rows says it is approximate, and stays near the breaths' value", () => {
    const breaths = results.get("normal")!.indices.heartRate.recovery1MinBpm.value!;
    const averaged = results.get("normal 10-s")!;
    expect(averaged.issues.map((i) => i.code)).toContain("hr-recovery-from-averaged-rows");
    // the margin is one row's HR fall at the reading (about ±4.5 bpm here): the two agree within it
    expect(Math.abs(averaged.indices.heartRate.recovery1MinBpm.value! - breaths)).toBeLessThan(5);
  });
});

describe("thresholds in order", () => {
  it("VT2's band does not reach below VT1, nor VT1's above VT2 (pre-operative demo)", () => {
    const { vt1, vt2 } = results.get("pre-operative")!.thresholds;
    expect(vt1.vo2MlMin.value).not.toBeNull();
    expect(vt2.vo2MlMin.value).not.toBeNull();
    expect(vt2.band!.lowMlMin).toBeGreaterThanOrEqual(vt1.vo2MlMin.value!);
    expect(vt1.band!.highMlMin).toBeLessThanOrEqual(vt2.vo2MlMin.value!);
    // the band's times follow its ends
    expect(vt2.bandTimes!.lowS).toBeGreaterThanOrEqual(vt1.timeS! - 30);
    // and where a band was cut, its reason says so (a low end equal to VT1 is the cut, not a measured limit)
    if (vt2.band!.lowMlMin === vt1.vo2MlMin.value)
      expect(vt2.reason).toContain(`band cut at VT1 (${Math.round(vt1.vo2MlMin.value!)} mL/min)`);
    else expect(vt2.reason ?? "").not.toContain("band cut at VT1");
  });

  it("a VT2 below VT1 is not where the slope 'to the RCP' ends (heart-failure demo as a 3-breath rolling mean)", () => {
    const r = results.get("heart failure 3-breath")!;
    const { vt1, vt2 } = r.thresholds;
    expect(vt2.vo2MlMin.value!).toBeLessThan(vt1.vo2MlMin.value!);
    expect(r.issues.map((i) => i.code)).toContain("ve-vco2-slope-vt2-out-of-order");
    const window = r.indices.veVco2.slopeToVt2.slope.provenance.window;
    // fitted as without a VT2: not to the VT2 time
    expect(window?.endS).not.toBe(vt2.timeS);
    expect(r.indices.veVco2.slopeToVt2.slope.provenance.method).not.toBe("ve-vco2-slope-to-vt2");
  });
});
