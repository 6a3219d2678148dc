import "server-only";
import crypto from "node:crypto";
import { ENGINE_VERSION, type AnalysisSettings, type TestRecord } from "../analysis";
import type { ColumnDecision } from "../breath";
import type { Issue } from "../core";
import { audit } from "./auditTrail";
import { getDb } from "./db";

export interface StoredTestSummary {
  id: number;
  label: string;
  status: "imported" | "refused";
  demo: boolean;
  createdAt: string;
  fileName: string | null;
}

export interface StoredTest extends StoredTestSummary {
  record: TestRecord | null;
  /** sha256 of the stored record JSON (null for a refused file): the snapshot an analysis version pins. */
  recordSha256: string | null;
  importColumns: ColumnDecision[];
  importIssues: Issue[];
  uploadId: number | null;
}

const now = () => new Date().toISOString();

/** Keep the original bytes exactly as uploaded; returns the upload id. */
export function saveUpload(fileName: string, bytes: Uint8Array): { id: number; sha256: string } {
  const sha256 = crypto.createHash("sha256").update(bytes).digest("hex");
  const info = getDb()
    .prepare("insert into uploads (file_name, sha256, size_bytes, bytes, created_at) values (?, ?, ?, ?, ?)")
    .run(fileName, sha256, bytes.byteLength, Buffer.from(bytes), now());
  return { id: Number(info.lastInsertRowid), sha256 };
}

export function getUploadBytes(uploadId: number): { fileName: string; bytes: Buffer } | null {
  const row = getDb().prepare("select file_name, bytes from uploads where id = ?").get(uploadId) as
    { file_name: string; bytes: Buffer } | undefined;
  return row ? { fileName: row.file_name, bytes: row.bytes } : null;
}

/**
 * An upload's bytes for someone downloading it, written to the audit trail (`original-file-downloaded`, under the test
 * read from it, or none for a file kept from a refused form). Null when there is no such upload (nothing audited).
 */
export function downloadUpload(uploadId: number, actor: string): { fileName: string; bytes: Buffer } | null {
  const db = getDb();
  const row = db.prepare("select file_name, sha256, bytes from uploads where id = ?").get(uploadId) as
    { file_name: string; sha256: string; bytes: Buffer } | undefined;
  if (!row) return null;
  const test = db.prepare("select id from tests where upload_id = ? order by id limit 1").get(uploadId) as
    { id: number } | undefined;
  audit(actor, "original-file-downloaded", test?.id ?? null, `upload ${uploadId} “${row.file_name}” (sha256 ${row.sha256})`);
  return { fileName: row.file_name, bytes: row.bytes };
}

export function saveTest(input: {
  uploadId: number | null;
  label: string;
  record: TestRecord | null;
  columns: ColumnDecision[];
  issues: Issue[];
  demo?: boolean;
  actor?: string;
}): number {
  const db = getDb();
  const info = db
    .prepare(
      "insert into tests (upload_id, label, status, record_json, import_json, demo, created_at) values (?, ?, ?, ?, ?, ?, ?)",
    )
    .run(
      input.uploadId,
      input.label,
      input.record ? "imported" : "refused",
      input.record ? JSON.stringify(input.record) : null,
      JSON.stringify({ columns: input.columns, issues: input.issues }),
      input.demo ? 1 : 0,
      now(),
    );
  const id = Number(info.lastInsertRowid);
  audit(input.actor ?? "system", input.record ? "test-imported" : "test-refused", id, input.label);
  return id;
}

/**
 * Replace a test's record. When the test has been analysed, a new analysis version with its current settings pins the new
 * record (`note` says what changed), so every report version keeps the record it was written on; returns that version's
 * number, or null when the test has no analysis version yet (the first one pins the record when it is made).
 */
export function updateTestRecord(id: number, record: TestRecord, actor: string, note = "test inputs changed"): number | null {
  const db = getDb();
  return db.transaction((): number | null => {
    db.prepare("update tests set record_json = ? where id = ?").run(JSON.stringify(record), id);
    audit(actor, "test-details-updated", id, note);
    const latest = latestSettings(id);
    return latest ? saveAnalysisVersion(id, latest.settings, ENGINE_VERSION, actor, note) : null;
  })();
}

/** sha256 of a record's stored JSON. */
function recordSha(json: string): string {
  return crypto.createHash("sha256").update(json).digest("hex");
}

interface TestRow {
  id: number;
  label: string;
  status: "imported" | "refused";
  demo: number;
  created_at: string;
  file_name: string | null;
  upload_id: number | null;
  record_json: string | null;
  import_json: string;
}

export function listTests(): StoredTestSummary[] {
  const rows = getDb()
    .prepare(
      "select t.id, t.label, t.status, t.demo, t.created_at, u.file_name from tests t left join uploads u on u.id = t.upload_id order by t.demo asc, t.id desc",
    )
    .all() as TestRow[];
  return rows.map((r) => ({
    id: r.id,
    label: r.label,
    status: r.status,
    demo: r.demo === 1,
    createdAt: r.created_at,
    fileName: r.file_name,
  }));
}

