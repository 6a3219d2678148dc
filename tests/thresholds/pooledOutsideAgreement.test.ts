import { describe, expect, it } from "vitest";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest } from "../../lib/synthetic";
import { buildThresholdSeries, detectThresholds, outsideAgreeingMethods } from "../../lib/thresholds/detectThresholds";
import { combineEstimates } from "../../lib/thresholds/consensus";
import { thresholdMethodWords } from "../../lib/analysis/draftExtras";
import { rcpVeVco2 } from "../../lib/thresholds/rcpVeVco2";
import type { MethodQuality } from "../../lib/thresholds/thresholdTypes";
import { methodWithValue } from "./methodWithValue";

// Synthetic data (invented): the main model's test with seed 11, moderate noise, true RCP by construction.

describe("a pooled threshold value outside the methods that agree", () => {
  const syn = generateSyntheticTest({}, 11);
  const series = buildThresholdSeries(conditionTable(syn.table))!;
  const base = rcpVeVco2(series);
  const as = (id: string, vo2MlMin: number, quality: MethodQuality) => methodWithValue(base, id, vo2MlMin, quality);
  // the VT2 pool's weights (detectThresholds): joint profile 2 (halved when "poor"), break 1, equivalents 0 (agreement only)
  const weights = { "vt2-joint-profile": 2, "vt2-ve-vco2-break": 1, "vt2-ventilatory-equivalents": 0 };
  // the joint profile at a given value and verdict, beside a good break at 2130 and a fair VE/VCO2 at 2160 (invented)
  const pool = (jointMlMin: number, jointQuality: MethodQuality) =>
    combineEstimates(
      [
        as("vt2-joint-profile", jointMlMin, jointQuality),
        as("vt2-ve-vco2-break", 2130, "good"),
        as("vt2-ventilatory-equivalents", 2160, "fair"),
      ],
      { weights },
    );

  it("is recognised: two methods agree, a poor heavy one does not, and the weighted median falls between the camps", () => {
    const c = pool(1570, "poor");
    expect(c.confidence).toBe("moderate");
    expect(c.band).toEqual({ lowMlMin: 2130, highMlMin: 2160 });
    expect(c.vo2MlMin).toBeCloseTo((1570 + 2130) / 2, 6); // equal weights 1 and 1: the mean of the two
    expect(outsideAgreeingMethods(c)).toBe(true);
  });

  it("is not flagged when the value lies within the agreeing methods' range or when confidence is already low", () => {
    const inside = pool(2140, "good");
    expect(outsideAgreeingMethods(inside)).toBe(false);
    const lone = combineEstimates([as("vt2-joint-profile", 1570, "poor"), as("vt2-ve-vco2-break", 2130, "good")], { weights });
    expect(lone.confidence).toBe("low");
    expect(outsideAgreeingMethods(lone)).toBe(false);
  });

  it("is reported with low confidence and a band that holds the value (file without end-tidal gases or phases)", () => {
    // Without PETO2, PETCO2, HR, load or phase columns this test's VT2 joint profile is "poor" and early while the
    // VE-vs-VCO2 break and VE/VCO2 agree near the true RCP; the pooled value sits between them.
    const keep = new Set(["timeS", "vo2MlMin", "vco2MlMin", "veLMin"]);
    const table = {
      ...syn.table,
      fields: syn.table.fields.filter((f) => keep.has(f)),
      rows: syn.table.rows.map((r) => ({ timeS: r.timeS, vo2MlMin: r.vo2MlMin, vco2MlMin: r.vco2MlMin, veLMin: r.veLMin })),
    };
    const r = detectThresholds(conditionTable(table), { bootstrap: 10, seed: 1 });
    const v = r.vt2.vo2MlMin.value!;
    const agreeing = r.methods.filter((m) => r.vt2.methodIds.includes(m.id)).map((m) => m.vo2MlMin.value!);
    expect(agreeing.length).toBeGreaterThanOrEqual(2);
    expect(v).toBeLessThan(Math.min(...agreeing));
    expect(r.vt2.confidence).toBe("low");
    expect(r.vt2.reason).toMatch(/outside the range of the methods that agree/);
    expect(r.vt2.band!.lowMlMin).toBeLessThanOrEqual(v);
    expect(r.vt2.band!.highMlMin).toBeGreaterThanOrEqual(v);
    // the warning gives the advice to review once, not the reason's own "confirm by review" as well
    const warning = r.issues.find((i) => i.code === "vt2-low-confidence")!;
    expect(warning.message).toMatch(
      /outside the range of the methods that agree \(\d+–\d+ mL\/min\)\); confirm or set it by review\.$/,
    );
    expect(warning.message.match(/by review/g)).toHaveLength(1);
    // the report's method words say why the confidence is low, after the band
    expect(thresholdMethodWords(r.vt2, r)).toMatch(/\(confidence low, band \d+–\d+ mL\/min; why: the pooled value lies outside/);
  });

  it("never leaves a reported value outside its band (ten main-model tests, both thresholds)", () => {
    for (let seed = 1; seed <= 10; seed++) {
      const r = detectThresholds(conditionTable(generateSyntheticTest({}, seed).table), { bootstrap: 10, seed: 1 });
      for (const e of [r.vt1, r.vt2]) {
        if (e.vo2MlMin.value === null) continue;
        expect(e.band!.lowMlMin).toBeLessThanOrEqual(e.vo2MlMin.value);
        expect(e.band!.highMlMin).toBeGreaterThanOrEqual(e.vo2MlMin.value);
      }
    }
  });
});
