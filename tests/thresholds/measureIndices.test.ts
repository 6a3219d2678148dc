import { describe, it, expect } from "vitest";
import { CORE_SOURCES, type Measured } from "../../lib/core";
import { measureIndices } from "../../lib/thresholds/measureIndices";
import { THRESHOLD_SOURCES } from "../../lib/thresholds/sources";
import { freezeTest, makeTest, oneHourRamp, standardRamp } from "./indicesFixture";

/** Walk a result and yield every Measured in it. */
function* measuredIn(x: unknown): Generator<Measured> {
  if (x && typeof x === "object") {
    const o = x as Record<string, unknown>;
    if ("provenance" in o && "unit" in o && "value" in o) {
      yield o as unknown as Measured;
      return;
    }
    for (const v of Object.values(o)) yield* measuredIn(v);
  }
}

describe("measureIndices on the invented ramp", () => {
  const test = freezeTest(standardRamp());
  const ctx = {
    patient: { sex: "male" as const, ageY: 50, weightKg: 70, heightCm: 175 },
    spirometry: { fev1L: 3.2 },
    vt1: { timeS: 420, vo2MlMin: 1480 },
    vt2: { timeS: 660, vo2MlMin: 1960 },
    lactate: [120, 300, 420, 540, 660, 780].map((timeS, i) => ({ timeS, lactateMmolL: [1.0, 1.1, 1.6, 2.6, 4.2, 7.5][i] })),
    bloodGases: [{ timeS: 770, paCO2MmHg: 38, label: "peak" }],
  };
  const r = measureIndices(test, ctx);

  it("wires the modules together", () => {
    expect(r.peaks.vo2MlKgMin.value).toBeCloseTo(31, 9);
    expect(r.atVt1?.vo2PercentPeak.value).toBeCloseTo((100 * 1480) / 2170, 9);
    // predicted 220 − 50 = 170; peak HR 177 → reserve −7 → HR criterion met
    expect(r.heartRate.predictedMaxBpm.value).toBe(170);
    expect(r.effort.metIds).toContain("hr-reserve-lt-15");
    expect(r.effort.maximal).toBe(true);
    // MVV 3.2·40 = 128; peak VE 60.6 → VE/MVV 47.34%
    expect(r.breathingReserve.veMvvPercent.value).toBeCloseTo((100 * 60.6) / 128, 9);
    // VE = 25·VCO2 + 3 everywhere in exercise
    expect(r.veVco2.slopeToVt2.slope.value).toBeCloseTo(25, 9);
    expect(r.vdVt).toHaveLength(1);
    expect(r.lactate?.axis).toBe("workW");
    // lactate at 660 s (160 W) 4.2, at 540 s (120 W) 2.6 → OBLA = 120 + (1.4/1.6)·40 = 155 W; VT2 at 160 W
    const obla = r.lactate!.thresholds.find((t) => t.id === "obla-4")!;
    expect(obla.intensity.value).toBeCloseTo(155, 9);
    expect(r.lactate!.relations.find((x) => x.id === "obla-4")?.comparedWith).toBe("VT2");
    expect(r.domains.domains).toHaveLength(3);
  });

  it("every Measured names registered sources and has a value or a reason", () => {
    const known = new Set([...Object.keys(THRESHOLD_SOURCES), ...Object.keys(CORE_SOURCES)]);
    for (const m of measuredIn(r)) {
      expect(m.value !== null || typeof m.reason === "string", m.provenance.method).toBe(true);
      expect(m.provenance.sourceIds.length, m.provenance.method).toBeGreaterThan(0);
      for (const id of m.provenance.sourceIds) expect(known.has(id), `${m.provenance.method}: ${id}`).toBe(true);
    }
    // The walk reached every module: each one that measures reports at least one Measured (effort holds verdicts
    // and issues holds issues, so neither has any). VT1 and VT2 are read by the same function, so they hold the
    // same number of values.
    const count = (x: unknown) => [...measuredIn(x)].length;
    const modules = [
      "peaks",
      "vo2FinalIncrease",
      "veVco2",
      "oues",
      "dVo2dWr",
      "o2Pulse",
      "breathingReserve",
      "heartRate",
      "spo2",
      "vdVt",
      "eov",
      "atVt1",
      "atVt2",
      "lactate",
      "domains",
    ] as const;
    for (const k of modules) expect(count(r[k]), k).toBeGreaterThan(0);
    expect(count(r.effort)).toBe(0);
    expect(count(r.atVt1)).toBe(count(r.atVt2));
    // VD/VT: one point per blood-gas sample, and ctx holds exactly one sample
    expect(r.vdVt).toHaveLength(ctx.bloodGases.length);
  });

  it("an empty test gives values with reasons, not exceptions", () => {
    const e = measureIndices(makeTest([], { exercise: null, phases: [] }), { patient: {} });
    expect(e.peaks.vo2MlMin.value).toBeNull();
    expect(e.oues.fits[0].slope.value).toBeNull();
    expect(e.lactate).toBeNull();
    expect(e.issues.length).toBeGreaterThan(0);
  });

  it("one hour of breaths (1 breath/s): ΔVO2/ΔWR = 0.8 mL/min per s ÷ (1/12 W per s) = 9.6 mL/min/W", () => {
    // Invented ramp: rest 0–299 s, exercise 300–3300 s with VO2 = 800 + 0.8·(t − 300) and work = (t − 300)/12 W,
    // recovery to 3599 s. The time this call takes is measured in bench/measureIndices.bench.ts, not asserted here.
    const big = oneHourRamp();
    const out = measureIndices(big, {
      patient: { ageY: 40, weightKg: 80 },
      vt1: { timeS: 1500, vo2MlMin: 1760 },
      vt2: { timeS: 2500, vo2MlMin: 2560 },
    });
    expect(out.dVo2dWr.whole.slope.value).toBeCloseTo(0.8 * 12, 6);
  });
});
