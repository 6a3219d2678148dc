import "server-only";
import type { ReportSection } from "../report/reportModel";
import { auditAtMostEvery } from "./auditTrail";
import { getDb } from "./db";
import { audit } from "./tests";

/**
 * A report page opened again by the same person within this many minutes is not audited again (this product's choice):
 * the page is drawn anew after every save, signature and reload, so each drawing would flood the trail with one
 * reviewer's editing, while 10 minutes still says who read which report when, at a finer grain than the 30-minute idle
 * limit of a session. Downloads are audited every time.
 */
export const REPORT_VIEW_AUDIT_MINUTES = 10;

/**
 * Audit that `actor` opened one of a test's own pages, which show the patient's details and values (`test-viewed`, with
 * the page; at most once per actor and test every `REPORT_VIEW_AUDIT_MINUTES`, whichever of the test's pages). Returns
 * whether an entry was written.
 */
export function auditTestViewed(actor: string, testId: number, page: "analysis" | "inputs" | "patient" | "columns"): boolean {
  return auditAtMostEvery(REPORT_VIEW_AUDIT_MINUTES, actor, "test-viewed", testId, `${page} page`);
}

/**
 * Audit that `actor` opened a test's report page (`report-viewed`, at most once per actor and test every
 * `REPORT_VIEW_AUDIT_MINUTES`). Returns whether an entry was written.
 */
export function auditReportViewed(
  actor: string,
  testId: number,
  report: { id: number; version: number; status: string },
): boolean {
  return auditAtMostEvery(
    REPORT_VIEW_AUDIT_MINUTES,
    actor,
    "report-viewed",
    testId,
    `report ${report.id} (version ${report.version}, ${report.status})`,
  );
}

/**
 * A stored report version: the editable text of one test's report for one analysis version, and its
 * signature. A signed version is immutable (enforced by triggers, migration 2); revising it creates
 * a new draft version, and the signed one stays.
 */
export interface StoredReport {
  id: number;
  testId: number;
  analysisId: number;
  /** 1-based version number among all report versions of the test, oldest first. */
  version: number;
  status: "draft" | "signed";
  sections: ReportSection[];
  signedBy: string | null;
  /** ISO 8601 time of signature. */
  signedAt: string | null;
  /** The attestation text the signer confirmed. */
  attestation: string | null;
  createdAt: string;
  /**
   * How many times the draft text was saved (0 when created). A page carries the revision it showed, so a save or a
   * signature from a page opened before someone else's save is refused instead of overwriting that text.
   */
  revision: number;
  /** The report exactly as signed (a `ReportModel` as JSON), null for drafts and versions signed before it was kept. */
  signedModelJson: string | null;
  /** For a signed version that amends an earlier signed one: which, and the signer's reason (kept with the signature). */
  amendment: ReportAmendment | null;
  /** The user name of the account the signer was signed in with (`lib/store/accounts`); null for a name typed without log-in. */
  signerAccount: string | null;
}

/** Why a signed version replaces an earlier signed version of the same test's report, as its signer gave it. */
export interface ReportAmendment {
  /** The version number of the signed version it amends. */
  revisesVersion: number;
  reason: string;
}

/** JSON kept in `reports.draft_json`. */
interface DraftJson {
  sections: ReportSection[];
  attestation?: string;
  amendment?: ReportAmendment;
  /** Set when the signer was signed in: their account's user name (the signed name is that account's display name). */
  signerAccount?: string;
}

interface ReportRow {
  id: number;
  test_id: number;
  analysis_id: number;
  status: "draft" | "signed";
  draft_json: string;
  signed_by: string | null;
  signed_at: string | null;
  created_at: string;
  version: number;
  revision: number;
  signed_model_json: string | null;
}

const now = () => new Date().toISOString();

const SELECT = `select r.*, (select count(*) from reports o where o.test_id = r.test_id and o.id <= r.id) as version from reports r`;

