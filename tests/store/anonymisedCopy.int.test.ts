/**
 * An anonymised teaching copy keeps what the analysis reads and nothing that names the patient or the reviewers.
 * SQLite in memory; the test is the INVENTED heart-failure demo case (tests/fixtures/cases) with INVENTED identifiers
 * added (file name, details lines, conduct notes, a reviewer's name) so that their absence can be checked.
 */
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { analyse, type TestRecord } from "../../lib/analysis";
import { caseRecord } from "../fixtures/caseRecord";
import { closeDb, getDb } from "../../lib/store/db";
import { ANONYMISED_REVIEWER, makeAnonymisedCopy } from "../../lib/store/anonymisedCopy";
import { getOrCreateDraft, listReports } from "../../lib/store/reports";
import { getTest, latestSettings, listAudit, saveAnalysisVersion, saveTest, saveUpload } from "../../lib/store/tests";

// INVENTED identifiers: each must be absent from everything stored for the copy
const FILE_NAME = "Doe_Jane_MRN0042137_2026-11-30.csv";
const DETAILS = "Name: Jane Doe (invented)";
const NOTE = "Stopped at Dr Inventa's request (invented)";
const REVIEWER = "Dr Revi Ewer (invented)";
const STUDY_NO = "HF-2026-0815";
const OVERRIDE_REASON = "Agreed with Dr Inventa at the case meeting (invented)";

async function original(): Promise<{ id: number; record: TestRecord }> {
  const base = await caseRecord("heart-failure");
  const upload = saveUpload(FILE_NAME, new TextEncoder().encode(`${DETAILS}\ntime_s,vo2_ml_min\n0,300\n`));
  const record: TestRecord = {
    ...base,
    upload: { fileName: FILE_NAME, sha256: upload.sha256, sizeBytes: 40 },
    conduct: { ...base.conduct, reasonForStopping: NOTE, notes: NOTE, peakBorg: 17 },
    importIssues: [
      ...base.importIssues,
      { severity: "info", code: "metadata-found", message: "1 line(s) above the header were read as record details, not data." },
      // the selection that picked this patient's rows out of a file of several (INVENTED study number)
      { severity: "info", code: "record-selected", message: `412 rows of the test where ID = ${STUDY_NO} were kept.` },
    ],
  };
  const id = saveTest({ uploadId: upload.id, label: `Jane Doe ${FILE_NAME}`, record, columns: [], issues: record.importIssues });
  const vt1 = analyse(record).thresholds.vt1;
  saveAnalysisVersion(
    id,
    {
      overrides: [{ which: "vt1", timeS: vt1.timeS! + 30, reason: OVERRIDE_REASON, by: REVIEWER, atIso: "2026-11-30T10:00:00Z" }],
    },
    "0.0.0-test",
    REVIEWER,
  );
  getOrCreateDraft(id, latestSettings(id)!.id, [{ id: "conclusion", title: "Conclusion", paragraphs: [`Seen by ${REVIEWER}`] }]);
  return { id, record };
}

/** Every stored text of a test: its row, its analysis versions, record snapshots and reports. */
function storedText(testId: number): string {
  const db = getDb();
  const rows = [
    db.prepare("select label, record_json, import_json, upload_id from tests where id = ?").all(testId),
    db.prepare("select * from analyses where test_id = ?").all(testId),
    db
      .prepare("select s.record_json from record_snapshots s join analyses a on a.record_sha256 = s.sha256 where a.test_id = ?")
      .all(testId),
    db.prepare("select * from reports where test_id = ?").all(testId),
  ];
  return JSON.stringify(rows);
}

