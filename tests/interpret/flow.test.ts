import { describe, expect, it } from "vitest";
import { composeDraft, interpret, type InterpretInput } from "../../lib/interpret";
import { baseInput, deepFreeze } from "./helpers";

// Flow: ATS/ACCP 2003 statement and Wasserman-school flowcharts (recalled); cut-offs per rules.json.
// Every patient below is INVENTED; each case exercises one path through the graph.
const path = (r: ReturnType<typeof interpret>) => r.path.steps.map((s) => `${s.nodeId}:${s.outcome}`);

describe("interpretation flow, one test per path", () => {
  it("maximal, normal capacity, normal efficiency → normal", () => {
    const r = interpret(baseInput());
    expect(path(r)).toEqual([
      "effort:adequate",
      "peak-vo2:normal",
      "normal-peak-efficiency:normal",
      "breathing-reserve:preserved",
      "gas-exchange:normal",
      "summary:normal",
    ]);
    expect(r.path.end?.key).toBe("normal");
  });

  it("normal capacity with a high VE/VCO2 slope (> 34, CCJM / Gitt 2002) → normal capacity with findings", () => {
    const r = interpret(baseInput({ veVco2SlopeWhole: 36 }));
    expect(path(r)).toContain("normal-peak-efficiency:abnormal");
    expect(r.path.end?.key).toBe("normal-capacity-with-findings");
  });

  it("reduced → low AT → cardiovascular discriminators abnormal (O2 pulse < 80 % predicted, CCJM)", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 60, vt1PctPredPeakVo2: 35, o2PulsePctPred: 70 }));
    expect(path(r).slice(1, 4)).toEqual(["peak-vo2:reduced", "at:low", "cardiovascular:abnormal"]);
    expect(r.path.end?.key).toBe("reduced-with-findings");
  });

  it("reduced → low AT → normal discriminators → deconditioning end", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 75, vt1PctPredPeakVo2: 36 }));
    expect(path(r)).toContain("cardiovascular:normal");
    expect(r.path.end?.key).toBe("reduced-low-vt1-only");
  });

  it("reduced → low AT → low haemoglobin (WHO 1968, recalled) → anaemia branch", () => {
    const r = interpret(
      baseInput(
        { peakVo2PctPred: 70, vt1PctPredPeakVo2: 36, o2PulsePctPred: 75 },
        { patient: { sex: "female", ageY: 40, haemoglobinGDl: 9.5 } },
      ),
    );
    expect(path(r)).toContain("cardiovascular:anaemia");
    expect(r.patterns[0].patternId).toBe("anaemia");
  });

  it("low haemoglobin beside a high VE/VCO2 slope and a low ΔVO2/ΔWR: the cardiovascular findings stay, anaemia is not the explanation", () => {
    // anaemia leaves ΔVO2/ΔWR and the VE/VCO2 slope normal (ATS/ACCP 2003 / Wasserman-school pattern table, recalled)
    const r = interpret(
      baseInput(
        { peakVo2PctPred: 55, vt1PctPredPeakVo2: 30, o2PulsePctPred: 62, veVco2SlopeWhole: 39.8, dVo2dWr: 7.6 },
        { patient: { sex: "male", ageY: 62, haemoglobinGDl: 11 } },
      ),
    );
    expect(path(r)).toContain("cardiovascular:abnormal");
    expect(r.path.steps.find((s) => s.nodeId === "cardiovascular")!.finding).toMatch(/low haemoglobin may add to it/);
    expect(r.patterns[0].patternId).toBe("cardiovascular");
    expect(r.patterns.find((p) => p.patternId === "anaemia")!.support).toBe("not-supported");
  });

  it.each([
    // Cole 1999 (confirmed): chronotropic index < 0.80 impaired; on a beta-blocker < 0.62 (Brubaker & Kitzman 2011, recalled)
    [0.79, false, true],
    [0.8, false, false],
    [0.7, true, false],
    [0.61, true, true],
  ])("chronotropic index %s (beta-blocker %s) is read in the cardiovascular step: impaired %s", (ci, bb, impaired) => {
    const r = interpret(
      baseInput(
        { peakVo2PctPred: 60, vt1PctPredPeakVo2: 35, o2PulsePctPred: 70, chronotropicIndex: ci },
        { patient: { sex: "male", ageY: 60, betaBlocker: bb } },
      ),
    );
    const check = r.path.steps
      .find((s) => s.nodeId === "cardiovascular")!
      .checks.find((c) => c.ruleId === "chronotropic-incompetence")!;
    expect(check.outcome).toBe(impaired);
    const cardiovascular = r.patterns.find((p) => p.patternId === "cardiovascular")!;
    const side = impaired ? cardiovascular.for : cardiovascular.against;
    expect(side.map((f) => f.ruleId)).toContain("chronotropic-incompetence");
  });

  it.each([
    // peak P(A−a)O2 upper limit: > 38 mmHg (Hansen et al. 1984, confirmed; default) or > 35 mmHg (ATS/ACCP 2003, recalled)
    [38, "above-38", false],
    [38.5, "above-38", true],
    [35, "above-35", false],
    [36, "above-35", true],
  ])("P(A−a)O2 %s mmHg with the %s limit: widened %s, and the gas-exchange step follows", (aa, option, widened) => {
    const r = interpret(baseInput({ peakVo2PctPred: 65, vt1PctPredPeakVo2: 45, aaGradientPeak: aa }), {
      choices: { "aa-gradient-upper": option },
    });
    const step = r.path.steps.find((s) => s.nodeId === "gas-exchange")!;
    expect(step.checks.find((c) => c.ruleId === "aa-gradient-high")!.outcome).toBe(widened);
    expect(step.outcome).toBe(widened ? "abnormal" : "normal");
  });

  it("reduced → AT normal → breathing reserve exhausted (VE/MVV ≥ 85 %, Radtke 2019)", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 65, vt1PctPredPeakVo2: 45, veMvvPct: 85 }));
    expect(path(r).slice(1, 4)).toEqual(["peak-vo2:reduced", "at:normal", "breathing-reserve:ventilatory-limitation"]);
  });

  it("reduced → AT not determined → continues to breathing reserve, says not assessable", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 65, vt1PctPredPeakVo2: null, vt1Determined: false }));
    expect(path(r)).toContain("at:not-assessable");
    expect(r.path.steps.find((s) => s.nodeId === "at")!.text).toMatch(/not available → not assessable/);
    expect(r.issues.map((i) => i.code)).toContain("not-assessable-at");
  });

  it("reduced, nothing else abnormal → reduced without an identified limit", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 70, vt1PctPredPeakVo2: 45 }));
    expect(r.path.end?.key).toBe("reduced-unexplained");
  });

  it("gas exchange abnormal (SpO2 fall ≥ 4, Hadeli 2001)", () => {
    const r = interpret(baseInput({ spo2Fall: 5, spo2Min: 91 }));
    expect(path(r)).toContain("gas-exchange:abnormal");
  });

  it("peak VO2 missing → not assessable, flow continues through AT", () => {
    const r = interpret(baseInput({ peakVo2PctPred: null }));
    expect(path(r).slice(0, 3)).toEqual(["effort:adequate", "peak-vo2:not-assessable", "at:normal"]);
    expect(r.path.end?.key).toBe("incomplete");
  });

  it("submaximal effort → effort-independent branch only (VE/VCO2 slope, VT1, oxygenation)", () => {
    const r = interpret(baseInput({ peakRer: 0.98, hrPctPred: 72, hrReserveBpm: 45, veMvvPct: 50, peakVo2PctPred: 55 }));
    expect(r.effort.verdict).toBe("submaximal");
    expect(path(r)).toEqual(["effort:submaximal", "submax-efficiency:normal", "submax-at:normal", "submax-gas-exchange:normal"]);
    expect(r.path.end?.key).toBe("submaximal");
    expect(r.issues.map((i) => i.code)).toContain("submaximal-test");
  });

  it("effort not assessable (no RER) → peak read with caution", () => {
    const r = interpret(
      baseInput({ peakRer: null, hrPctPred: null, hrReserveBpm: null, veMvvPct: null, spo2Fall: null, spo2Min: null }),
    );
    expect(r.effort.verdict).toBe("not-assessable");
    expect(path(r)[0]).toBe("effort:not-assessable");
  });

  it("each step reads with the patient's values, the equation and the cut-off", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 62 }, { predictedEquations: { peakVo2: "Hansen 1984" } }));
    const step = r.path.steps.find((s) => s.nodeId === "peak-vo2")!;
    expect(step.checks[0].text).toBe("Peak VO2 62 % predicted (Hansen 1984) < 85 % predicted → Peak VO2 reduced");
    expect(step.sourceIds).toContain("glaab-2021-guide");
    expect(step.status).toBe("secondary");
  });

  it("does not mutate its input and is deterministic", () => {
    const input = deepFreeze(baseInput({ peakVo2PctPred: 62 }));
    expect(interpret(input)).toEqual(interpret(input));
  });
});

