import { describe, it, expect } from "vitest";
import type { BreathRow } from "../../lib/breath/types";
import {
  generateSecondOpinionTest,
  secondOpinionSpec,
  type SecondOpinionTest,
} from "../../lib/synthetic/generateSecondOpinionTest";
import { SECOND_OPINION_SOURCES } from "../../lib/synthetic/sources";

// Checks of the second-opinion synthetic model by construction (invented data throughout).

const BANK = 42; // two rounds of the 21-group pattern
const SEED = 20240611;
const LEVELS = ["none", "low", "moderate", "high"] as const;
const bank: SecondOpinionTest[] = Array.from({ length: BANK }, (_, i) =>
  generateSecondOpinionTest(secondOpinionSpec(i, SEED, [...LEVELS]), SEED + i),
);

/** Plain OLS slope written out here (standard statistics), independent of lib/numeric. */
function olsSlope(x: number[], y: number[]): number {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
  }
  return sxy / sxx;
}

/** Noise-free value at time t by linear interpolation between the neighbouring breaths. */
function at(rows: BreathRow[], t: number, get: (b: BreathRow) => number): number {
  const j = rows.findIndex((b) => b.timeS >= t);
  if (j <= 0) throw new Error("time outside the breaths");
  const a = rows[j - 1];
  const b = rows[j];
  return get(a) + ((t - a.timeS) / (b.timeS - a.timeS)) * (get(b) - get(a));
}

const sd = (xs: number[]): number => {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
};

describe("secondOpinionSpec", () => {
  it("is deterministic for (i, seed) and varies with the seed", () => {
    expect(secondOpinionSpec(5, 1, ["moderate"])).toEqual(secondOpinionSpec(5, 1, ["moderate"]));
    expect(secondOpinionSpec(5, 2, ["moderate"])).not.toEqual(secondOpinionSpec(5, 1, ["moderate"]));
  });

  it("throws on a bad index or no noise levels (programming mistakes)", () => {
    expect(() => secondOpinionSpec(-1, 1, ["low"])).toThrow();
    expect(() => secondOpinionSpec(1.5, 1, ["low"])).toThrow();
    expect(() => secondOpinionSpec(0, 1, [])).toThrow();
  });

  it("gives a varied clinical mix with parameters inside their stated ranges", () => {
    const specs = bank.map((t) => t.spec);
    const groups = new Set(specs.map((s) => s.group));
    const protocols = new Set(specs.map((s) => s.protocol));
    expect(groups.size).toBe(8);
    expect(protocols).toEqual(new Set(["cycle-ramp", "cycle-steps", "treadmill-ramp", "treadmill-stages"]));
    expect(new Set(specs.map((s) => s.noise))).toEqual(new Set(LEVELS));
    expect(specs.some((s) => s.warmupS === 0) && specs.some((s) => s.warmupS > 0)).toBe(true);
    expect(specs.some((s) => s.earlyStopFraction !== null)).toBe(true);
    expect(specs.some((s) => s.vt2FractionOfCapacity === null)).toBe(true);
    expect(specs.some((s) => s.eov !== null)).toBe(true);
    expect(specs.some((s) => s.ventilatoryStopFraction !== null)).toBe(true);
    for (const s of specs) {
      expect(s.ageY).toBeGreaterThanOrEqual(19);
      expect(s.ageY).toBeLessThanOrEqual(84);
      expect(s.weightKg).toBeGreaterThanOrEqual(50);
      expect(s.weightKg).toBeLessThanOrEqual(115);
      expect(s.vo2CapacityMlMin).toBeGreaterThan(s.vo2UnloadedMlMin);
      expect(s.vt1FractionOfCapacity).toBeGreaterThan(0.2);
      expect(s.vt1FractionOfCapacity).toBeLessThan(0.9);
      if (s.vt2FractionOfCapacity !== null) {
        expect(s.vt2FractionOfCapacity).toBeGreaterThan(s.vt1FractionOfCapacity);
        expect(s.vt2FractionOfCapacity).toBeLessThanOrEqual(0.94);
      }
      // ΔVO2/ΔWR ranges around 10.29 ± 1.01 (health) and 8.29 ± 1.17 (circulatory disease), hansen-1987-vo2-work-rate.
      expect(s.gainMlMinPerW).toBeGreaterThanOrEqual(7);
      expect(s.gainMlMinPerW).toBeLessThanOrEqual(11.2);
      // EOV cycle length within 30–140 s (eov-definitions-review).
      if (s.eov) expect(s.eov.periodS).toBeGreaterThanOrEqual(30);
      if (s.eov) expect(s.eov.periodS).toBeLessThanOrEqual(140);
      if (s.stepS !== null) expect([60, 120, 180]).toContain(s.stepS);
      expect(Number.isInteger(s.transitDelayS)).toBe(true);
    }
  });

  it("names only registered sources", () => {
    for (const id of [
      "hansen-1987-vo2-work-rate",
      "beaver-1986-excess-co2",
      "alveolar-gas-equations",
      "second-opinion-invented",
    ]) {
      expect(SECOND_OPINION_SOURCES[id as keyof typeof SECOND_OPINION_SOURCES].id).toBe(id);
    }
  });
});

