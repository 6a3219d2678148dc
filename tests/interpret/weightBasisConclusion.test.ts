import { describe, expect, it } from "vitest";
import { composeDraft, conclusionLead, interpret } from "../../lib/interpret";
import { analyse } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";
import { baseInput } from "./helpers";

const conclusion = (d: ReturnType<typeof composeDraft>) => d.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ");

describe("a capacity reduced on one weight basis only says so in the conclusion", () => {
  it("both readings and the basis question, beside the capacity statement (INVENTED input)", () => {
    const input = {
      ...baseInput({ peakVo2PctPred: 84 }),
      weightBasisSplit: { actualPct: 84, idealPct: 106, idealWeightKg: 77.5, reducedOnActual: true },
    };
    const text = conclusion(composeDraft(input, interpret(input)));
    expect(text).toContain(
      "Peak VO2 is 84 % of predicted on actual body weight (reduced) and 106 % on predicted body mass (77.5 kg; not reduced): the reading depends on the weight basis",
    );
    // without the split, no such sentence
    const plain = baseInput({ peakVo2PctPred: 84 });
    expect(conclusion(composeDraft(plain, interpret(plain)))).not.toMatch(/depends on the weight basis/);
  });

  it("reduced on predicted body mass only: the two readings lead, and 'no limitation' is said as the reading on actual weight", () => {
    // INVENTED: FRIEND 2018 reads 94 % on actual weight and 74 % on predicted body mass (review-10 M6 shape)
    const input = {
      ...baseInput({ peakVo2PctPred: 94 }),
      weightBasisSplit: { actualPct: 94, idealPct: 74, idealWeightKg: 64.5, reducedOnActual: false },
    };
    const interpretation = interpret(input);
    expect(interpretation.path.end?.key).toBe("normal");
    const lead = conclusionLead(interpretation, input);
    expect(lead).toEqual([
      "Peak VO2 is 74 % of predicted on predicted body mass (64.5 kg; reduced) but 94 % on actual body weight (not reduced): the reading depends on the weight basis, which the report should state.",
      "On actual body weight: no exercise limitation identified.",
    ]);
    const paragraphs = composeDraft(input, interpretation).sections.find((s) => s.id === "conclusion")!.paragraphs;
    expect(paragraphs.slice(0, 2)).toEqual(lead);
    expect(paragraphs[0]).not.toMatch(/^No exercise limitation/);
    // without a split the end leads as before
    const plain = baseInput({ peakVo2PctPred: 94 });
    expect(conclusionLead(interpret(plain), plain)).toEqual(["No exercise limitation identified."]);
  });

  it("end to end: the INVENTED normal-adult demo given 190 kg at 178 cm (the bases disagree) and 130 kg (they agree)", async () => {
    const base = await caseRecord("normal-adult");
    for (const [weightKg, split] of [
      [190, true],
      [130, false],
    ] as const) {
      const result = analyse({ ...base, patient: { ...base.patient, weightKg } }, { bootstrap: 0 });
      // the note and the conclusion say the same thing: both or neither (found by trying weights on this demo)
      expect(result.issues.some((i) => i.code === "weight-basis-changes-conclusion")).toBe(split);
      const text = result.draft.sections.find((s) => s.id === "conclusion")!.paragraphs.join(" ");
      expect(/depends on the weight basis/.test(text)).toBe(split);
    }
  }, 60_000);
});