export function getTest(id: number): StoredTest | null {
  const r = getDb()
    .prepare(
      "select t.id, t.label, t.status, t.demo, t.created_at, t.upload_id, t.record_json, t.import_json, u.file_name from tests t left join uploads u on u.id = t.upload_id where t.id = ?",
    )
    .get(id) as TestRow | undefined;
  if (!r) return null;
  const imp = JSON.parse(r.import_json) as { columns: ColumnDecision[]; issues: Issue[] };
  return {
    id: r.id,
    label: r.label,
    status: r.status,
    demo: r.demo === 1,
    createdAt: r.created_at,
    fileName: r.file_name,
    uploadId: r.upload_id,
    record: r.record_json ? (JSON.parse(r.record_json) as TestRecord) : null,
    recordSha256: r.record_json ? recordSha(r.record_json) : null,
    importColumns: imp.columns,
    importIssues: imp.issues,
  };
}

export function countTests(): number {
  return (getDb().prepare("select count(*) as n from tests").get() as { n: number }).n;
}

/**
 * Analysis versions: an override, a changed choice or changed inputs make a new version; old ones are kept. Each pins
 * the settings and the test's record as it is now (`record_snapshots`, one row per distinct record).
 */
export function saveAnalysisVersion(
  testId: number,
  settings: AnalysisSettings,
  engineVersion: string,
  actor: string,
  note?: string,
): number {
  const db = getDb();
  return db.transaction((): number => {
    const last = db.prepare("select max(version) as v from analyses where test_id = ?").get(testId) as { v: number | null };
    const version = (last.v ?? 0) + 1;
    const row = db.prepare("select record_json from tests where id = ?").get(testId) as
      { record_json: string | null } | undefined;
    const sha = row?.record_json ? recordSha(row.record_json) : null;
    if (sha) db.prepare("insert or ignore into record_snapshots (sha256, record_json) values (?, ?)").run(sha, row!.record_json);
    db.prepare(
      "insert into analyses (test_id, version, settings_json, engine_version, note, created_by, created_at, record_sha256) values (?, ?, ?, ?, ?, ?, ?, ?)",
    ).run(testId, version, JSON.stringify(settings), engineVersion, note ?? null, actor, now(), sha);
    audit(actor, "analysis-version", testId, `v${version}${note ? `: ${note}` : ""}`);
    return version;
  })();
}

/**
 * The record an analysis version was made on (`record_snapshots`); null when the version predates the snapshots (then
 * the test's current record stands in) or does not exist.
 */
export function analysisRecord(analysisId: number): TestRecord | null {
  const row = getDb()
    .prepare("select s.record_json from analyses a join record_snapshots s on s.sha256 = a.record_sha256 where a.id = ?")
    .get(analysisId) as { record_json: string } | undefined;
  return row ? (JSON.parse(row.record_json) as TestRecord) : null;
}

export interface AnalysisVersion {
  id: number;
  version: number;
  settings: AnalysisSettings;
  /** sha256 of the record the version pins (null: saved before records were pinned). */
  recordSha256: string | null;
  engineVersion: string;
  note: string | null;
  createdBy: string | null;
  createdAt: string;
}

export function listAnalysisVersions(testId: number): AnalysisVersion[] {
  const rows = getDb()
    .prepare(
      "select id, version, settings_json, engine_version, note, created_by, created_at, record_sha256 from analyses where test_id = ? order by version desc",
    )
    .all(testId) as {
    id: number;
    version: number;
    settings_json: string;
    engine_version: string;
    note: string | null;
    created_by: string | null;
    created_at: string;
    record_sha256: string | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    version: r.version,
    settings: JSON.parse(r.settings_json) as AnalysisSettings,
    recordSha256: r.record_sha256,
    engineVersion: r.engine_version,
    note: r.note,
    createdBy: r.created_by,
    createdAt: r.created_at,
  }));
}

export function latestSettings(testId: number): { version: number; settings: AnalysisSettings; id: number } | null {
  const v = listAnalysisVersions(testId)[0];
  return v ? { version: v.version, settings: v.settings, id: v.id } : null;
}

/** The settings a test is analysed with: its latest saved version, else the lab's defaults. */
export function effectiveSettings(testId: number, labDefaults: AnalysisSettings): AnalysisSettings {
  return latestSettings(testId)?.settings ?? labDefaults;
}

/**
 * Rename a test (its label in the register and the title of its report). A report already signed keeps the title it
 * was signed with. Returns false when the test does not exist (audit: `test-renamed`, old and new label).
 */
export function renameTest(testId: number, label: string, actor: string): boolean {
  const db = getDb();
  return db.transaction(() => {
    const row = db.prepare("select label from tests where id = ?").get(testId) as { label: string } | undefined;
    if (!row) return false;
    if (row.label === label) return true;
    db.prepare("update tests set label = ? where id = ?").run(label, testId);
    audit(actor, "test-renamed", testId, `“${row.label}” → “${label}”`);
    return true;
  })();
}

/** Add an entry to the audit trail (its time is the database clock's; hash-chained): lib/store/auditTrail.ts. */
export { audit };

export function listAudit(testId: number): { at: string; actor: string | null; action: string; detail: string | null }[] {
  return getDb().prepare("select at, actor, action, detail from audit where test_id = ? order by id desc").all(testId) as {
    at: string;
    actor: string | null;
    action: string;
    detail: string | null;
  }[];
}
