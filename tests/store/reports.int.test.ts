import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { closeDb, getDb } from "../../lib/store/db";
import {
  getOrCreateDraft,
  getReport,
  listReports,
  reportStanding,
  reportStandings,
  saveDraft,
  signReport,
  standingWords,
} from "../../lib/store/reports";
import { latestSettings, listAudit, saveAnalysisVersion, saveTest } from "../../lib/store/tests";
import type { ReportSection } from "../../lib/report/reportModel";

const initial: ReportSection[] = Object.freeze([
  Object.freeze({ id: "summary", title: "Summary", paragraphs: Object.freeze(["Placeholder."]) as string[] }),
]) as ReportSection[];

function newTestWithAnalysis(): { testId: number; analysisId: number } {
  const testId = saveTest({ uploadId: null, label: "Store test (invented)", record: null, columns: [], issues: [] });
  saveAnalysisVersion(testId, {}, "0.0.0-test", "tester");
  return { testId, analysisId: latestSettings(testId)!.id };
}

describe("report drafts and signatures (SQLite in memory)", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("creates one draft per test and analysis version and returns it again", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    const a = getOrCreateDraft(testId, analysisId, initial);
    const b = getOrCreateDraft(testId, analysisId, [{ id: "x", title: "X", paragraphs: [] }]);
    expect(a).toMatchObject({ status: "draft", version: 1, sections: initial, signedBy: null });
    expect(b.id).toBe(a.id);
    expect(b.sections).toEqual(initial);
    expect(listAudit(testId).map((e) => e.action)).toContain("report-draft-created");
  });

  it("saves edited text in place while draft", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    const draft = getOrCreateDraft(testId, analysisId, initial);
    const edited = [{ id: "summary", title: "Summary", paragraphs: ["Edited by the reviewer.", "Second paragraph."] }];
    const saved = saveDraft(draft.id, edited, "reviewer");
    expect(saved).toMatchObject({ id: draft.id, status: "draft", sections: edited });
    expect(listReports(testId)).toHaveLength(1);
    expect(saveDraft(9999, edited, "reviewer")).toBeNull();
  });

  it("says where each test's report stands: none, draft, signed, and a draft that revises a signed version", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    expect(standingWords(reportStandings().get(testId))).toBe("no report yet");
    const v1 = getOrCreateDraft(testId, analysisId, initial);
    expect(standingWords(reportStandings().get(testId))).toBe("draft version 1, not signed");
    signReport(v1.id, "Dr A Example", "Reviewed.");
    expect(standingWords(reportStandings().get(testId))).toBe("signed (version 1, Dr A Example)");
    expect(reportStanding(testId)).toEqual(reportStandings().get(testId));
    // editing the signed version's text makes version 2, a draft that revises it
    saveDraft(v1.id, [{ ...initial[0], paragraphs: ["Edited after signing (invented)."] }, ...initial.slice(1)], "reviewer");
    expect(listReports(testId)).toHaveLength(2);
    expect(standingWords(reportStandings().get(testId))).toBe("draft version 2, not signed (revises signed version 1)");
    // a new analysis version (inputs corrected) leaves the newest report behind until the report page makes a new draft
    saveAnalysisVersion(testId, {}, "0.0.0-test", "tester", "weight corrected (invented)");
    expect(standingWords(reportStandings().get(testId))).toBe(
      "draft version 2, not signed; the analysis has changed since: open the report to review a new draft",
    );
  });

  it("a signature made while signed in keeps the account with it, and the audit names the account", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    const draft = getOrCreateDraft(testId, analysisId, initial);
    expect(signReport(draft.id, "Dr A Example", "Reviewed.", undefined, undefined, "aexample").ok).toBe(true);
    expect(getReport(draft.id)).toMatchObject({ status: "signed", signedBy: "Dr A Example", signerAccount: "aexample" });
    expect(listAudit(testId).find((a) => a.action === "report-signed")?.actor).toBe("aexample");
  });

  it("signing records signer, time and attestation, and makes the version immutable", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    const draft = getOrCreateDraft(testId, analysisId, initial);
    const res = signReport(draft.id, "Dr A Example", "I have reviewed the data and the text.");
    expect(res.ok).toBe(true);
    const signed = getReport(draft.id)!;
    expect(signed).toMatchObject({
      status: "signed",
      signedBy: "Dr A Example",
      attestation: "I have reviewed the data and the text.",
    });
    expect(Number.isNaN(Date.parse(signed.signedAt!))).toBe(false);
    expect(signed.signerAccount).toBeNull();
    // Signing twice is refused with a reason, not an exception.
    const again = signReport(draft.id, "Someone Else", "x");
    expect(again.ok).toBe(false);
    // The database itself refuses to change or delete a signed version (migration 2 triggers).
    expect(() => getDb().prepare("update reports set draft_json = '{}' where id = ?").run(draft.id)).toThrow(/immutable/);
    // nor an entry of the audit trail (migration 7)
    expect(() => getDb().prepare("delete from audit").run()).toThrow(/append-only/);
    expect(() => getDb().prepare("update audit set actor = 'someone else'").run()).toThrow(/append-only/);
    expect(() => getDb().prepare("delete from reports where id = ?").run(draft.id)).toThrow(/cannot be deleted/);
    expect(getReport(draft.id)!.signedBy).toBe("Dr A Example");
    expect(listAudit(testId).find((e) => e.action === "report-signed")?.actor).toBe("Dr A Example");
  });

  it("editing a signed report creates a new draft version and keeps the signed one", () => {
    const { testId, analysisId } = newTestWithAnalysis();
    const draft = getOrCreateDraft(testId, analysisId, initial);
    signReport(draft.id, "Dr A Example", "Reviewed.");
    const revised = [{ id: "summary", title: "Summary", paragraphs: ["Corrected text."] }];
    const next = saveDraft(draft.id, revised, "reviewer")!;
    expect(next.id).not.toBe(draft.id);
    expect(next).toMatchObject({ status: "draft", version: 2, sections: revised, signedBy: null, analysisId });
    expect(getReport(draft.id)).toMatchObject({ status: "signed", sections: initial, version: 1 });
    // The current report is now the new draft.
    expect(getOrCreateDraft(testId, analysisId, initial).id).toBe(next.id);
    expect(listReports(testId).map((r) => [r.version, r.status])).toEqual([
      [2, "draft"],
      [1, "signed"],
    ]);
    expect(listAudit(testId).map((e) => e.action)).toContain("report-revised");
  });
});
