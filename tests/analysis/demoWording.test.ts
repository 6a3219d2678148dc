/**
 * The words the engine puts in front of a clinician, on the INVENTED demo cases (tests/fixtures/cases, made by the
 * synthetic generator, see scripts/make-case-fixtures.ts): no rule ids, variable keys, choice ids or operators on
 * categories; scheme results that give the rule that placed the patient; one overall line per scheme; and a
 * reviewer's threshold that replaces the engine's doubt about the automatic one.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, type AnalysisResult, type TestRecord } from "../../lib/analysis";
import { UNCOMBINED_SCHEME_TEXT } from "../../lib/interpret";
import { caseRecord } from "../fixtures/caseRecord";

const records = new Map<string, TestRecord>();
const results = new Map<string, AnalysisResult>();

beforeAll(async () => {
  for (const id of ["heart-failure", "preop-low-at", "pulmonary-vascular"]) {
    const record = await caseRecord(id);
    records.set(id, record);
    results.set(id, analyse(record, { bootstrap: 0 }));
  }
}, 60_000);

/** Every clinician-facing line of an analysis: path, effort, patterns, schemes, draft and issues. */
function lines(r: AnalysisResult): string[] {
  const i = r.interpretation;
  return [
    i.effort.text,
    ...i.path.steps.flatMap((s) => [s.text, s.finding, ...s.checks.map((c) => c.text)]),
    ...i.patterns.flatMap((p) => [p.statement, ...[...p.for, ...p.against, ...p.notAssessable].map((f) => f.text)]),
    ...i.schemes.flatMap((s) => [s.overallText, ...s.notes, ...s.axes.map((a) => a.text)]),
    ...r.draft.sections.flatMap((s) => s.paragraphs),
    ...r.issues.map((x) => x.message),
  ];
}

