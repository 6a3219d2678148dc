import { describe, it, expect } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { linearRegression } from "../../lib/numeric";
import { generateHoldoutTest, holdoutSpec } from "../../lib/synthetic";
import type { HoldoutTest, NoiseLevel } from "../../lib/synthetic";

// Invented data throughout: the hold-out generator's answers are known by construction.

const POPULATION = 40;
const SEED = 11;

function population(level: NoiseLevel): HoldoutTest[] {
  return Array.from({ length: POPULATION }, (_, i) => generateHoldoutTest(holdoutSpec(i, SEED, [level]), 500 + i));
}
const noiseFreePop = population("none");
const moderatePop = population("moderate");

const median = (a: number[]): number => {
  const s = [...a].sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};
/** Robust SD: 1.4826 × median absolute deviation (consistent with the SD for Gaussian data; common practice). */
const robustSd = (a: number[]): number => {
  const m = median(a);
  return 1.4826 * median(a.map((x) => Math.abs(x - m)));
};
const quantile = (a: number[], q: number): number => [...a].sort((x, y) => x - y)[Math.floor(q * (a.length - 1))];
const within = (rows: BreathRow[], from: number, to: number): BreathRow[] => rows.filter((r) => r.timeS >= from && r.timeS <= to);
const num = (r: BreathRow, f: keyof BreathRow): number => r[f] as number;

describe("holdoutSpec", () => {
  it("is deterministic and cycles the noise levels", () => {
    const levels: NoiseLevel[] = ["low", "moderate", "high"];
    expect(holdoutSpec(7, 3, levels)).toEqual(holdoutSpec(7, 3, levels));
    expect(holdoutSpec(7, 3, levels)).not.toEqual(holdoutSpec(8, 3, levels));
    expect(holdoutSpec(7, 3, levels)).not.toEqual(holdoutSpec(7, 4, levels));
    expect([0, 1, 2, 3, 4].map((i) => holdoutSpec(i, 3, levels).noise)).toEqual(["low", "moderate", "high", "low", "moderate"]);
  });

  it("draws a varied population inside the stated ranges", () => {
    const specs = Array.from({ length: 200 }, (_, i) => holdoutSpec(i, 21, ["moderate"]));
    for (const s of specs) {
      expect(s.ageY).toBeGreaterThanOrEqual(20);
      expect(s.ageY).toBeLessThanOrEqual(80);
      expect(s.weightKg).toBeGreaterThanOrEqual(50);
      expect(s.weightKg).toBeLessThanOrEqual(120);
      expect(s.restS).toBeGreaterThanOrEqual(60);
      expect(s.restS).toBeLessThanOrEqual(180);
      expect(s.warmupS).toBeLessThanOrEqual(240);
      expect(s.rampS).toBeGreaterThanOrEqual(360);
      expect(s.rampS).toBeLessThanOrEqual(900);
      expect(s.recoveryS).toBeGreaterThanOrEqual(60);
      expect(s.recoveryS).toBeLessThanOrEqual(240);
      if (s.modality === "cycle") {
        expect(s.rampWPerMin).toBeGreaterThanOrEqual(5);
        expect(s.rampWPerMin).toBeLessThanOrEqual(50);
        expect(s.treadmill).toBeNull();
      } else {
        expect(s.rampWPerMin).toBeNull();
        expect(s.treadmill).not.toBeNull();
      }
    }
    const kinds = new Set(specs.map((s) => s.group));
    expect(kinds.size).toBe(5);
    const treadmill = specs.filter((s) => s.modality === "treadmill").length;
    expect(treadmill).toBeGreaterThan(20);
    expect(treadmill).toBeLessThan(100);
    expect(specs.some((s) => s.warmupS === 0)).toBe(true);
  });
});