describe("makeAnonymisedCopy", () => {
  beforeEach(() => {
    process.env.CPET_DB = ":memory:";
    closeDb();
  });
  afterEach(() => closeDb());

  it("keeps the breaths, measurements and settings (same numbers) and nothing that names anyone", async () => {
    const { id } = await original();
    const res = makeAnonymisedCopy(id, { label: "Teaching case 1", keepFreeText: false, actor: "teacher" });
    expect(res.ok).toBe(true);
    const copyId = res.ok ? res.id : 0;
    const copy = getTest(copyId)!;
    const orig = getTest(id)!;
    expect([copy.uploadId, copy.fileName, copy.record!.upload]).toEqual([null, null, undefined]);
    const text = storedText(copyId);
    // the scan reads the copy's row, its settings (with the neutral reviewer) and its pinned record
    expect(text).toContain("Teaching case 1");
    expect(text).toContain(ANONYMISED_REVIEWER);
    expect(
      getDb()
        .prepare("select count(*) as n from record_snapshots s join analyses a on a.record_sha256 = s.sha256 where a.test_id = ?")
        .get(copyId),
    ).toEqual({ n: 1 });
    for (const identifier of [FILE_NAME, "Jane Doe", "MRN0042137", STUDY_NO, NOTE, REVIEWER, OVERRIDE_REASON, "2026-11-30"])
      expect([identifier, text.includes(identifier)]).toEqual([identifier, false]);
    // what the analysis reads is kept: measurements, spirometry, numbers of the conduct
    expect(copy.record!.patient).toEqual(orig.record!.patient);
    expect(copy.record!.spirometry).toEqual(orig.record!.spirometry);
    expect(copy.record!.table).toEqual(orig.record!.table);
    expect(copy.record!.conduct?.peakBorg).toBe(17);
    expect(copy.record!.importIssues.map((i) => i.code)).not.toContain("metadata-found");
    // the same settings, with the override credited to no one: the same numbers, the reviewer's VT1 included
    const settings = latestSettings(copyId)!.settings;
    expect(settings.overrides![0].by).toBe(ANONYMISED_REVIEWER);
    const a = analyse(orig.record!, latestSettings(id)!.settings);
    const b = analyse(copy.record!, settings);
    expect(b.thresholds.vt1.timeS).toBe(a.thresholds.vt1.timeS);
    expect(b.thresholds.vt1.vo2MlMin.value).toBe(a.thresholds.vt1.vo2MlMin.value);
    expect(b.indices.peaks.vo2MlKgMin.value).toBe(a.indices.peaks.vo2MlKgMin.value);
    expect(b.comparisons.map((c) => c.percentPredicted)).toEqual(a.comparisons.map((c) => c.percentPredicted));
    // no report came with it; the original is untouched and says a copy was made
    expect(listReports(copyId)).toEqual([]);
    expect(listReports(id)).toHaveLength(1);
    expect(getTest(id)!.record).toEqual(orig.record);
    expect(listAudit(id)[0]).toMatchObject({ action: "anonymised-copy-made" });
    expect(listAudit(id)[0].detail).toContain(`as test ${copyId}`);
    expect(listAudit(copyId).map((x) => x.action)).toContain("anonymised-copy-created");
    expect(JSON.stringify(listAudit(copyId))).not.toContain(String(`test ${id} `));
  });

  it("keeps the free text only when asked to", async () => {
    const { id } = await original();
    const res = makeAnonymisedCopy(id, { label: "Teaching case 2", keepFreeText: true, actor: "teacher" });
    const copyId = res.ok ? res.id : 0;
    expect(getTest(copyId)!.record!.conduct?.reasonForStopping).toBe(NOTE);
    const override = latestSettings(copyId)!.settings.overrides![0];
    expect([override.by, override.reason, override.atIso]).toEqual([ANONYMISED_REVIEWER, OVERRIDE_REASON, undefined]);
    expect(storedText(copyId)).not.toContain(FILE_NAME);
  });

  it("refuses a missing or refused test, writing nothing", () => {
    const refused = saveTest({ uploadId: null, label: "Refused (invented)", record: null, columns: [], issues: [] });
    const before = getDb().prepare("select count(*) as n from tests").get() as { n: number };
    expect(makeAnonymisedCopy(refused, { label: "x", keepFreeText: false, actor: "t" })).toEqual({
      ok: false,
      reason: "A refused upload has no record to copy; make the file usable first.",
    });
    expect(makeAnonymisedCopy(9999, { label: "x", keepFreeText: false, actor: "t" }).ok).toBe(false);
    expect(getDb().prepare("select count(*) as n from tests").get()).toEqual(before);
  });
});