function toReport(row: ReportRow): StoredReport {
  const json = JSON.parse(row.draft_json) as DraftJson;
  return {
    id: row.id,
    testId: row.test_id,
    analysisId: row.analysis_id,
    version: row.version,
    status: row.status,
    sections: json.sections,
    signedBy: row.signed_by,
    signedAt: row.signed_at,
    attestation: json.attestation ?? null,
    createdAt: row.created_at,
    revision: row.revision,
    signedModelJson: row.signed_model_json ?? null,
    amendment: json.amendment ?? null,
    signerAccount: json.signerAccount ?? null,
  };
}

function insertDraft(testId: number, analysisId: number, sections: ReportSection[]): number {
  const info = getDb()
    .prepare("insert into reports (test_id, analysis_id, status, draft_json, created_at) values (?, ?, 'draft', ?, ?)")
    .run(testId, analysisId, JSON.stringify({ sections } satisfies DraftJson), now());
  return Number(info.lastInsertRowid);
}

/** One report version by id, or null. */
export function getReport(reportId: number): StoredReport | null {
  const row = getDb().prepare(`${SELECT} where r.id = ?`).get(reportId) as ReportRow | undefined;
  return row ? toReport(row) : null;
}

/** All report versions of a test, newest first. */
/** Where a test's report stands, for the register and the analysis view. */
export interface ReportStanding {
  /** How many report versions the test has (0: none made yet). */
  versions: number;
  /** The newest version's status. */
  newest: "draft" | "signed" | null;
  /** The newest signed version's number and signer, when one is signed. */
  lastSigned: { version: number; signedBy: string | null; signedAt: string | null } | null;
  /**
   * The test's analysis changed after its newest report version was written (inputs corrected, a threshold set by hand):
   * that version no longer shows the current values, and a new draft is made when the report page is opened.
   */
  analysisChanged: boolean;
}

/** Report standing of every test at once (one query), by test id; tests without a report are absent. */
export function reportStandings(): Map<number, ReportStanding> {
  return standingsOf(null);
}

/** Report standing of one test (for its own page: reads only that test's reports); undefined without a report. */
export function reportStanding(testId: number): ReportStanding | undefined {
  return standingsOf(testId).get(testId);
}

function standingsOf(testId: number | null): Map<number, ReportStanding> {
  const rows = getDb()
    .prepare(
      `select x.*, (select max(a.id) from analyses a where a.test_id = x.test_id) as latest_analysis_id from (${SELECT}${testId === null ? "" : " where r.test_id = ?"}) x order by x.test_id, x.id`,
    )
    .all(...(testId === null ? [] : [testId])) as (ReportRow & { latest_analysis_id: number | null })[];
  const out = new Map<number, ReportStanding>();
  for (const r of rows) {
    const cur = out.get(r.test_id) ?? { versions: 0, newest: null, lastSigned: null, analysisChanged: false };
    cur.versions = r.version;
    cur.newest = r.status;
    cur.analysisChanged = r.latest_analysis_id !== null && r.latest_analysis_id !== r.analysis_id;
    if (r.status === "signed") cur.lastSigned = { version: r.version, signedBy: r.signed_by, signedAt: r.signed_at };
    out.set(r.test_id, cur);
  }
  return out;
}

/** A report standing in words: "signed (version 2, Dr A)", "draft version 3, not signed (revises signed version 2)". */
export function standingWords(s: ReportStanding | undefined): string {
  if (!s || s.versions === 0) return "no report yet";
  if (s.analysisChanged)
    return `${s.newest === "signed" ? `signed (version ${s.versions}${s.lastSigned?.signedBy ? `, ${s.lastSigned.signedBy}` : ""})` : `draft version ${s.versions}, not signed`}; the analysis has changed since: open the report to review a new draft`;
  if (s.newest === "signed") return `signed (version ${s.versions}${s.lastSigned?.signedBy ? `, ${s.lastSigned.signedBy}` : ""})`;
  return `draft version ${s.versions}, not signed${s.lastSigned ? ` (revises signed version ${s.lastSigned.version})` : ""}`;
}

export function listReports(testId: number): StoredReport[] {
  return (getDb().prepare(`${SELECT} where r.test_id = ? order by r.id desc`).all(testId) as ReportRow[]).map(toReport);
}

