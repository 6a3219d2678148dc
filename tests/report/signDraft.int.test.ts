import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { closeDb } from "../../lib/store/db";
import { getOrCreateDraft, getReport, saveDraft } from "../../lib/store/reports";
import { getTest, latestSettings, listAudit, renameTest, saveAnalysisVersion, saveTest } from "../../lib/store/tests";
import { labelSchema } from "../../app/schemas";
import type { ReportSection } from "../../lib/report/reportModel";
import { AMENDMENT_REASON_MAX_CHARS, readSignForm } from "../../app/tests/[id]/report/schemas";
import { mergeRecheck, saveDraftChecked, signDraft } from "../../app/tests/[id]/report/signDraft";
import { listReports } from "../../lib/store/reports";

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
  form.set("revision", String(getReport(reportId)?.revision ?? 0)); // the revision the page showed
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

/** A save as the page sends it: the version and revision it showed, and its text (INVENTED). */
function save(testId: number, reportId: number, shownStatus: "draft" | "signed", conclusion: string, revision?: number) {
  return saveDraftChecked({
    testId,
    reportId,
    revision: revision ?? getReport(reportId)!.revision,
    shownStatus,
    sections: [
      { id: "results", title: "Results", paragraphs: ["Peak VO2 1284 mL/min."] },
      { id: "conclusion", title: "Conclusion", paragraphs: [conclusion] },
    ],
    rechecked: [],
    actor: "tester",
  });
}

