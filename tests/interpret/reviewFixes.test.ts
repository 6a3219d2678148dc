/**
 * Agreement between the parts of one interpretation: the limitation patterns and the conclusion, the effort
 * verdict and its criteria, the step titles and their text, and the threshold wording of the draft.
 * Inputs are INVENTED (tests/interpret/helpers.ts baseInput: a maximal test with nothing abnormal) and the six
 * INVENTED demo cases (tests/fixtures/cases, made by the synthetic generator).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { analyse, type AnalysisResult } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";
import { composeDraft, interpret } from "../../lib/interpret";
import { vo2PlateauPresent } from "../../lib/thresholds";
import { baseInput } from "./helpers";

const section = (d: ReturnType<typeof composeDraft>, id: string) => d.sections.find((s) => s.id === id)!.paragraphs.join(" ");

describe("patterns agree with the conclusion on a normal study", () => {
  // Haemoglobin not measured (as on the demo cases): the anaemia pattern's key finding is missing.
  const input = baseInput({}, { patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 75, betaBlocker: false } });
  const r = interpret(input);

  it("the flow ends with no limitation and no pattern is stated as a finding", () => {
    expect(r.path.end?.key).toBe("normal");
    expect(r.patterns.filter((p) => ["strong", "moderate", "weak"].includes(p.support))).toEqual([]);
    const d = composeDraft(input, r);
    expect(section(d, "patterns")).toBe("No limitation pattern is supported by the data available.");
    expect(section(d, "conclusion")).toMatch(/^No exercise limitation identified\./);
    expect(section(d, "patterns")).not.toMatch(/consistent with a limitation of oxygen-carrying capacity/);
  });

  it("anaemia: peak VO2 normal is a key feature against it (ATS/ACCP 2003 patterns table, anaemia row: peak VO2 reduced; recalled)", () => {
    const a = r.patterns.find((p) => p.patternId === "anaemia")!;
    expect(a.support).toBe("not-supported");
    expect(a.against.find((f) => f.ruleId === "peak-vo2-reduced")?.key).toBe(true);
  });

  it("a pattern whose key findings are all missing is not assessable, whatever the other findings (obesity without BMI)", () => {
    const noBody = baseInput({}, { patient: { sex: "male", ageY: 45, betaBlocker: false } });
    const o = interpret(noBody).patterns.find((p) => p.patternId === "obesity")!;
    // Features for it (peak VO2 normal, VT1 not low, slope not high…) are present, but BMI is not.
    expect(o.for.length).toBeGreaterThan(0);
    expect(o.support).toBe("not-assessable");
    expect(o.supportNote).toMatch(/BMI/);
  });

  it("weak support is kept when the flow finds a limitation (anaemia with Hb missing on a reduced study)", () => {
    const reduced = baseInput(
      { peakVo2PctPred: 60, vt1PctPredPeakVo2: 35, o2PulsePctPred: 70 },
      { patient: { sex: "male", ageY: 45, heightCm: 178, weightKg: 75, betaBlocker: false } },
    );
    const rr = interpret(reduced);
    expect(rr.path.end?.severity).toBeGreaterThan(0);
    expect(rr.patterns.find((p) => p.patternId === "anaemia")!.support).toBe("weak");
  });
});

describe("text without doubled labels", () => {
  const input = baseInput({ vo2Plateau: false });
  const r = interpret(input);

  it("effort text is the criteria only; the verdict label is not repeated", () => {
    expect(r.effort.label).toBe("Maximal effort (peak RER criterion met)");
    expect(r.effort.text.startsWith(r.effort.label)).toBe(false);
    expect(`${r.effort.label}. ${r.effort.text}`).not.toMatch(/Maximal effort \(peak RER criterion met\)[.:]? Maximal effort/);
    expect(r.effort.text).toMatch(/^Peak RER 1\.15 > 1\.05 → Peak RER at maximal-effort level; /);
  });

  it("a step's text does not start with its title", () => {
    for (const s of r.path.steps) expect(s.text.startsWith(s.title), s.nodeId).toBe(false);
    const effortStep = r.path.steps[0];
    expect(`${effortStep.title}: ${effortStep.text}`).not.toMatch(/Test validity and effort: Test validity and effort/);
  });

  it("the draft says each label once", () => {
    const d = composeDraft(input, r);
    const all = d.sections.flatMap((s) => s.paragraphs).join("\n");
    expect(all).not.toMatch(/Test validity and effort: Test validity and effort/);
    expect(all.match(/Maximal effort \(peak RER criterion met\)/g)).toHaveLength(1);
  });
});

describe("threshold wording in the draft", () => {
  const input = baseInput();
  const r = interpret(input);
  const thr = (vt1: string) => section(composeDraft(input, r, { thresholdMethods: { vt1 } }), "thresholds");

  it("an overridden VT1 reads 'was set by the reviewer (name): reason'", () => {
    const t = thr("set by the reviewer (Dr A. Example): V-slope break hidden by noise; VE/VO2 nadir used.");
    expect(t).toMatch(/VT1 was set by the reviewer \(Dr A\. Example\): V-slope break hidden by noise; VE\/VO2 nadir used\./);
    expect(t).not.toMatch(/found by set by/);
  });
  it("a method reads 'was found by …'; not determinable reads 'was not determinable: …'", () => {
    expect(thr("consensus of V-slope, ventilatory equivalents (confidence high)")).toMatch(
      /VT1 was found by consensus of V-slope, ventilatory equivalents \(confidence high\)\./,
    );
    expect(thr("not determinable: no method gave an estimate")).toMatch(/VT1 was not determinable: no method gave an estimate\./);
  });
});

describe("the effort check and the interpretation read one plateau determination", () => {
  // INVENTED demo case (tests/fixtures/cases/normal-adult: synthetic generator, no plateau built in).
  let result: AnalysisResult;
  beforeAll(async () => {
    result = analyse(await caseRecord("normal-adult"));
  }, 60_000);

  it("demo test 1: no plateau in the criteria set, and the interpretation given that value says the same", () => {
    const present = vo2PlateauPresent(result.indices.vo2FinalIncrease);
    expect(present).toBe(false);
    expect(result.indices.effort.metIds).not.toContain("vo2-plateau-2-ml-kg");
    const input = { ...result.interpretInput, values: { ...result.interpretInput.values, vo2Plateau: present } };
    const plateauRule = interpret(input).effort.criteria.find((c) => c.ruleId === "vo2-plateau")!;
    expect(plateauRule.outcome).toBe(false);
    expect(plateauRule.text).toMatch(/No VO2 plateau/);
  });
});
