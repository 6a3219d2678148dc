/** A cell as read: text from delimited files, text or number from workbooks, null when empty. */
export type Cell = string | number | null;

/** A table of cells with the 1-based file line (or sheet row) of each row. */
export interface Grid {
  rows: Cell[][];
  lines: number[];
}

export type Delimiter = "," | ";" | "\t" | "|" | "whitespace";

/** Split one line on `delimiter`, honouring double quotes ("" inside quotes is one quote). */
export function splitLine(line: string, delimiter: Delimiter): string[] {
  if (delimiter === "whitespace") return line.trim().split(/\s{2,}|\t/);
  const out: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"') {
        if (line[i + 1] === '"') {
          cell += '"';
          i++;
        } else quoted = false;
      } else cell += ch;
    } else if (ch === '"' && cell.trim().length === 0) {
      quoted = true;
      cell = "";
    } else if (ch === delimiter) {
      out.push(cell);
      cell = "";
    } else cell += ch;
  }
  out.push(cell);
  return out;
}

/**
 * Detect the delimiter from the lower part of the file (where the data rows are): the first of tab,
 * semicolon, pipe, comma that splits at least 80 % of those lines into the same number (≥ 2) of
 * fields. Tab and semicolon are tried before comma because a comma may be a decimal mark.
 * Falls back to aligned columns (two or more spaces), then to comma.
 */
export function detectDelimiter(lines: readonly string[]): Delimiter {
  const nonEmpty = lines.filter((l) => l.trim().length > 0);
  const sample = nonEmpty.slice(Math.floor(nonEmpty.length * 0.3)).slice(0, 200);
  if (sample.length === 0) return ",";
  const candidates: Delimiter[] = ["\t", ";", "|", ",", "whitespace"];
  for (const d of candidates) {
    const counts = new Map<number, number>();
    for (const line of sample) {
      const n = splitLine(line, d).length;
      counts.set(n, (counts.get(n) ?? 0) + 1);
    }
    let modeCount = 0;
    let mode = 0;
    for (const [n, c] of counts) {
      if (c > modeCount || (c === modeCount && n > mode)) {
        mode = n;
        modeCount = c;
      }
    }
    if (mode >= 2 && modeCount >= 0.8 * sample.length) return d;
  }
  return ",";
}

/**
 * Parse delimited text into a grid. Quoted fields may hold delimiters and line breaks.
 * Blank lines are skipped; `lines` keeps each row's 1-based line number.
 */
export function parseDelimited(text: string, delimiter: Delimiter): Grid {
  const rows: Cell[][] = [];
  const lines: number[] = [];
  if (delimiter === "whitespace") {
    const raw = text.split(/\r\n|\n|\r/);
    for (let i = 0; i < raw.length; i++) {
      if (raw[i].trim().length === 0) continue;
      rows.push(splitLine(raw[i], delimiter).map(clean));
      lines.push(i + 1);
    }
    return { rows, lines };
  }
  let row: Cell[] = [];
  let cell = "";
  let quoted = false;
  let line = 1;
  let rowLine = 1;
  let cellStarted = false;
  const pushRow = () => {
    row.push(clean(cell));
    if (row.some((c) => c !== null)) {
      rows.push(row);
      lines.push(rowLine);
    }
    row = [];
    cell = "";
    cellStarted = false;
  };
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          cell += '"';
          i++;
        } else quoted = false;
      } else {
        if (ch === "\n") line++;
        cell += ch;
      }
      continue;
    }
    if (ch === '"' && !cellStarted) {
      quoted = true;
      cellStarted = true;
      cell = "";
    } else if (ch === delimiter) {
      row.push(clean(cell));
      cell = "";
      cellStarted = false;
    } else if (ch === "\n" || ch === "\r") {
      if (ch === "\r" && text[i + 1] === "\n") i++;
      pushRow();
      line++;
      rowLine = line;
    } else {
      if (ch !== " " || cellStarted) cellStarted = cellStarted || ch !== " ";
      cell += ch;
    }
  }
  if (cell.length > 0 || row.length > 0) pushRow();
  return { rows, lines };
}

function clean(s: string): string | null {
  const t = s.trim();
  return t.length === 0 ? null : t;
}
