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
  issues.push(...modeMismatch(imported.modeNamed, input.ergometer));
  const selected = selectedWords(input.importOptions?.select);
  const record: TestRecord = {
    patient,
    ergometer: input.ergometer,
    referral: input.referral ?? "general",
    table: imported.table,
    columns: imported.columns,
    importIssues: issues,
    upload: {
      fileName: input.fileName,
      sha256: input.sha256 ?? "",
      sizeBytes: input.bytes.byteLength,
      ...(selected ? { selected } : {}),
    },
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

/** Exercise modes by the words a file uses for them (English; common export names). */
const MODE_WORDS: { mode: string; ergometer: Ergometer | null; pattern: RegExp }[] = [
  { mode: "cycling", ergometer: "cycle", pattern: /cycl|bike|biking|velo/i },
  { mode: "running or walking", ergometer: "treadmill", pattern: /run|treadmill|walk/i },
  { mode: "rowing", ergometer: null, pattern: /row/i },
  { mode: "kayaking or canoeing", ergometer: null, pattern: /kayak|canoe|paddl/i },
  { mode: "arm cranking", ergometer: null, pattern: /arm|crank/i },
  { mode: "skiing", ergometer: null, pattern: /ski/i },
  { mode: "swimming", ergometer: null, pattern: /swim/i },
];

/**
 * The exercise mode a column of the file names (sport = "Rowing") against the ergometer chosen: equations and cut-offs
 * are for cycle ergometry and treadmill walking or running only, and a rowing or kayak test read as either is compared
 * with the wrong predicted values (common practice: predicted peak VO2 and work rate depend on the mode).
 */
function modeMismatch(named: { header: string; values: string[] } | null, ergometer: Ergometer): Issue[] {
  if (!named) return [];
  const found = MODE_WORDS.filter((m) => named.values.some((v) => m.pattern.test(v)));
  const other = found.find((m) => m.ergometer !== ergometer);
  if (!other || found.some((m) => m.ergometer === ergometer)) return [];
  const said = named.values.join(", ");
  return [
    makeIssue(
      "warning",
      "exercise-mode-mismatch",
      other.ergometer
        ? `The file's column "${named.header}" says ${said} (${other.mode}), but the test is analysed as ${ergometer === "cycle" ? "cycle ergometry" : "a treadmill test"}: if the test was done that way, change the ergometer (predicted values and cut-offs depend on it); if the column names the athlete's sport, this does not apply.`
        : `The file's column "${named.header}" says ${said} (${other.mode}). If the test was done on that ergometer, this software has predicted values and cut-offs for cycle ergometry and treadmill tests only: it is read as ${ergometer === "cycle" ? "cycle ergometry" : "a treadmill test"}, and its % predicted and graded findings do not describe ${other.mode}. If the column names the athlete's sport, this does not apply.`,
      { field: "ergometer" },
    ),
  ];
}

/** The rows kept from a file holding several tests, in words: "ID = 13" ("" without a selection). */
function selectedWords(select: Record<string, string | number> | undefined): string {
  return Object.entries(select ?? {})
    .map(([column, value]) => `${column} = ${value}`)
    .join(" and ");
}
