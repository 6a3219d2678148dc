import { describe, expect, it } from "vitest";
import { interpret, type InterpretInput, type InterpretSettings } from "../../lib/interpret";
import { baseInput } from "./helpers";

// All patients here are INVENTED; only the cut-offs come from the cited publications.
type V = Partial<InterpretInput["values"]>;
function run(
  schemeId: string,
  values: V,
  patient: Partial<InterpretInput["patient"]> = {},
  choices: Record<string, string> = {},
) {
  const input = baseInput(values);
  input.patient = { ...input.patient, ...patient };
  const settings: InterpretSettings = { addSchemes: [schemeId], choices };
  const r = interpret(input, settings);
  return { r, s: r.schemes.find((x) => x.schemeId === schemeId)! };
}
function axis(
  schemeId: string,
  axisId: string,
  values: V,
  patient: Partial<InterpretInput["patient"]> = {},
  choices: Record<string, string> = {},
) {
  return run(schemeId, values, patient, choices).s.axes.find((a) => a.axisId === axisId)!.category?.key ?? null;
}

describe("Weber class (Janicki, Weber & McElroy 1988, Eur Heart J 9 Suppl H, confirmed; decimal boundaries our labelled choice)", () => {
  it.each([
    [20.01, "A"],
    [20.0, "B"],
    [19.99, "B"],
    [16.01, "B"],
    [16.0, "B"],
    [15.99, "C"],
    [10.01, "C"],
    [10.0, "C"],
    [9.99, "D"],
  ])("peak VO2 %s mL/kg/min → class %s", (v, k) => {
    expect(axis("weber", "peak", { peakVo2MlKgMin: v })).toBe(k);
  });
  it.each([
    [14.01, "A"],
    [14.0, "B"],
    [13.99, "B"],
    [11.01, "B"],
    [11.0, "B"],
    [10.99, "C"],
    [8.01, "C"],
    [8.0, "C"],
    [7.99, "D"],
  ])("AT %s mL/kg/min → class %s", (v, k) => {
    expect(axis("weber", "at", { vt1Vo2MlKgMin: v })).toBe(k);
  });
  it("reports both sub-classes and, by default, the worse one, labelled as our choice", () => {
    const { s } = run("weber", { peakVo2MlKgMin: 18, vt1Vo2MlKgMin: 9 }); // peak → B, AT → C
    expect(s.axes.map((a) => a.category?.key)).toEqual(["B", "C"]);
    expect(s.overall?.key).toBe("C");
    expect(s.overall?.basis).toMatch(/our choice/);
    expect(run("weber", { peakVo2MlKgMin: 18, vt1Vo2MlKgMin: 9 }, {}, { "weber-combination": "peak-vo2" }).s.overall?.key).toBe(
      "B",
    );
    expect(run("weber", { peakVo2MlKgMin: 18, vt1Vo2MlKgMin: 9 }, {}, { "weber-combination": "at" }).s.overall?.key).toBe("C");
  });
  it("peak sub-class is not assessable on a submaximal test; AT sub-class still is", () => {
    const { s } = run("weber", { peakVo2MlKgMin: 18, vt1Vo2MlKgMin: 12, peakRer: 0.95, hrPctPred: 70, hrReserveBpm: 50 });
    expect(s.axes[0].category).toBeNull();
    expect(s.axes[0].reason).toMatch(/maximal effort not demonstrated/);
    expect(s.overall?.key).toBe("B");
  });
});

