/**
 * Are the synthetic noise levels real? The late-ramp breath VO2 noise of the six models at each level is set beside
 * the same measure on real recordings, and `recolourNoise` is checked by construction.
 *
 * Real data: ACTES — Chabert C, Mongin D, Hermand E, Collado A, Hue O. Cardiorespiratory measurement from graded
 * cycloergometer exercise testing (version 1.0.0). PhysioNet; 2022. https://doi.org/10.13026/2qs3-kh43. Licensed under
 * the Open Data Commons Attribution License v1.0. (18 young athletes, +15 W per minute; breaths approximated as changes
 * of the VO2 value, `tests/fixtures/open-data/actes/README.md`.)
 *
 * The measure (ours, common practice for a robust spread): residual of each breath's VO2 from the centred 15-breath
 * running median, over the second half of the exercise; spread = 1.4826 × MAD (in % of the running median), and the
 * lag-1 correlation of the residuals. On ACTES: spread 2.0–7.2 % (median 4.2 %), lag-1 correlation 0.43–0.67.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import type { BreathTable } from "../../lib/breath";
import { quantile } from "../../lib/numeric";
import { RECOLOURED_FIELDS, recolourNoise, type NoiseLevel } from "../../lib/synthetic";
import { bankCases, type BankGenerator } from "../../scripts/threshold-bank";

const HALF_WINDOW = 7;

function median(values: number[]): number {
  return quantile(values, 0.5);
}

/** Lag-1 sample autocorrelation about the mean (common practice), written here apart from the code under test. */
function lag1(x: number[]): number {
  const m = x.reduce((a, b) => a + b, 0) / x.length;
  let num = 0;
  let den = 0;
  for (let i = 0; i < x.length; i++) {
    den += (x[i] - m) ** 2;
    if (i > 0) num += (x[i] - m) * (x[i - 1] - m);
  }
  return num / den;
}

/** Robust spread (%) and lag-1 correlation of breath residuals around a centred 15-breath running median. */
function breathNoise(vo2: number[]): { spreadPct: number; lag1: number } {
  const res: number[] = [];
  for (let i = HALF_WINDOW; i < vo2.length - HALF_WINDOW; i++) {
    const m = median(vo2.slice(i - HALF_WINDOW, i + HALF_WINDOW + 1));
    res.push(vo2[i] / m - 1);
  }
  const mid = median(res);
  return { spreadPct: 100 * 1.4826 * median(res.map((r) => Math.abs(r - mid))), lag1: lag1(res) };
}

/** ACTES: per recording, the breaths of the second half of the loaded exercise (time > 0, power > 0). */
function actesNoise(): { spreadPct: number; lag1: number }[] {
  const text = readFileSync(new URL("../fixtures/open-data/actes/actes_vo2_breaths_derived.csv", import.meta.url), "utf8");
  const byId = new Map<number, { t: number; vo2: number; w: number }[]>();
  for (const line of text.trim().split("\n").slice(1)) {
    const [id, t, vo2, w] = line.split(",").map(Number);
    if (!byId.has(id)) byId.set(id, []);
    byId.get(id)!.push({ t, vo2, w });
  }
  return [...byId.values()].map((rows) => {
    const loaded = rows.filter((r) => r.t > 0 && r.w > 0);
    const end = loaded[loaded.length - 1].t;
    return breathNoise(loaded.filter((r) => r.t > end / 2).map((r) => r.vo2));
  });
}

/** One model at one level: the median spread and lag-1 correlation over its first 20 tests (second half of the ramp). */
function modelNoise(generator: BankGenerator, level: NoiseLevel): { spreadPct: number; lag1: number } {
  const all = bankCases(generator, 20, undefined, [level]).map((c) => {
    const syn = c.make();
    const { warmupEndS, rampEndS } = syn.truth.phases;
    const mid = (warmupEndS + rampEndS) / 2;
    const vo2 = syn.table.rows
      .filter((r) => r.timeS > mid && r.timeS <= rampEndS && Number.isFinite(r.vo2MlMin))
      .map((r) => r.vo2MlMin as number);
    return breathNoise(vo2);
  });
  return { spreadPct: median(all.map((a) => a.spreadPct)), lag1: median(all.map((a) => a.lag1)) };
}

const MODELS: BankGenerator[] = ["main", "variant", "holdout", "audit", "crosscheck", "secondopinion"];