describe("generateSecondOpinionTest", () => {
  it("is deterministic for (spec, seed); another seed changes the noise only", () => {
    const spec = secondOpinionSpec(3, 7, ["moderate"]);
    const a = generateSecondOpinionTest(spec, 11);
    const b = generateSecondOpinionTest(Object.freeze({ ...spec }), 11);
    expect(b).toEqual(a);
    const c = generateSecondOpinionTest(spec, 12);
    expect(c.truth.vt1.vo2MlMin).toBe(a.truth.vt1.vo2MlMin);
    expect(c.table.rows.map((r) => r.vo2MlMin)).not.toEqual(a.table.rows.map((r) => r.vo2MlMin));
  });

  it("marks phases in order that cover the table, with the truth's boundaries", () => {
    const order = ["rest", "warmup", "exercise", "recovery"];
    for (const t of bank) {
      const rows = t.table.rows;
      const p = t.truth.phases;
      expect(rows.length).toBe(t.noiseFree.rows.length);
      expect(rows.map((r) => r.timeS)).toEqual(t.noiseFree.rows.map((r) => r.timeS));
      expect(rows[0].timeS).toBeGreaterThan(0);
      expect(rows[rows.length - 1].timeS).toBeLessThanOrEqual(p.endS);
      expect(p.endS - rows[rows.length - 1].timeS).toBeLessThan(15);
      const problems: string[] = [];
      for (let i = 0; i < rows.length; i++) {
        const r = rows[i];
        if (i > 0 && !(r.timeS > rows[i - 1].timeS)) problems.push(`time not increasing at ${i}`);
        if (i > 0 && order.indexOf(r.phase!) < order.indexOf(rows[i - 1].phase!)) problems.push(`phase order at ${i}`);
        const want =
          r.timeS < p.restEndS ? "rest" : r.timeS < p.warmupEndS ? "warmup" : r.timeS < p.rampEndS ? "exercise" : "recovery";
        if (r.phase !== want) problems.push(`phase ${r.phase} at ${i}, want ${want}`);
        for (const f of t.table.fields) if (r[f] === undefined) problems.push(`${f} missing in row ${i}`);
      }
      expect(problems).toEqual([]);
      expect(rows.some((r) => r.phase === "rest") && rows.some((r) => r.phase === "exercise")).toBe(true);
      expect(rows.some((r) => r.phase === "recovery")).toBe(true);
      if (t.spec.warmupS > 0) expect(rows.some((r) => r.phase === "warmup")).toBe(true);
      const treadmill = t.secondOpinion.ergometer === "treadmill";
      expect(t.table.fields.includes("workW")).toBe(!treadmill);
      expect(t.table.fields.includes("speedKmh")).toBe(treadmill);
      if (treadmill) expect(t.truth.vt1.workW).toBe(0);
    }
  });

  it("puts VT1 where metabolic VO2 crossed the lactate threshold, one transit delay later at the mouth", () => {
    for (const t of bank) {
      const s = t.spec;
      const so = t.secondOpinion;
      // By construction the mouth VO2 at VT1 is the lactate-threshold VO2 (fraction × capacity).
      expect(t.truth.vt1.vo2MlMin).toBeCloseTo(s.vt1FractionOfCapacity * s.vo2CapacityMlMin, 6);
      expect(t.truth.vt1.timeS).toBeCloseTo(so.vt1MetabolicTimeS + s.transitDelayS, 9);
      // The noise-free breaths around VT1 agree (interpolation between breaths ≤ ~3 s apart; 0.5 % tolerance).
      const v = at(t.noiseFree.rows, t.truth.vt1.timeS, (b) => b.vo2MlMin!);
      expect(Math.abs(v - t.truth.vt1.vo2MlMin) / t.truth.vt1.vo2MlMin).toBeLessThan(0.005);
      // VT1 lies in the incremental phase, at least 90 s before its end (bank rule).
      expect(t.truth.vt1.timeS).toBeGreaterThan(t.truth.phases.warmupEndS);
      expect(t.truth.phases.rampEndS - t.truth.vt1.timeS).toBeGreaterThanOrEqual(89.99);
    }
  });

  it("puts VT2 at the start of extra ventilation above the isocapnic VE–VCO2 line", () => {
    let checked = 0;
    for (const t of bank) {
      const s = t.spec;
      if (t.truth.vt2 === null) {
        expect(t.secondOpinion.vt2MetabolicTimeS).toBeNull();
        continue;
      }
      expect(t.truth.vt2.vo2MlMin).toBeCloseTo(s.vt2FractionOfCapacity! * s.vo2CapacityMlMin, 6);
      expect(t.truth.vt2.timeS).toBeGreaterThan(t.truth.vt1.timeS);
      if (s.eov !== null) continue;
      // Isocapnic line VE = a + b·VCO2 (ward-2021-ve-vco2) holds up to VT2 and is left after it.
      const line = (b: BreathRow): number => s.veInterceptLMin + (s.veVco2Slope * b.vco2MlMin!) / 1000;
      const ex = t.noiseFree.rows.filter((b) => b.phase === "exercise");
      if (Math.max(...ex.map((b) => b.veLMin!)) > 0.8 * s.mvvLMin) continue; // soft ceiling near MVV bends the line
      for (const b of ex.filter((r) => r.timeS <= t.truth.vt2!.timeS)) expect(b.veLMin! / line(b)).toBeCloseTo(1, 4);
      const after = ex.filter((r) => r.timeS >= t.truth.vt2!.timeS + 30);
      expect(after.length).toBeGreaterThan(0);
      for (const b of after) expect(b.veLMin! / line(b)).toBeGreaterThan(1.0005);
      // (the 1-s simulation grid lets the onset blur by < 1 s, hence 1e-3)
      expect(t.truth.vt2.veLMin / line({ timeS: 0, vco2MlMin: t.truth.vt2.vco2MlMin })).toBeCloseTo(1, 3);
      checked++;
    }
    expect(checked).toBeGreaterThan(10);
  });

  it("truth slopes equal independent OLS fits on the noise-free breaths", () => {
    for (const t of bank) {
      const tr = t.truth;
      const end = tr.vt2?.timeS ?? tr.phases.rampEndS;
      const sel = t.noiseFree.rows.filter((b) => b.timeS >= tr.phases.warmupEndS && b.timeS <= end);
      const slope = olsSlope(
        sel.map((b) => b.vco2MlMin! / 1000),
        sel.map((b) => b.veLMin!),
      );
      // Relative 1e-6: the library's prefix-sum OLS and this centred OLS differ only by rounding.
      expect(Math.abs(tr.veVco2SlopeToVt2 / slope - 1)).toBeLessThan(1e-6);
      // Without oscillation or ventilatory ceiling VE is exactly linear in VCO2 before VT2, so the slope is the spec's.
      const capped = Math.max(...sel.map((b) => b.veLMin!)) > 0.8 * t.spec.mvvLMin;
      if (t.spec.eov === null && !capped) expect(Math.abs(tr.veVco2SlopeToVt2 / t.spec.veVco2Slope - 1)).toBeLessThan(1e-4);
      if (t.secondOpinion.ergometer === "cycle") {
        const w = t.noiseFree.rows.filter((b) => b.timeS >= tr.phases.warmupEndS + 60 && b.timeS <= tr.phases.rampEndS);
        const g = olsSlope(
          w.map((b) => b.workW!),
          w.map((b) => b.vo2MlMin!),
        );
        expect(Math.abs(tr.deltaVo2DeltaWrMlMinW / g - 1)).toBeLessThan(1e-6);
      }
      // Peak: a 30-s mean of the incremental phase, at or below capacity and above VT1.
      expect(tr.peak.vo2MlMin).toBeLessThanOrEqual(t.spec.vo2CapacityMlMin);
      expect(tr.peak.vo2MlMin).toBeGreaterThan(tr.vt1.vo2MlMin);
      // Excess CO2 above VT1 steepens VCO2 vs VO2 (beaver-1986-excess-co2).
      expect(tr.vco2Vo2SlopeAboveVt1).toBeGreaterThan(tr.vco2Vo2SlopeBelowVt1 - 0.6);
    }
  });

  it("gives plausible physiology at rest and at VT1 in health (invented ranges around published values)", () => {
    const healthy = bank.filter((t) => ["healthy", "sedentary", "athlete"].includes(t.spec.group));
    const petco2AtVt1 = healthy.map((t) => at(t.noiseFree.rows, t.truth.vt1.timeS, (b) => b.petco2MmHg!));
    // PETCO2 at VT 40.6 ± 4.2 mmHg in healthy adults (lewthwaite-2021-normal-vt): mean within 34–46.
    const mean = petco2AtVt1.reduce((a, b) => a + b, 0) / petco2AtVt1.length;
    expect(mean).toBeGreaterThan(34);
    expect(mean).toBeLessThan(46);
    for (const t of healthy) {
      expect(t.truth.peak.rer).toBeGreaterThan(0.9);
      expect(t.truth.peak.rer).toBeLessThan(1.6);
    }
  });

  it("with noise 'none' the table equals the noise-free breaths", () => {
    const t = bank.find((x) => x.spec.noise === "none")!;
    expect(t.table.rows).toEqual(t.noiseFree.rows);
    expect(t.secondOpinion.artefacts).toEqual([]);
  });

  it("breath noise is near its setting: VE by the VT and duration deviations, VO2 and VCO2 beyond their coupling", () => {
    for (const level of ["low", "moderate", "high"] as const) {
      const logVe: number[] = [];
      const vo2Res: number[] = [];
      const vco2Res: number[] = [];
      let ns = bank[0].secondOpinion.noiseSettings;
      for (let i = 0; i < 6; i++) {
        const spec = { ...secondOpinionSpec(i, 99, [level]), eov: null };
        const t = generateSecondOpinionTest(spec, 1000 + i);
        ns = t.secondOpinion.noiseSettings;
        const bad = new Set(t.secondOpinion.artefacts.map((a) => a.index));
        t.table.rows.forEach((r, j) => {
          if (bad.has(j)) return;
          const f = t.noiseFree.rows[j];
          const u = Math.log(r.veLMin! / f.veLMin!);
          logVe.push(u);
          vo2Res.push(r.vo2MlMin! - f.vo2MlMin! * Math.exp(ns.vo2Coupling * u));
          vco2Res.push(r.vco2MlMin! - f.vco2MlMin! * Math.exp(ns.vco2Coupling * u));
        });
      }
      expect(logVe.length).toBeGreaterThan(1500);
      expect(sd(logVe) / ns.expectedLogVeSd).toBeGreaterThan(0.85);
      expect(sd(logVe) / ns.expectedLogVeSd).toBeLessThan(1.15);
      expect(sd(vo2Res) / ns.vo2SdMlMin).toBeGreaterThan(0.85);
      expect(sd(vo2Res) / ns.vo2SdMlMin).toBeLessThan(1.15);
      expect(sd(vco2Res) / ns.vco2SdMlMin).toBeGreaterThan(0.85);
      expect(sd(vco2Res) / ns.vco2SdMlMin).toBeLessThan(1.15);
    }
  });

  it("adds artefacts at noisy levels, and leaks read low", () => {
    const noisy = bank.filter((t) => t.spec.noise === "high");
    const arts = noisy.flatMap((t) => t.secondOpinion.artefacts.map((a) => ({ ...a, t })));
    expect(arts.length).toBeGreaterThan(5);
    for (const a of arts.filter((x) => x.kind === "leak")) {
      expect(a.t.table.rows[a.index].vtL!).toBeLessThan(a.t.noiseFree.rows[a.index].vtL! * 1.6);
    }
    const kinds = new Set(arts.map((a) => a.kind));
    expect(kinds.size).toBeGreaterThanOrEqual(3);
  });
});
