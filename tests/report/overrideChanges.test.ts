import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { carryForwardDraft } from "../../lib/report/carryForwardDraft";
import { describeInterpretationChanges } from "../../lib/report/describeInterpretationChanges";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { demoRecord } from "./demoRecord";

// INVENTED demo case (synthetic generator preset, fixed seed); the override values are chosen relative to the
// automatic VT1 so the expected changes are known by construction.
describe("a reviewer's VT1 override in the report (invented demo case 'pulmonary-vascular')", async () => {
  const record = await demoRecord("pulmonary-vascular");
  const before = analyse(record);
  const auto = before.thresholds.vt1.vo2MlMin.value!;
  const predictedPeak = before.predicted.values.vo2PeakMlMin!.value!;
  // Low VT1: VO2 at VT1 < 40 % of predicted peak VO2 (Hansen, Sue & Wasserman 1984, Am Rev Respir Dis 129:S49;
  // confirmed). The interpretation layer applies that cut-off; this test only reads which side each VT1 falls. Set the override clearly below that line (35 %) and the automatic one above it.
  const low = Math.round(0.35 * predictedPeak);
  const reason = "clear VE/VO2 rise with flat VE/VCO2 at this point";
  const after = analyse(record, {
    overrides: [{ which: "vt1", vo2MlMin: low, reason, by: "Dr Review", atIso: "2026-01-01T00:00:00.000Z" }],
  });

  it("precondition: the automatic VT1 is not low and the override is", () => {
    expect(auto / predictedPeak).toBeGreaterThanOrEqual(0.4);
    expect(after.thresholds.vt1.overridden).toBeDefined();
  });

  it("the Thresholds row names the reviewer and the reason once and shows no detection confidence", () => {
    const model = buildReportModel(after, record, "x", { status: "draft", sections: [] });
    const vt1 = model.thresholds.find((r) => r.label === "VT1 (AT)")!;
    expect(vt1.value).toBe(String(low));
    expect(vt1.method).toBe(`set by the reviewer (Dr Review): ${reason}`);
    const shown = `${vt1.method}. ${vt1.note ?? ""}`;
    expect(shown.split(reason).length - 1).toBe(1);
    expect(shown).not.toMatch(/confidence|band/);
    expect(vt1.note).toContain(`automatic estimate was ${Math.round(auto)} mL/min`);
    expect(vt1.note).toMatch(/HR \d+ bpm/);
  });

  it("lists the changed interpretation step first, then the values, in the carried conclusion's note", () => {
    const changes = describeInterpretationChanges(before, after);
    const step = changes.find((c) => c.startsWith("Interpretation step “Anaerobic threshold (VT1)”: "));
    expect(step).toBe(
      "Interpretation step “Anaerobic threshold (VT1)”: “VT1 not low” → “low VT1: oxygen delivery or utilisation limitation”",
    );
    // The % of predicted peak VO2 the step compared: 100 × VO2 at VT1 / predicted peak VO2, rounded.
    const pctBefore = Math.round((100 * auto) / predictedPeak);
    const pctAfter = Math.round((100 * low) / predictedPeak);
    expect(
      changes.some(
        (c) => c.includes(`VO2 at VT1 ${pctBefore} % of predicted peak VO2`) && c.includes(`→ VO2 at VT1 ${pctAfter} %`),
      ),
    ).toBe(true);
    expect(describeInterpretationChanges(before, before)).toEqual([]);

    const edited = initialDraftSections(before).map((s) =>
      s.id === "conclusion" ? { ...s, paragraphs: ["Mine (invented)."] } : s,
    );
    const out = carryForwardDraft({ reportId: 1, version: 1, status: "draft", sections: edited }, before, after, record);
    const list = out.sections.find((s) => s.id === "conclusion")!.recheck!.changes;
    const iStep = list.indexOf(step!);
    const iRow = list.findIndex((c) => c.startsWith("VT1 (AT): "));
    expect(iStep).toBeGreaterThanOrEqual(0);
    expect(iRow).toBeGreaterThan(iStep);
    // The row lists every displayed value read at the threshold that changed, not only VO2.
    const row = list[iRow];
    expect(row).toMatch(new RegExp(`^VT1 \\(AT\\): ${Math.round(auto)} mL/min → ${low} mL/min, `));
    expect(row).toMatch(/mL\/kg\/min → [\d.]+ mL\/kg\/min/);
    expect(row).toMatch(/% of peak VO2 → \d+ % of peak VO2/);
    expect(row).toMatch(/HR \d+ bpm → HR \d+ bpm/);
    expect(row).toMatch(/\d+ W → \d+ W/);
  });
});
