/**
 * A signed report is rebuilt from the record and settings its analysis version pinned, so correcting the test's inputs
 * later (patient details, spirometry, a re-read file) gives a new analysis version and a new draft, never a changed signed
 * report; a draft saved from a page opened before someone else's save is refused; the caution section cannot be signed
 * empty. SQLite in a temporary file; the test is the INVENTED normal-adult demo case (tests/fixtures/cases).
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

import type { TestRecord } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";
import type { ReportSection } from "../../lib/report/reportModel";
import { closeDb } from "../../lib/store/db";
import { getReport, listReports } from "../../lib/store/reports";
import { analysisRecord, getTest, listAnalysisVersions, saveTest, updateTestRecord } from "../../lib/store/tests";
import { updatePatientDetails } from "../../lib/store/updatePatientDetails";
import { freezeReport, loadReport } from "../../app/tests/[id]/report/loadReport";
import { saveDraftAction } from "../../app/tests/[id]/report/actions";
import { DRAFT_CHANGED_ELSEWHERE } from "../../app/tests/[id]/report/schemas";
import { saveDraftChecked, signDraft } from "../../app/tests/[id]/report/signDraft";
import { renderReportPdf } from "../../lib/report/pdf/renderReportPdf";

let dir = "";
let record: TestRecord;

beforeEach(async () => {
  closeDb();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "cpet-pinned-"));
  process.env.CPET_DB = path.join(dir, "test.sqlite");
  record = { ...(await caseRecord("normal-adult")), spirometry: { fev1L: 4.2 } };
});
afterEach(() => {
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
});

/** Sign a report version as a reviewer would from a page that showed `revision`, with `text` changing some sections. */
function signAs(
  testId: number,
  report: { id: number; sections: ReportSection[] },
  revision: number,
  text: (s: ReportSection) => string[] = (s) => s.paragraphs,
) {
  return signDraft({
    testId,
    reportId: report.id,
    revision,
    signer: "Dr A Example",
    attestation: "reviewed",
    sections: report.sections.map((s) => ({ id: s.id, title: s.title, paragraphs: text(s) })),
    rechecked: [],
  });
}

/** A test with its first draft (as opening the report page makes it), signed as shown. */
function signedTest() {
  const testId = saveTest({ uploadId: null, label: "Pinned (invented)", record, columns: [], issues: [] });
  const first = loadReport(testId)!;
  expect(signAs(testId, first.report, first.report.revision).ok).toBe(true);
  return { testId, first };
}

/** The body mass corrected after import, as the patient page does it (a new analysis version; INVENTED values). */
const correctWeight = (testId: number, weightKg: number) =>
  updatePatientDetails(testId, { ...record.patient, weightKg, ergometer: record.ergometer, referral: record.referral }, "tester");

const tables = (r: ReturnType<typeof loadReport>) =>
  JSON.stringify([r!.model.patientLine, r!.model.keyValues, r!.model.thresholds]);

