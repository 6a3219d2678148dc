import { describe, expect, it } from "vitest";
import { composeDraft, interpret } from "../../lib/interpret";
import { loadFixture } from "./helpers";

// Six INVENTED patients (tests/interpret/fixtures) built to match the typical patterns of the
// ATS/ACCP 2003 patterns table and the Wasserman textbook (recalled), corroborated by the CCJM
// patterns table (secondary) for the deconditioning, cardiac and pulmonary rows (clinical-reference §4.2).
const steps = (r: ReturnType<typeof interpret>) => r.path.steps.map((s) => `${s.nodeId}:${s.outcome}`);
const top = (r: ReturnType<typeof interpret>) => r.patterns[0];

describe("worked cases from the §4.2 pattern table", () => {
  it("normal: all values within limits → no limitation, no pattern supported", () => {
    const r = interpret(loadFixture("normal").input);
    expect(r.effort.verdict).toBe("maximal");
    expect(r.path.end?.key).toBe("normal");
    expect(r.patterns.every((p) => p.support === "not-supported")).toBe(true);
    expect(r.schemes[0].overall?.key).toBe("normal");
  });

  it("heart failure (§4.2 row: peak, AT, O2 pulse, ΔVO2/ΔWR low; VE/VCO2 slope > 34; BR and SpO2 normal)", () => {
    const r = interpret(loadFixture("heart-failure").input);
    expect(steps(r)).toEqual([
      "effort:adequate",
      "peak-vo2:reduced",
      "at:low",
      "cardiovascular:abnormal",
      "breathing-reserve:preserved",
      "gas-exchange:normal",
      "summary:reduced-explained",
    ]);
    expect(top(r).patternId).toBe("cardiovascular");
    expect(top(r).support).toBe("strong");
    expect(top(r).statement).toMatch(/^The findings are consistent with a cardiovascular/);
    const byId = Object.fromEntries(r.schemes.map((s) => [s.schemeId, s]));
    // Weber (Janicki 1988): peak 14.0 → C (10.0–15.99), AT 10.0 → C (8.0–10.99).
    expect(byId.weber.axes.map((a) => a.category?.key)).toEqual(["C", "C"]);
    // Arena 2007: slope 42.5 → VC-III (36.0–44.9).
    expect(byId["arena-ventilatory-class"].overall?.key).toBe("VC-III");
    // Peak 47 % predicted < 50 → severe (Respir Res 2021 guide).
    expect(byId["peak-vo2-grade"].overall?.key).toBe("severe");
    const hf = Object.fromEntries(byId["hf-prognostic-table"].axes.map((a) => [a.axisId, a.category?.key]));
    expect(hf).toEqual({
      slope: "VC-III",
      peak: "C",
      eov: "present",
      "petco2-rest": "low",
      "petco2-rise": "small",
      hrr1: "abnormal",
      rer: "maximal",
    });
    expect(r.patterns.find((p) => p.patternId === "ventilatory")!.support).toBe("not-supported");
  });

  it("ventilatory limitation (§4.2 COPD row: BR exhausted, HR reserve left, O2 pulse and ΔVO2/ΔWR normal)", () => {
    const r = interpret(loadFixture("ventilatory").input);
    // Peak RER 1.02 is below 1.05, but the ventilatory limit was reached (VE/MVV 96 % ≥ 85 %).
    expect(r.effort.verdict).toBe("physiological-limit");
    expect(steps(r)).toContain("breathing-reserve:ventilatory-limitation");
    expect(steps(r)).toContain("at:normal");
    expect(top(r).patternId).toBe("ventilatory");
    expect(top(r).support).toBe("strong");
    expect(r.patterns.find((p) => p.patternId === "submaximal-effort")!.support).toBe("not-supported");
  });

  it("pulmonary vascular (§4.2 row: VE/VCO2 ↑↑, PETCO2 ↓, SpO2 ↓, O2 pulse ↓, BR normal)", () => {
    const r = interpret(loadFixture("pulmonary-vascular").input);
    expect(steps(r)).toContain("gas-exchange:abnormal");
    expect(top(r).patternId).toBe("pulmonary-vascular");
    expect(top(r).score).toBe(1);
    const ph = Object.fromEntries(
      r.schemes.find((s) => s.schemeId === "ph-esc-ers-2015")!.axes.map((a) => [a.axisId, a.category?.key]),
    );
    // ESC/ERS 2015: peak 13.5 mL/kg/min → 11–15 intermediate; 55 % → 35–65 intermediate; slope 48 ≥ 45 → high.
    expect(ph).toEqual({ "peak-kg": "intermediate", "peak-pct": "intermediate", slope: "high" });
    expect(r.patterns.find((p) => p.patternId === "ventilatory")!.support).toBe("not-supported");
  });

  it("deconditioning (CCJM: low-normal peak VO2 + low AT + nothing else abnormal)", () => {
    const r = interpret(loadFixture("deconditioning").input);
    expect(steps(r)).toContain("cardiovascular:normal");
    expect(r.path.end?.key).toBe("reduced-low-vt1-only");
    expect(top(r).patternId).toBe("deconditioning");
    expect(top(r).support).toBe("strong");
    expect(r.patterns.find((p) => p.patternId === "cardiovascular")!.support).not.toBe("strong");
  });

  it("pre-operative low AT with ischaemic heart disease (Older 1993; three-tier scheme; cohort thresholds)", () => {
    const r = interpret(loadFixture("preoperative-low-at").input);
    const byId = Object.fromEntries(r.schemes.map((s) => [s.schemeId, s]));
    // AT 9.5 < 11 with ischaemia → Older 1993 worst category.
    expect(byId["preop-older-1993"].overall?.key).toBe("low-with-ischaemia");
    // AT 9.5 (8–10.9) + VE/VCO2 at AT 36 > 34 + IHD = three risk factors → high.
    expect(byId["preop-three-tier"].overall?.key).toBe("high");
    const thr = Object.fromEntries(byId["preop-published-thresholds"].axes.map((a) => [a.axisId, a.category?.key]));
    expect(thr["wilson-2010-at"]).toBe("beyond");
    expect(thr["west-2016-peak"]).toBe("beyond"); // 17.3 ≤ 18.2
    expect(thr["rose-2018"]).toBe("within"); // 17.3 is not < 13.1
    expect(thr["lai-2013"]).toBe("unfit");
    expect(r.patterns.find((p) => p.patternId === "deconditioning")!.support).toBe("not-supported"); // VE/VCO2 slope 35 > 34
  });

  it("patterns are always worded 'consistent with', never as a diagnosis", () => {
    for (const name of [
      "normal",
      "heart-failure",
      "ventilatory",
      "pulmonary-vascular",
      "deconditioning",
      "preoperative-low-at",
    ]) {
      const fx = loadFixture(name);
      expect(fx.description).toMatch(/^INVENTED/);
      const r = interpret(fx.input);
      for (const p of r.patterns) {
        expect(p.statement).toMatch(/consistent with/);
        expect(p.statement).not.toMatch(/diagnos/i);
      }
      const d = composeDraft(fx.input, r);
      expect(JSON.stringify(d.sections)).not.toMatch(/\bdiagnosis\b/i);
    }
  });
});