/**
 * The current report of a test for an analysis version: its newest report version (draft or
 * signed). When there is none, a draft is created from `initialSections` (audit: `report-draft-created`).
 */
export function getOrCreateDraft(
  testId: number,
  analysisId: number,
  initialSections: ReportSection[],
  actor = "system",
): StoredReport {
  const db = getDb();
  return db.transaction(() => {
    const row = db
      .prepare(`${SELECT} where r.test_id = ? and r.analysis_id = ? order by r.id desc limit 1`)
      .get(testId, analysisId) as ReportRow | undefined;
    if (row) return toReport(row);
    const id = insertDraft(testId, analysisId, initialSections);
    audit(actor, "report-draft-created", testId, `report ${id} for analysis ${analysisId}`);
    return getReport(id)!;
  })();
}

/**
 * Save the editable text. A draft is updated in place; a signed version is left untouched and the
 * text becomes a new draft version (same test and analysis). Returns the version that now holds the
 * text, or null when `reportId` does not exist.
 */
export function saveDraft(reportId: number, sections: ReportSection[], actor: string): StoredReport | null {
  const db = getDb();
  return db.transaction(() => {
    const current = getReport(reportId);
    if (!current) return null;
    if (current.status === "draft") {
      db.prepare("update reports set draft_json = ?, revision = revision + 1 where id = ? and status = 'draft'").run(
        JSON.stringify({ sections } satisfies DraftJson),
        reportId,
      );
      audit(actor, "report-draft-saved", current.testId, `report ${reportId}`);
      return getReport(reportId);
    }
    const id = insertDraft(current.testId, current.analysisId, sections);
    audit(actor, "report-revised", current.testId, `new draft ${id} from signed report ${reportId}`);
    return getReport(id);
  })();
}

export type SignResult = { ok: true; report: StoredReport } | { ok: false; reason: string };

/**
 * Sign a draft: status becomes "signed" with the signer's name, the time and the attestation they
 * confirmed; from then on the version is immutable. Signing a missing or already signed version is
 * refused with a reason (audit: `report-signed`). `freeze`, given the version as it will read once signed, returns the
 * whole report as JSON; it is stored by the same statement that signs (a signed row can no longer be updated).
 * `amendment`, for a version that replaces an earlier signed one, is kept with the signature and audited.
 */
export function signReport(
  reportId: number,
  signer: string,
  attestation: string,
  freeze?: (signed: StoredReport) => string,
  amendment?: ReportAmendment,
  signerAccount?: string,
): SignResult {
  const db = getDb();
  return db.transaction((): SignResult => {
    const current = getReport(reportId);
    if (!current) return { ok: false, reason: "This report version does not exist." };
    if (current.status === "signed")
      return { ok: false, reason: `This version was already signed by ${current.signedBy} on ${current.signedAt}.` };
    const signedAt = now();
    const frozen = freeze
      ? freeze({
          ...current,
          status: "signed",
          signedBy: signer,
          signedAt,
          attestation,
          amendment: amendment ?? null,
          signerAccount: signerAccount ?? null,
        })
      : null;
    const info = db
      .prepare(
        "update reports set status = 'signed', signed_by = ?, signed_at = ?, draft_json = ?, signed_model_json = ? where id = ? and status = 'draft'",
      )
      .run(
        signer,
        signedAt,
        JSON.stringify({
          sections: current.sections,
          attestation,
          ...(amendment ? { amendment } : {}),
          ...(signerAccount ? { signerAccount } : {}),
        } satisfies DraftJson),
        frozen,
        reportId,
      );
    if (info.changes !== 1) return { ok: false, reason: "This version could not be signed; reload the page." };
    audit(
      signerAccount ?? signer,
      "report-signed",
      current.testId,
      `report ${reportId} (version ${current.version}): ${attestation}` +
        (amendment ? ` Amends version ${amendment.revisesVersion}: ${amendment.reason}` : ""),
    );
    return { ok: true, report: getReport(reportId)! };
  })();
}
