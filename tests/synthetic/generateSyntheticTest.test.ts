import { describe, it, expect } from "vitest";
import { linearRegression } from "../../lib/numeric";
import { breathTableToCsv, generateSyntheticTest, SYNTHETIC_PRESETS, syntheticBank } from "../../lib/synthetic";
import type { BreathRow } from "../../lib/breath";

// Synthetic data: invented, answers known by construction.

const pick = (rows: BreathRow[], from: number, to: number) => rows.filter((r) => r.timeS >= from && r.timeS <= to);
const fit = (rows: BreathRow[], xf: keyof BreathRow, yf: keyof BreathRow) =>
  linearRegression(
    rows.map((r) => r[xf] as number),
    rows.map((r) => r[yf] as number),
  );

describe("generateSyntheticTest: noise-free output has the built-in properties", () => {
  // short VO2 lag, no CO2/VE lag: the noise-free relations are exactly the model's lines after the onset transient
  const spec = {
    noise: "none" as const,
    tauVo2S: 20,
    tauCo2ExtraS: 0,
    tauVeS: 0,
    s1: 0.95,
    s2: 1.35,
    veVco2Slope: 28,
    gainMlMinPerW: 10.3,
  };
  const syn = generateSyntheticTest(spec, 11);
  const rows = syn.noiseFree.rows;
  const { warmupEndS, rampEndS } = syn.truth.phases;

  it("VCO2 against VO2 has slope S1 below VT1 and S2 above it", () => {
    const below = pick(rows, warmupEndS + 120, syn.truth.vt1.timeS - 20);
    const above = pick(rows, syn.truth.vt1.timeS + 20, rampEndS - 5);
    // tolerance 0.01: the only departures are 0.1-mL/min rounding of the breath values
    expect(fit(below, "vo2MlMin", "vco2MlMin").slope).toBeCloseTo(0.95, 2);
    expect(fit(above, "vo2MlMin", "vco2MlMin").slope).toBeCloseTo(1.35, 2);
  });
  it("VE/VCO2 slope to VT2 equals the built-in slope, and VE rises faster above VT2", () => {
    expect(syn.truth.veVco2SlopeToVt2).toBeCloseTo(28, 1);
    const below = pick(rows, warmupEndS + 60, syn.truth.vt2!.timeS - 5);
    expect(fit(below, "vco2MlMin", "veLMin").slope * 1000).toBeCloseTo(28, 1);
    expect(syn.truth.veVco2SlopeToPeak).toBeGreaterThan(28.5);
  });
  it("ΔVO2/ΔWR equals the built-in gain (Hansen et al. 1987 normal 10.29 mL/min/W used as default)", () => {
    expect(syn.truth.deltaVo2DeltaWrMlMinW).toBeGreaterThan(10.3 * 0.98);
    expect(syn.truth.deltaVo2DeltaWrMlMinW).toBeLessThan(10.3 * 1.02);
  });
  it("end-tidal gases: PETCO2 falls after VT2, PETO2 rises from VT1", () => {
    const at = (t: number) => rows.reduce((best, r) => (Math.abs(r.timeS - t) < Math.abs(best.timeS - t) ? r : best));
    const v1 = syn.truth.vt1.timeS;
    const v2 = syn.truth.vt2!.timeS;
    expect(at(rampEndS - 3).petco2MmHg!).toBeLessThan(at(v2).petco2MmHg! - 1.5);
    expect(at(v2).peto2MmHg!).toBeGreaterThan(at(v1).peto2MmHg! + 1);
    expect(Math.abs(at(v2).petco2MmHg! - at(v1).petco2MmHg!)).toBeLessThan(2.5);
  });
  it("PETO2 bends up at VT1: falling or flat in the 2 min before, rising in the 2 min after (no VD/VT corner there)", () => {
    const v1 = syn.truth.vt1.timeS;
    const before = fit(pick(rows, v1 - 120, v1 - 10), "timeS", "peto2MmHg").slope * 60;
    const after = fit(pick(rows, v1 + 10, v1 + 120), "timeS", "peto2MmHg").slope * 60;
    // physiology (common practice): PETO2 reaches its nadir near VT1 and rises above it; PETCO2 does not fall there
    expect(before).toBeLessThanOrEqual(0.05);
    expect(after).toBeGreaterThan(0.3);
    expect(after - before).toBeGreaterThan(0.3);
    expect(fit(pick(rows, v1 + 10, v1 + 120), "timeS", "petco2MmHg").slope).toBeGreaterThanOrEqual(0);
  });
  it("truth is ordered and matches the spec fractions", () => {
    expect(syn.truth.invented).toBe(true);
    expect(syn.truth.vt1.vo2MlMin).toBeLessThan(syn.truth.vt2!.vo2MlMin);
    expect(syn.truth.vt2!.vo2MlMin).toBeLessThan(syn.truth.peak.vo2MlMin);
    // default spec: VT1 at 55 % of 2600 = 1430 mL/min (no CO2 lag, so the corner is at that VO2 within a 1-s step)
    expect(syn.truth.vt1.vo2MlMin).toBeGreaterThan(1430);
    expect(syn.truth.vt1.vo2MlMin).toBeLessThan(1430 + 10);
    expect(Math.abs(syn.truth.peak.vo2MlMin - 2600) / 2600).toBeLessThan(0.03);
  });
  it("writes phase markers in protocol order", () => {
    const phases = [...new Set(syn.table.rows.map((r) => r.phase))];
    expect(phases).toEqual(["rest", "warmup", "exercise", "recovery"]);
  });
});

