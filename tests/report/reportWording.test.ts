import { describe, expect, it } from "vitest";
import { analyse, buildRecord, type AnalysisSettings } from "../../lib/analysis";
import { buildReportModel } from "../../lib/report/buildReportModel";
import { carryForwardDraft } from "../../lib/report/carryForwardDraft";
import { initialDraftSections } from "../../lib/report/initialDraftSections";
import { demoRecord } from "./demoRecord";
import { plainRampCsv } from "../../e2e/fixtures/plain-ramp.csv";

describe("report wording: rounded numbers with units, cut-offs in words, labels instead of field names", async () => {
  const record = await demoRecord("ventilatory-limitation");
  const result = analyse(record);
  const model = buildReportModel(result, record, "Demo (invented)", { status: "draft", sections: initialDraftSections(result) });

  it("writes the interpretation path with display precision, units and clinical signs", () => {
    expect(model.path.length).toBeGreaterThan(2);
    for (const p of model.path) {
      for (const text of [p.value, p.cutoff]) {
        expect(text).not.toMatch(/\d+\.\d{3,}/); // never more than 2 decimals
        expect(text).not.toMatch(/==|>=|<=|!=|\bn\/a\b|\btrue\b|\bfalse\b/);
      }
    }
    const effort = model.path[0];
    // The patient's RER is shown with 2 decimals (the rounding of the analysis' own value).
    const rer = result.indices.peaks.rerMax.value!;
    expect(effort.value).toContain(`Peak RER ${rer.toFixed(2)}`);
    // Peak RER > 1.05: ERS statement, Radtke et al. 2019, Eur Respir Rev 28:180101, Table 3 (confirmed).
    expect(effort.cutoff).toContain("Peak RER > 1.05");
    expect(effort.cutoff).toContain("VO2 plateau present");
    expect(effort.value).toMatch(/Peak HR \d+ % predicted/);
  });

  it("gives heart rates in whole bpm, each source once, and predicted values by their label", () => {
    const hrRows = model.keyValues.filter((r) => /heart|HR/i.test(r.label));
    expect(hrRows.length).toBeGreaterThanOrEqual(3);
    for (const r of hrRows) {
      expect(r.unit).toBe("bpm");
      expect(r.value).toMatch(/^(\d+|not determinable)$/);
    }
    for (const r of [...model.keyValues, ...model.thresholds, ...model.path, ...model.schemes])
      expect(new Set(r.sourceIds).size).toBe(r.sourceIds.length);
    const vo2 = model.keyValues.find((r) => r.label === "Peak VO2")!;
    expect(vo2.note).toMatch(/^predicted peak VO2 by Hansen, Sue & Wasserman 1984/);
    const internal = /\b(vo2PeakMlMin|vo2PeakMlKgMin|workMaxW|hrMaxBpm|o2PulseMaxMlBeat|veVco2NadirRatio|mvvLMin)\b/;
    for (const line of [...model.methods, ...model.keyValues.map((r) => r.note ?? "")]) expect(line).not.toMatch(internal);
    expect(model.methods.join(" ")).toContain("predicted maximal heart rate by");
    const vt1 = model.thresholds.find((t) => t.label === "VT1 (AT)")!;
    if (/\bHR \d/.test(vt1.note ?? "")) expect(vt1.note).toMatch(/\bHR \d+ bpm/);
  });
});

describe("carryForwardDraft (synthetic ramp, known by construction)", async () => {
  // e2e/fixtures/plain-ramp.csv.ts: VO2 500 → 2500 mL/min, man 50 y 175 cm 80 kg (invented).
  const bytes = new TextEncoder().encode(plainRampCsv());
  const record = (
    await buildRecord({
      bytes,
      fileName: "plain-ramp.csv",
      patient: { sex: "male", ageY: 50, heightCm: 175, weightKg: 80 },
      ergometer: "cycle",
    })
  ).record!;
  const before = analyse(record);
  const override: AnalysisSettings = {
    overrides: [{ which: "vt1", vo2MlMin: 1500, reason: "set by hand (test)", by: "tester", atIso: "2026-01-01T00:00:00.000Z" }],
  };
  const after = analyse(record, override);

  it("carries the reviewer's conclusion into the new draft and lists the threshold that changed", () => {
    const generated = initialDraftSections(before);
    const edited = generated.map((s) =>
      s.id === "conclusion" ? { ...s, paragraphs: ["Reviewer's own conclusion (test)."] } : s,
    );
    const out = carryForwardDraft({ reportId: 11, version: 1, status: "draft", sections: edited }, before, after, record);
    const conclusion = out.sections.find((s) => s.id === "conclusion")!;
    expect(conclusion.paragraphs).toEqual(["Reviewer's own conclusion (test)."]);
    expect(conclusion.recheck).toBeDefined();
    // The override set VT1 to 1500 mL/min (by construction of the settings above).
    expect(conclusion.recheck!.changes.some((c) => /^VT1 \(AT\): .* → 1500 mL\/min/.test(c))).toBe(true);
    expect(conclusion.recheck!.generated).toEqual(initialDraftSections(after).find((s) => s.id === "conclusion")!.paragraphs);
    // Sections the reviewer did not edit take the text generated from the new numbers.
    const thresholds = out.sections.find((s) => s.id === "thresholds")!;
    expect(thresholds.recheck).toBeUndefined();
    expect(thresholds.paragraphs.join(" ")).toContain("1500 mL/min");
    expect(out.carried).toEqual([conclusion.title]);
  });
});