describe("Arena ventilatory class (Arena et al. 2007, Circulation, PMID 17452607, confirmed)", () => {
  it.each([
    [45.01, "VC-IV"],
    [45.0, "VC-IV"],
    [44.99, "VC-III"],
    [36.01, "VC-III"],
    [36.0, "VC-III"],
    [35.99, "VC-II"],
    [30.01, "VC-II"],
    [30.0, "VC-II"],
    [29.99, "VC-I"],
  ])("slope %s → %s", (v, k) => {
    expect(axis("arena-ventilatory-class", "slope", { veVco2SlopeWhole: v })).toBe(k);
  });
  it("with the 2007-abstract choice VC-I ≤29, 29.5 falls between published classes and raises an issue", () => {
    const ch = { "arena-vc1": "at-or-below-29" };
    expect(axis("arena-ventilatory-class", "slope", { veVco2SlopeWhole: 29.0 }, {}, ch)).toBe("VC-I");
    expect(axis("arena-ventilatory-class", "slope", { veVco2SlopeWhole: 29.01 }, {}, ch)).toBeNull();
    const { r } = run("arena-ventilatory-class", { veVco2SlopeWhole: 29.5 }, {}, ch);
    expect(r.issues.map((i) => i.code)).toContain("value-between-bands");
    expect(r.settingsUsed.find((s) => s.choiceId === "arena-vc1")).toMatchObject({
      optionId: "at-or-below-29",
      isDefault: false,
    });
  });
  it("uses the slope definition the lab chose (to RCP instead of whole test)", () => {
    expect(
      axis(
        "arena-ventilatory-class",
        "slope",
        { veVco2SlopeWhole: 37, veVco2SlopeToRcp: 33 },
        {},
        { "vevco2-slope-definition": "to-rcp" },
      ),
    ).toBe("VC-II");
  });
});

describe("Peak VO2 severity (practical guide, Respir Res 2021 Table 1, secondary)", () => {
  it.each([
    [49.99, "severe"],
    [50, "moderate"],
    [69.99, "moderate"],
    [70, "mild"],
    [84.99, "mild"],
    [85, "normal"],
    [85.01, "normal"],
  ])("%s %% predicted → %s (default < 85 %%)", (v, k) => {
    expect(axis("peak-vo2-grade", "grade", { peakVo2PctPred: v })).toBe(k);
  });
  it("ATS/ACCP choice (> 84 % normal, recalled) and CCJM choice (< 80 % reduced)", () => {
    expect(axis("peak-vo2-grade", "grade", { peakVo2PctPred: 84 }, {}, { "peak-vo2-normal": "at-or-below-84" })).toBe("mild");
    expect(axis("peak-vo2-grade", "grade", { peakVo2PctPred: 84.01 }, {}, { "peak-vo2-normal": "at-or-below-84" })).toBe(
      "normal",
    );
    expect(axis("peak-vo2-grade", "grade", { peakVo2PctPred: 80 }, {}, { "peak-vo2-normal": "below-80" })).toBe("normal");
    expect(axis("peak-vo2-grade", "grade", { peakVo2PctPred: 79.99 }, {}, { "peak-vo2-normal": "below-80" })).toBe("mild");
  });
});

describe("Heart-failure prognostic table (EACPR/AHA 2012, recalled; rows independently supported as marked)", () => {
  it.each([
    ["petco2-rest", { petco2RestMmHg: 32.99 }, "low"],
    ["petco2-rest", { petco2RestMmHg: 33 }, "normal"],
    ["petco2-rest", { petco2RestMmHg: 33.01 }, "normal"],
    ["petco2-rise", { petco2RiseMmHg: 2.99 }, "small"],
    ["petco2-rise", { petco2RiseMmHg: 3 }, "normal"],
    ["hrr1", { hrr1Bpm: 11 }, "abnormal"],
    ["hrr1", { hrr1Bpm: 12 }, "abnormal"],
    ["hrr1", { hrr1Bpm: 13 }, "normal"],
    ["rer", { peakRer: 1.09 }, "submaximal"],
    ["rer", { peakRer: 1.1 }, "maximal"],
    ["rer", { peakRer: 1.11 }, "maximal"],
    ["eov", { eovPresent: true }, "present"],
    ["eov", { eovPresent: false }, "absent"],
    ["eov", {}, null],
  ] as [string, V, string | null][])("%s %o → %s", (id, v, k) => {
    expect(axis("hf-prognostic-table", id, v)).toBe(k);
  });
  it("has no combined category (none published)", () => {
    expect(run("hf-prognostic-table", { petco2RestMmHg: 30 }).s.overall).toBeNull();
  });
});