describe("generateSyntheticTest: noise, determinism, artefacts", () => {
  it("is deterministic for a seed and differs between seeds", () => {
    const a = generateSyntheticTest({}, 5);
    const b = generateSyntheticTest({}, 5);
    const c = generateSyntheticTest({}, 6);
    expect(a.table.rows).toEqual(b.table.rows);
    expect(a.table.rows[50].vo2MlMin).not.toEqual(c.table.rows[50].vo2MlMin);
  });
  it("moderate noise has the documented size (common 8 % + 80 mL/min independent)", () => {
    const s = generateSyntheticTest({ noise: "moderate" }, 9);
    const d = s.table.rows
      .map((r, i) => r.vo2MlMin! - s.noiseFree.rows[i].vo2MlMin!)
      .filter((_, i) => s.table.rows[i].phase === "rest");
    const sd = Math.sqrt(d.reduce((q, v) => q + v * v, 0) / d.length);
    // at rest VO2 = 300: √((0.08·300)² + 80²) = √(576 + 6400) ≈ 83.5 mL/min
    expect(sd).toBeGreaterThan(83.5 * 0.75);
    expect(sd).toBeLessThan(83.5 * 1.25);
  });
  it("artefact breaths appear at about the requested rate", () => {
    const s = generateSyntheticTest({ noise: "low", artefactRate: 0.05 }, 3);
    const spikes = s.table.rows.filter((r, i) => Math.abs(Math.log(r.veLMin! / s.noiseFree.rows[i].veLMin!)) > 0.5).length;
    expect(spikes / s.table.rows.length).toBeGreaterThan(0.02);
    expect(spikes / s.table.rows.length).toBeLessThan(0.09);
  });
  it("ventilatory cap keeps VE below MVV", () => {
    const s = generateSyntheticTest({ noise: "none", mvvLMin: 50, vt2FractionOfPeak: null }, 1);
    expect(Math.max(...s.noiseFree.rows.map((r) => r.veLMin!))).toBeLessThanOrEqual(50);
    expect(s.truth.vt2).toBeNull();
  });
  it("EOV makes VE oscillate with the requested period", () => {
    const s = generateSyntheticTest({ noise: "none", eov: { periodS: 60, amplitudeFraction: 0.2 } }, 1);
    const { restEndS } = s.truth.phases;
    // peak of the sine at t − restEndS = 15 s, trough at 45 s (period 60 s): VE higher at the peak
    const near = (t: number) => s.noiseFree.rows.reduce((b, r) => (Math.abs(r.timeS - t) < Math.abs(b.timeS - t) ? r : b));
    expect(near(restEndS + 75).veLMin!).toBeGreaterThan(near(restEndS + 105).veLMin! * 1.2);
  });
});