describe("demo cases: plain clinical words", () => {
  it("no variable keys, choice or rule ids, and no operators on categories reach the text", () => {
    for (const [id, r] of results) {
      for (const l of lines(r)) {
        expect(l, id).not.toMatch(/\b(sex|effortVerdict|referral|haemoglobinGDl|veVco2NadirRatio|vt1Vo2MlKgMin)\b/);
        expect(l, id).not.toMatch(/weber-combination|peak-vo2-normal|vevco2-slope-definition/);
        expect(l, id).not.toMatch(/ (==|!=|<=|>=) /);
        expect(l, id).not.toMatch(/Sex \w+ [=≠]/);
        // "a" before a number said with a vowel sound ("a 11-W increase", "a 8 %"): English wants "an" (common usage)
        expect(l, id).not.toMatch(/\ba (8|11|18)(\d{0,2})?\b(?![.,]\d)/);
      }
    }
  });

  it("heart failure: the plateau criterion says why it cannot be judged in words that read ('a rise of 11 W')", () => {
    const r = results.get("heart-failure")!;
    expect(lines(r).join(" ")).toMatch(/a rise of \d+ W would raise VO2 by only/);
  });

  it("heart failure: the haemoglobin check reads 'men: Haemoglobin … not available' (the women's branch is left out)", () => {
    const r = results.get("heart-failure")!;
    const hb = r.interpretation.path.steps.flatMap((s) => s.checks).find((c) => c.ruleId === "hb-low")!;
    expect(hb.outcome).toBeNull(); // no haemoglobin given in the demo
    expect(hb.text).toBe("men: Haemoglobin (g/dL) not available → not assessable");
    const weber = r.interpretation.schemes.find((s) => s.schemeId === "weber")!;
    expect(weber.notes.join(" ")).toMatch(/Weber class when peak VO2 and AT disagree/);
  });

  it("pre-operative three-tier scheme: the high band shows the two risk factors that placed the patient there", () => {
    const r = results.get("preop-low-at")!;
    const tier = r.interpretation.schemes.find((s) => s.schemeId === "preop-three-tier")!;
    const at = r.interpretInput.values.vt1Vo2MlKgMin!;
    const slopeAtVt1 = r.interpretInput.values.veVco2AtVt1!;
    // the demo's AT is 8-10.99 mL/kg/min and its VE/VCO2 at VT1 above 34: two of the three risk factors (S34 scheme)
    expect(at).toBeGreaterThanOrEqual(8);
    expect(at).toBeLessThan(11);
    expect(slopeAtVt1).toBeGreaterThan(34);
    expect(tier.overall?.key).toBe("high");
    const text = tier.axes[0].text;
    expect(text).toMatch(/2 of 3 criteria met \(at least 2 needed\)/);
    expect(text).toMatch(/VE\/VCO2 at VT1 [\d.]+ > 34\.0/);
    // the satisfied "AT not below 8" is not shown as if it were the reason for the high band
    expect(text).not.toMatch(/≥ 8\.0 mL\/kg\/min or /);
    expect(text).not.toMatch(/Ischaemic heart disease: no/);
    expect(tier.axes[0].sourceIds).toContain("periop-3tier-s34");
    expect(tier.axes[0].status).toBe("confirmed");
  });

  it("pulmonary hypertension (ESC/ERS 2015): one overall line, the same in the draft", () => {
    const r = results.get("pulmonary-vascular")!;
    const ph = r.interpretation.schemes.find((s) => s.schemeId === "ph-esc-ers-2015")!;
    expect(ph.overall).toBeNull();
    expect(ph.overallText).toBe(UNCOMBINED_SCHEME_TEXT);
    const para = r.draft.sections.find((s) => s.id === "schemes")!.paragraphs.find((p) => p.startsWith(ph.name))!;
    expect(para).toContain(UNCOMBINED_SCHEME_TEXT);
    expect(para).not.toMatch(/not assessable \(/);
  });
});

describe("a reviewer's threshold replaces the engine's doubt about the automatic one", () => {
  it("pre-operative demo: VT1 and VT2 uncertainty warnings become info lines after review", () => {
    const before = results.get("preop-low-at")!;
    const codes = (r: AnalysisResult, sev: string) => r.issues.filter((i) => i.severity === sev).map((i) => i.code);
    expect(codes(before, "warning")).toEqual(expect.arrayContaining(["vt1-low-confidence", "vt2-low-confidence"]));
    const vt1 = before.thresholds.vt1.vo2MlMin.value!;
    const vt2 = before.thresholds.vt2.vo2MlMin.value!;
    const after = analyse(records.get("preop-low-at")!, {
      bootstrap: 0,
      overrides: [
        { which: "vt1", vo2MlMin: vt1, reason: "V-slope corner confirmed by eye", by: "reviewer" },
        { which: "vt2", vo2MlMin: vt2, reason: "VE/VCO2 upturn confirmed", by: "reviewer" },
      ],
    });
    expect(codes(after, "warning")).not.toContain("vt1-low-confidence");
    expect(codes(after, "warning")).not.toContain("vt2-low-confidence");
    const info = after.issues.filter((i) => i.code.endsWith("-set-by-review")).map((i) => i.message);
    expect(info).toHaveLength(2);
    expect(info[0]).toMatch(/^The automatic VT1 \(anaerobic threshold\) was uncertain \(.+\); VT1 was set by the reviewer\.$/);
    expect(info[1]).toMatch(
      /^The automatic VT2 \(respiratory compensation point\) was uncertain \(.+\); VT2 was set by the reviewer\.$/,
    );
    expect(after.issues.map((i) => i.message).join(" ")).not.toMatch(/confirm or set it by review/);
    expect(info.join(" ")).not.toMatch(/by review/);
  });
});

describe("heart-failure demo: prognostic markers in the conclusion", () => {
  it("names the adverse rows of the prognostic table the conclusion does not already state", () => {
    const r = results.get("heart-failure")!;
    const concl = r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs.join("\n");
    // the INVENTED demo has oscillatory ventilation and a resting PETCO2 below 33 mmHg (EACPR/AHA 2012, recalled)
    expect(concl).toMatch(/markers outside the favourable band: .*Exercise oscillatory ventilation: EOV present/);
    expect(concl).toMatch(/Resting PETCO2 < 33 mmHg/);
    // Weber and ventilatory class are stated once each
    expect(concl.match(/Ventilatory class III/g)).toHaveLength(1);
  });
});
