import type { Ergometer, Issue, Patient } from "../core";
import { importBreathFile, type ColumnDecision, type ImportOptions } from "../breath";
import type { ReferralQuestion, TestRecord } from "./types";

export interface BuildRecordInput {
  bytes: Uint8Array;
  fileName: string;
  sha256?: string;
  patient: Patient;
  ergometer: Ergometer;
  referral?: ReferralQuestion;
  importOptions?: ImportOptions;
}

export interface BuildRecordResult {
  record: TestRecord | null;
  columns: ColumnDecision[];
  issues: Issue[];
}

/** Import an uploaded file and join it with the patient's details into a test record. */
export async function buildRecord(input: BuildRecordInput): Promise<BuildRecordResult> {
  const imported = await importBreathFile(input.bytes, { fileName: input.fileName, ...input.importOptions });
  if (!imported.table) return { record: null, columns: imported.columns, issues: imported.issues };
  const record: TestRecord = {
    patient: input.patient,
    ergometer: input.ergometer,
    referral: input.referral ?? "general",
    table: imported.table,
    columns: imported.columns,
    importIssues: imported.issues,
    upload: { fileName: input.fileName, sha256: input.sha256 ?? "", sizeBytes: input.bytes.byteLength },
  };
  return { record, columns: imported.columns, issues: imported.issues };
}
