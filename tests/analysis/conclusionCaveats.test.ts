/**
 * The conclusion's one-line scheme results carry what the sections grading them say (INVENTED demo cases):
 * - heart failure: peak RER 1.06 is short of the RER ≥ 1.10 of a maximal test in heart-failure prognosis (JACC HF 2020,
 *   confirmed; the prognostic table's `rer` axis) beside Weber's peak-VO2 class; the VE/VCO2 slope band's reach into
 *   Arena class IV; survival figures named as the Arena 2007 cohort's (Arena et al. 2007, Circulation, confirmed);
 * - pre-operative: a VT1 of low confidence under every AT-graded category;
 * - pulmonary hypertension: the ESC/ERS 2015 CPET rows, which publish no combined category, are given row by row.
 */
import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";

const conclusion = async (id: string) => {
  const r = analyse(await caseRecord(id), {});
  return { r, lines: r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs };
};

describe("conclusion caveats (invented demo cases)", () => {
  it("heart failure: Weber's class carries peak RER < 1.10 and the VT1 band; Arena's survival is the cohort's", async () => {
    const { r, lines } = await conclusion("heart-failure");
    const rer = r.interpretation.schemes.find((s) => s.schemeId === "hf-prognostic-table")!.axes.find((a) => a.axisId === "rer")!;
    expect(rer.category?.key).toBe("submaximal");
    const weber = lines.find((l) => l.startsWith("Weber class"))!;
    expect(weber).toMatch(/Read with: .*Peak RER < 1\.10: read peak VO2 with caution \(peak RER 1\.0\d\)/);
    // Weber takes the worse of its two classes (peak VO2 and AT, both C here): the VT1 band reaching the better class B
    // cannot change it, so the conclusion does not raise it (the schemes section still shows it)
    const weberScheme = r.interpretation.schemes.find((s) => s.schemeId === "weber")!;
    expect(weberScheme.overallMode).toBe("worst");
    expect(weberScheme.axes.find((a) => a.axisId === "at")!.bandReaches).toMatch(/reaches Class B/);
    expect(weber).not.toMatch(/reaches Class B/);
    const arena = lines.find((l) => l.startsWith("Ventilatory class"))!;
    expect(arena).toMatch(/72\.3 % in the Arena 2007 cohort/);
    expect(arena).toMatch(/Read with: the whole-exercise VE\/VCO2 slope band .* reaches Ventilatory class IV/);
  });

  it("pre-operative: categories graded on a low-confidence VT1 say to confirm it", async () => {
    const { r, lines } = await conclusion("preop-low-at");
    expect(r.thresholds.vt1.confidence).toBe("low");
    for (const name of ["Pre-operative AT (Older 1993)", "Pre-operative three-tier risk scheme"])
      expect(lines.find((l) => l.startsWith(name))).toMatch(/VT1 was found with low confidence: confirm it on review/);
  });

  it("a reviewer's VT1 needs no such caveat", async () => {
    const record = await caseRecord("preop-low-at");
    const auto = analyse(record, {});
    const r = analyse(record, {
      overrides: [
        { which: "vt1", vo2MlMin: auto.thresholds.vt1.vo2MlMin.value!, reason: "checked on the V-slope plot", by: "reviewer" },
      ],
    });
    const lines = r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs;
    expect(lines.join(" ")).not.toMatch(/low confidence/);
  });

  it("pulmonary hypertension: the risk rows reach the conclusion", async () => {
    const { lines } = await conclusion("pulmonary-vascular");
    expect(lines.find((l) => l.startsWith("Pulmonary hypertension risk"))).toMatch(/VE\/VCO2 slope: High risk \(≥ 45\)/);
  });
});

describe("prescription caveats (invented demo cases)", () => {
  it("ramp work rates and low-confidence thresholds are said beside the domains they shape", async () => {
    const preop = analyse(await caseRecord("preop-low-at"), {});
    const rx = preop.draft.sections.find((s) => s.id === "prescription")!.paragraphs.join(" ");
    expect(rx).toMatch(/Work rates are read from the ramp\. VO2 lagged this ramp by about \d+ s/);
    expect(rx).toMatch(/VT1 and VT2 were found with low confidence: confirm on review before prescribing from them\./);
    const normal = analyse(await caseRecord("normal-adult"), {});
    expect(normal.draft.sections.find((s) => s.id === "prescription")!.paragraphs.join(" ")).not.toMatch(/low confidence/);
  });
});

describe("a heart-failure test stopped early (invented demo cut at 760 s)", () => {
  it("Weber by AT carries the peak-VO2 class it could not grade, and Arena the slope's brief-exercise shortfall", async () => {
    const full = await caseRecord("heart-failure");
    const cut = { ...full, table: { ...full.table, rows: full.table.rows.filter((r) => r.timeS <= 760) } };
    const r = analyse(cut, {});
    expect(r.interpretation.effort.peakConclusionsAllowed).toBe(false);
    const lines = r.draft.sections.find((s) => s.id === "conclusion")!.paragraphs;
    expect(lines.find((l) => l.startsWith("Weber class"))).toMatch(/not graded, and able to give a worse class: By peak VO2/);
    // brief, submaximal exercise (briefExercise.ts, measured on invented tests): the slope with its median shortfall undone
    expect(lines.find((l) => l.startsWith("Ventilatory class"))).toMatch(/brief, submaximal exercise reads a median \d+ % low/);
  });
});