describe("Pulmonary hypertension risk, CPET rows (ESC/ERS 2015, secondary; 2022 recalled)", () => {
  it.each([
    ["peak-kg", { peakVo2MlKgMin: 10.99 }, "high"],
    ["peak-kg", { peakVo2MlKgMin: 11 }, "intermediate"],
    ["peak-kg", { peakVo2MlKgMin: 15 }, "intermediate"],
    ["peak-kg", { peakVo2MlKgMin: 15.01 }, "low"],
    ["peak-pct", { peakVo2PctPred: 34.99 }, "high"],
    ["peak-pct", { peakVo2PctPred: 35 }, "intermediate"],
    ["peak-pct", { peakVo2PctPred: 65 }, "intermediate"],
    ["peak-pct", { peakVo2PctPred: 65.01 }, "low"],
    ["slope", { veVco2SlopeWhole: 35.99 }, "low"],
    ["slope", { veVco2SlopeWhole: 36 }, "intermediate"],
    ["slope", { veVco2SlopeWhole: 44.99 }, "intermediate"],
    ["slope", { veVco2SlopeWhole: 45 }, "high"],
  ] as [string, V, string][])("2015 %s %o → %s", (id, v, k) => {
    expect(axis("ph-esc-ers-2015", id, v)).toBe(k);
  });
  it("2022 rows (recalled): slope 44 intermediate, 44.01 high; chosen through ph-risk-version", () => {
    const ch = { "ph-risk-version": "esc-ers-2022" };
    const r44 = interpret(baseInput({ veVco2SlopeWhole: 44 }, { referral: "pulmonary-hypertension" }), { choices: ch });
    expect(r44.schemes.map((s) => s.schemeId)).toContain("ph-esc-ers-2022");
    expect(r44.schemes.map((s) => s.schemeId)).not.toContain("ph-esc-ers-2015");
    expect(r44.schemes.find((s) => s.schemeId === "ph-esc-ers-2022")!.axes.find((a) => a.axisId === "slope")!.category?.key).toBe(
      "intermediate",
    );
    expect(axis("ph-esc-ers-2022", "slope", { veVco2SlopeWhole: 44.01 }, {}, ch)).toBe("high");
    expect(r44.schemes.find((s) => s.schemeId === "ph-esc-ers-2022")!.status).toBe("recalled");
  });
});

describe("Pre-operative AT (Older et al. 1993, Chest 104:701, confirmed)", () => {
  it.each([
    [10.99, "low"],
    [11, "adequate"],
    [11.01, "adequate"],
  ])("AT %s mL/kg/min → %s", (v, k) => {
    expect(axis("preop-older-1993", "at", { vt1Vo2MlKgMin: v })).toBe(k);
  });
  it("low AT with ischaemia is the worst category; the ischaemia axis is not applicable without IHD", () => {
    const { s } = run("preop-older-1993", { vt1Vo2MlKgMin: 10, ischaemicHeartDisease: true });
    expect(s.overall?.key).toBe("low-with-ischaemia");
    const n = run("preop-older-1993", { vt1Vo2MlKgMin: 10, ischaemicHeartDisease: false }).s;
    expect(n.axes[1].category).toBeNull();
    expect(n.axes[1].reason).toMatch(/not applicable/);
    expect(n.overall?.key).toBe("low");
  });
});