describe("synthetic breath noise against real recordings (ACTES, ODC-By 1.0)", () => {
  const actes = actesNoise();
  const spreads = actes.map((a) => a.spreadPct);
  const actesMin = Math.min(...spreads);
  const actesMax = Math.max(...spreads);
  const actesMedian = median(spreads);

  it("measures the real recordings as described (18 tests, spread 2–7.5 %, residuals correlated from breath to breath)", () => {
    expect(actes).toHaveLength(18);
    expect(actesMin).toBeGreaterThan(1.5);
    expect(actesMax).toBeLessThan(7.5);
    expect(actesMedian).toBeGreaterThan(3.5);
    expect(actesMedian).toBeLessThan(5);
    // every recording's residuals carry over to the next breath (0.43–0.67): a cart or export that averages
    for (const a of actes) expect(a.lag1).toBeGreaterThan(0.35);
  });

  for (const model of MODELS) {
    it(`${model}: low noise lies within the real range; moderate is no quieter than the real median; high is louder`, () => {
      const low = modelNoise(model, "low");
      const moderate = modelNoise(model, "moderate");
      const high = modelNoise(model, "high");
      expect(low.spreadPct).toBeGreaterThanOrEqual(actesMin);
      expect(low.spreadPct).toBeLessThanOrEqual(actesMax);
      // the accuracy goals are measured at moderate noise: it must not flatter the engine against real breaths
      expect(moderate.spreadPct).toBeGreaterThanOrEqual(actesMedian);
      expect(high.spreadPct).toBeGreaterThan(moderate.spreadPct);
      expect(high.spreadPct).toBeGreaterThan(actesMax);
      // the models' own noise is close to independent from breath to breath (what recolourNoise exists to change)
      for (const m of [low, moderate, high]) expect(Math.abs(m.lag1)).toBeLessThan(0.3);
    });
  }
});

describe("recolourNoise (by construction)", () => {
  /** A flat noise-free table and white noise of SD 100 mL/min on VO2 (Box–Muller on a fixed linear congruential stream). */
  function whiteTable(n: number): { noisy: BreathTable; clean: BreathTable } {
    let s = 12345;
    const u = () => {
      s = (s * 1103515245 + 12345) % 2147483648;
      return (s + 0.5) / 2147483648;
    };
    const clean: BreathTable = { shape: "breath", fields: ["timeS", "vo2MlMin", "workW"], rows: [] };
    const noisy: BreathTable = { shape: "breath", fields: ["timeS", "vo2MlMin", "workW"], rows: [] };
    for (let i = 0; i < n; i++) {
      const z = Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
      clean.rows.push({ timeS: 3 * i, vo2MlMin: 2000, workW: 100 });
      noisy.rows.push({ timeS: 3 * i, vo2MlMin: 2000 + 100 * z, workW: 100 });
    }
    return { noisy, clean };
  }
  const sd = (x: number[]) => {
    const m = x.reduce((a, b) => a + b, 0) / x.length;
    return Math.sqrt(x.reduce((a, b) => a + (b - m) ** 2, 0) / (x.length - 1));
  };

  it("gives white noise the lag-1 correlation asked for and keeps its spread", () => {
    const { noisy, clean } = whiteTable(20000);
    const before = noisy.rows.map((r) => (r.vo2MlMin as number) - 2000);
    expect(Math.abs(lag1(before))).toBeLessThan(0.03);
    for (const rho of [0.3, 0.5, 0.8]) {
      const after = recolourNoise(noisy, clean, rho).rows.map((r) => (r.vo2MlMin as number) - 2000);
      // AR(1): lag-1 correlation ρ, variance unchanged (common practice); 20 000 breaths give about ±0.01 and ±2 %
      expect(lag1(after)).toBeCloseTo(rho, 1);
      expect(sd(after) / sd(before)).toBeGreaterThan(0.95);
      expect(sd(after) / sd(before)).toBeLessThan(1.05);
    }
  });

  it("leaves the protocol channels, the breath times and the input alone; ρ = 0 is a copy; bad input is a programming error", () => {
    const { noisy, clean } = whiteTable(50);
    const snapshot = JSON.stringify(noisy);
    const out = recolourNoise(noisy, clean, 0.6);
    expect(JSON.stringify(noisy)).toBe(snapshot);
    expect(out.rows.map((r) => [r.timeS, r.workW])).toEqual(noisy.rows.map((r) => [r.timeS, r.workW]));
    expect(RECOLOURED_FIELDS).not.toContain("workW");
    expect(out.rows[0].vo2MlMin).toBe(noisy.rows[0].vo2MlMin);
    expect(recolourNoise(noisy, clean, 0).rows).toEqual(noisy.rows);
    expect(() => recolourNoise(noisy, clean, 1)).toThrow(RangeError);
    expect(() => recolourNoise(noisy, { ...clean, rows: clean.rows.slice(1) }, 0.5)).toThrow(RangeError);
  });
});
