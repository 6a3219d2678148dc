import { describe, it, expect } from "vitest";
import {
  assessEffort,
  CRITERION_GUARD_SE,
  criterionMet,
  EFFORT_CRITERIA_SETS,
  type EffortCriterion,
  VO2_PLATEAU_CRITERION,
  vo2FinalIncrease,
  vo2PlateauNotAssessedReason,
  vo2PlateauPresent,
  type Vo2FinalIncrease,
} from "../../lib/thresholds/effortCriteria";
import { THRESHOLD_SOURCES } from "../../lib/thresholds/sources";
import { CORE_SOURCES } from "../../lib/core";
import { conditionTable } from "../../lib/signal";
import { seededRandom } from "../../lib/numeric";
import { generateSyntheticTest, syntheticBank } from "../../lib/synthetic";
import { freezeTest, standardRamp } from "./indicesFixture";

const met = (values: Parameters<typeof assessEffort>[0], set: string, id: string) =>
  assessEffort(values, set).criteria.find((c) => c.criterion.id === id)?.met;

describe("effort criteria: boundaries exactly as published", () => {
  it("RER > 1.05 (ERS 2019, confirmed): 1.05 does not meet it, 1.0501 does", () => {
    expect(met({ rerPeak: 1.05 }, "ers-2019", "rer-gt-1.05")).toBe(false);
    expect(met({ rerPeak: 1.0501 }, "ers-2019", "rer-gt-1.05")).toBe(true);
  });
  it("RER ≥ 1.10 (JACC HF 2020, confirmed): 1.10 meets it, 1.0999 does not", () => {
    expect(assessEffort({ rerPeak: 1.1 }, "hf-rer-1.10").maximal).toBe(true);
    expect(assessEffort({ rerPeak: 1.0999 }, "hf-rer-1.10").maximal).toBe(false);
  });
  it("RER ≥ 1.0 (FRIEND treadmill inclusion, confirmed)", () => {
    expect(assessEffort({ rerPeak: 1.0 }, "friend-treadmill").maximal).toBe(true);
    expect(assessEffort({ rerPeak: 0.99 }, "friend-treadmill").maximal).toBe(false);
  });
  it("HR ≥ 85% predicted and HR reserve < 15 bpm (Respir Res 2021 guide, secondary)", () => {
    expect(met({ hrPercentPredicted: 85 }, "ers-2019", "hr-85-percent-predicted")).toBe(true);
    expect(met({ hrPercentPredicted: 84.99 }, "ers-2019", "hr-85-percent-predicted")).toBe(false);
    expect(met({ hrReserveBpm: 15 }, "ers-2019", "hr-reserve-lt-15")).toBe(false);
    expect(met({ hrReserveBpm: 14.9 }, "ers-2019", "hr-reserve-lt-15")).toBe(true);
  });
  it("VE/MVV ≥ 85% (ERS 2019) and VO2 plateau < 2 mL/kg/min for a 5–10 % work increase (ERS 2019, confirmed)", () => {
    expect(met({ veMvvPercent: 85 }, "ers-2019", "ve-mvv-85")).toBe(true);
    expect(met({ veMvvPercent: 84.9 }, "ers-2019", "ve-mvv-85")).toBe(false);
    expect(met({ vo2FinalIncreaseMlKgMin: 2 }, "ers-2019", "vo2-plateau-2-ml-kg")).toBe(false);
    expect(met({ vo2FinalIncreaseMlKgMin: 1.99 }, "ers-2019", "vo2-plateau-2-ml-kg")).toBe(true);
  });
  it("composite (Rapp 2018, confirmed): lactate ≥ 8 alone is enough", () => {
    const a = assessEffort({ rerPeak: 1.0, lactatePeakMmolL: 8, hrPercentPredicted: 80 }, "rapp-2018");
    expect(a.metIds).toEqual(["lactate-ge-8"]);
    expect(a.maximal).toBe(true);
  });
});

