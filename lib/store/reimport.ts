import "server-only";
import { ENGINE_VERSION, type ClinicalContext, type ReferralQuestion, type TestRecord } from "../analysis";
import { columnMappingSchema, type ColumnDecision, type ColumnMapping } from "../breath";
import type { Ergometer, Issue, Patient, Spirometry } from "../core";
import { getDb } from "./db";
import { audit, latestSettings, saveAnalysisVersion } from "./tests";

/** The choices a file was last read with (kept beside the column decisions so the review page can show them). */
export interface ImportChoices {
  /** Header → decision set by the user (from the review page or a profile). */
  mapping: ColumnMapping;
  /** Column → value choosing one test in a file that holds several. */
  select?: Record<string, string>;
  /** Body mass used for per-kg VO2 columns, kg. */
  weightKg?: number;
  /** Spacing given to consecutive stages when the file has no time column, s. */
  stageDurationS?: number;
  /** Name of the profile the mapping came from, when it came from one. */
  profileName?: string;
}

/**
 * Patient and test details entered with an upload whose file was refused. A refused test has no record to
 * hold them, so they are kept beside the import and used when the file becomes usable.
 */
export interface UploadDetails {
  patient: Patient;
  ergometer: Ergometer;
  referral: ReferralQuestion;
  spirometry?: Spirometry;
  context?: ClinicalContext;
}

interface ImportJson {
  columns: ColumnDecision[];
  issues: Issue[];
  choices?: ImportChoices;
  details?: UploadDetails;
}

function readImportJson(testId: number): ImportJson | null {
  const row = getDb().prepare("select import_json from tests where id = ?").get(testId) as { import_json: string } | undefined;
  return row ? (JSON.parse(row.import_json) as ImportJson) : null;
}

/** The choices the test's file was last read with; null when it was read automatically (or the test is unknown). */
export function getImportChoices(testId: number): ImportChoices | null {
  const c = readImportJson(testId)?.choices;
  if (!c) return null;
  const mapping = columnMappingSchema.safeParse(c.mapping);
  return { ...c, mapping: mapping.success ? mapping.data : {} };
}

/** Remember the choices an upload was read with (e.g. the profile picked on the upload form). */
export function recordImportChoices(testId: number, choices: ImportChoices, actor = "local user"): void {
  const current = readImportJson(testId);
  if (!current) return;
  getDb()
    .prepare("update tests set import_json = ? where id = ?")
    .run(JSON.stringify({ ...current, choices }), testId);
  if (choices.profileName) audit(actor, "mapping-profile-applied", testId, choices.profileName);
}

/** Keep the details entered with an upload that was refused (see `UploadDetails`). */
export function recordUploadDetails(testId: number, details: UploadDetails, actor = "local user"): void {
  const current = readImportJson(testId);
  if (!current) return;
  getDb()
    .prepare("update tests set import_json = ? where id = ?")
    .run(JSON.stringify({ ...current, details }), testId);
  audit(actor, "upload-details-kept", testId, describeDetails(details));
}

/** The details entered with a refused upload; null when none were kept (or the test is unknown). */
export function getUploadDetails(testId: number): UploadDetails | null {
  const d = readImportJson(testId)?.details;
  if (!d || typeof d !== "object" || typeof d.patient !== "object" || d.patient === null) return null;
  return d;
}

/** "male, 45 y, 178 cm, 75 kg, cycle, general" (missing ones as "?"). */
export function describeDetails(d: UploadDetails): string {
  const p = d.patient;
  return [
    p.sex ?? "sex ?",
    `${p.ageY ?? "?"} y`,
    `${p.heightCm ?? "?"} cm`,
    `${p.weightKg ?? "?"} kg`,
    d.ergometer,
    d.referral,
    ...(d.context?.ischaemicHeartDisease !== undefined
      ? [`ischaemic heart disease ${d.context.ischaemicHeartDisease ? "yes" : "no"}`]
      : []),
  ].join(", ");
}

/**
 * Replace a test's reading of its kept file after a re-read with new choices: record (null = the file
 * still cannot be used), column decisions, issues and the choices. The status follows the record
 * (a refused test becomes imported). The audit trail says who re-read it, with what, and the outcome; a test already
 * analysed gets a new analysis version pinning the new reading (reports signed on the old one keep theirs).
 * Returns false when the test does not exist.
 */
export function replaceImport(
  testId: number,
  input: { record: TestRecord | null; columns: ColumnDecision[]; issues: Issue[]; choices: ImportChoices; actor: string },
): boolean {
  return getDb().transaction(() => replaceImportNow(testId, input))();
}

function replaceImportNow(
  testId: number,
  input: { record: TestRecord | null; columns: ColumnDecision[]; issues: Issue[]; choices: ImportChoices; actor: string },
): boolean {
  const info = getDb()
    .prepare("update tests set status = ?, record_json = ?, import_json = ? where id = ?")
    .run(
      input.record ? "imported" : "refused",
      input.record ? JSON.stringify(input.record) : null,
      JSON.stringify({
        columns: input.columns,
        issues: input.issues,
        choices: input.choices,
        // details entered with a refused upload stay until the file becomes usable (then the record holds them)
        ...(input.record ? {} : { details: readImportJson(testId)?.details }),
      }),
      testId,
    );
  if (info.changes === 0) return false;
  const userCols = Object.keys(input.choices.mapping).length;
  const sel = input.choices.select ? Object.entries(input.choices.select).map(([k, v]) => `${k} = ${v}`) : [];
  const detail = [
    `${userCols} column(s) set by user`,
    input.choices.profileName ? `profile ${input.choices.profileName}` : null,
    sel.length > 0 ? `test ${sel.join(", ")}` : null,
    input.choices.weightKg !== undefined ? `body mass ${input.choices.weightKg} kg` : null,
    input.record ? `${input.record.table.rows.length} rows read` : "still refused",
  ]
    .filter(Boolean)
    .join("; ");
  audit(input.actor, "import-re-read", testId, detail);
  const latest = input.record ? latestSettings(testId) : null;
  if (latest) saveAnalysisVersion(testId, latest.settings, ENGINE_VERSION, input.actor, `file re-read: ${detail}`);
  return true;
}