describe("only the newest version is saved or signed; the sections are the version's own (SQLite in memory)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("two tabs revising one signed report: the second is refused, the first keeps its own draft", () => {
    const { testId, draft } = newDraft();
    expect(submit(signForm(testId, draft.id, { results: "a", conclusion: "b" })).ok).toBe(true);
    const signedRevision = getReport(draft.id)!.revision;
    // tab A revises the signed version: a new draft
    const a = save(testId, draft.id, "signed", "TAB A", signedRevision);
    expect(a.ok && a.newVersion).toBe(true);
    const v2 = a.ok ? a.report : null;
    // tab B, still showing the signed version, is refused: version 2 is newer
    const b = save(testId, draft.id, "signed", "TAB B", signedRevision);
    expect(!b.ok && b.errors.form).toMatch(
      /a newer version of this report was made after this page was opened \(version 2, a draft\)/,
    );
    expect(listReports(testId)).toHaveLength(2);
    // tab A's second save lands in its own draft, which is still the newest
    const a2 = save(testId, v2!.id, "draft", "TAB A again");
    expect(a2.ok).toBe(true);
    expect(getReport(v2!.id)!.sections[1].paragraphs).toEqual(["TAB A again"]);
  });

  it("an amendment is signed only with its reason, as the form sends it; a first signature keeps none", () => {
    const { testId, draft } = newDraft();
    // a first signature: a reason sent by a forged form is not kept (there is nothing to amend)
    expect(submit(signForm(testId, draft.id, { results: "a", conclusion: "b" }, { amendmentReason: "forged" })).ok).toBe(true);
    expect(getReport(draft.id)!.amendment).toBeNull();
    const v2 = save(testId, draft.id, "signed", "corrected conclusion", getReport(draft.id)!.revision);
    expect(v2.ok).toBe(true);
    const id2 = v2.ok ? v2.report.id : 0;
    const texts = { results: "a", conclusion: "corrected conclusion" };
    const none = submit(signForm(testId, id2, texts));
    expect(!none.ok && none.errors.form).toMatch(/replaces version 1, which is signed\. Give the reason for the amendment/);
    // longer than the form allows: refused by the schema, under the field's own key
    const long = readSignForm(signForm(testId, id2, texts, { amendmentReason: "r".repeat(AMENDMENT_REASON_MAX_CHARS + 1) }));
    expect(long.error?.issues.map((i) => i.path[0])).toEqual(["amendmentReason"]);
    // characters the PDF cannot show are refused in the reason as in the text
    const cjk = submit(signForm(testId, id2, texts, { amendmentReason: "typo in 李 (invented)" }));
    expect(!cjk.ok && cjk.errors.form).toMatch(/李 in the reason for the amendment/);
    expect(getReport(id2)!.status).toBe("draft");
    const ok = submit(signForm(testId, id2, texts, { amendmentReason: "  Typo in\r\n the conclusion. " }));
    expect(ok.ok).toBe(true);
    expect(getReport(id2)!.amendment).toEqual({ revisesVersion: 1, reason: "Typo in the conclusion." });
    expect(listAudit(testId)[0].detail).toMatch(/Amends version 1: Typo in the conclusion\.$/);
  });

  it("an older version can be neither saved nor signed once a newer one exists", () => {
    const { testId, draft } = newDraft();
    expect(submit(signForm(testId, draft.id, { results: "a", conclusion: "b" })).ok).toBe(true);
    const v2 = save(testId, draft.id, "signed", "revision");
    expect(v2.ok).toBe(true);
    // a newer analysis made a third version; the page on version 2 can no longer write or sign it
    const v2id = v2.ok ? v2.report.id : 0;
    const newer = getOrCreateDraft(testId, saveNewAnalysis(testId), generated);
    expect(newer.id).not.toBe(v2id);
    const stale = save(testId, v2id, "draft", "late text");
    expect(!stale.ok && stale.errors.form).toMatch(/newer version/);
    const sign = submit(signForm(testId, v2id, { results: "x", conclusion: "y" }));
    expect(!sign.ok && sign.errors.form).toMatch(/Not signed: a newer version/);
  });

  it("a draft signed in another tab is not silently revised by a stale page", () => {
    const { testId, draft } = newDraft();
    const opened = getReport(draft.id)!.revision;
    expect(submit(signForm(testId, draft.id, { results: "a", conclusion: "b" })).ok).toBe(true);
    const stale = save(testId, draft.id, "draft", "typed in the other tab", opened);
    expect(!stale.ok && stale.errors.form).toMatch(
      /this draft was signed after this page was opened \(version 1, signed by Dr A Example/,
    );
    expect(listReports(testId)).toHaveLength(1);
  });

  it("revising a signed version without changing it makes no new version", () => {
    const { testId, draft } = newDraft();
    expect(submit(signForm(testId, draft.id, { results: "Peak VO2 1284 mL/min.", conclusion: "same" })).ok).toBe(true);
    const res = save(testId, draft.id, "signed", "same");
    expect(!res.ok && res.errors.form).toMatch(/Nothing saved: the text is the same as the signed version/);
    expect(listReports(testId)).toHaveLength(1);
  });

  it("a forged form: a missing revision, renamed or dropped sections, unknown ones are refused", () => {
    const { testId, draft } = newDraft();
    const noRevision = signForm(testId, draft.id, { results: "a", conclusion: "b" });
    noRevision.delete("revision");
    expect(readSignForm(noRevision).input).toBeNull();
    // one invented section instead of the version's two
    const forged = signForm(testId, draft.id, { results: "a", conclusion: "b" });
    forged.delete("section:results");
    forged.delete("title:results");
    const r1 = submit(forged);
    expect(!r1.ok && r1.errors.form).toMatch(/the sections sent are not this report's sections \(missing: “Results”\)/);
    const extra = signForm(
      testId,
      draft.id,
      { results: "a", conclusion: "b" },
      { "section:normal": "Normal study.", "title:normal": "X" },
    );
    const r2 = submit(extra);
    expect(!r2.ok && r2.errors.form).toMatch(/not in this report: normal/);
    // a renamed title is not signed: the stored title is kept
    const renamed = signForm(testId, draft.id, { results: "a", conclusion: "b" }, { "title:conclusion": "Conclusion (FORGED)" });
    expect(submit(renamed).ok).toBe(true);
    expect(getReport(draft.id)!.sections.map((x) => x.title)).toEqual(["Results", "Conclusion"]);
  });

  it("a name or text the PDF cannot show is refused before signing, naming the characters", () => {
    const { testId, draft } = newDraft();
    const res = submit(signForm(testId, draft.id, { results: "a", conclusion: "reviewed 🫀" }, { signer: "Dr 李明 Example" }));
    expect(!res.ok && res.errors.form).toMatch(/cannot show 李 明 in the name, or 🫀 in the text/);
    // and says in words what the PDF does print
    expect(!res.ok && res.errors.form).toMatch(
      /prints Latin \(including Central European and Vietnamese\), Greek and Cyrillic letters/,
    );
    expect(!res.ok && res.errors.form).not.toMatch(/Latin letters or/);
    expect(getReport(draft.id)!.status).toBe("draft");
    // an invisible joiner is named by its code point
    const zwj = submit(signForm(testId, draft.id, { results: "a", conclusion: "b" }, { signer: "Dr A‍Example" }));
    expect(!zwj.ok && zwj.errors.form).toMatch(/cannot show U\+200D in the name/);
    // a line break in the name would print a second line under "Signed by": refused
    const newline = submit(
      signForm(testId, draft.id, { results: "a", conclusion: "b" }, { signer: "Dr Nobody\nCountersigned by X" }),
    );
    expect(!newline.ok && newline.errors.form).toMatch(/may not hold line breaks/);
    // the test's label is the report's title on every page: checked too
    const { input } = readSignForm(signForm(testId, draft.id, { results: "a", conclusion: "b" }));
    const label = signDraft(input!, undefined, "Lehrfall 李明 (invented)");
    expect(!label.ok && label.errors.form).toMatch(/李 明 in the test's label \(rename it on the patient page\)/);
    // Central European, Greek and Cyrillic letters print as typed: signed, and stored as typed
    const { testId: t2, draft: d2 } = newDraft();
    expect(submit(signForm(t2, d2.id, { results: "Ελένη", conclusion: "Дмитрий" }, { signer: "Dr Łucja Wójcik" })).ok).toBe(true);
    expect(getReport(d2.id)!.signedBy).toBe("Dr Łucja Wójcik");
    const { testId: t3, draft: d3 } = newDraft();
    expect(submit(signForm(t3, d3.id, { results: "a", conclusion: "b" }, { signer: "Ελένη Παπαδοπούλου" })).ok).toBe(true);
  });

  it("the whole report as signed is kept with the signature, written by the signing statement", () => {
    const { testId, draft } = newDraft();
    const { input } = readSignForm(signForm(testId, draft.id, { results: "a", conclusion: "b" }));
    let seen: { status: string; signedBy: string | null } | null = null;
    const res = signDraft(input!, (signed) => {
      seen = { status: signed.status, signedBy: signed.signedBy };
      return JSON.stringify({ frozen: true, sections: signed.sections });
    });
    expect(res.ok).toBe(true);
    expect(seen).toEqual({ status: "signed", signedBy: "Dr A Example" });
    const stored = getReport(draft.id)!;
    expect(JSON.parse(stored.signedModelJson!)).toEqual({ frozen: true, sections: stored.sections });
    // a refused signature keeps nothing
    const { testId: t2, draft: d2 } = newDraft();
    const bad = signForm(t2, d2.id, { results: "a", conclusion: "b" }, { revision: "7" });
    expect(signDraft(readSignForm(bad).input!, () => "{}").ok).toBe(false);
    expect(getReport(d2.id)!.signedModelJson).toBeNull();
  });
});

/** A second analysis version of the test (as a changed setting makes), returning its id. */
function saveNewAnalysis(testId: number) {
  saveAnalysisVersion(testId, { peakWindowS: 20 }, "0.0.0-test", "tester");
  return latestSettings(testId)!.id;
}

describe("renaming a test (SQLite in memory)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("changes the label, writes the old and new label to the audit, and refuses an unknown test", () => {
    const { testId } = newDraft();
    expect(renameTest(testId, "Teaching case 7 (invented)", "tester")).toBe(true);
    expect(getTest(testId)!.label).toBe("Teaching case 7 (invented)");
    expect(listAudit(testId).find((a) => a.action === "test-renamed")?.detail).toBe(
      "“Sign test (invented)” → “Teaching case 7 (invented)”",
    );
    expect(renameTest(999999, "x", "tester")).toBe(false);
  });

  it("the label schema refuses what the report PDF cannot print and control characters", () => {
    expect(labelSchema.safeParse("Teaching case 7").success).toBe(true);
    const cjk = labelSchema.safeParse("Lehrfall 李明");
    expect(!cjk.success && cjk.error.issues[0].message).toMatch(/cannot show 李 明 in the label/);
    const emoji = labelSchema.safeParse("Stress test 🫀");
    expect(!emoji.success && emoji.error.issues[0].message).toMatch(
      /prints Latin .*, Greek and Cyrillic letters and cannot show 🫀 in the label/,
    );
    for (const ok of ["Próba wysiłkowa (Łódź)", "Εργοσπιρομέτρηση", "Нагрузочный тест", "Terhelés – Győr"])
      expect([ok, labelSchema.safeParse(ok).success]).toEqual([ok, true]);
    expect(labelSchema.safeParse("two\nlines").success).toBe(false);
  });
});
