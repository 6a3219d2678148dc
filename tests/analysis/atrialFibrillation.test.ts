/**
 * Atrial fibrillation entered with the patient (INVENTED demo case): the ventricular rate is irregular and not set by the
 * sinus node, so heart rate against an age-predicted maximum, heart-rate reserve, chronotropic index, heart-rate
 * recovery and O2 pulse are not interpreted (common practice); the values stay on show with a note.
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { ATRIAL_FIBRILLATION_HR_NOTE } from "../../lib/interpret";
import { caseRecord } from "../fixtures/caseRecord";

describe("atrial fibrillation (invented demo case)", () => {
  it("heart-rate criteria, indices and O2 pulse leave the interpretation, with the reason; the measured values stay", async () => {
    const sinus = await caseRecord("heart-failure");
    const af = { ...sinus, patient: { ...sinus.patient, betaBlocker: false, atrialFibrillation: true } };
    const a = analyse(af, {});
    const b = analyse({ ...sinus, patient: { ...sinus.patient, betaBlocker: false } }, {});
    // the same measurements
    expect(a.indices.heartRate.chronotropicIndex.value).toBe(b.indices.heartRate.chronotropicIndex.value);
    // none of the heart-rate readings is assessed in atrial fibrillation
    const rules = a.interpretation.path.steps.flatMap((s) => s.checks);
    for (const id of ["hr-reached", "chronotropic-incompetence", "hrr1-abnormal", "o2pulse-low", "o2pulse-flat"]) {
      const r = rules.find((c) => c.ruleId === id);
      if (r) expect(r.outcome, id).toBeNull();
    }
    expect(a.interpretation.effort.criteria.find((c) => c.ruleId === "hr-reached")!.text).toMatch(/atrial fibrillation/);
    // in sinus rhythm the same test reads them
    expect(b.interpretation.path.steps.flatMap((s) => s.checks).find((c) => c.ruleId === "o2pulse-low")!.outcome).not.toBeNull();
    const text = a.draft.sections.flatMap((s) => s.paragraphs).join("\n");
    expect(text).toContain(ATRIAL_FIBRILLATION_HR_NOTE);
    expect(text).toMatch(/Peak O2 pulse .*\(atrial fibrillation: not interpreted\)/);
    // the effort line carries its near-cut-off note (peak RER 1.06 with ±2 SE reaching 1.01–1.10)
    expect(text).toMatch(/Effort: .*? Near a cut-off: /);
  });

  it("the drafted prescription gives no heart-rate targets in atrial fibrillation; the work-rate ranges stay", async () => {
    const sinus = await caseRecord("preop-low-at");
    const rx = (r: ReturnType<typeof analyse>) => r.draft.sections.find((s) => s.id === "prescription")!.paragraphs.join("\n");
    expect(rx(analyse(sinus, {}))).toMatch(/heart rate up to \d+ bpm/);
    const af = rx(analyse({ ...sinus, patient: { ...sinus.patient, atrialFibrillation: true } }, {}));
    expect(af).not.toMatch(/heart rate (up to|from|\d)/);
    expect(af).toMatch(/work rate up to \d+ W/);
    expect(af).toMatch(/in atrial fibrillation heart rate is not given as a training target/);
  });
});