describe("generateHoldoutTest", () => {
  it("is deterministic for a seed and changes with it", () => {
    const spec = holdoutSpec(3, 5, ["moderate"]);
    const a = generateHoldoutTest(spec, 99);
    const b = generateHoldoutTest(spec, 99);
    const c = generateHoldoutTest(spec, 100);
    expect(a.table).toEqual(b.table);
    expect(a.truth).toEqual(b.truth);
    expect(a.table.rows.map((r) => r.vo2MlMin)).not.toEqual(c.table.rows.map((r) => r.vo2MlMin));
    expect(a.holdout).toEqual({ noise: "moderate" });
  });

  it("does not mutate a frozen spec", () => {
    const spec = Object.freeze(holdoutSpec(4, 5, ["low"]));
    expect(() => generateHoldoutTest(spec, 1)).not.toThrow();
  });

  it("gives exactly the noise-free table at noise 'none'", () => {
    for (const t of noiseFreePop.slice(0, 10)) expect(t.table).toEqual(t.noiseFree);
  });

  it("marks phases in order, with breath times rising and shared by both tables", () => {
    const order = { rest: 0, warmup: 1, exercise: 2, recovery: 3 };
    for (const t of moderatePop) {
      const rows = t.table.rows;
      expect(t.table.shape).toBe("breath");
      expect(rows.map((r) => r.timeS)).toEqual(t.noiseFree.rows.map((r) => r.timeS));
      for (let i = 1; i < rows.length; i++) {
        expect(rows[i].timeS).toBeGreaterThan(rows[i - 1].timeS);
        expect(order[rows[i].phase!]).toBeGreaterThanOrEqual(order[rows[i - 1].phase!]);
      }
      expect(rows[0].phase).toBe("rest");
      expect(rows[rows.length - 1].phase).toBe("recovery");
      expect(rows.some((r) => r.phase === "warmup")).toBe(t.spec.warmupS > 0);
    }
  });

  it("treadmill tests carry speed and grade and no work rate", () => {
    const tm = moderatePop.filter((t) => t.spec.modality === "treadmill");
    expect(tm.length).toBeGreaterThan(0);
    for (const t of tm) {
      expect(t.table.fields).not.toContain("workW");
      expect(t.table.fields).toContain("speedKmh");
      expect(t.table.fields).toContain("gradePct");
      expect(t.table.rows.every((r) => r.workW === undefined)).toBe(true);
      expect(Number.isNaN(t.truth.vt1.workW)).toBe(true);
      expect(Number.isNaN(t.truth.deltaVo2DeltaWrMlMinW)).toBe(true);
      const ex = t.table.rows.filter((r) => r.phase === "exercise");
      // incremental: speed or grade at the end above the start
      const first = ex[0];
      const last = ex[ex.length - 1];
      expect(num(last, "speedKmh") + num(last, "gradePct")).toBeGreaterThan(num(first, "speedKmh") + num(first, "gradePct"));
    }
    for (const t of moderatePop.filter((x) => x.spec.modality === "cycle")) {
      expect(t.table.fields).toContain("workW");
      expect(t.table.fields).not.toContain("speedKmh");
    }
  });
});