describe("effort set rules", () => {
  it("default set is labelled and combines by 'any'; missing values are not assessable", () => {
    const a = assessEffort({ rerPeak: 1.02, hrPercentPredicted: 90 });
    expect(a.setId).toBe("ers-2019");
    expect(a.isDefaultSet).toBe(true);
    expect(a.maximal).toBe(true);
    expect(a.metIds).toEqual(["hr-85-percent-predicted"]);
    expect(a.criteria.find((c) => c.criterion.id === "ve-mvv-85")?.met).toBeNull();
  });
  it("nothing assessable → maximal null; all assessed unmet → false", () => {
    expect(assessEffort({}).maximal).toBeNull();
    expect(assessEffort({ rerPeak: 0.95, hrReserveBpm: 40 }).maximal).toBe(false);
  });
  it("every criterion names registered sources", () => {
    const known = new Set([...Object.keys(THRESHOLD_SOURCES), ...Object.keys(CORE_SOURCES)]);
    for (const set of Object.values(EFFORT_CRITERIA_SETS)) {
      for (const id of set.ruleSourceIds) expect(known.has(id), id).toBe(true);
      for (const c of set.criteria) for (const id of c.sourceIds) expect(known.has(id), id).toBe(true);
    }
  });
  it("unknown set id is a programming mistake", () => {
    expect(() => assessEffort({}, "nope")).toThrow(/unknown effort criteria set/);
  });
});

describe("vo2FinalIncrease on the invented ramp", () => {
  // Invented ramp: VO2 = 1000 + 2·(t − 180) mL/min, work = (t − 180)/3 W, one breath every 3 s, exercise 180–780 s.
  it("final 30 s against the 30 s where work was 10 % lower; a steady rise below the cut-off is not called a plateau", () => {
    const r = vo2FinalIncrease(freezeTest(standardRamp()), { windowS: 30, weightKg: 70 });
    // final window (750, 780]: breaths 753..780, mean t 766.5 → work 195.5 W, VO2 1000 + 2·586.5 = 2173
    // 90 % of 195.5 = 175.95 W → last breath at or below it t = 705 (175 W); window [690, 720]: mean t 705 →
    // work 175 W, VO2 1000 + 2·525 = 2050. Work rise 20.5 W (11.7 %, ≥ 5 %).
    expect(r.workIncreaseW.value).toBeCloseTo(20.5, 9);
    expect(r.increaseMlMin.provenance.inputs).toMatchObject({ earlierMlMin: 2050, finalMlMin: 2173 });
    // Own slope: window centred at (180 + 705)/2 = 442.5 → VO2 1525 at 87.5 W; (2050 − 1525)/(175 − 87.5) = 6 mL/min/W.
    // Expected rise 6·20.5/70 = 1.757 mL/kg/min < 2: a steady rise cannot be told from a plateau → not determined.
    expect(r.increaseMlKgMin.value).toBeNull();
    expect(r.increaseMlKgMin.reason).toMatch(/6\.0 mL\/min\/W.*1\.76 mL\/kg\/min/);
    expect(vo2PlateauPresent(r)).toBeNull();
  });
  it("the same ramp for a 50-kg patient: expected rise 6·20.5/50 = 2.46 ≥ 2 → measured rise 123/50 = 2.46, no plateau", () => {
    const r = vo2FinalIncrease(freezeTest(standardRamp()), { windowS: 30, weightKg: 50 });
    expect(r.increaseMlMin.value).toBeCloseTo(123, 9);
    expect(r.increaseMlKgMin.value).toBeCloseTo(2.46, 9);
    expect(vo2PlateauPresent(r)).toBe(false);
  });
  it("no work rate (treadmill without work) → not determined, with the reason", () => {
    const t = standardRamp();
    const rows = t.clean.map((row) => ({ ...row, workW: undefined }));
    const r = vo2FinalIncrease(freezeTest({ ...t, clean: rows, averaged: rows }), { windowS: 30, weightKg: 50 });
    expect(r.increaseMlKgMin.value).toBeNull();
    expect(r.increaseMlKgMin.reason).toMatch(/work/);
    expect(vo2PlateauPresent(r)).toBeNull();
  });
});