describe("effort and cut-off choices", () => {
  it.each([
    [1.05, "physiological-limit"],
    [1.06, "maximal"],
  ])("peak RER %s with HR reached → %s (default RER > 1.05, ERS 2019)", (rer, verdict) => {
    expect(interpret(baseInput({ peakRer: rer })).effort.verdict).toBe(verdict);
  });
  it("RER ≥ 1.10 choice (JACC HF 2020) moves 1.08 from maximal to physiological limit", () => {
    expect(interpret(baseInput({ peakRer: 1.08 })).effort.verdict).toBe("maximal");
    const r = interpret(baseInput({ peakRer: 1.08 }), { choices: { "rer-maximal": "at-least-1.10" } });
    expect(r.effort.verdict).toBe("physiological-limit");
    expect(r.settingsUsed.find((s) => s.choiceId === "rer-maximal")).toMatchObject({
      optionId: "at-least-1.10",
      isDefault: false,
      status: "confirmed",
    });
  });
  it("breathing-reserve choices: VE/MVV ≥ 85 % (default), BR < 11 L/min (Hansen 1984), BR < 15 % (secondary)", () => {
    const v = { veMvvPct: 84, breathingReserveLMin: 10.9, breathingReservePct: 16 };
    expect(interpret(baseInput(v)).rules["br-low"].outcome).toBe(false);
    expect(interpret(baseInput(v), { choices: { "breathing-reserve": "br-below-11" } }).rules["br-low"].outcome).toBe(true);
    expect(interpret(baseInput(v), { choices: { "breathing-reserve": "br-below-15-pct" } }).rules["br-low"].outcome).toBe(false);
  });
  it("desaturation choices differ at fall 4, nadir 88", () => {
    const v = { spo2Fall: 4, spo2Min: 92 };
    expect(interpret(baseInput(v)).rules.desaturation.outcome).toBe(true);
    expect(interpret(baseInput(v), { choices: { desaturation: "fall-over-4-below-90" } }).rules.desaturation.outcome).toBe(false);
    expect(
      interpret(baseInput({ spo2Fall: 2, spo2Min: 88 }), { choices: { desaturation: "nadir-88" } }).rules.desaturation.outcome,
    ).toBe(true);
  });
  it("a rule's status is the weakest of its own and the chosen option's (ATS/ACCP option is recalled)", () => {
    const r = interpret(baseInput({ peakVo2PctPred: 84 }), { choices: { "peak-vo2-normal": "at-or-below-84" } });
    expect(r.rules["peak-vo2-reduced"].status).toBe("recalled");
    expect(r.rules["peak-vo2-reduced"].sourceIds).toContain("ats-accp-2003");
  });
  it("an unknown choice option is an issue, and the default is used", () => {
    const r = interpret(baseInput(), { choices: { "rer-maximal": "1.2", "no-such-choice": "x" } });
    expect(r.issues.map((i) => i.code)).toEqual(expect.arrayContaining(["unknown-cutoff-option", "unknown-cutoff-choice"]));
    expect(r.settingsUsed.find((s) => s.choiceId === "rer-maximal")!.optionId).toBe("above-1.05");
  });
});