describe("hold-out truth (noise-free, known by construction)", () => {
  it("orders VT1 < VT2 < peak with the detector margins", () => {
    let nullVt2 = 0;
    for (const t of noiseFreePop) {
      const { vt1, vt2, peak, phases } = t.truth;
      expect(t.truth.invented).toBe(true);
      // VT1 at least 150 s into the incremental phase (built in: the threshold is lifted to that point)
      expect(vt1.timeS - phases.warmupEndS).toBeGreaterThanOrEqual(150);
      expect(vt1.vo2MlMin).toBeLessThan(peak.vo2MlMin);
      if (vt2 === null) {
        nullVt2++;
        continue;
      }
      expect(vt2.timeS).toBeGreaterThan(vt1.timeS);
      expect(vt2.timeS).toBeLessThan(phases.rampEndS);
      // VT2 at least 8 % of peak VO2 above VT1
      expect(vt2.vo2MlMin - vt1.vo2MlMin).toBeGreaterThanOrEqual(0.08 * peak.vo2MlMin);
      expect(vt2.vo2MlMin).toBeLessThan(peak.vo2MlMin);
    }
    // some tests never reach VT2 (about 10 % by design: 45 % of COPD-like, few others)
    expect(nullVt2).toBeGreaterThan(0);
    expect(nullVt2).toBeLessThanOrEqual(POPULATION * 0.3);
    const specs = Array.from({ length: 300 }, (_, i) => holdoutSpec(i, 77, ["none"]));
    const specNull = specs.filter((s) => s.vt2FractionOfPeak === null).length / specs.length;
    expect(specNull).toBeGreaterThan(0.05);
    expect(specNull).toBeLessThan(0.16);
  });

  it("has no excess CO2 below VT1 and a steeper VCO2-VO2 slope after it", () => {
    for (const t of noiseFreePop) {
      const { vt1, phases } = t.truth;
      const below = within(t.noiseFree.rows, phases.warmupEndS + 120, vt1.timeS - 5);
      if (below.length < 8) continue;
      const fitBelow = linearRegression(
        below.map((r) => num(r, "vo2MlMin")),
        below.map((r) => num(r, "vco2MlMin")),
      );
      // metabolic RQ rises linearly with VO2, so VCO2 = RQ·VO2 is a near-straight line: slope between RQ at rest
      // and RQ at peak plus the RQ rise (d(RQ·V)/dV = RQ + V·dRQ/dV ≤ rqPeak + (rqPeak − rqRest)·V/(V − Vrest))
      // treadmill stages are steps: VO2 and VCO2 answer each with different lags, so the relation loops a little
      expect(fitBelow.r2).toBeGreaterThan(t.spec.modality === "cycle" ? 0.995 : 0.97);
      if (t.spec.modality === "cycle") {
        // (treadmill: the first stage is a step, and VCO2 catching up through its store steepens this span)
        expect(fitBelow.slope).toBeGreaterThan(t.spec.rqRest - 0.05);
        expect(fitBelow.slope).toBeLessThan(t.spec.rqPeak + 2 * (t.spec.rqPeak - t.spec.rqRest) + 0.05);
      }
      // RER below VT1 stays at or under the metabolic RQ at peak (no excess CO2 yet)
      for (const r of below) expect(num(r, "vco2MlMin") / num(r, "vo2MlMin")).toBeLessThanOrEqual(t.spec.rqPeak + 0.01);
      const end = t.truth.vt2 ? t.truth.vt2.timeS : phases.rampEndS;
      const above = within(t.noiseFree.rows, vt1.timeS, end);
      const fitAbove = linearRegression(
        above.map((r) => num(r, "vo2MlMin")),
        above.map((r) => num(r, "vco2MlMin")),
      );
      if (t.spec.modality === "cycle") expect(fitAbove.slope).toBeGreaterThan(fitBelow.slope + 0.05);
      // excess CO2 above VT1 lifts RER over the metabolic RQ by the end of the ramp
      expect(t.truth.peak.rer).toBeGreaterThan(t.spec.rqPeak);
      if (t.spec.modality === "cycle") {
        expect(t.truth.vco2Vo2SlopeAboveVt1).toBeGreaterThan(t.truth.vco2Vo2SlopeBelowVt1);
      }
    }
  });

  it("keeps PaCO2 constant between VT1 and VT2 (PETCO2 near flat)", () => {
    for (const t of noiseFreePop) {
      if (!t.truth.vt2) continue;
      const seg = within(t.noiseFree.rows, t.truth.vt1.timeS, t.truth.vt2.timeS);
      // Back-calculated PaCO2 = 863·VCO2/(VE·(1 − VDanat/VT − alveolar dead-space fraction)) (alveolar ventilation
      // equation, common practice). Tolerance 1 mmHg: VE lags its target by tauVe ≤ 6 s; hand calculation of the
      // bias: (6/60 min)·(0.3 L/min per min ÷ 1.5 L/min)·40 mmHg = 0.8 mmHg at VT1, less later.
      const pa = seg.map(
        (r) =>
          (863 * (num(r, "vco2MlMin") / 1000)) /
          (num(r, "veLMin") * (1 - t.spec.vdAnatomicL / num(r, "vtL") - t.spec.alveolarDeadSpaceFraction)),
      );
      expect(Math.max(...pa) - Math.min(...pa)).toBeLessThan(1);
      // PETCO2 = PaCO2 diluted by alveolar dead space + ½ the expiratory PCO2 rise; the rise grows with VT − VD.
      // Hand calculation: ½·713·0.55/863 = 0.227 mmHg per (mmHg·L/L); × 40 mmHg / 3 L EELV × 0.5 L more (VT − VD)
      // = 1.5 mmHg; tolerance 3 mmHg for small lungs and high PaCO2.
      const pet = seg.map((r) => num(r, "petco2MmHg"));
      expect(Math.max(...pet) - Math.min(...pet)).toBeLessThan(3);
    }
  });

  it("has VE/VCO2 rising and PaCO2 falling after VT2", () => {
    for (const t of noiseFreePop) {
      const vt2 = t.truth.vt2;
      if (!vt2) continue;
      const rows = t.noiseFree.rows.filter((r) => r.phase === "exercise");
      const last = rows[rows.length - 1];
      const eqAt = (r: { veLMin?: number; vco2MlMin?: number }): number =>
        num(r as BreathRow, "veLMin") / (num(r as BreathRow, "vco2MlMin") / 1000);
      expect(eqAt(last)).toBeGreaterThan(eqAt(vt2));
      // corner of VE vs VCO2: steeper after VT2 than in the 2 min before it
      const before = within(rows, vt2.timeS - 120, vt2.timeS);
      const after = within(rows, vt2.timeS, t.truth.phases.rampEndS);
      if (after.length < 6) continue;
      const sBefore = linearRegression(
        before.map((r) => num(r, "vco2MlMin")),
        before.map((r) => num(r, "veLMin")),
      ).slope;
      const sAfter = linearRegression(
        after.map((r) => num(r, "vco2MlMin")),
        after.map((r) => num(r, "veLMin")),
      ).slope;
      expect(sAfter).toBeGreaterThan(sBefore * 1.03);
      // PETCO2 at the end of the ramp below its value at VT2
      const petAtVt2 = median(within(rows, vt2.timeS - 20, vt2.timeS).map((r) => num(r, "petco2MmHg")));
      expect(num(last, "petco2MmHg")).toBeLessThan(petAtVt2);
    }
  });

  it("computes the truth slopes from the noise-free breaths over the stated spans", () => {
    for (const t of noiseFreePop.slice(0, 12)) {
      const { phases, vt2 } = t.truth;
      const to = vt2 ? vt2.timeS : phases.rampEndS;
      const seg = within(t.noiseFree.rows, phases.warmupEndS, to);
      const fit = linearRegression(
        seg.map((r) => num(r, "vco2MlMin") / 1000),
        seg.map((r) => num(r, "veLMin")),
      );
      expect(t.truth.veVco2SlopeToVt2).toBeCloseTo(fit.slope, 10);
      expect(t.truth.veVco2SlopeToPeak).toBeGreaterThanOrEqual(t.truth.veVco2SlopeToVt2 - 1e-9);
      if (t.spec.modality === "cycle") {
        // ΔVO2/ΔWR near the demand gain (Hansen JE et al., Am J Cardiol 1987;59:669-74 — confirmed, author list
        // recalled: 10.29 ± 1.01 normal, 8.29 ± 1.17 in disease; hansen-1987-ramp-gain). The ×0.8–×1.25 band
        // around the model's own gain is our plausibility bound, not a published value.
        expect(t.truth.deltaVo2DeltaWrMlMinW).toBeGreaterThan(t.spec.gainMlMinPerW * 0.8);
        expect(t.truth.deltaVo2DeltaWrMlMinW).toBeLessThan(t.spec.gainMlMinPerW * 1.25);
      }
    }
  });
});

