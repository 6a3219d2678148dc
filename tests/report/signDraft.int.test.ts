import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { closeDb } from "../../lib/store/db";
import { getOrCreateDraft, getReport, saveDraft } from "../../lib/store/reports";
import { latestSettings, listAudit, saveAnalysisVersion, saveTest } from "../../lib/store/tests";
import type { ReportSection } from "../../lib/report/reportModel";
import { readSignForm } from "../../app/tests/[id]/report/schemas";
import { mergeRecheck, signDraft } from "../../app/tests/[id]/report/signDraft";

// INVENTED report text (not patient data).
const generated: ReportSection[] = [
  { id: "results", title: "Results", paragraphs: ["Peak VO2 1284 mL/min."] },
  { id: "conclusion", title: "Conclusion", paragraphs: ["Generated conclusion."] },
];

function newDraft(sections: ReportSection[] = generated) {
  const testId = saveTest({ uploadId: null, label: "Sign test (invented)", record: null, columns: [], issues: [] });
  saveAnalysisVersion(testId, {}, "0.0.0-test", "tester");
  const analysisId = latestSettings(testId)!.id;
  return { testId, analysisId, draft: getOrCreateDraft(testId, analysisId, sections) };
}

/** The sign form as the browser sends it: the on-screen text in hidden fields. */
function signForm(testId: number, reportId: number, texts: Record<string, string>, extra: Record<string, string> = {}) {
  const form = new FormData();
  form.set("testId", String(testId));
  form.set("reportId", String(reportId));
  for (const s of generated) {
    form.set(`title:${s.id}`, s.title);
    form.set(`section:${s.id}`, texts[s.id]);
  }
  form.set("signer", "Dr A Example");
  form.set("attest", "on");
  for (const [k, v] of Object.entries(extra)) form.set(k, v);
  return form;
}

/** What the server action does with the form: read it as the action does (`readSignForm`), then `signDraft`. */
function submit(form: FormData) {
  const { input, error } = readSignForm(form);
  if (!input) throw error;
  return signDraft(input);
}

describe("signDraft: what is signed is exactly the text on screen (SQLite in memory)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("saves unsaved on-screen edits and signs that text in one step", () => {
    const { testId, draft } = newDraft();
    // The reviewer typed a new conclusion and never pressed "Save draft".
    const onScreen = {
      results: "Peak VO2 1284 mL/min.",
      conclusion: "Reviewer's conclusion, typed but not saved.\n\nSecond paragraph.",
    };
    const res = submit(signForm(testId, draft.id, onScreen));
    expect(res.ok).toBe(true);
    const signed = getReport(draft.id)!;
    expect(signed.status).toBe("signed");
    expect(signed.sections.find((s) => s.id === "conclusion")!.paragraphs).toEqual([
      "Reviewer's conclusion, typed but not saved.",
      "Second paragraph.",
    ]);
    expect(res.ok && res.textSaved).toBe(true);
    const actions = listAudit(testId).map((a) => a.action);
    expect(actions.slice(0, 2)).toEqual(["report-signed", "report-draft-saved"]);
  });

  it("signs without a new save when the on-screen text is the stored text", () => {
    const { testId, draft } = newDraft();
    const res = submit(signForm(testId, draft.id, { results: "Peak VO2 1284 mL/min.", conclusion: "Generated conclusion." }));
    expect(res).toMatchObject({ ok: true, textSaved: false });
    expect(getReport(draft.id)!.sections).toEqual(generated);
    expect(listAudit(testId).map((a) => a.action)).not.toContain("report-draft-saved");
  });

  it("refuses, changing nothing, when the analysis changed after the page was opened", () => {
    const { testId, draft } = newDraft();
    saveAnalysisVersion(testId, { bootstrap: 5 }, "0.0.0-test", "tester", "VT1 override (test)");
    const res = submit(signForm(testId, draft.id, { results: "x", conclusion: "Edited." }));
    expect(res.ok).toBe(false);
    expect(!res.ok && res.errors.form).toMatch(/analysis of this test changed/);
    expect(getReport(draft.id)).toMatchObject({ status: "draft", sections: generated });
  });

  it("refuses while a carried-forward section is not re-checked, and rolls back the on-screen save", () => {
    const note = {
      fromVersion: 1,
      fromReportId: 1,
      reason: "Written for an earlier analysis.",
      changes: ["VT1 (AT): 890 mL/min → 1100 mL/min"],
      generated: [],
    };
    const carried: ReportSection[] = [generated[0], { ...generated[1], paragraphs: ["Old conclusion."], recheck: note }];
    const { testId, draft } = newDraft(carried);
    const texts = { results: "Edited results.", conclusion: "Old conclusion." };
    const refused = submit(signForm(testId, draft.id, texts));
    expect(refused.ok).toBe(false);
    expect(!refused.ok && refused.errors.conclusion).toMatch(/Re-check/);
    expect(!refused.ok && refused.errors.form).toMatch(/“Conclusion”/);
    expect(getReport(draft.id)).toMatchObject({ status: "draft", sections: carried }); // nothing saved
    // Ticked as re-checked: signed, and the note is gone from the signed text.
    const ok = submit(signForm(testId, draft.id, texts, { "rechecked:conclusion": "on" }));
    expect(ok.ok).toBe(true);
    const signed = getReport(draft.id)!;
    expect(signed.sections.map((s) => s.recheck)).toEqual([undefined, undefined]);
    expect(signed.sections[0].paragraphs).toEqual(["Edited results."]);
  });

  it("refuses an already signed version with a reason", () => {
    const { testId, draft } = newDraft();
    const texts = { results: "a", conclusion: "b" };
    expect(submit(signForm(testId, draft.id, texts)).ok).toBe(true);
    const again = submit(signForm(testId, draft.id, { results: "c", conclusion: "d" }));
    expect(!again.ok && again.errors.form).toMatch(/already signed by Dr A Example/);
    expect(getReport(draft.id)!.sections[0].paragraphs).toEqual(["a"]);
    // A save on a signed version makes a new draft; the signed text stays.
    const revised = saveDraft(draft.id, generated, "tester")!;
    expect(revised.id).not.toBe(draft.id);
  });

  it("mergeRecheck keeps the server's note unless the reviewer ticked the section", () => {
    const note = { fromVersion: 2, fromReportId: 5, reason: "r", changes: [], generated: [] };
    const stored = [{ ...generated[1], recheck: note }];
    const onScreen = [{ id: "conclusion", title: "Conclusion", paragraphs: ["x"] }];
    expect(mergeRecheck(stored, onScreen, [])[0].recheck).toEqual(note);
    expect(mergeRecheck(stored, onScreen, ["conclusion"])[0].recheck).toBeUndefined();
  });
});
