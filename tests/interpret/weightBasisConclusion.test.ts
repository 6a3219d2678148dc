import { describe, expect, it } from "vitest";
import { composeDraft, interpret } from "../../lib/interpret";
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