describe("one plateau determination, checked on synthetic tests known by construction", () => {
  // Synthetic generator (invented data, lib/synthetic): healthy adult, 75 kg, 20 W/min ramp, VO2 gain
  // 10.3 mL/min/W. With plateau = true the steady-state VO2 is capped at the peak for the last 20 W of the
  // ramp (a plateau by construction); with plateau = false it rises to the end. Noise "none" and "low".
  const run = (plateau: boolean, noise: "none" | "low", seed: number) => {
    const syn = generateSyntheticTest({ plateau, noise, weightKg: 75 }, seed);
    const test = conditionTable(syn.table);
    const inc = vo2FinalIncrease(test, { windowS: 30, weightKg: 75 });
    const effort = assessEffort({ vo2FinalIncreaseMlKgMin: inc.increaseMlKgMin.value }, "ers-2019", {
      vo2FinalIncreaseMlKgMin: inc.seMlKgMin.value,
    });
    const criterion = effort.criteria.find((c) => c.criterion.id === VO2_PLATEAU_CRITERION.id)!;
    return { inc, present: vo2PlateauPresent(inc), criterionMet: criterion.met };
  };
  for (const noise of ["none", "low"] as const) {
    for (const seed of [1, 2, 3]) {
      it(`plateau built in → present; effort set agrees (noise ${noise}, seed ${seed})`, () => {
        const r = run(true, noise, seed);
        expect(r.present).toBe(true);
        expect(r.criterionMet).toBe(r.present);
      });
      it(`no plateau → absent; effort set agrees (noise ${noise}, seed ${seed})`, () => {
        const r = run(false, noise, seed);
        // 10 % of ≈ 210 W ≈ 21 W × 10.3 mL/min/W ≈ 216 mL/min ≈ 2.9 mL/kg/min at 75 kg, above the 2 cut-off.
        expect(r.inc.increaseMlKgMin.value).toBeGreaterThan(2);
        expect(r.present).toBe(false);
        expect(r.criterionMet).toBe(r.present);
      });
    }
  }
});

describe("guard band: a criterion met only within its standard error is not assessable", () => {
  // Hand calculation with CRITERION_GUARD_SE = 1.28 (one-sided 90 %, our choice): cut-off 2 mL/kg/min ("<").
  it("rise 1.0 ± 0.5: 1.0 + 0.64 = 1.64 < 2 → met; rise 1.5 ± 0.5: 2.14 ≥ 2 → not assessable; 2.3 ± 0.5 → not met", () => {
    expect(CRITERION_GUARD_SE).toBe(1.28);
    expect(criterionMet(VO2_PLATEAU_CRITERION, 1.0, 0.5)).toBe(true);
    expect(criterionMet(VO2_PLATEAU_CRITERION, 1.5, 0.5)).toBeNull();
    expect(criterionMet(VO2_PLATEAU_CRITERION, 2.3, 0.5)).toBe(false);
    // no SE (or stage data): the published boundary alone
    expect(criterionMet(VO2_PLATEAU_CRITERION, 1.5)).toBe(true);
    expect(criterionMet(VO2_PLATEAU_CRITERION, 1.5, null)).toBe(true);
  });
  it("for a '≥' criterion the band lies on the other side: RER 1.12 ± 0.03 → 1.0816 < 1.10 → not assessable", () => {
    const rer: EffortCriterion = { id: "x", label: "x", quantity: "rerPeak", comparator: ">=", cutoff: 1.1, sourceIds: [] };
    expect(criterionMet(rer, 1.12, 0.03)).toBeNull();
    expect(criterionMet(rer, 1.2, 0.03)).toBe(true);
    expect(criterionMet(rer, 1.05, 0.03)).toBe(false);
  });
  it("the reason in words: the rise, the band and the cut-off when guarded; none when the plateau was assessed", () => {
    // Hand-built rises (invented numbers); only value and SE are read. 1.7 + 1.28·1.0 = 2.98 ≥ 2 → guarded;
    // 1.0 + 1.28·0.5 = 1.64 < 2 → met; 2.5 → not met (both assessed, no reason).
    const mk = (rise: number | null, se: number | null, reason?: string): Vo2FinalIncrease => {
      const prov = { method: "hand-built", label: "hand-built", sourceIds: [] as string[] };
      const m = (v: number | null, unit: string, why?: string) => ({
        value: v,
        unit,
        provenance: prov,
        ...(why ? { reason: why } : {}),
      });
      return {
        increaseMlMin: m(rise === null ? null : rise * 70, "mL/min", reason),
        increaseMlKgMin: m(rise, "mL/kg/min", reason),
        seMlMin: m(se === null ? null : se * 70, "mL/min"),
        seMlKgMin: m(se, "mL/kg/min"),
        workIncreaseW: m(20, "W"),
      };
    };
    expect(vo2PlateauNotAssessedReason(mk(1.7, 1.0))).toBe(
      "end-exercise VO2 rise 1.7 mL/kg/min lies within 1.28 standard errors (SE 1.0) of the < 2 mL/kg/min cut-off",
    );
    expect(vo2PlateauNotAssessedReason(mk(1.0, 0.5))).toBeNull();
    expect(vo2PlateauNotAssessedReason(mk(2.5, 0.5))).toBeNull();
    // not measured: its own reason, without the "not determined:" lead-in
    expect(vo2PlateauNotAssessedReason(mk(null, null, "not determined: no work rate to judge the 5–10 % increase"))).toBe(
      "no work rate to judge the 5–10 % increase",
    );
  });
  it("the effort set carries the SE and the guarded outcome", () => {
    const a = assessEffort({ vo2FinalIncreaseMlKgMin: 1.5 }, "ers-2019", { vo2FinalIncreaseMlKgMin: 0.5 });
    const c = a.criteria.find((x) => x.criterion.id === VO2_PLATEAU_CRITERION.id)!;
    expect(c.value).toBe(1.5);
    expect(c.se).toBe(0.5);
    expect(c.met).toBeNull();
  });
});