describe("a signed report keeps the record it was signed on", () => {
  it("a corrected body mass makes a new analysis version and draft; the signed version still reads the old mass and values", () => {
    const { testId, first } = signedTest();
    const peakPerKg = first.result!.indices.peaks.vo2MlKgMin.value!;
    const before = listAnalysisVersions(testId).length;
    const weightKg = record.patient.weightKg!;
    const change = correctWeight(testId, weightKg + 15);
    expect(change.ok).toBe(true);
    expect(listAnalysisVersions(testId)).toHaveLength(before + 1); // one version, not two
    const again = loadReport(testId, first.report.id)!;
    expect(again.report.status).toBe("signed");
    expect(again.record!.patient.weightKg).toBe(weightKg);
    expect(again.result!.indices.peaks.vo2MlKgMin.value).toBe(peakPerKg);
    expect(tables(again)).toBe(tables(first));
    const current = loadReport(testId)!;
    expect(current.report.id).not.toBe(first.report.id);
    expect(current.report.status).toBe("draft");
    expect(current.record!.patient.weightKg).toBe(weightKg + 15);
    // the same VO2 over 15 kg more: per kg by weight / (weight + 15), as the arithmetic says
    expect(current.result!.indices.peaks.vo2MlKgMin.value!).toBeCloseTo((peakPerKg * weightKg) / (weightKg + 15), 6);
  });

  it("the reviewer's signed text carried into the new draft lists the values the corrected mass changed", () => {
    const testId = saveTest({ uploadId: null, label: "Carried (invented)", record, columns: [], issues: [] });
    const first = loadReport(testId)!;
    const signed = signAs(testId, first.report, first.report.revision, (s) =>
      s.id === "conclusion" ? ["Reviewer's own conclusion (invented)."] : s.paragraphs,
    );
    expect(signed.ok).toBe(true);
    const weightKg = record.patient.weightKg!;
    correctWeight(testId, weightKg + 15);
    const carried = loadReport(testId)!.report.sections.find((s) => s.id === "conclusion")!;
    expect(carried.paragraphs).toEqual(["Reviewer's own conclusion (invented)."]);
    expect(carried.recheck?.reason).toMatch(/The numbers changed since it was written/);
    expect(carried.recheck?.changes.join("; ")).toMatch(/mL\/kg\/min/);
  });

  it("spirometry entered after signing: the signed breathing reserve stays, the new draft reads the new FEV1", () => {
    const { testId, first } = signedTest();
    const br = first.result!.indices.breathingReserve.reservePercent.value;
    const version = updateTestRecord(testId, { ...record, spirometry: { fev1L: 2.0 } }, "tester", "spirometry updated");
    expect(version).not.toBeNull();
    const signed = loadReport(testId, first.report.id)!;
    expect(signed.result!.indices.breathingReserve.reservePercent.value).toBe(br);
    expect(signed.record!.spirometry?.fev1L).toBe(4.2);
    const current = loadReport(testId)!;
    expect(current.record!.spirometry?.fev1L).toBe(2.0);
    // MVV = FEV1 × 40 (the engine's default; Campbell 1982 — recalled attribution): half the FEV1, a smaller reserve
    expect(current.result!.indices.breathingReserve.reservePercent.value!).toBeLessThan(br!);
    // the new draft carries the reviewer's signed text forward for re-checking
    expect(listReports(testId)).toHaveLength(2);
  });

  it("each version pins its record once per content (a settings-only version shares the snapshot)", () => {
    const { testId, first } = signedTest();
    const v1 = listAnalysisVersions(testId)[0];
    expect(v1.recordSha256).toBe(getTest(testId)!.recordSha256);
    expect(analysisRecord(v1.id)).toEqual(record);
    expect(first.report.analysisId).toBe(v1.id);
  });
});

describe("two pages on one draft", () => {
  const form = (
    testId: number,
    reportId: number,
    revision: number,
    sections: { id: string; title: string; text: string }[],
    shownStatus: "draft" | "signed" = "draft",
  ) => {
    const f = new FormData();
    f.set("testId", String(testId));
    f.set("reportId", String(reportId));
    f.set("revision", String(revision));
    f.set("shownStatus", shownStatus);
    for (const s of sections) {
      f.set(`title:${s.id}`, s.title);
      f.set(`section:${s.id}`, s.text);
    }
    return f;
  };

  it("the second save from a page opened before the first is refused, keeping both texts", async () => {
    const testId = saveTest({ uploadId: null, label: "Two tabs (invented)", record, columns: [], issues: [] });
    const opened = loadReport(testId)!.report; // both tabs show revision 0
    const texts = opened.sections.map((s) => ({ id: s.id, title: s.title, text: s.paragraphs.join("\n\n") }));
    const tabA = texts.map((s) => (s.id === "conclusion" ? { ...s, text: "TAB-A conclusion" } : s));
    const a = await saveDraftAction({}, form(testId, opened.id, opened.revision, tabA));
    expect(a.errors).toBeUndefined();
    expect(a.revision).toBe(opened.revision + 1);
    const tabB = texts.map((s) => (s.id === "referral" ? { ...s, text: "TAB-B referral" } : s));
    const b = await saveDraftAction({}, form(testId, opened.id, opened.revision, tabB));
    expect(b.errors?.form).toBe(DRAFT_CHANGED_ELSEWHERE);
    expect(b.texts?.referral).toBe("TAB-B referral"); // tab B's text comes back to its screen
    const stored = getReport(opened.id)!;
    expect(stored.sections.find((s) => s.id === "conclusion")!.paragraphs).toEqual(["TAB-A conclusion"]);
    // signing from tab B's stale page is refused too; from the page that saw revision 1 it goes through
    const sign = (revision: number) => signAs(testId, stored, revision);
    const stale = sign(opened.revision);
    expect(stale.ok).toBe(false);
    expect(!stale.ok && stale.errors.form).toMatch(/saved elsewhere/);
    expect(sign(a.revision!).ok).toBe(true);
  });

  it("an emptied caution section is not signed", () => {
    const testId = saveTest({ uploadId: null, label: "Caution (invented)", record, columns: [], issues: [] });
    const opened = loadReport(testId)!.report;
    expect(opened.sections.some((s) => s.id === "caution")).toBe(true);
    const res = signAs(testId, opened, opened.revision, (s) => (s.id === "caution" ? [] : s.paragraphs));
    expect(res.ok).toBe(false);
    expect(!res.ok && res.errors.caution).toMatch(/not left empty/);
    expect(getReport(opened.id)!.status).toBe("draft");
  });
});

