import { z } from "zod";
import { makeIssue, type Issue } from "../core";
import { PLAIN_COLUMNS, type BreathRow, type BreathTable, type NumericField, type Phase, PHASES } from "./types";

/** How one source column was understood. Shown to the user with its reason. */
export interface ColumnDecision {
  /** Header text as found in the file. */
  header: string;
  /** 0-based column index in the file. */
  index: number;
  /** Canonical field, or null when the column is ignored. */
  field: NumericField | "phase" | null;
  /** Unit the values were read in (before conversion to canonical). */
  unit?: string;
  reason: string;
}

export interface ImportOptions {
  fileName?: string;
}

export interface ImportResult {
  /** null when the file cannot be used; `issues` then says what to fix. */
  table: BreathTable | null;
  columns: ColumnDecision[];
  issues: Issue[];
}

const finite = z.number().refine(Number.isFinite, "not a finite number");

/** Plausible physiological ranges in canonical units (common practice; generous on purpose). */
export const PLAUSIBLE_RANGE: Partial<Record<NumericField, [number, number]>> = {
  vo2MlMin: [50, 8000],
  vco2MlMin: [30, 10000],
  veLMin: [1, 300],
  hrBpm: [25, 240],
  workW: [0, 2500],
  speedKmh: [0, 40],
  gradePct: [-10, 40],
  rrBrMin: [3, 90],
  vtL: [0.1, 6],
  peto2MmHg: [40, 150],
  petco2MmHg: [10, 80],
  spo2Pct: [50, 100],
  lactateMmolL: [0.1, 30],
};

const rowSchema = z.object({ timeS: finite }).passthrough();

/**
 * Import a breath-by-breath or stage table. This first version reads the plain column
 * convention (README: `time_s, vo2_ml_min, …`), comma-separated, and checks plausibility.
 */
export async function importBreathFile(bytes: Uint8Array, _options: ImportOptions = {}): Promise<ImportResult> {
  const issues: Issue[] = [];
  const text = new TextDecoder("utf-8", { fatal: false }).decode(bytes).replace(/^\uFEFF/, "");
  const lines = text.split(/\r\n|\n|\r/);
  const headerIndex = lines.findIndex((l) => l.trim().length > 0);
  if (headerIndex < 0) {
    return { table: null, columns: [], issues: [makeIssue("error", "empty-file", "The file is empty.")] };
  }
  const headers = lines[headerIndex].split(",").map((h) => h.trim().replace(/^"|"$/g, ""));
  const columns: ColumnDecision[] = headers.map((header, index) => {
    const field = PLAIN_COLUMNS[header.toLowerCase()] ?? null;
    return field
      ? { header, index, field, reason: "plain column convention: the header names quantity and unit" }
      : { header, index, field: null, reason: "not a recognised column name; ignored" };
  });
  if (!columns.some((c) => c.field === "timeS")) {
    issues.push(makeIssue("error", "no-time-column", "No time column was found. Add a column named time_s (seconds)."));
  }
  if (!columns.some((c) => c.field === "vo2MlMin")) {
    issues.push(makeIssue("error", "no-vo2-column", "No VO2 column was found. Add a column named vo2_ml_min (mL/min)."));
  }
  if (issues.length > 0) return { table: null, columns, issues };

  const rows: BreathRow[] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const line = lines[i];
    if (line.trim().length === 0) continue;
    const cells = line.split(",");
    const row: Record<string, unknown> = { sourceRow: i + 1 };
    for (const col of columns) {
      if (!col.field) continue;
      const raw = (cells[col.index] ?? "").trim().replace(/^"|"$/g, "");
      if (raw === "") continue;
      if (col.field === "phase") {
        const p = raw.toLowerCase() as Phase;
        if (PHASES.includes(p)) row.phase = p;
        else issues.push(makeIssue("warning", "unknown-phase", `Phase "${raw}" is not one of rest, warmup, exercise, recovery; ignored.`, { row: i + 1, column: col.header }));
        continue;
      }
      const value = Number(raw);
      if (!Number.isFinite(value)) {
        issues.push(makeIssue("warning", "not-a-number", `"${raw}" is not a number; the cell was left empty.`, { row: i + 1, column: col.header }));
        continue;
      }
      row[col.field] = value;
    }
    const parsed = rowSchema.safeParse(row);
    if (!parsed.success) {
      issues.push(makeIssue("warning", "row-without-time", "A row has no usable time; it was set aside.", { row: i + 1 }));
      continue;
    }
    rows.push(parsed.data as unknown as BreathRow);
  }
  for (let r = 1; r < rows.length; r++) {
    if (rows[r].timeS < rows[r - 1].timeS) {
      issues.push(makeIssue("error", "time-goes-backwards", `Time goes backwards at row ${rows[r].sourceRow}.`, { row: rows[r].sourceRow, column: "time_s" }));
      break;
    }
  }
  for (const [field, [lo, hi]] of Object.entries(PLAUSIBLE_RANGE) as [NumericField, [number, number]][]) {
    const out = rows.filter((r) => r[field] !== undefined && ((r[field] as number) < lo || (r[field] as number) > hi));
    if (out.length > 0) {
      issues.push(makeIssue("warning", "implausible-values", `${out.length} value(s) of ${field} lie outside ${lo}–${hi}; check the units.`, { row: out[0].sourceRow, field }));
    }
  }
  if (rows.length < 10) {
    issues.push(makeIssue("error", "too-few-rows", `Only ${rows.length} usable rows were found; at least 10 are needed.`));
  }
  const usable = !issues.some((x) => x.severity === "error");
  const fields = columns.flatMap((c) => (c.field ? [c.field] : []));
  return { table: usable ? { shape: "breath", rows, fields } : null, columns, issues };
}