describe("standard error of the final VO2 rise, known by construction", () => {
  // Invented: the standard ramp with white noise of ±σ alternating breath by breath is awkward (r = −1); instead a
  // seeded Gaussian noise of SD 100 mL/min on VO2 (seededRandom, Box–Muller). Each 30-s window holds 10 breaths (3 s
  // apart), so SE of the difference of the two window means ≈ 100 × √(1/10 + 1/10) = 44.7 mL/min (white noise; the
  // lag-1 correction is clipped at 0 for negative r). The estimate from one record scatters: within ±35 %. 50 kg, as
  // above, so the late rise of VO2 with work rate expects a rise above the cut-off and the rise is assessed.
  it("SE ≈ 100·√(2/10) = 44.7 mL/min from white noise of SD 100 mL/min (within ±35 %), and 0 noise-free", () => {
    const rng = seededRandom(11);
    const base = standardRamp();
    const noisy = base.clean.map((r) => ({ ...r, vo2MlMin: r.vo2MlMin! + 100 * rng.normal() }));
    const r = vo2FinalIncrease(freezeTest({ ...base, clean: noisy, averaged: noisy }), { windowS: 30, weightKg: 50 });
    expect(r.seMlMin.value!).toBeGreaterThan(44.7 * 0.65);
    expect(r.seMlMin.value!).toBeLessThan(44.7 * 1.35);
    expect(r.seMlKgMin.value!).toBeCloseTo(r.seMlMin.value! / 50, 9);
    const clean = vo2FinalIncrease(freezeTest(standardRamp()), { windowS: 30, weightKg: 50 });
    expect(clean.seMlMin.value!).toBeLessThan(1e-6);
  });
});

describe("false VO2 plateaus under breath noise (synthetic, moderate noise, invented data)", () => {
  // 60 main-bank tests at moderate noise (lib/synthetic/syntheticBank, seed 2024): tests built without a plateau in which
  // the criterion still reads one, with and without the guard band (the band can only remove calls, never add them).
  it("the guard band removes false plateau calls and keeps every noise-free call", () => {
    let falseWithout = 0;
    let falseWith = 0;
    for (const c of syntheticBank(60, { seed: 2024, noiseLevels: ["moderate"] })) {
      if (c.spec.plateau) continue;
      const inc = vo2FinalIncrease(conditionTable(generateSyntheticTest(c.spec, c.seed).table), { weightKg: c.spec.weightKg });
      if (criterionMet(VO2_PLATEAU_CRITERION, inc.increaseMlKgMin.value) === true) falseWithout++;
      if (vo2PlateauPresent(inc) === true) falseWith++;
    }
    expect(falseWithout).toBeGreaterThan(0);
    expect(falseWith).toBeLessThan(falseWithout);
    // noise-free the rise has no scatter (SE 0): every call, with or without a plateau, is the unguarded one
    let plateausNoiseFree = 0;
    for (const c of syntheticBank(60, { seed: 2024, noiseLevels: ["moderate"] })) {
      const syn = generateSyntheticTest({ ...c.spec, noise: "none", artefactRate: 0 }, c.seed);
      const inc = vo2FinalIncrease(conditionTable(syn.table), { weightKg: c.spec.weightKg });
      expect(vo2PlateauPresent(inc)).toBe(criterionMet(VO2_PLATEAU_CRITERION, inc.increaseMlKgMin.value));
      if (vo2PlateauPresent(inc) === true) plateausNoiseFree++;
    }
    expect(plateausNoiseFree).toBeGreaterThan(0);
  });
});
