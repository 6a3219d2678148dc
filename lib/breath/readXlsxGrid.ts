import type { Cell, Grid } from "./parseDelimited";

/** Seconds between the spreadsheet day-zero (1899-12-30) and the Unix epoch. */
const SHEET_EPOCH_MS = Date.UTC(1899, 11, 30);

export type XlsxGridResult = { ok: true; grid: Grid; sheet: string; sheetCount: number } | { ok: false; message: string };

/**
 * Read the most table-like worksheet of an xlsx workbook into a grid (exceljs, loaded on demand).
 * Numbers stay numbers; a date/time cell becomes seconds since the sheet's day zero, so a cell
 * formatted as a duration (e.g. 00:05:30) gives 330 s. Formula cells give their cached result.
 * Never throws: a workbook that cannot be opened gives `{ ok: false }`.
 */
export async function readXlsxGrid(bytes: Uint8Array): Promise<XlsxGridResult> {
  try {
    const { default: ExcelJS } = await import("exceljs");
    const workbook = new ExcelJS.Workbook();
    const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    await workbook.xlsx.load(buffer);
    let best: { grid: Grid; sheet: string; score: number } | null = null;
    for (const ws of workbook.worksheets) {
      const rows: Cell[][] = [];
      const lines: number[] = [];
      let score = 0;
      ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
        const values = Array.isArray(row.values) ? row.values.slice(1) : [];
        const cells: Cell[] = values.map((v) => toCell(v));
        if (!cells.some((c) => c !== null)) return;
        if (cells.filter((c) => typeof c === "number").length >= 2) score++;
        rows.push(cells);
        lines.push(rowNumber);
      });
      if (!best || score > best.score) best = { grid: { rows, lines }, sheet: ws.name, score };
    }
    if (!best) return { ok: false, message: "The workbook has no worksheets." };
    return { ok: true, grid: best.grid, sheet: best.sheet, sheetCount: workbook.worksheets.length };
  } catch (e) {
    return { ok: false, message: e instanceof Error ? e.message : String(e) };
  }
}

function toCell(v: unknown): Cell {
  if (v === null || v === undefined) return null;
  if (typeof v === "number") return Number.isFinite(v) ? v : null;
  if (typeof v === "string") return v.trim().length > 0 ? v.trim() : null;
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  if (v instanceof Date) {
    const ms = v.getTime();
    return Number.isFinite(ms) ? Math.round(ms - SHEET_EPOCH_MS) / 1000 : null;
  }
  if (typeof v === "object") {
    const o = v as Record<string, unknown>;
    if ("result" in o) return toCell(o.result);
    if ("richText" in o && Array.isArray(o.richText))
      return toCell(o.richText.map((p) => (p as { text?: string }).text ?? "").join(""));
    if ("text" in o) return toCell(o.text);
    if ("error" in o) return null;
  }
  return null;
}