describe("presets and bank (invented data)", () => {
  it("every preset generates a plausible test marked as invented", () => {
    for (const p of SYNTHETIC_PRESETS) {
      expect(p.invented).toBe(true);
      const s = generateSyntheticTest({ ...p.spec, noise: "none" }, 1);
      expect(s.table.rows.length).toBeGreaterThan(200);
      expect(s.truth.vt1.vo2MlMin).toBeLessThan(s.truth.peak.vo2MlMin);
    }
  });
  it("heart-failure preset has a high VE/VCO2 slope and pulmonary-vascular a low PETCO2", () => {
    const hf = generateSyntheticTest(
      { ...SYNTHETIC_PRESETS.find((p) => p.id === "heart-failure")!.spec, noise: "none", eov: null },
      1,
    );
    expect(hf.truth.veVco2SlopeToVt2).toBeGreaterThan(36); // Arena VC-III from 36 (Arena 2007, confirmed)
    const pv = generateSyntheticTest({ ...SYNTHETIC_PRESETS.find((p) => p.id === "pulmonary-vascular")!.spec, noise: "none" }, 1);
    const atVt1 = pv.noiseFree.rows.find((r) => r.timeS >= pv.truth.vt1.timeS)!;
    expect(atVt1.petco2MmHg!).toBeLessThan(33);
  });
  it("bank specs vary and respect VT1/VT2 ranges", () => {
    const bank = syntheticBank(60);
    expect(bank).toHaveLength(60);
    for (const c of bank) {
      expect(c.spec.vt1FractionOfPeak!).toBeGreaterThanOrEqual(0.4);
      expect(c.spec.vt1FractionOfPeak!).toBeLessThanOrEqual(0.7);
      expect(c.spec.vt2FractionOfPeak!).toBeLessThanOrEqual(0.9);
    }
    expect(new Set(bank.map((c) => c.spec.noise)).size).toBe(3);
  });
  it("writes the plain CSV convention", () => {
    const csv = breathTableToCsv(generateSyntheticTest({ noise: "none" }, 1).table);
    expect(csv.split("\n")[0]).toBe(
      "time_s,vo2_ml_min,vco2_ml_min,ve_l_min,hr_bpm,work_w,rr_br_min,vt_l,peto2_mmhg,petco2_mmhg,spo2_pct,phase",
    );
  });
});

describe("stepped protocol option (invented data)", () => {
  it("raises the load by rate·stage/60 every stage, same mean rate as the ramp, and keeps the thresholds", () => {
    // default spec: warm-up 10 W, 20 W/min; 60-s stages → +20 W at the start of every minute of the incremental phase
    const ramp = generateSyntheticTest({ noise: "none" }, 3);
    const steps = generateSyntheticTest({ noise: "none", stageS: 60 }, 3);
    const start = steps.truth.phases.warmupEndS;
    const at = (t: number) => steps.noiseFree.rows.find((r) => r.timeS >= t)!.workW!;
    expect(at(start + 5)).toBeCloseTo(30, 6); // 10 + 20
    expect(at(start + 55)).toBeCloseTo(30, 6);
    expect(at(start + 65)).toBeCloseTo(50, 6); // 10 + 2·20
    // thresholds are set in VO2, so their VO2 does not depend on the protocol (within 1 %)
    expect(Math.abs(steps.truth.vt1.vo2MlMin - ramp.truth.vt1.vo2MlMin) / ramp.truth.vt1.vo2MlMin).toBeLessThan(0.01);
  });
});
