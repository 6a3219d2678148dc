/**
 * An EOV call on breaths whose noise carries over (as when a cart exports smoothed breaths) reaches the reader's
 * scheme: the heart-failure demo (INVENTED, tests/fixtures/cases) exported as a 3-breath trailing mean, against the same
 * demo as generated. Why the warning exists: lib/thresholds/eov.ts (`CARRY_OVER_WARNING`), README-thresholds.md round 19.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, buildRecord, type AnalysisResult } from "../../lib/analysis";
import { measurePeaks } from "../../lib/thresholds/measurePeaks";
import { threeBreathMean } from "./smoothedExport";

const dir = path.resolve(__dirname, "../fixtures/cases");
const results = new Map<string, AnalysisResult>();

beforeAll(async () => {
  const meta = JSON.parse(fs.readFileSync(path.join(dir, "heart-failure.json"), "utf8"));
  expect(meta.invented).toBe(true);
  const csv = fs.readFileSync(path.join(dir, "heart-failure.csv"), "utf8");
  for (const [id, text] of [
    ["as generated", csv],
    ["3-breath mean", threeBreathMean(csv)],
  ] as const) {
    const built = await buildRecord({
      bytes: new TextEncoder().encode(text),
      fileName: "heart-failure.csv",
      patient: meta.patient,
      ergometer: meta.ergometer,
      referral: meta.referral,
    });
    results.set(id, analyse({ ...built.record!, conduct: meta.conduct, context: meta.context }, { bootstrap: 0 }));
  }
}, 60_000);

const eovAxes = (r: AnalysisResult) =>
  r.interpretation.schemes.flatMap((s) => s.axes).filter((a) => a.category?.label === "EOV present");

describe("EOV on breaths exported smoothed (invented heart-failure demo)", () => {
  it("as generated: EOV is found, breath noise does not carry over, and the scheme says nothing more", () => {
    const r = results.get("as generated")!;
    expect(r.indices.eov.definitions.every((d) => d.detected === true)).toBe(true);
    expect(r.indices.eov.breathNoiseCarryOver).not.toBeNull();
    expect(r.indices.eov.breathNoiseCarryOver!).toBeLessThan(0.3);
    expect(r.issues.some((i) => i.code === "eov-breath-noise-carries-over")).toBe(false);
    expect(eovAxes(r).length).toBeGreaterThan(0);
    for (const a of eovAxes(r)) expect(a.bandReaches).toBeUndefined();
  });

  it("3-breath mean: EOV is still found, with the warning, and the scheme says the call reaches EOV absent", () => {
    const r = results.get("3-breath mean")!;
    expect(r.indices.eov.definitions.every((d) => d.detected === true)).toBe(true);
    // a 3-breath moving mean of independent noise has lag-1 correlation 2/3 (common practice); read about the median: 0.43
    expect(r.indices.eov.breathNoiseCarryOver!).toBeGreaterThan(0.3);
    const warning = r.issues.find((i) => i.code === "eov-breath-noise-carries-over");
    expect(warning?.severity).toBe("warning");
    expect(warning?.message).toContain("check the VE trace");
    const axes = eovAxes(r);
    expect(axes.length).toBeGreaterThan(0);
    for (const a of axes) {
      expect(a.bandReaches).toMatch(
        /EOV call on breaths whose noise carries over \(lag-1 correlation 0\.\d\d; check the VE trace\) reaches EOV absent/,
      );
      expect(a.text).toContain("reaches EOV absent");
    }
  });
});

describe("peak RER's standard error on breaths exported smoothed (invented heart-failure demo)", () => {
  // n breaths of AR(1) noise with lag-1 correlation ρ carry n(1 − ρ)/(1 + ρ) independent breaths' worth of information
  // (standard time-series result, e.g. Bretherton et al. 1999 — recalled): the SE grows by √((1 + ρ)/(1 − ρ)).
  it("as generated: the SE is SD/√n, with no carry-over read into it", () => {
    const inputs = results.get("as generated")!.indices.peaks.rerMax.provenance.inputs!;
    expect(inputs.rerSe).toBeGreaterThan(0);
    expect(inputs.rerCarryOver).toBeUndefined();
  });

  it("3-breath mean: the SE is widened by exactly √((1 + ρ)/(1 − ρ)) for the carry-over measured, and the band says so", () => {
    const r = results.get("3-breath mean")!;
    const rho = r.indices.eov.breathNoiseCarryOver!;
    expect(rho).toBeGreaterThan(0.3);
    const inputs = r.indices.peaks.rerMax.provenance.inputs!;
    expect(inputs.rerCarryOver).toBe(rho);
    // the same window read without the carry-over (measurePeaks with noiseCarryOver null) gives the plain SE
    const plain = measurePeaks(r.conditioned, { windowS: 30, weightKg: 80, noiseCarryOver: null }).rerMax.provenance.inputs!;
    expect(plain.rerBreaths).toBe(inputs.rerBreaths);
    expect((inputs.rerSe as number) / (plain.rerSe as number)).toBeCloseTo(Math.sqrt((1 + rho) / (1 - rho)), 9);
    expect(r.interpretation.effort.borderline ?? "").toMatch(
      /standard errors over its window, breath noise carrying over with lag-1 correlation 0\.\d\d\)/,
    );
  });
});
