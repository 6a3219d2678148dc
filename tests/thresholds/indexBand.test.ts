import { describe, expect, it } from "vitest";
import { dilutionCorrectedSlope } from "../../lib/numeric";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest, syntheticBank } from "../../lib/synthetic";
import { INDEX_BAND_FACTORS } from "../../lib/thresholds/bandCalibration";
import { dVo2dWr } from "../../lib/thresholds/dVo2dWr";
import { exerciseSpan, pairedSeries } from "../../lib/thresholds/indexSeries";
import { oues } from "../../lib/thresholds/oues";
import { bandCentre, lineBandScale, veVco2Slope } from "../../lib/thresholds/veVco2Slope";

// Bands of the whole-exercise VE/VCO2 slope, OUES and ΔVO2/ΔWR on invented tests (the main synthetic model, moderate
// noise): how each band is built and traced. How often they hold the truth is the index bank's (bankIndices.test.ts).
const spec = syntheticBank(12, { seed: 2024, noiseLevels: ["moderate"] })[3];
const syn = generateSyntheticTest(spec.spec, spec.seed);
const test = conditionTable(syn.table);

describe("index bands", () => {
  const whole = veVco2Slope(test).slopeWholeExercise;
  const fits = oues(test).fits;
  const dwr = dVo2dWr(test).whole;

  it("every band holds its reported value and has a width", () => {
    for (const line of [whole, dwr, ...fits]) {
      const v = line.slope.value!;
      expect(line.band).toBeTruthy();
      expect(line.band!.low).toBeLessThanOrEqual(v);
      expect(line.band!.high).toBeGreaterThanOrEqual(v);
      expect(line.band!.high - line.band!.low).toBeGreaterThan(0);
    }
  });

  it("the VE/VCO2 band is centred on the slope corrected for breath noise in VCO2, recorded in its provenance", () => {
    const span = exerciseSpan(test)!;
    const p = pairedSeries(test.clean, "vco2MlMin", "veLMin", span);
    const x = p.x.map((v) => v / 1000);
    const c = dilutionCorrectedSlope(x, p.y, 0, x.length);
    const inputs = whole.slope.provenance.inputs!;
    expect(inputs.dilutionCorrected).toBeCloseTo(c.slope, 10);
    expect(inputs.reliability).toBeCloseTo(c.reliability, 10);
    expect(typeof inputs.residualLag1).toBe("number");
    // noise in the regressor flattens the plain slope: the corrected one is steeper
    expect(c.slope).toBeGreaterThan(whole.slope.value!);
    // the band: centre × (1 ± factor × scale), joined with the value
    const scale = lineBandScale(whole)!;
    const centre = bandCentre(whole)!;
    expect(whole.band!.high).toBeCloseTo(Math.max(centre * (1 + INDEX_BAND_FACTORS.veVco2Whole * scale), whole.slope.value!), 10);
    expect(whole.band!.low).toBeCloseTo(Math.min(centre * (1 - INDEX_BAND_FACTORS.veVco2Whole * scale), whole.slope.value!), 10);
  });

  it("ΔVO2/ΔWR is not corrected (the work rate is set, not measured breath by breath)", () => {
    const inputs = dwr.slope.provenance.inputs!;
    expect(inputs.dilutionCorrected).toBeUndefined();
    expect(bandCentre(dwr)).toBe(dwr.slope.value);
  });

  it("stage tables get no band, nor does a line that is not determined", () => {
    const stage = conditionTable({ ...syn.table, shape: "stage" });
    expect(veVco2Slope(stage).slopeWholeExercise.band).toBeUndefined();
    expect(oues(stage).fits[0].band).toBeUndefined();
    expect(dVo2dWr(stage).whole.band).toBeUndefined();
    const short = conditionTable({ ...syn.table, rows: syn.table.rows.slice(0, 5) });
    expect(veVco2Slope(short).slopeWholeExercise.band).toBeUndefined();
  });
});

describe("ΔVO2/ΔWR bands on real breath-by-breath recordings (ACTES, ODC-By 1.0)", () => {
  // Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded cycloergometer exercise
  // testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43. Licensed under the Open Data Commons
  // Attribution License v1.0. 18 graded cycle tests with breath VO2 and power: no truth, but the residuals show how
  // serially correlated real breaths are, which is what the band's scale allows for.
  it("each band holds its value, the residuals are serially correlated, a looser fit gets a wider band and a loose one a warning", async () => {
    const { readFileSync } = await import("node:fs");
    const { importBreathFile } = await import("../../lib/breath");
    const bytes = new Uint8Array(
      readFileSync(new URL("../fixtures/open-data/actes/actes_vo2_breaths_derived.csv", import.meta.url)),
    );
    const rows: { r2: number; widthPct: number; lag1: number }[] = [];
    const warned: number[] = [];
    for (let id = 1; id <= 18; id++) {
      const imported = await importBreathFile(bytes, { select: { ID: String(id) } });
      const result = dVo2dWr(conditionTable(imported.table!));
      const line = result.whole;
      if (result.issues.some((i) => i.code === "dvo2-dwr-loose-fit")) warned.push(id);
      const v = line.slope.value!;
      expect(line.band!.low).toBeLessThanOrEqual(v);
      expect(line.band!.high).toBeGreaterThanOrEqual(v);
      rows.push({
        r2: line.r2.value!,
        widthPct: (100 * (line.band!.high - line.band!.low)) / v,
        lag1: line.slope.provenance.inputs!.residualLag1 as number,
      });
    }
    // the one recording whose VO2 follows the load loosely (r² 0.28: about 1.4 L/min at 170 W) is flagged, no other
    expect(warned).toEqual([7]);
    // measured: lag-1 autocorrelation 0.53–0.87 on all 18 (the plain standard error would be 1.8–3.8 times too small)
    expect(Math.min(...rows.map((r) => r.lag1))).toBeGreaterThan(0.4);
    // the 6 tightest fits (r² ≥ 0.92) have narrower bands than the 6 loosest (r² ≤ 0.83)
    const byR2 = [...rows].sort((a, b) => b.r2 - a.r2);
    const widest = Math.max(...byR2.slice(0, 6).map((r) => r.widthPct));
    const narrowest = Math.min(...byR2.slice(-6).map((r) => r.widthPct));
    expect(widest).toBeLessThan(narrowest);
  });
});
