import "server-only";
import { importBreathFile, parseUnitText, type ColumnDecision, type FileFormat } from "@/lib/breath";
import { readTableLayout } from "@/lib/breath/readTableLayout";
import type { Issue } from "@/lib/core";
import { getImportChoices, getUploadDetails, type ImportChoices, type UploadDetails } from "@/lib/store/reimport";
import { getTest, getUploadBytes, type StoredTest } from "@/lib/store/tests";
import {
  decidedByText,
  fieldOptions,
  readAsText,
  reasonAfterTag,
  unitOptions,
  type FieldKey,
  type FieldOption,
} from "./fieldChoices";

/** One column of the file as the review page shows it. */
export interface ColumnRowView {
  index: number;
  header: string;
  /** Text of the units row under the header, when the file has one. */
  unitsRow: string | null;
  /** First values and the last value of the column exactly as written in the file ("…" between). */
  samples: string[];
  readAs: string;
  reason: string;
  decidedBy: string;
  /** What the file gives without any user choice (for the "automatic" option). */
  autoField: FieldKey | null;
  autoLabel: string;
  /** Current choice: "auto", "ignore" or a field; unit "auto" or a unit text. */
  choiceField: string;
  choiceUnit: string;
}

export interface ColumnReview {
  test: StoredTest;
  fileName: string;
  /** null when the bytes are not a readable table at all. */
  format: Omit<FileFormat, "timeFormat"> | null;
  rows: ColumnRowView[];
  fields: FieldOption[];
  issues: Issue[];
  choices: ImportChoices | null;
  /** Column that identifies the test when the file holds several, with its values (and row counts). */
  record: { column: string; options: { value: string; rows: number }[]; chosen: string } | null;
  /** Body mass the page proposes for per-kg VO2 columns, kg. */
  weightKg: number | undefined;
  perKgColumn: boolean;
  /** The file has no time column and its rows are read as consecutive stages. */
  stageOrder: boolean;
  /** Stage spacing last used for such a file, s. */
  stageDurationS: number | undefined;
  /** Refused test: the patient and test details entered with its upload (null when none were kept). */
  details: UploadDetails | null;
}

const SAMPLE_COUNT = 4;

/** The kept file, read again for the review: headers, sample cells, automatic decisions and the current choices. */
export async function loadColumnReview(testId: number): Promise<ColumnReview | null> {
  const test = getTest(testId);
  if (!test) return null;
  const stored = test.uploadId ? getUploadBytes(test.uploadId) : null;
  const choices = getImportChoices(testId);
  const details = test.record ? null : getUploadDetails(testId);
  const weightKg = test.record?.patient.weightKg ?? choices?.weightKg ?? details?.patient.weightKg;
  const base = {
    test,
    fileName: stored?.fileName ?? test.fileName ?? "(none kept)",
    fields: fieldOptions(),
    issues: test.importIssues,
    choices,
    weightKg,
    stageDurationS: choices?.stageDurationS,
    details,
  };
  if (!stored) return { ...base, format: null, rows: [], record: null, perKgColumn: false, stageOrder: false };
  const bytes = new Uint8Array(stored.bytes);
  const layoutIssues: Issue[] = [];
  const layout = await readTableLayout(bytes, layoutIssues);
  if (!layout) return { ...base, format: null, rows: [], record: null, perKgColumn: false, stageOrder: false };

  // Automatic reading (no mapping) of the same test, for the "automatic" option of every column.
  const auto = await importBreathFile(bytes, {
    fileName: stored.fileName,
    ...(choices?.select ? { select: choices.select } : {}),
    ...(weightKg !== undefined ? { weightKg } : {}),
    ...(choices?.stageDurationS !== undefined ? { stageDurationS: choices.stageDurationS } : {}),
  });
  const autoByIndex = new Map(auto.columns.map((c) => [c.index, c]));
  const currentByIndex = new Map<number, ColumnDecision>(test.importColumns.map((c) => [c.index, c]));
  const mapping = choices?.mapping ?? {};
  const findOverride = (header: string) => {
    const key = Object.keys(mapping).find((k) => k.trim().toLowerCase() === header.trim().toLowerCase());
    return key !== undefined ? mapping[key] : undefined;
  };

  const rows: ColumnRowView[] = layout.headers.map((header, index) => {
    // The first few values and the last one, as written in the file.
    const filled: string[] = [];
    for (const r of layout.rows) {
      const cell = r[index];
      if (cell !== null && cell !== undefined && String(cell).trim() !== "") filled.push(String(cell));
    }
    const samples =
      filled.length <= SAMPLE_COUNT ? filled : [...filled.slice(0, SAMPLE_COUNT - 1), "…", filled[filled.length - 1]];
    const cur = currentByIndex.get(index);
    const a = autoByIndex.get(index);
    const autoField: FieldKey | null = a ? (a.field ?? (a.storedAs ? "vo2MlMin" : null)) : null;
    const o = findOverride(header);
    let choiceField = "auto";
    let choiceUnit = "auto";
    if (o) {
      choiceField = o.field ?? "ignore";
      if (o.unit && o.field) {
        const key = parseUnitText(o.unit);
        choiceUnit = unitOptions(o.field).find((u) => parseUnitText(u.value) === key)?.value ?? "auto";
      }
    } else if (!choices && cur?.decidedBy === "user") {
      choiceField = cur.field ?? (cur.storedAs ? "vo2MlMin" : "ignore");
    }
    return {
      index,
      header,
      unitsRow: layout.units[index] ?? null,
      samples,
      readAs: cur ? readAsText(cur) : "not reached (the file was refused before this column was read)",
      reason: cur ? reasonAfterTag(cur.reason, decidedByText(cur.decidedBy)) : "",
      decidedBy: cur ? decidedByText(cur.decidedBy) : "—",
      autoField,
      autoLabel: a ? readAsText(a) : "ignored",
      choiceField,
      choiceUnit,
    };
  });

  // Several tests in one file: the identifying column and its values.
  let record: ColumnReview["record"] = null;
  const selectColumn =
    Object.keys(choices?.select ?? {})[0] ??
    [...test.importIssues, ...auto.issues].find((i) => i.code === "several-records")?.where?.column;
  const colIndex = selectColumn !== undefined ? layout.headers.indexOf(selectColumn) : -1;
  if (selectColumn !== undefined && colIndex >= 0) {
    const counts = new Map<string, number>();
    for (const r of layout.rows) {
      const v = r[colIndex];
      if (v === null || v === undefined || String(v).trim() === "") continue;
      const k = String(v).trim();
      counts.set(k, (counts.get(k) ?? 0) + 1);
    }
    record = {
      column: selectColumn,
      options: [...counts.entries()].map(([value, n]) => ({ value, rows: n })),
      chosen: choices?.select?.[selectColumn] ?? "",
    };
  }
  const perKgColumn =
    test.importColumns.some((c) => c.storedAs === "vo2MlKgMin" || /per kg|mL\/kg\/min/i.test(c.unit ?? "")) ||
    auto.columns.some((c) => c.storedAs === "vo2MlKgMin" || /per kg|mL\/kg\/min/i.test(c.unit ?? ""));
  const stageOrder = auto.format?.timeFormat === "stage-order";
  return { ...base, format: layout.format, rows, record, perKgColumn, stageOrder };
}
