/**
 * Readings an uncertainty band would turn are said in the conclusion (INVENTED demo cases):
 * - an MVV estimated from FEV1: both multipliers in use, × 35 and × 40 (Otto-Yáñez et al. 2020, Front Physiol —
 *   confirmed, compares them), give the breathing-reserve values at the band's ends; the ventilatory-limitation case read
 *   with FEV1 alone (1.4 L: MVV 49 or 56 L/min) gives VE/MVV ≥ 85 % (ERS 2019 cut-off, confirmed) at × 35 only;
 * - a leading pattern one of whose findings the VT1 band reverses says so beside it.
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { composeDraft, interpret } from "../../lib/interpret";
import { caseRecord } from "../fixtures/caseRecord";

const conclusionOf = (r: ReturnType<typeof analyse>) => r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs;

describe("borderline readings in the conclusion (invented demo cases)", () => {
  it("an estimated MVV that one multiplier reads as ventilatory limitation is said, with both MVVs", async () => {
    const rec = await caseRecord("ventilatory-limitation");
    const estimated = analyse({ ...rec, spirometry: { fev1L: 1.4 } }, {});
    const lines = conclusionOf(estimated);
    expect(lines.join(" ")).toMatch(
      /Breathing reserve is borderline: the MVV estimated from FEV1 \(49 L\/min at × 35, 56 L\/min at × 40; measure MVV\) reaches "breathing reserve exhausted: ventilatory limitation" \(by Peak VE\/MVV 91 % ≥ 85 %\)\./,
    );
    const step = estimated.interpretation.path.steps.find((s) => s.title === "Breathing reserve")!;
    expect(step.borderline).toMatch(/MVV estimated from FEV1/);
    // the step-by-step section says it beside the step's finding, not only the conclusion
    const pathway = estimated.draft.sections.find((s) => s.id === "pathway")!.paragraphs.join(" ");
    expect(pathway).toMatch(/Breathing reserve: [^.]*; borderline: the MVV estimated from FEV1/);
    // with the measured MVV there is no estimate to doubt
    const measured = analyse(rec, {});
    expect(conclusionOf(measured).join(" ")).not.toMatch(/MVV estimated/);
    expect(measured.interpretInput.uncertainty?.some((u) => u.words.startsWith("MVV estimated"))).toBe(false);
  });

  it("a leading pattern whose finding the VT1 band reverses carries it on its conclusion line", async () => {
    const r = analyse(await caseRecord("heart-failure"), {});
    const leading = r.interpretation.patterns.find((p) => p.support === "strong" || p.support === "moderate")!;
    expect(leading.borderline).toMatch(/^the VT1 band \d+–\d+ mL\/min gives "/);
    const line = conclusionOf(r).find((l) => l.startsWith(leading.statement))!;
    expect(line).toContain(`Read with: ${leading.borderline}.`);
    // the same band is not said twice from the stepwise reading
    expect(conclusionOf(r).filter((l) => l.includes("the VT1 band")).length).toBe(1);
  });

  it("a normal test has no borderline pattern line", async () => {
    const r = analyse(await caseRecord("normal-adult"), {});
    expect(conclusionOf(r).join(" ")).not.toMatch(/borderline|Read with: the/);
  });
});

describe("patterns with equal support all reach the conclusion (invented demo cases)", () => {
  it("pre-operative case: two patterns at moderate support are both stated, not ranked apart on their scores", async () => {
    const r = analyse(await caseRecord("preop-low-at"), {});
    const moderate = r.interpretation.patterns.filter((p) => p.support === "moderate");
    expect(moderate.length).toBeGreaterThanOrEqual(2);
    const text = conclusionOf(r).join(" ");
    expect(text).toContain(moderate[0].statement);
    for (const p of moderate.slice(1))
      expect(text).toContain(p.statement.replace(/^The findings are consistent with/, "They are equally consistent with"));
  });

  it("deconditioning ('no sign of a specific disease') says when another limitation also has support", async () => {
    const r = analyse(await caseRecord("deconditioning"), {});
    expect(r.interpretation.patterns[0].patternId).toBe("deconditioning");
    // as recorded, the PETCO2 rise to VT1 is normal (5.2 mmHg), which weighs against a cardiovascular limitation: no
    // other pattern reaches moderate support and none is said to fit
    expect(r.interpretation.patterns.slice(1).some((p) => p.support === "moderate" || p.support === "strong")).toBe(false);
    expect(conclusionOf(r).join(" ")).not.toContain("also fits");
    // INVENTED alteration: the same test with a rise of 1 mmHg (a heart-failure marker) gives the cardiovascular pattern
    // moderate support beside deconditioning, and the conclusion says it also fits
    const input = { ...r.interpretInput, values: { ...r.interpretInput.values, petco2RiseMmHg: 1 } };
    const i2 = interpret(input);
    const lead = i2.patterns[0];
    expect(lead.patternId).toBe("deconditioning");
    const other = i2.patterns.find((p) => p !== lead && (p.support === "moderate" || p.support === "strong"))!;
    expect(other.patternId).toBe("cardiovascular");
    expect(
      composeDraft(input, i2)
        .sections.find((x) => x.id === "conclusion")!
        .paragraphs.join(" "),
    ).toContain(`${other.label} (${other.support} support) also fits, so a specific cause is not excluded.`);
  });
});

describe("the effort line under a heart-failure referral (invented demo case)", () => {
  it("'maximal' by peak RER > 1.05 (Radtke 2019, confirmed) says the prognostic scheme's stricter RER ≥ 1.10 (JACC HF 2020, confirmed)", async () => {
    const r = analyse(await caseRecord("heart-failure"), {});
    expect(r.interpretation.effort.verdict).toBe("maximal");
    const effort = r.draft.sections.find((s) => s.id === "conduct")!.paragraphs.find((p) => p.startsWith("Effort:"))!;
    expect(effort).toMatch(
      /^Effort: Maximal effort \(peak RER criterion met\)\. For the Heart-failure prognostic [^:]+: Peak RER < 1\.10: read peak VO2 with caution\./,
    );
    // the band's end is quoted, not run into the sentence
    expect(effort).toMatch(
      /Near a cut-off: the peak RER [\d.]+–[\d.]+ \(±2 standard errors over its window\) reaches "Maximal effort not demonstrated/,
    );
    // a general referral has no such scheme
    const general = analyse({ ...(await caseRecord("heart-failure")), referral: "general" }, {});
    const line = general.draft.sections.find((s) => s.id === "conduct")!.paragraphs.find((p) => p.startsWith("Effort:"))!;
    expect(line).not.toMatch(/For the Heart-failure/);
  });
});

describe("a heart-rate recovery whose scatter spans the cut-off (invented demo case)", () => {
  it("is shown with its value as borderline, not hidden, and not read against the 12-bpm cut-off (Cole 1999, confirmed)", async () => {
    const r = analyse(await caseRecord("heart-failure"), {});
    const hrr = r.indices.heartRate;
    // this demo's recovery (about 12.7 bpm) lies within its breath scatter of the cut-off
    expect(hrr.recovery1MinAbnormal).toBeNull();
    expect(r.interpretInput.values.hrr1Bpm).toBeCloseTo(hrr.recovery1MinBpm.value!, 9);
    expect(r.interpretInput.notRead?.hrr1Bpm).toMatch(/^borderline: .* spans the 12-bpm cut-off/);
    const hrLine = r.draft.sections.find((s) => s.id === "results")!.paragraphs.find((p) => p.startsWith("Peak heart rate"))!;
    expect(hrLine).toMatch(/recovery at 1 min \d+ bpm \(borderline: /);
  });
});

describe("a threshold moved by breaths set aside by review (invented demo case)", () => {
  it("is said with both values when it moves more than 5 % (our choice), even from a span outside its 60-s reach", async () => {
    const rec = await caseRecord("normal-adult");
    const base = analyse(rec, {});
    const t1 = base.thresholds.vt1.timeS!;
    const before = base.thresholds.vt1.vo2MlMin.value!;
    const r = analyse(rec, { conditioning: { setAside: [{ startS: t1 + 45, endS: t1 + 75, reason: "cough" }] } });
    const after = r.thresholds.vt1.vo2MlMin.value!;
    const moved = r.issues.find((i) => i.code === "vt1-moved-by-set-aside");
    // the warning follows the measured move either way: said exactly when it exceeds 5 % of the value without the span
    expect(Boolean(moved)).toBe(Math.abs(after - before) > 0.05 * before);
    expect(Math.abs(after - before) / before).toBeGreaterThan(0.05);
    expect(moved!.message).toContain(`VT1 moved from ${Math.round(before)} to ${Math.round(after)} mL/min`);
    // a heart-rate span leaves the gas values, and the thresholds, where they were
    const hr = analyse(rec, {
      conditioning: { setAside: [{ startS: t1 + 45, endS: t1 + 75, reason: "lead off", channel: "heart-rate" }] },
    });
    expect(hr.issues.map((i) => i.code)).not.toContain("vt1-moved-by-set-aside");
    expect(hr.thresholds.vt1.vo2MlMin.value).toBe(before);
  });
});