describe("hold-out population at moderate noise", () => {
  // Every bound below is a physiological plausibility limit, common practice (wide ranges any clinician would
  // accept for an adult test), not a published cut-off; they check the invented model stays human.
  it("has physiologically plausible ranges in every test", () => {
    for (const t of moderatePop) {
      const rows = t.table.rows;
      const rest = rows.filter((r) => r.phase === "rest");
      const rerRest = median(rest.map((r) => num(r, "vco2MlMin") / num(r, "vo2MlMin")));
      // resting RER 0.7–0.95 (common practice)
      expect(rerRest).toBeGreaterThan(0.7);
      expect(rerRest).toBeLessThan(0.95);
      // peak: 30-s mean of the last 30 s of exercise
      const end = t.truth.phases.rampEndS;
      const last = within(rows, end - 30, end).filter((r) => r.phase === "exercise");
      const mean = (f: keyof BreathRow): number => last.reduce((s, r) => s + num(r, f), 0) / last.length;
      // peak RER ≥ 1.0 at the end of a symptom-limited ramp; peak VE < 200 L/min (common practice, plausibility)
      expect(mean("vco2MlMin") / mean("vo2MlMin")).toBeGreaterThanOrEqual(1.0);
      expect(mean("veLMin")).toBeLessThan(200);
      // peak VO2 9–60 mL/kg/min (common practice, plausibility: severe disease to a trained adult)
      const peakPerKg = t.truth.peak.vo2MlMin / t.spec.weightKg;
      expect(peakPerKg).toBeGreaterThan(9);
      expect(peakPerKg).toBeLessThan(60);
      // PETCO2 20–55 mmHg (common practice, plausibility; 5th to 95th percentile of breaths, single glitch breaths
      // are allowed outside)
      const pet = rows.map((r) => num(r, "petco2MmHg"));
      expect(quantile(pet, 0.05)).toBeGreaterThan(20);
      expect(quantile(pet, 0.95)).toBeLessThan(55);
      // median SpO2 > 90 % and 95th-percentile HR < 210 bpm (common practice, plausibility)
      const spo2 = rows.map((r) => num(r, "spo2Pct"));
      expect(quantile(spo2, 0.5)).toBeGreaterThan(90);
      const hr = rows.map((r) => num(r, "hrBpm"));
      expect(quantile(hr, 0.95)).toBeLessThan(210);
    }
  });

  it("has breath-to-breath VO2 CV of 10–15 % at rest, smaller in heavy exercise", () => {
    // CV of the noisy/noise-free ratio, robust SD so a single sigh does not decide it (invented target band
    // for typical clinical breath-by-breath exports)
    const cv = (pop: HoldoutTest[], pick: (r: BreathRow, t: HoldoutTest) => boolean): number =>
      median(
        pop.map((t) => {
          const idx = t.table.rows.map((_, i) => i).filter((i) => pick(t.table.rows[i], t));
          return robustSd(idx.map((i) => num(t.table.rows[i], "vo2MlMin") / num(t.noiseFree.rows[i], "vo2MlMin")));
        }),
      );
    const atRest = (r: BreathRow): boolean => r.phase === "rest";
    const heavy = (r: BreathRow, t: HoldoutTest): boolean => r.phase === "exercise" && r.timeS > t.truth.phases.rampEndS - 120;
    const moderateRest = cv(moderatePop, atRest);
    const moderateHeavy = cv(moderatePop, heavy);
    expect(moderateRest).toBeGreaterThanOrEqual(0.1);
    expect(moderateRest).toBeLessThanOrEqual(0.15);
    expect(moderateHeavy).toBeLessThan(moderateRest * 0.7);
    const lowPop = Array.from({ length: 12 }, (_, i) => generateHoldoutTest(holdoutSpec(i, SEED, ["low"]), 500 + i));
    const highPop = Array.from({ length: 12 }, (_, i) => generateHoldoutTest(holdoutSpec(i, SEED, ["high"]), 500 + i));
    expect(cv(lowPop, atRest)).toBeLessThan(moderateRest);
    expect(cv(highPop, atRest)).toBeGreaterThan(moderateRest);
    // the noise is unbiased: median noisy/noise-free ratio in heavy exercise within 6 % of 1 (slow ventilatory wander over 2 min)
    for (const t of moderatePop.slice(0, 10)) {
      const idx = t.table.rows.map((_, i) => i).filter((i) => heavy(t.table.rows[i], t));
      const ratio = median(idx.map((i) => num(t.table.rows[i], "vo2MlMin") / num(t.noiseFree.rows[i], "vo2MlMin")));
      expect(Math.abs(ratio - 1)).toBeLessThan(0.06);
    }
  });
});