describe("a missing value says why", () => {
  it("the engine's reason follows 'not available' wherever a rule reads the value", () => {
    const why = "end-exercise VO2 rise 1.7 mL/kg/min lies within 1.28 standard errors (SE 1.0) of the < 2 mL/kg/min cut-off";
    const r = interpret({ ...baseInput({ vo2Plateau: null }), reasons: { vo2Plateau: why } });
    expect(r.effort.text).toContain(`VO2 plateau not available (${why})`);
    // without a reason the wording is as before
    expect(interpret(baseInput({ vo2Plateau: null })).effort.text).toMatch(/VO2 plateau not available →/);
  });
});

describe("effort when peak RER is missing", () => {
  it("a limit reached without an RER is not called 'RER below the cut-off', and peak values are still read", () => {
    // HR 95 % of predicted ≥ 85 % (default hr-reached choice: Glaab et al. 2021, secondary) with no peak RER (VO2 given
    // per kg only, say)
    const r = interpret(baseInput({ peakRer: null, hrPctPred: 95 }));
    expect(r.effort.verdict).toBe("limit-without-rer");
    expect(r.effort.label).not.toMatch(/RER below/);
    expect(r.effort.label).toMatch(/Peak RER not available/);
    // the limit reached is named, not the list of possible ones
    expect(r.effort.label).toBe("Peak RER not available, but a physiological limit was reached: Peak HR reached predicted range");
    expect(path(r)[0]).toBe("effort:adequate");
    // heart rate alone, without an RER, is weak evidence: said as a warning
    expect(r.issues.find((i) => i.code === "effort-rests-on-heart-rate")?.message).toMatch(
      /^Effort is judged adequate on heart rate alone \(the only effort criterion met\), with no peak RER/,
    );
  });

  it("heart rate alone with peak RER 0.97 is warned about; with a plateau as well, or RER 1.02, it is not", () => {
    const warned = (over: Partial<InterpretInput["values"]>) =>
      interpret(baseInput({ hrPctPred: 95, ...over })).issues.some((i) => i.code === "effort-rests-on-heart-rate");
    const r = interpret(baseInput({ peakRer: 0.97, hrPctPred: 95 }));
    expect(r.effort.verdict).toBe("physiological-limit");
    expect(r.effort.label).toBe(
      "Peak RER below the maximal-effort cut-off, but a physiological limit was reached: Peak HR reached predicted range",
    );
    // 0.97 < 1.0, the lowest RER any cited source accepts as maximal (FRIEND inclusion, confirmed); 1.02 is not below it
    expect(warned({ peakRer: 0.97 })).toBe(true);
    expect(warned({ peakRer: 1.02 })).toBe(false);
    expect(warned({ peakRer: 0.97, vo2Plateau: true })).toBe(false);
    // an RER that rounds to the floor is printed with the digit that puts it below: "0.999 (below 1.00)"
    const near = interpret(baseInput({ peakRer: 0.9993, hrPctPred: 95 })).issues.find(
      (i) => i.code === "effort-rests-on-heart-rate",
    );
    expect(near?.message).toContain("peak RER 0.999 (below 1.00)");
    // the draft's step-by-step line says what the adequate effort rests on
    const steps = composeDraft(baseInput({ peakRer: 0.97, hrPctPred: 95 }), r).sections.find((s) => s.id === "pathway")!;
    expect(steps.paragraphs[0]).toMatch(/^Test validity and effort: .+ \(on heart rate alone; see the data-quality warning\)\.$/);
  });

  it("heart rate alone with peak RER 1.02 or 1.05 (not above the default > 1.05 of ERS 2019, confirmed) gets an info line", () => {
    const info = (over: Partial<InterpretInput["values"]>) =>
      interpret(baseInput({ hrPctPred: 95, ...over })).issues.find((i) => i.code === "effort-mainly-on-heart-rate");
    expect(info({ peakRer: 1.02 })?.severity).toBe("info");
    expect(info({ peakRer: 1.05 })?.message).toContain("peak RER 1.05 is below the maximal-effort cut-off though not below 1.00");
    // not with RER above the cut-off, not with a second criterion, not below the floor (the warning says it there)
    expect(info({ peakRer: 1.06 })).toBeUndefined();
    expect(info({ peakRer: 1.02, vo2Plateau: true })).toBeUndefined();
    expect(info({ peakRer: 0.97 })).toBeUndefined();
  });
});

describe("submaximal test: the ventilatory-efficiency step names what it read (invented values)", () => {
  // maximal effort not shown: peak RER 0.95 with heart rate and breathing reserve left (ERS 2019 markers, confirmed)
  const submax = (over: Partial<InterpretInput["values"]>) =>
    interpret(baseInput({ peakRer: 0.95, hrPctPred: 70, hrReserveBpm: 45, veMvvPct: 50, ...over })).path.steps.find(
      (s) => s.nodeId === "submax-efficiency",
    )!;
  it("slope 27 and OUES 1600 (above 1400, Myers 2014 — confirmed): ventilatory efficiency normal", () => {
    expect(submax({ veVco2SlopeWhole: 27, oues: 1600 }).finding).toBe("ventilatory efficiency normal (effort-independent)");
  });
  it("slope 27 without OUES: only the slope is called normal, and the finding says OUES was not available", () => {
    expect(submax({ veVco2SlopeWhole: 27, oues: null }).finding).toBe(
      "VE/VCO2 slope normal (effort-independent; OUES not available)",
    );
  });
  it("OUES 1300: abnormal", () => {
    expect(submax({ veVco2SlopeWhole: 27, oues: 1300 }).outcome).toBe("abnormal");
  });
});
