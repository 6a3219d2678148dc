import { makeIssue, type Issue } from "../core";
import { decodeBytes } from "./decodeBytes";
import { locateHeader } from "./locateHeader";
import { isBlankCell, looksNumeric } from "./parseCell";
import { detectDelimiter, parseDelimited, type Cell, type Delimiter, type Grid } from "./parseDelimited";
import { readXlsxGrid } from "./readXlsxGrid";
import type { FileFormat } from "./types";

/** A table found in a file: header, optional units row, data rows (with file lines) and the rows that hold events. */
export interface TableLayout {
  headers: string[];
  units: (string | null)[];
  rows: Cell[][];
  lines: number[];
  /** Rows inside the data block that are not data (event or marker lines). */
  eventRows: { cells: Cell[]; line: number }[];
  format: Omit<FileFormat, "timeFormat">;
}

const KIND_OF: Record<Delimiter, FileFormat["kind"]> = {
  ",": "csv",
  ";": "semicolon",
  "\t": "tsv",
  "|": "pipe",
  whitespace: "whitespace",
};

/**
 * Bytes → table layout: decode (text or xlsx), detect delimiter and decimal mark, find the header under
 * any metadata lines, and a units row. Problems that make the file unusable come back as error issues
 * (never thrown).
 */
export async function readTableLayout(bytes: Uint8Array, issues: Issue[]): Promise<TableLayout | null> {
  const decoded = decodeBytes(bytes);
  let grid: Grid;
  let kind: FileFormat["kind"];
  let encoding: FileFormat["encoding"];
  let sheet: string | undefined;
  switch (decoded.kind) {
    case "empty":
      issues.push(
        makeIssue("error", "empty-file", "The file is empty. Export the test again and upload the file that holds the data."),
      );
      return null;
    case "binary":
      issues.push(
        makeIssue(
          "error",
          "binary-file",
          "This file is not a text table (CSV, TSV) or an .xlsx workbook. Export the test as CSV or .xlsx and upload that.",
        ),
      );
      return null;
    case "legacy-xls":
      issues.push(
        makeIssue(
          "error",
          "legacy-xls",
          "This is an old-style .xls workbook, which cannot be read. Save it as .xlsx or CSV and upload again.",
        ),
      );
      return null;
    case "xlsx": {
      const x = await readXlsxGrid(bytes);
      if (!x.ok) {
        issues.push(
          makeIssue(
            "error",
            "xlsx-unreadable",
            `The workbook could not be opened (${x.message}). Save it again as .xlsx or export CSV.`,
          ),
        );
        return null;
      }
      grid = x.grid;
      kind = "xlsx";
      encoding = "xlsx";
      sheet = x.sheet;
      if (x.sheetCount > 1)
        issues.push(
          makeIssue(
            "info",
            "sheet-chosen",
            `The workbook has ${x.sheetCount} sheets; the sheet "${x.sheet}" holds the table and was read.`,
          ),
        );
      break;
    }
    case "text": {
      const lines = decoded.text.split(/\r\n|\n|\r/);
      const delimiter = detectDelimiter(lines);
      grid = parseDelimited(decoded.text, delimiter);
      kind = KIND_OF[delimiter];
      encoding = decoded.encoding;
      break;
    }
  }
  const loc = locateHeader(grid);
  if (!loc.ok) {
    if (loc.reason === "header-only") {
      issues.push(
        makeIssue(
          "error",
          "header-only",
          "The file has column names but no rows of numbers under them. Export the test with its data.",
          { row: grid.lines[loc.headerIndex ?? 0] },
        ),
      );
    } else if (loc.reason === "no-header-row") {
      issues.push(
        makeIssue(
          "error",
          "no-header-row",
          "Rows of numbers were found but no line of column names above them. Add a header line (e.g. time_s, vo2_ml_min, …).",
        ),
      );
    } else {
      issues.push(
        makeIssue(
          "error",
          "no-table-found",
          "No table of numbers was found. The file needs a line of column names followed by rows of values.",
        ),
      );
    }
    return null;
  }
  const headerCells = grid.rows[loc.headerIndex];
  const width = Math.max(headerCells.length, loc.width);
  const headers: string[] = [];
  const seen = new Map<string, number>();
  for (let i = 0; i < width; i++) {
    const c = headerCells[i];
    let h = c === null || c === undefined ? `column ${i + 1}` : String(c).trim();
    const n = seen.get(h) ?? 0;
    seen.set(h, n + 1);
    if (n > 0) h = `${h} (${n + 1})`;
    headers.push(h);
  }
  const unitCells = loc.unitsIndex !== null ? grid.rows[loc.unitsIndex] : [];
  const units = headers.map((_, i) => {
    const u = unitCells[i];
    return u === null || u === undefined ? null : String(u);
  });
  // metadata: every non-empty line above the header
  const metadata: Record<string, string> = {};
  for (let r = 0; r < loc.headerIndex; r++) {
    const cells = grid.rows[r].filter((c) => c !== null).map((c) => String(c).trim());
    if (cells.length === 0) continue;
    let key: string | undefined;
    let value: string | undefined;
    const m = /^([^:=]{1,60})[:=]\s*(.*)$/.exec(cells[0]);
    if (m) {
      key = m[1].trim();
      value = [m[2], ...cells.slice(1)].filter((s) => s.length > 0).join(" ");
    } else if (cells.length >= 2) {
      key = cells[0].replace(/[:=]\s*$/, "");
      value = cells.slice(1).join(" ");
    }
    if (key && value !== undefined && !(key in metadata)) metadata[key] = value;
  }
  const metadataLines = loc.headerIndex;
  if (metadataLines > 0) {
    issues.push(
      makeIssue("info", "metadata-found", `${metadataLines} line(s) above the header were read as record details, not data.`, {
        row: grid.lines[0],
      }),
    );
  }
  if (loc.unitsIndex !== null) {
    issues.push(
      makeIssue("info", "units-row-found", "The line under the header gives units; they were used to read the columns.", {
        row: grid.lines[loc.unitsIndex],
      }),
    );
  }
  const rows: Cell[][] = [];
  const lines: number[] = [];
  const eventRows: { cells: Cell[]; line: number }[] = [];
  let commaDecimals = 0;
  let dotDecimals = 0;
  for (let r = loc.dataStart; r < grid.rows.length; r++) {
    const cells = grid.rows[r];
    let filled = 0;
    let numeric = 0;
    for (const c of cells) {
      if (isBlankCell(c)) continue;
      filled++;
      if (looksNumeric(c)) {
        numeric++;
        if (typeof c === "string") {
          if (/^[-+]?\d*,\d+$/.test(c) || /^[-+]?\d{1,3}(\.\d{3})+,\d+$/.test(c)) commaDecimals++;
          else if (/^[-+]?\d*\.\d+$/.test(c) || /^[-+]?\d{1,3}(,\d{3})+\.\d+$/.test(c)) dotDecimals++;
        }
      }
    }
    if (filled < Math.max(2, Math.ceil(0.5 * loc.width)) || numeric < 0.5 * filled) {
      eventRows.push({ cells, line: grid.lines[r] });
      continue;
    }
    rows.push(cells);
    lines.push(grid.lines[r]);
  }
  return {
    headers,
    units,
    rows,
    lines,
    eventRows,
    format: {
      kind,
      encoding,
      decimalMark: commaDecimals > dotDecimals ? "," : ".",
      headerRow: grid.lines[loc.headerIndex],
      unitsRow: loc.unitsIndex !== null ? grid.lines[loc.unitsIndex] : null,
      metadataLines,
      metadata,
      ...(sheet !== undefined ? { sheet } : {}),
    },
  };
}