describe("an older draft kept in the history", () => {
  it("says on every page that a newer version replaced it; the current draft and signed reports do not", () => {
    const testId = saveTest({ uploadId: null, label: "Superseded (invented)", record, columns: [], issues: [] });
    const first = loadReport(testId)!;
    expect(first.model.draftMark).not.toMatch(/Superseded/);
    updateTestRecord(testId, { ...record, spirometry: { fev1L: 3.9 } }, "tester", "spirometry corrected");
    const current = loadReport(testId)!;
    expect(current.report.id).not.toBe(first.report.id);
    expect(current.model.draftMark).not.toMatch(/Superseded/);
    const old = loadReport(testId, first.report.id)!;
    expect(old.report.status).toBe("draft");
    expect(old.model.draftMark).toMatch(new RegExp(`Superseded: version ${current.report.version} of this report is newer`));
  });
});

describe("a signed report is kept as signed, and its history is marked", () => {
  const signKept = (
    testId: number,
    report: { id: number; sections: ReportSection[]; revision: number },
    by: string,
    amendmentReason?: string,
  ) =>
    signDraft(
      {
        testId,
        reportId: report.id,
        revision: report.revision,
        signer: by,
        attestation: "reviewed",
        sections: report.sections.map((s) => ({ id: s.id, title: s.title, paragraphs: s.paragraphs })),
        rechecked: [],
        ...(amendmentReason !== undefined ? { amendmentReason } : {}),
      },
      freezeReport(testId, report.id)!.freeze,
    );

  it("a version signed with its report is read back as signed, not recomputed", () => {
    const testId = saveTest({ uploadId: null, label: "Kept (invented)", record, columns: [], issues: [] });
    const first = loadReport(testId)!;
    expect(signKept(testId, first.report, "Dr A Example").ok).toBe(true);
    const kept = loadReport(testId, first.report.id)!;
    expect(kept.result).toBeUndefined(); // nothing recomputed: an engine change cannot reach it
    expect(kept.model.status).toBe("signed");
    expect(kept.model.signedBy).toBe("Dr A Example");
    expect(tables(kept)).toBe(tables(first));
    expect(kept.model.engineVersion).toBe(first.model.engineVersion);
    // the current report of the test is that signed version, shown as kept
    expect(tables(loadReport(testId))).toBe(tables(first));
    expect(loadReport(testId)!.model.signedBy).toBe("Dr A Example");
  });

  it("an amended report says so on every PDF page; the amendment names what it revises", async () => {
    const testId = saveTest({ uploadId: null, label: "Amended (invented)", record, columns: [], issues: [] });
    const v1 = loadReport(testId)!.report;
    expect(signKept(testId, v1, "Dr A Example").ok).toBe(true);
    const revised = saveDraftChecked({
      testId,
      reportId: v1.id,
      revision: getReport(v1.id)!.revision,
      shownStatus: "signed",
      sections: v1.sections.map((s) => ({
        id: s.id,
        title: s.title,
        paragraphs: s.id === "conclusion" ? ["Amended conclusion (invented)."] : s.paragraphs,
      })),
      rechecked: [],
      actor: "tester",
    });
    expect(revised.ok).toBe(true);
    const v2 = revised.ok ? revised.report : null;
    // while the revision is a draft, the signed version stands and says a revision is in progress
    expect(loadReport(testId, v1.id)!.model.versionNote).toMatch(/A revision \(version 2\) is in progress as an unsigned draft/);
    // the draft shows what signing it would change: only the text, here
    expect(loadReport(testId)!.model.valueChanges).toEqual({ sinceVersion: 1, lines: [] });
    // an amendment is not signed without its reason (none, or blank after collapsing spaces)
    for (const reason of [undefined, "   \n  ", "x"]) {
      const refused = signKept(testId, v2!, "Dr B Example", reason);
      expect(refused.ok).toBe(false);
      expect(!refused.ok && refused.errors.amendmentReason).toBe("Why does this version replace signed version 1?");
      expect(getReport(v2!.id)!.status).toBe("draft");
    }
    expect(signKept(testId, v2!, "Dr B Example", "Conclusion\n reworded  after the team's review (invented).").ok).toBe(true);
    const amended = loadReport(testId, v2!.id)!.model;
    // kept with the signature, spaces collapsed; the values it changes, read from both versions as signed
    expect(amended.amendment).toEqual({ revisesVersion: 1, reason: "Conclusion reworded after the team's review (invented)." });
    expect(JSON.parse(getReport(v2!.id)!.signedModelJson!).amendment).toEqual(amended.amendment);
    expect(amended.valueChanges).toEqual({ sinceVersion: 1, lines: [] });
    const amendedText = execFileSync("pdftotext", ["-", "-"], { input: await renderReportPdf(amended) })
      .toString()
      .replace(/\s+/g, " ");
    expect(amendedText).toContain(
      "Amends signed version 1. Reason: Conclusion reworded after the team's review (invented). No key value, threshold or scheme result differs from version 1.",
    );
    const old = loadReport(testId, v1.id)!.model;
    expect(old.versionNote).toMatch(
      /^Version 1 of 2\. Superseded: version 2 \(the amended report\), signed by Dr B Example on .+ UTC, replaces this report\.$/,
    );
    expect(loadReport(testId, v2!.id)!.model.versionNote).toMatch(/^Version 2 of 2\. Revises version 1, signed by Dr A Example/);
    // every page of the old version's PDF (pdftotext, poppler: pages split at form feeds)
    const file = path.join(dir, "amended.pdf");
    fs.writeFileSync(file, await renderReportPdf(old));
    const pages = execFileSync("pdftotext", [file, "-"])
      .toString()
      .split("\f")
      .filter((p) => p.trim() !== "");
    expect(pages.length).toBeGreaterThan(1);
    for (const page of pages)
      expect(page.replace(/\s+/g, " ")).toMatch(/Superseded: version 2 \(the amended report\), signed by Dr B Example/);
  });

  it("a draft after a corrected body mass lists the reported values that differ from the signed version", () => {
    const testId = saveTest({ uploadId: null, label: "Changed values (invented)", record, columns: [], issues: [] });
    const v1 = loadReport(testId)!;
    expect(signKept(testId, v1.report, "Dr A Example").ok).toBe(true);
    const weightKg = record.patient.weightKg!;
    const change = correctWeight(testId, weightKg + 15);
    expect(change.ok).toBe(true);
    const draft = loadReport(testId)!.model;
    expect(draft.valueChanges?.sinceVersion).toBe(1);
    const row = (m: typeof draft) => m.keyValues.find((r) => r.label === "Peak VO2 per kg")!;
    const was = Number(row(v1.model).value);
    const now = Number(row(draft).value);
    // the same VO2 over 15 kg more: per kg by weight / (weight + 15), to the 0.1 shown
    expect(Math.abs(now - (was * weightKg) / (weightKg + 15))).toBeLessThanOrEqual(0.1);
    expect(draft.valueChanges!.lines).toContainEqual(
      expect.stringMatching(new RegExp(`^Peak VO2 per kg: ${was.toFixed(1)} mL/kg/min → ${now.toFixed(1)} mL/kg/min`)),
    );
    // peak VO2 in mL/min does not depend on the mass: its measured value is not listed (its predicted value is, as
    // the predicted equation reads the body mass)
    expect(draft.valueChanges!.lines.some((l) => /^Peak VO2: \d+ mL\/min →/.test(l))).toBe(false);
    expect(draft.valueChanges!.lines).toContainEqual(expect.stringMatching(/^Peak VO2: % predicted \d+ → \d+, predicted /));
  });

  it("a version signed before reports were kept says it is rebuilt; a later data correction is named as such", () => {
    const { testId, first } = signedTest(); // signed without keeping the report, as before migration 5
    const legacy = loadReport(testId, first.report.id)!.model.versionNote!;
    expect(legacy).toMatch(
      /Signed before signed reports were kept as signed: rebuilt by engine \S+ from the record and settings/,
    );
    const weightKg = record.patient.weightKg!;
    correctWeight(testId, weightKg + 10);
    loadReport(testId); // the current report: a draft for the corrected data
    expect(loadReport(testId, first.report.id)!.model.versionNote).toMatch(
      /Changed after this version was signed: patient details changed: weight \d+ kg → \d+ kg\. The values here are those at signing; version 2, for the changed test, is an unsigned draft, and until it is signed this version remains the signed report\./,
    );
  });
});