// Source: perioperative CPET three-tier risk scheme, Authorea preprint (authorea.com/users/424398/articles/556575;
// authors, year and journal not recorded in the clinical sheets or the lib registry), status confirmed (lib id
// "periop-3tier-s34"): low AT ≥ 11; intermediate one of AT 8–10.9, VE/VCO2 at AT > 34, ischaemic heart disease;
// high AT < 8 or ≥ 2 of those. The same three factors (AT ≤ 10.9 mL/kg/min, VE/VCO2 at AT > 34, IHD) are the
// cohort cut-offs of Wilson RJT, Davies S, Yates D, Redman J, Stone M, Br J Anaesth 2010 — confirmed (volume/page
// 105:297 recalled).
describe("Pre-operative three-tier scheme (Authorea preprint, authors not recorded; confirmed)", () => {
  it.each([
    [{ vt1Vo2MlKgMin: 7.99, veVco2AtVt1: 30, ischaemicHeartDisease: false }, "high"],
    [{ vt1Vo2MlKgMin: 8, veVco2AtVt1: 30, ischaemicHeartDisease: false }, "intermediate"],
    [{ vt1Vo2MlKgMin: 10.99, veVco2AtVt1: 30, ischaemicHeartDisease: false }, "intermediate"],
    [{ vt1Vo2MlKgMin: 11, veVco2AtVt1: 30, ischaemicHeartDisease: false }, "low"],
    [{ vt1Vo2MlKgMin: 12, veVco2AtVt1: 34, ischaemicHeartDisease: false }, "low"],
    [{ vt1Vo2MlKgMin: 12, veVco2AtVt1: 34.01, ischaemicHeartDisease: false }, "intermediate"],
    [{ vt1Vo2MlKgMin: 12, veVco2AtVt1: 30, ischaemicHeartDisease: true }, "intermediate"],
    [{ vt1Vo2MlKgMin: 12, veVco2AtVt1: 35, ischaemicHeartDisease: true }, "high"],
    [{ vt1Vo2MlKgMin: 9, veVco2AtVt1: 35, ischaemicHeartDisease: false }, "high"],
  ] as [V, string][])("%o → %s", (v, k) => {
    expect(axis("preop-three-tier", "tier", v)).toBe(k);
  });
  it("missing ischaemic-heart-disease status leaves no category but says what each answer gives (low if absent, intermediate if present)", () => {
    // INVENTED: AT 11.0 mL/kg/min and VE/VCO2 at AT 34.0 are both on the favourable side of their cut-offs (Older 1993 /
    // Wilson 2010 via the three-tier scheme, periop-3tier-s34): IHD alone then decides low (no factor) or intermediate (one)
    expect(axis("preop-three-tier", "tier", { vt1Vo2MlKgMin: 12, veVco2AtVt1: 30 })).toBeNull();
    const { r, s } = run("preop-three-tier", { vt1Vo2MlKgMin: 11, veVco2AtVt1: 34 });
    expect(s.overall).toBeNull();
    expect(s.axes[0].dependsOn).toMatch(
      /^depends on ischaemic heart disease \(not recorded\): low risk \(.*\) if absent; intermediate risk \(.*\) if present$/,
    );
    expect(s.overallText).toBe(`No overall category: ${s.axes[0].dependsOn}`);
    expect(r.issues.map((i) => i.code)).toContain("scheme-category-depends-on-input");
    // each answer, recorded, gives the category the sentence promised
    expect(axis("preop-three-tier", "tier", { vt1Vo2MlKgMin: 11, veVco2AtVt1: 34, ischaemicHeartDisease: false })).toBe("low");
    expect(axis("preop-three-tier", "tier", { vt1Vo2MlKgMin: 11, veVco2AtVt1: 34, ischaemicHeartDisease: true })).toBe(
      "intermediate",
    );
    // an axis reading nothing but the missing answer is not spelled out both ways (heart-failure prognostic table's
    // oscillatory-ventilation row: "present if present" says nothing)
    const hf = interpret(baseInput({ eovPresent: null }, { referral: "heart-failure" }));
    const eovAxes = hf.schemes.flatMap((x) => x.axes).filter((a) => a.label.toLowerCase().includes("oscillatory"));
    expect(eovAxes.length).toBeGreaterThan(0);
    for (const a of eovAxes) expect(a.dependsOn).toBeUndefined();
    // a missing number is not guessed at: AT unknown stays not assessable
    const { s: noAt } = run("preop-three-tier", { vt1Vo2MlKgMin: null, veVco2AtVt1: 30 });
    expect(noAt.axes[0].dependsOn).toBeUndefined();
    expect(noAt.overallText).toMatch(/could be placed in a band/);
    // each missing input is named once, not once per comparison that reads it (three for AT in this scheme)
    expect(noAt.axes[0].text.match(/VO2 at VT1 \(mL\/kg\/min\) not available/g)).toHaveLength(1);
  });
  it("with ischaemic heart disease not recorded, AT 8-10.9 is at least intermediate risk (high not excluded), not 'no category'", () => {
    // INVENTED: AT 8.0 mL/kg/min, VE/VCO2 at AT 30: one risk factor for sure, the second (IHD) unknown
    const { r, s } = run("preop-three-tier", { vt1Vo2MlKgMin: 8, veVco2AtVt1: 30 });
    const tier = s.axes[0];
    expect(tier.category?.key).toBe("intermediate");
    expect(tier.atLeast).toBe(true);
    expect(tier.text).toMatch(
      /at least intermediate risk .*; high risk .* not excluded \(.*Ischaemic heart disease not available/i,
    );
    expect(s.overall?.label).toMatch(/^At least intermediate risk/);
    expect(r.issues.map((i) => i.code)).toContain("scheme-category-floor");
    // with IHD recorded the category is exact again
    expect(axis("preop-three-tier", "tier", { vt1Vo2MlKgMin: 8, veVco2AtVt1: 30, ischaemicHeartDisease: true })).toBe("high");
  });
});

describe("Published pre-operative cohort thresholds, shown with study and population", () => {
  it.each([
    ["wilson-2010-at", { vt1Vo2MlKgMin: 10.9 }, "beyond"],
    ["wilson-2010-at", { vt1Vo2MlKgMin: 10.91 }, "within"],
    ["wilson-2010-vevco2", { veVco2AtVt1: 34 }, "within"],
    ["wilson-2010-vevco2", { veVco2AtVt1: 34.01 }, "beyond"],
    ["west-2016-at", { vt1Vo2MlKgMin: 11.1 }, "beyond"],
    ["west-2016-at", { vt1Vo2MlKgMin: 11.11 }, "within"],
    ["west-2016-peak", { peakVo2MlKgMin: 18.2 }, "beyond"],
    ["west-2016-peak", { peakVo2MlKgMin: 18.21 }, "within"],
    ["west-2016-vevco2", { veVco2AtVt1: 30.9 }, "within"],
    ["west-2016-vevco2", { veVco2AtVt1: 30.91 }, "beyond"],
    ["west-2014-rectal-at", { vt1Vo2MlKgMin: 10.6 }, "beyond"],
    ["west-2014-rectal-at", { vt1Vo2MlKgMin: 10.61 }, "within"],
    ["lai-2013", { vt1Determined: false, vt1Vo2MlKgMin: null }, "no-at"],
    ["lai-2013", { vt1Determined: true, vt1Vo2MlKgMin: 10.99 }, "unfit"],
    ["lai-2013", { vt1Determined: true, vt1Vo2MlKgMin: 11 }, "fit"],
    ["rose-2018", { peakVo2MlKgMin: 13.09, veVco2AtVt1: 34 }, "beyond"],
    ["rose-2018", { peakVo2MlKgMin: 13.1, veVco2AtVt1: 34 }, "within"],
    ["rose-2018", { peakVo2MlKgMin: 12, veVco2AtVt1: 33.99 }, "within"],
  ] as [string, V, string][])("%s %o → %s", (id, v, k) => {
    expect(axis("preop-published-thresholds", id, v)).toBe(k);
  });
  it("every threshold names its population", () => {
    for (const a of run("preop-published-thresholds", {}).s.axes) expect(a.population).toBeTruthy();
  });
});

describe("Heart-transplant listing CPET criteria (Mehra et al. 2016, J Heart Lung Transplant, confirmed)", () => {
  it.each([
    ["peak-on-bb", { peakVo2MlKgMin: 12, peakRer: 1.06 }, { betaBlocker: true }, "met"],
    ["peak-on-bb", { peakVo2MlKgMin: 12.01, peakRer: 1.06 }, { betaBlocker: true }, "not-met"],
    ["peak-on-bb", { peakVo2MlKgMin: 11, peakRer: 1.05 }, { betaBlocker: true }, "not-applicable-submaximal"],
    ["peak-no-bb", { peakVo2MlKgMin: 14, peakRer: 1.1 }, { betaBlocker: false }, "met"],
    ["peak-no-bb", { peakVo2MlKgMin: 14.01, peakRer: 1.1 }, { betaBlocker: false }, "not-met"],
    ["pct-pred", { peakVo2PctPred: 50, peakRer: 1.1 }, { sex: "female", ageY: 60 }, "met"],
    ["pct-pred", { peakVo2PctPred: 50.01, peakRer: 1.1 }, { sex: "male", ageY: 49 }, "not-met"],
    ["pct-pred", { peakVo2PctPred: 40, peakRer: 1.1 }, { sex: "male", ageY: 50 }, null],
    ["submax-slope", { peakRer: 1.0, veVco2SlopeWhole: 35 }, {}, "not-met"],
    ["submax-slope", { peakRer: 1.0, veVco2SlopeWhole: 35.01 }, {}, "met"],
    ["submax-slope", { peakRer: 1.06, veVco2SlopeWhole: 40 }, {}, null],
    ["lean-mass", { peakVo2LeanMlKgMin: 18.99 }, { bmi: 30.01 }, "met"],
    ["lean-mass", { peakVo2LeanMlKgMin: 19 }, { bmi: 32 }, "not-met"],
    ["lean-mass", { peakVo2LeanMlKgMin: 15 }, { bmi: 30 }, null],
  ] as [string, V, Partial<InterpretInput["patient"]>, string | null][])("%s %o %o → %s", (id, v, p, k) => {
    expect(axis("ishlt-2016", id, v, p)).toBe(k);
  });
  it("overall reports a met criterion, ignoring the maximal-test axis", () => {
    const { s } = run("ishlt-2016", { peakVo2MlKgMin: 11, peakRer: 1.1 }, { betaBlocker: true });
    expect(s.overall?.key).toBe("met");
    expect(s.notes.join(" ")).toMatch(/never rest on peak VO2 alone/);
  });
});

describe("Lung resection, ERS/ESTS 2009 (Brunelli et al., Eur Respir J 34:17-41; secondary/recalled)", () => {
  const end = (v: V, choices: Record<string, string> = {}) => {
    const r = interpret(baseInput(v, { referral: "lung-resection" }), { choices });
    const s = r.schemes.find((x) => x.kind === "graph")!;
    return { key: s.overall?.key ?? null, path: s.path!.steps.map((st) => `${st.nodeId}:${st.outcome}`), s };
  };
  it("FEV1 and DLCO both > 80 %: no further testing (80.01 passes, 80 does not)", () => {
    expect(end({ fev1PctPred: 80.01, dlcoPctPred: 81 }).key).toBe("up-to-pneumonectomy");
    expect(end({ fev1PctPred: 80, dlcoPctPred: 81, peakVo2MlKgMin: 22, peakVo2PctPred: 90 }).path).toEqual([
      "lr-spirometry:cpet-indicated",
      "lr-cpet:high",
    ]);
  });
  it.each([
    [{ peakVo2MlKgMin: 20.01, peakVo2PctPred: 60 }, "up-to-pneumonectomy"],
    [{ peakVo2MlKgMin: 18, peakVo2PctPred: 75.01 }, "up-to-pneumonectomy"],
    [{ peakVo2MlKgMin: 9.99, peakVo2PctPred: 50 }, "not-advised"],
    [{ peakVo2MlKgMin: 15, peakVo2PctPred: 34.99 }, "not-advised"],
  ] as [V, string][])("peak VO2 %o → %s", (v, k) => {
    expect(end({ fev1PctPred: 60, dlcoPctPred: 60, ...v }).key).toBe(k);
  });
  it("intermediate capacity: ppo = pre-op × (1 − segments/19), worked example", () => {
    // FEV1 57 %, DLCO 76 %, 5 segments: ppoFEV1 = 57 × 14/19 = 42.0; ppoDLCO = 76 × 14/19 = 56.0 → both > 30 %.
    const r = end({ fev1PctPred: 57, dlcoPctPred: 76, resectedSegments: 5, peakVo2MlKgMin: 15, peakVo2PctPred: 60 });
    expect(r.key).toBe("up-to-calculated-extent");
    const ppo = r.s.path!.steps[2].checks[0].comparisons;
    expect(ppo[0].value as number).toBeCloseTo(42.0, 10);
    expect(ppo[1].value as number).toBeCloseTo(56.0, 10);
  });
  it("ppo at 30 % exactly goes on to ppo peak VO2; ppo VO2 < 10 or < 35 % → not advised", () => {
    // segments 0 → ppo = pre-op value.
    const base = { fev1PctPred: 30, dlcoPctPred: 60, resectedSegments: 0 };
    expect(end({ ...base, peakVo2MlKgMin: 15, peakVo2PctPred: 60 }).key).toBe("up-to-calculated-extent");
    expect(end({ ...base, peakVo2MlKgMin: 15, peakVo2PctPred: 60 }).path.at(-1)).toBe("lr-ppo-vo2:adequate");
    // 19 segments would be the whole lung; 4 segments: ppo VO2 = 12 × 15/19 = 9.47 < 10 → not advised.
    expect(end({ fev1PctPred: 30, dlcoPctPred: 60, resectedSegments: 4, peakVo2MlKgMin: 12, peakVo2PctPred: 60 }).key).toBe(
      "not-advised",
    );
    expect(end({ ...base, fev1PctPred: 30.01, dlcoPctPred: 30.01, peakVo2MlKgMin: 15, peakVo2PctPred: 60 }).path.at(-1)).toBe(
      "lr-ppo:both-over-30",
    );
  });
  it("conflicting peak-VO2 criteria (< 10 mL/kg/min and > 75 % predicted, as in obesity) end at high risk and say they conflict", () => {
    // INVENTED: 9.9 mL/kg/min and 86 % predicted (the review's case); either high-risk criterion alone marks high risk
    // (Brunelli et al. 2009, secondary)
    const r = end({ fev1PctPred: 60, dlcoPctPred: 60, peakVo2MlKgMin: 9.9, peakVo2PctPred: 86 });
    expect(r.key).toBe("not-advised");
    const step = r.s.path!.steps.find((st) => st.nodeId === "lr-cpet")!;
    expect(step.conflict).toBe(
      'the criteria of "capacity adequate" hold too; "high risk", listed first, is taken: a reviewer decides',
    );
    expect(r.s.overallText).toContain("criteria conflict at Peak VO2: reviewer decision required");
    const accp = end(
      { resectedSegments: 0, fev1PctPred: 29.99, dlcoPctPred: 60, peakVo2MlKgMin: 9, peakVo2PctPred: 80 },
      { "lung-resection-algorithm": "accp-2013" },
    );
    expect(accp.key).toBe("high-risk");
    expect(accp.s.path!.steps.at(-1)!.conflict).toContain('"low risk" hold too');
    // no conflict without one
    expect(
      end({ fev1PctPred: 60, dlcoPctPred: 60, peakVo2MlKgMin: 9.9, peakVo2PctPred: 50 }).s.path!.steps[1].conflict,
    ).toBeUndefined();
  });
  it("a ppo value equal to the cut-off up to floating-point rounding is the cut-off: 57 % × 10/19 = 30 % goes on to ppo peak VO2", () => {
    // INVENTED: FEV1 57 %, 9 of 19 segments → ppoFEV1 = 57 × 10/19 = 30 exactly (30.000000000000004 in floating point)
    const r = end({ fev1PctPred: 57, dlcoPctPred: 80, resectedSegments: 9, peakVo2MlKgMin: 15, peakVo2PctPred: 55 });
    expect(57 * (1 - 9 / 19)).not.toBe(30);
    expect(r.path).toContain("lr-ppo:low");
    // ppo peak VO2 = 15 × 10/19 = 7.9 mL/kg/min < 10 → high risk (it had ended at "up to the calculated extent")
    expect(r.path.at(-1)).toBe("lr-ppo-vo2:low");
    expect(r.key).toBe("not-advised");
    expect(r.s.path!.steps[2].text).not.toContain("just above");
  });
  it("ACCP 2013 alternative", () => {
    const ch = { "lung-resection-algorithm": "accp-2013" };
    const seg0 = { resectedSegments: 0 };
    expect(end({ ...seg0, fev1PctPred: 60, dlcoPctPred: 60 }, ch).key).toBe("low-risk");
    expect(end({ ...seg0, fev1PctPred: 59.99, dlcoPctPred: 60, stairClimbM: 22, shuttleWalkM: 400 }, ch).key).toBe("low-risk");
    expect(
      end({ ...seg0, fev1PctPred: 50, dlcoPctPred: 60, stairClimbM: 21.99, peakVo2MlKgMin: 15, peakVo2PctPred: 60 }, ch).key,
    ).toBe("moderate-risk");
    expect(end({ ...seg0, fev1PctPred: 29.99, dlcoPctPred: 60, peakVo2MlKgMin: 9.99, peakVo2PctPred: 60 }, ch).key).toBe(
      "high-risk",
    );
    expect(end({ ...seg0, fev1PctPred: 29.99, dlcoPctPred: 60, peakVo2MlKgMin: 20.01, peakVo2PctPred: 60 }, ch).key).toBe(
      "low-risk",
    );
    expect(end({ ...seg0, fev1PctPred: 29.99, dlcoPctPred: 60, peakVo2MlKgMin: 20, peakVo2PctPred: 75 }, ch).key).toBe(
      "moderate-risk",
    );
  });
});

describe("scheme selection by referral question", () => {
  it.each([
    ["general", ["peak-vo2-grade"]],
    ["heart-failure", ["peak-vo2-grade", "weber", "arena-ventilatory-class", "hf-prognostic-table"]],
    ["transplant", ["peak-vo2-grade", "weber", "arena-ventilatory-class", "hf-prognostic-table", "ishlt-2016"]],
    ["pulmonary-hypertension", ["peak-vo2-grade", "ph-esc-ers-2015"]],
    ["pre-operative", ["peak-vo2-grade", "preop-older-1993", "preop-three-tier", "preop-published-thresholds"]],
    ["lung-resection", ["peak-vo2-grade", "lung-resection-ers-ests-2009"]],
    ["training", ["peak-vo2-grade"]],
  ] as [InterpretInput["referral"], string[]][])("%s → %o", (referral, ids) => {
    expect(interpret(baseInput({}, { referral })).schemes.map((s) => s.schemeId)).toEqual(ids);
  });
  it("categories are neutral keys with an ordinal severity, no colours", () => {
    const r = interpret(baseInput({}, { referral: "heart-failure" }));
    for (const s of r.schemes) {
      expect(s.maxSeverity).toBeGreaterThan(0);
      expect(JSON.stringify(s)).not.toMatch(/\b(colou?r|red|green|amber|yellow)\b|#[0-9a-f]{6}/i);
    }
  });
});
