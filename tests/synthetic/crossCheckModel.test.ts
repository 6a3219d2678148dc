import { describe, it, expect } from "vitest";
import {
  CROSS_CHECK_NOISE,
  SYNTHETIC_SOURCES,
  crossCheckSpec,
  generateCrossCheckTest,
  type CrossCheckGroup,
  type CrossCheckTest,
} from "../../lib/synthetic";
import type { BreathRow } from "../../lib/breath";
import { linearRegression } from "../../lib/numeric";

// Cross-check model (invented data, source `cross-check-model-invented`): checks known by construction and
// against published physiology. Bank of 200 specs, seed 2024, three noise levels.
const SEED = 2024;
const LEVELS = ["low", "moderate", "high"] as const;
const bank: CrossCheckTest[] = Array.from({ length: 200 }, (_, i) =>
  generateCrossCheckTest(crossCheckSpec(i, SEED, [...LEVELS]), SEED * 1000 + i),
);
const byGroup = (g: CrossCheckGroup): CrossCheckTest[] => bank.filter((t) => t.spec.group === g);
const median = (v: number[]): number => {
  const s = [...v].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
/** Continuous cycle ramps with unloaded pedalling and no oscillatory ventilation: the cleanest shape. */
const cleanRamps = bank.filter((t) => t.spec.protocol === "cycle-ramp" && t.spec.warmupS > 0 && t.spec.eov === null);

describe("cross-check model: construction", () => {
  it("is deterministic for a seed and changes with the seed", () => {
    const spec = crossCheckSpec(3, 77, ["moderate"]);
    const a = generateCrossCheckTest(spec, 5);
    const b = generateCrossCheckTest(crossCheckSpec(3, 77, ["moderate"]), 5);
    const c = generateCrossCheckTest(spec, 6);
    expect(b.table).toEqual(a.table);
    expect(b.truth).toEqual(a.truth);
    expect(c.table.rows.map((r) => r.vo2MlMin)).not.toEqual(a.table.rows.map((r) => r.vo2MlMin));
    expect(a.crossCheck.noise).toBe("moderate");
  });

  it("does not mutate a frozen spec", () => {
    const spec = Object.freeze(crossCheckSpec(8, 1, ["low"]));
    expect(() => generateCrossCheckTest(spec, 1)).not.toThrow();
  });

  it("takes the noise level from noiseLevels[i % length]", () => {
    expect(crossCheckSpec(0, 1, ["low", "high"]).noise).toBe("low");
    expect(crossCheckSpec(5, 1, ["low", "high"]).noise).toBe("high");
    expect(() => crossCheckSpec(0, 1, [])).toThrow();
  });

  it("200 specs generate; every breath is finite and positive; phases in order; tables share breath times", () => {
    expect(bank).toHaveLength(200);
    const order = { rest: 0, warmup: 1, exercise: 2, recovery: 3 } as const;
    const bad: string[] = [];
    for (const t of bank) {
      expect(t.table.rows.length).toBe(t.noiseFree.rows.length);
      for (const table of [t.table, t.noiseFree]) {
        let prev = -1;
        let prevTime = -Infinity;
        for (const r of table.rows) {
          for (const k of [
            "vo2MlMin",
            "vco2MlMin",
            "veLMin",
            "hrBpm",
            "rrBrMin",
            "vtL",
            "peto2MmHg",
            "petco2MmHg",
            "spo2Pct",
          ] as const) {
            const v = r[k] as number;
            if (!(Number.isFinite(v) && v > 0)) bad.push(`${t.spec.label} ${k}=${v}`);
          }
          if (r.spo2Pct! > 100) bad.push(`${t.spec.label} SpO2 ${r.spo2Pct}`);
          const load = t.spec.protocol.startsWith("cycle") ? r.workW! : Math.min(r.speedKmh!, r.gradePct!);
          if (!(load >= 0)) bad.push(`${t.spec.label} load`);
          if (order[r.phase!] < prev || !(r.timeS > prevTime)) bad.push(`${t.spec.label} order at ${r.timeS}`);
          prev = order[r.phase!];
          prevTime = r.timeS;
        }
      }
      t.table.rows.forEach((r, k) => {
        if (Math.abs(r.timeS - t.noiseFree.rows[k].timeS) > 0.006) bad.push(`${t.spec.label} time ${k}`);
      });
    }
    expect(bad).toEqual([]);
  });

  it("covers every group, the four protocol shapes, ramps without unloaded pedalling, plateaus and EOV", () => {
    for (const g of ["athlete", "healthy-active", "sedentary", "older", "heart-failure", "copd-like"] as const) {
      expect(byGroup(g).length, g).toBeGreaterThanOrEqual(10);
    }
    for (const p of ["cycle-ramp", "cycle-steps", "treadmill-ramp", "treadmill-steps"] as const) {
      expect(bank.filter((t) => t.spec.protocol === p).length, p).toBeGreaterThanOrEqual(8);
    }
    expect(bank.some((t) => t.spec.protocol === "cycle-ramp" && t.spec.warmupS === 0)).toBe(true);
    expect(bank.some((t) => t.spec.plateauS > 0)).toBe(true);
    const eov = bank.filter((t) => t.spec.eov !== null);
    expect(eov.length).toBeGreaterThan(3);
    expect(eov.every((t) => t.spec.group === "heart-failure")).toBe(true);
  });

  it("VT1 truth sits at the spec's VO2 and VT2 above it; thresholds lie inside the incremental phase", () => {
    for (const t of bank) {
      const { vt1, vt2, phases } = t.truth;
      // Onset convention: VO2 at the mouth when excess CO2 begins = vt1Vo2MlMin (grid step 0.5 s → ≤ 1 %).
      expect(Math.abs(vt1.vo2MlMin - t.spec.vt1Vo2MlMin) / t.spec.vt1Vo2MlMin).toBeLessThan(0.01);
      expect(vt1.timeS).toBeGreaterThan(phases.warmupEndS);
      expect(vt1.timeS).toBeLessThan(phases.rampEndS);
      if (vt2) {
        expect(vt2.vo2MlMin).toBeGreaterThan(vt1.vo2MlMin);
        expect(vt2.timeS).toBeLessThan(phases.rampEndS);
      }
    }
  });
});

describe("cross-check model: gas exchange known by construction", () => {
  it("noise-free VCO2 vs VO2 slope below VT1 ≈ the spec's metabolic slope S1 (clean cycle ramps)", () => {
    expect(cleanRamps.length).toBeGreaterThan(30);
    for (const t of cleanRamps) expect(Math.abs(t.truth.vco2Vo2SlopeBelowVt1 - t.spec.s1), t.spec.label).toBeLessThan(0.06);
  });

  it("excess CO2 is zero below VT1 and positive above it (residual from the sub-VT1 VCO2-VO2 line)", () => {
    for (const t of cleanRamps) {
      const rows = t.noiseFree.rows;
      const t1 = t.truth.vt1.timeS;
      const below = rows.filter((r) => r.timeS >= t.truth.phases.warmupEndS + 90 && r.timeS <= t1);
      const fit = linearRegression(
        below.map((r) => r.vo2MlMin!),
        below.map((r) => r.vco2MlMin!),
      );
      const excess = (r: BreathRow): number => r.vco2MlMin! - (fit.intercept + fit.slope * r.vo2MlMin!);
      for (const r of below) expect(Math.abs(excess(r))).toBeLessThan(12);
      const later = rows.filter((r) => r.timeS >= t1 + 60 && r.timeS <= t.truth.phases.rampEndS);
      for (const r of later) expect(excess(r), t.spec.label).toBeGreaterThan(0);
      expect(excess(later[later.length - 1])).toBeGreaterThan(0.015 * t.truth.peak.vo2MlMin);
      expect(t.truth.vco2Vo2SlopeAboveVt1).toBeGreaterThan(t.truth.vco2Vo2SlopeBelowVt1);
    }
  });

  it("no RCP where the spec has none: VE/VCO2 does not turn up after its low point near peak", () => {
    const noRcp = bank.filter((t) => t.truth.vt2 === null);
    expect(noRcp.filter((t) => t.spec.group === "copd-like").length).toBeGreaterThan(5);
    for (const t of noRcp) {
      expect(t.spec.vt2Vo2MlMin).toBeNull();
      expect(t.crossCheck.vt2TimeS).toBeNull();
      if (t.spec.eov !== null) continue;
      // With PaCO2 held (isocapnic) or rising, VE/VCO2 in the last 90 s stays within 6 % of its value at
      // the midpoint between VT1 and the end (only dead-space and breathing-pattern changes act).
      const rows = t.noiseFree.rows.filter((r) => r.phase === "exercise");
      const end = t.truth.phases.rampEndS;
      const mid = (t.truth.vt1.timeS + end) / 2;
      const ratioAt = (x: number): number => {
        const r = rows.reduce((b, q) => (Math.abs(q.timeS - x) < Math.abs(b.timeS - x) ? q : b));
        return r.veLMin! / (r.vco2MlMin! / 1000);
      };
      expect(ratioAt(end) / ratioAt(mid), t.spec.label).toBeLessThan(1.06);
    }
  });

  it("with an RCP, PETCO2 turns down and VE/VCO2 turns up after VT2 (isocapnic buffering before)", () => {
    // Ramps only: in stepped protocols VE/VCO2 also swings within each stage.
    const withRcp = bank.filter((t) => t.truth.vt2 !== null && t.spec.eov === null && t.spec.stageS === null);
    expect(withRcp.length).toBeGreaterThan(50);
    for (const t of withRcp) {
      const rows = t.noiseFree.rows.filter((r) => r.phase === "exercise");
      const after = rows.filter((r) => r.timeS >= t.truth.vt2!.timeS);
      const atVt2 = after[0];
      const last = after[after.length - 1];
      const eq = (r: BreathRow): number => r.veLMin! / (r.vco2MlMin! / 1000);
      expect(last.petco2MmHg!, t.spec.label).toBeLessThan(atVt2.petco2MmHg!);
      // COPD-like: weak compensation (0.4–0.8 mmHg per mmol/L) can be outweighed by the falling VD/VT.
      if (t.spec.group !== "copd-like") expect(eq(last), t.spec.label).toBeGreaterThan(eq(atVt2));
    }
  });
});

describe("cross-check model: against published physiology", () => {
  it("ΔVO2/ΔWR of noise-free cycle ramps: healthy groups within Hansen 1987 10.29 ± 2·1.01, HF within 8.29 ± 2·1.17", () => {
    // hansen-1987-ramp-gain (confirmed): normal men 10.29 ± 1.01; circulatory disorders 8.29 ± 1.17 mL/min/W.
    const ramps = bank.filter((t) => t.spec.protocol === "cycle-ramp");
    const healthy = ramps.filter((t) => t.spec.group !== "heart-failure");
    const hf = ramps.filter((t) => t.spec.group === "heart-failure");
    for (const t of healthy) expect(t.truth.deltaVo2DeltaWrMlMinW, t.spec.label).toBeGreaterThanOrEqual(10.29 - 2 * 1.01 - 0.3);
    for (const t of healthy) expect(t.truth.deltaVo2DeltaWrMlMinW, t.spec.label).toBeLessThanOrEqual(10.29 + 2 * 1.01);
    for (const t of hf) expect(Math.abs(t.truth.deltaVo2DeltaWrMlMinW - 8.29), t.spec.label).toBeLessThanOrEqual(2 * 1.17 + 0.3);
    expect(Math.abs(median(healthy.map((t) => t.truth.deltaVo2DeltaWrMlMinW)) - 10.29)).toBeLessThan(1.01);
    // Treadmill: no work rate, so no ΔVO2/ΔWR.
    expect(
      bank.filter((t) => t.spec.protocol.startsWith("treadmill")).every((t) => Number.isNaN(t.truth.deltaVo2DeltaWrMlMinW)),
    ).toBe(true);
  });

  it("peak RER by group: ≥ 1.05 in healthy groups (ERS 2019 > 1.05; FRIEND cycle ≥ 1.10), lower allowed in HF and COPD", () => {
    for (const t of bank) {
      const rer = t.truth.peak.rer;
      if (["athlete", "healthy-active", "sedentary", "older"].includes(t.spec.group)) {
        expect(rer, t.spec.label).toBeGreaterThanOrEqual(1.0);
        expect(rer, t.spec.label).toBeLessThanOrEqual(1.45);
      } else {
        expect(rer, t.spec.label).toBeGreaterThanOrEqual(0.92);
        expect(rer, t.spec.label).toBeLessThanOrEqual(1.3);
      }
    }
    // kaminsky-2017-cycle-standards: maximal cycle tests reach RER ≥ 1.10 — the healthy median does.
    const healthy = bank.filter((t) => ["athlete", "healthy-active", "sedentary"].includes(t.spec.group));
    expect(median(healthy.map((t) => t.truth.peak.rer))).toBeGreaterThanOrEqual(1.1);
    expect(median(byGroup("copd-like").map((t) => t.truth.peak.rer))).toBeLessThan(1.08);
  });

  it("VE/VCO2 slopes: healthy < 30 (Arena 2007 VC-I) with FRIEND-like medians; HF higher; COPD raised", () => {
    // arena-2007-ventilatory-classes (confirmed): VC-I < 30. friend-ve-vco2-reference (confirmed): 50th pct
    // 27–34 across ages (slope to peak).
    for (const g of ["athlete", "healthy-active", "sedentary"] as const) {
      for (const t of byGroup(g)) {
        expect(t.truth.veVco2SlopeToVt2, t.spec.label).toBeGreaterThan(20);
        expect(t.truth.veVco2SlopeToVt2, t.spec.label).toBeLessThan(30);
      }
      const m = median(byGroup(g).map((t) => t.truth.veVco2SlopeToPeak));
      expect(m).toBeGreaterThan(23);
      expect(m).toBeLessThan(34);
    }
    const hf = byGroup("heart-failure").map((t) => t.truth.veVco2SlopeToPeak);
    expect(median(hf)).toBeGreaterThan(30);
    expect(Math.max(...hf)).toBeLessThan(65);
    const copd = byGroup("copd-like").map((t) => t.truth.veVco2SlopeToPeak);
    expect(median(copd)).toBeGreaterThan(25);
    expect(Math.max(...copd)).toBeLessThan(45);
  });

  it("PETCO2: at VT1 in healthy groups ≈ Lewthwaite 2021 40.6 ± 4.2 mmHg; at rest in HF near Arena 2006 mean 34.1", () => {
    const nearest = (t: CrossCheckTest, x: number): BreathRow =>
      t.noiseFree.rows.reduce((b, r) => (Math.abs(r.timeS - x) < Math.abs(b.timeS - x) ? r : b));
    const healthy = bank.filter((t) => ["healthy-active", "sedentary", "older"].includes(t.spec.group));
    const atVt1 = healthy.map((t) => nearest(t, t.truth.vt1.timeS).petco2MmHg!);
    // lewthwaite-2021-vt (confirmed): 40.6 ± 4.2 → every value within ±2.5 SD, median within 1 SD.
    for (const v of atVt1) expect(Math.abs(v - 40.6)).toBeLessThan(2.5 * 4.2);
    expect(Math.abs(median(atVt1) - 40.6)).toBeLessThan(4.2);
    const hfRest = byGroup("heart-failure").map((t) => {
      const rest = t.noiseFree.rows.filter((r) => r.phase === "rest");
      return rest.reduce((a, r) => a + r.petco2MmHg!, 0) / rest.length;
    });
    // arena-2006-petco2-rest (confirmed): mean 34.1 mmHg in 121 HF patients.
    expect(Math.abs(median(hfRest) - 34.1)).toBeLessThan(4);
    // PETCO2 rises from rest to VT1 in healthy subjects (isocapnic PaCO2, larger VT; jones-1979-petco2-paco2).
    for (const t of healthy.filter((q) => q.spec.restHyperventilationMmHg === 0)) {
      const rest = t.noiseFree.rows.find((r) => r.phase === "rest")!;
      expect(nearest(t, t.truth.vt1.timeS).petco2MmHg!).toBeGreaterThan(rest.petco2MmHg!);
    }
  });

  it("VT1 as a share of peak VO2: healthy adults centred near Lewthwaite 2021 (48 ± 11 %), all > 33 %", () => {
    const share = (t: CrossCheckTest): number => t.truth.vt1.vo2MlMin / t.truth.peak.vo2MlMin;
    const healthy = bank.filter((t) => ["healthy-active", "sedentary", "older"].includes(t.spec.group));
    for (const t of healthy) expect(share(t)).toBeGreaterThan(0.326); // 5th percentile 32.6 % (lewthwaite-2021-vt)
    expect(Math.abs(median(healthy.map(share)) - 0.483)).toBeLessThan(0.106);
  });

  it("heart-rate recovery at 1 min: healthy > 12 bpm, most HF ≤ 18 (Cole 1999: ≤ 12 abnormal)", () => {
    const hrr1 = (t: CrossCheckTest): number => {
      const r = t.noiseFree.rows.find((q) => q.timeS >= t.truth.phases.rampEndS + 60)!;
      return t.truth.peak.hrBpm - r.hrBpm!;
    };
    for (const t of bank.filter((q) => ["athlete", "healthy-active"].includes(q.spec.group))) expect(hrr1(t)).toBeGreaterThan(12);
    expect(median(byGroup("heart-failure").map(hrr1))).toBeLessThanOrEqual(12);
  });
});

describe("cross-check model: noise levels", () => {
  const mad = (v: number[]): number => {
    const m = median(v);
    return 1.4826 * median(v.map((x) => Math.abs(x - m)));
  };
  // Documented on CROSS_CHECK_NOISE (robust SD on exercise breaths without artefacts).
  const RANGES = {
    low: { vo2: [35, 90], vePct: [3, 8] },
    moderate: { vo2: [70, 170], vePct: [7, 14] },
    high: { vo2: [120, 330], vePct: [12, 25] },
  } as const;
  for (const level of LEVELS) {
    it(`"${level}": VO2 and VE breath noise within the documented range`, () => {
      const tests = bank.filter((t) => t.spec.noise === level);
      expect(tests.length).toBeGreaterThan(50);
      for (const t of tests) {
        const art = new Set(t.crossCheck.artefactRows);
        const dVo2: number[] = [];
        const dVe: number[] = [];
        t.table.rows.forEach((r, k) => {
          if (r.phase !== "exercise" || art.has(k) || art.has(k - 1)) return;
          const f = t.noiseFree.rows[k];
          dVo2.push(r.vo2MlMin! - f.vo2MlMin!);
          dVe.push(100 * (r.veLMin! / f.veLMin! - 1));
        });
        const sdVo2 = mad(dVo2);
        const sdVe = mad(dVe);
        expect(sdVo2, t.spec.label).toBeGreaterThanOrEqual(RANGES[level].vo2[0]);
        expect(sdVo2, t.spec.label).toBeLessThanOrEqual(RANGES[level].vo2[1]);
        expect(sdVe, t.spec.label).toBeGreaterThanOrEqual(RANGES[level].vePct[0]);
        expect(sdVe, t.spec.label).toBeLessThanOrEqual(RANGES[level].vePct[1]);
      }
      // Artefact share follows the level's rate (binomial; generous bounds).
      const rows = tests.reduce((a, t) => a + t.table.rows.length, 0);
      const arts = tests.reduce((a, t) => a + t.crossCheck.artefactRows.length, 0);
      expect(arts / rows).toBeGreaterThan(CROSS_CHECK_NOISE[level].artefactRate * 0.6);
      expect(arts / rows).toBeLessThan(CROSS_CHECK_NOISE[level].artefactRate * 1.5);
    });
  }

  it("noise level 'none' gives the noise-free values (up to rounding)", () => {
    const t = generateCrossCheckTest(crossCheckSpec(4, 9, ["none"]), 3);
    t.table.rows.forEach((r, k) => expect(Math.abs(r.vo2MlMin! - t.noiseFree.rows[k].vo2MlMin!)).toBeLessThanOrEqual(0.5));
    expect(t.crossCheck.artefactRows).toHaveLength(0);
  });

  it("its sources are registered", () => {
    for (const id of [
      "cross-check-model-invented",
      "wasserman-unloaded-pedalling",
      "jones-1979-petco2-paco2",
      "arena-2006-petco2-rest",
    ]) {
      expect(SYNTHETIC_SOURCES[id as keyof typeof SYNTHETIC_SOURCES]).toBeDefined();
    }
  });
});
