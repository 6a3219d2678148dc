import { makeIssue, type Ergometer, type Issue, type Patient } from "../core";
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
  // A body mass read from the file (its details lines or a weight column) stands in when none was entered, so
  // per-kg values agree with the importer's own conversion; the patient's entered value always wins.
  const issues = [...imported.issues];
  let patient = input.patient;
  if (patient.weightKg === undefined && imported.weight && imported.weight.from !== "options") {
    patient = { ...patient, weightKg: imported.weight.kg };
    if (!issues.some((i) => i.code === "weight-from-file"))
      issues.push(
        makeIssue(
          "info",
          "weight-from-file",
          `Body mass ${imported.weight.kg} kg was taken from the file (${imported.weight.from === "metadata" ? "its details lines" : "its weight column"}) because none was entered.`,
        ),
      );
  }
  issues.push(...ergometerMismatch(imported.table.rows, input.ergometer));
  const record: TestRecord = {
    patient,
    ergometer: input.ergometer,
    referral: input.referral ?? "general",
    table: imported.table,
    columns: imported.columns,
    importIssues: issues,
    upload: { fileName: input.fileName, sha256: input.sha256 ?? "", sizeBytes: input.bytes.byteLength },
  };
  return { record, columns: imported.columns, issues };
}

/**
 * The ergometer chosen against the load columns of the file: treadmill speed and no work rate on a "cycle" test, or a work
 * rate and no speed on a "treadmill" one. The ergometer picks the predicted-value equations (cycle and treadmill peak VO2
 * differ by about 10–20 %, common practice), so a wrong choice moves every % predicted.
 */
function ergometerMismatch(rows: readonly { workW?: number; speedKmh?: number }[], ergometer: Ergometer): Issue[] {
  const work = rows.some((r) => typeof r.workW === "number" && r.workW > 0);
  const speed = rows.some((r) => typeof r.speedKmh === "number" && r.speedKmh > 0);
  const other =
    ergometer === "cycle" && speed && !work ? "treadmill" : ergometer === "treadmill" && work && !speed ? "cycle" : null;
  if (!other) return [];
  return [
    makeIssue(
      "warning",
      "ergometer-differs-from-file",
      `The file has ${other === "treadmill" ? "treadmill speed and no work rate" : "a work rate and no treadmill speed"}, but the test is set as a ${ergometer} test: the ${ergometer} predicted values are used. Set the ergometer to ${other} if the test was done on one.`,
    ),
  ];
}
