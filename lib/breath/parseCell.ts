import type { Cell } from "./parseDelimited";

/** Cell texts that mean "no value" (common practice in exported tables). */
const EMPTY_MARKERS = new Set(["-", "--", "---", ".", "na", "n/a", "nan", "null", "none", "—", "–", "*"]);

const NUMBER_DOT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;
const NUMBER_COMMA = /^[-+]?(\d+,?\d*|,\d+)([eE][-+]?\d+)?$/;
/** Decimal dot with comma thousands ("1,087.7"). */
const THOUSANDS_DOT = /^[-+]?\d{1,3}(,\d{3})+(\.\d+)?$/;
/** Decimal comma with dot thousands ("1.087,7", "1.187"), as spreadsheets in comma-decimal locales write them. */
const THOUSANDS_COMMA = /^[-+]?\d{1,3}(\.\d{3})+(,\d+)?$/;
/** Space thousands (plain, no-break or narrow no-break space) with either decimal mark ("1 087,7", "1 087.7"). */
const THOUSANDS_SPACE = /^[-+]?\d{1,3}([ \u00a0\u202f]\d{3})+([.,]\d+)?$/;
const CLOCK = /^[-+]?\d{1,3}:\d{1,2}(:\d{1,2})?([.,]\d+)?$/;

/** True when a cell holds nothing usable (empty or an empty marker such as "-" or "n/a"). */
export function isBlankCell(cell: Cell): boolean {
  return cell === null || (typeof cell === "string" && EMPTY_MARKERS.has(cell.trim().toLowerCase()));
}

/** True when a text cell looks like a number in either decimal convention, or a clock time. */
export function looksNumeric(cell: Cell): boolean {
  if (typeof cell === "number") return true;
  if (cell === null) return false;
  const s = cell.trim();
  return (
    NUMBER_DOT.test(s) ||
    NUMBER_COMMA.test(s) ||
    THOUSANDS_DOT.test(s) ||
    THOUSANDS_COMMA.test(s) ||
    THOUSANDS_SPACE.test(s) ||
    CLOCK.test(s)
  );
}

/**
 * Parse a numeric cell with the file's decimal mark. Thousands separators that cannot be the decimal mark are
 * read too: a dot in a comma-decimal file ("1.087,7" = 1087.7; "1.187" = 1187), a comma in a dot-decimal file
 * ("1,087.7"), spaces in either. Returns NaN when the cell is not a number (blank cells give NaN too; tell them apart
 * with `isBlankCell`).
 */
export function parseNumberCell(cell: Cell, decimalMark: "." | ","): number {
  if (typeof cell === "number") return cell;
  if (cell === null) return NaN;
  let s = cell.trim();
  // the plain forms first (nearly every cell), the thousands-separated ones only when those fail
  if (decimalMark === ",") {
    if (NUMBER_COMMA.test(s)) s = s.replace(",", ".");
    else if (THOUSANDS_COMMA.test(s)) s = s.replace(/\./g, "").replace(",", ".");
    else if (THOUSANDS_SPACE.test(s)) s = s.replace(/[ \u00a0\u202f]/g, "").replace(",", ".");
    else return NaN;
  } else if (!NUMBER_DOT.test(s)) {
    if (THOUSANDS_DOT.test(s)) s = s.replace(/,/g, "");
    else if (THOUSANDS_SPACE.test(s)) s = s.replace(/[ \u00a0\u202f]/g, "");
    else return NaN;
  }
  const v = Number(s);
  return Number.isFinite(v) ? v : NaN;
}

/**
 * Parse a clock-style time: "m:ss", "mm:ss.s" (minutes may exceed 59) or "h:mm:ss(.s)".
 * Returns seconds, or NaN when the text is not a clock time.
 */
export function parseClock(cell: Cell): number {
  if (typeof cell !== "string") return NaN;
  const s = cell.trim();
  if (!CLOCK.test(s)) return NaN;
  const negative = s.startsWith("-");
  const parts = s.replace(/^[-+]/, "").replace(",", ".").split(":");
  let seconds: number;
  if (parts.length === 2) seconds = Number(parts[0]) * 60 + Number(parts[1]);
  else seconds = Number(parts[0]) * 3600 + Number(parts[1]) * 60 + Number(parts[2]);
  return negative ? -seconds : seconds;
}

/**
 * A time typed by a person (a form field, a command-line option): a clock time as in the files ("6:00", "1:02:30")
 * or plain seconds ("360"). Returns seconds, or NaN when the text is neither or the time is negative.
 */
export function parseTimeText(text: string): number {
  const v = parseSignedTimeText(text);
  return v >= 0 ? v : NaN;
}

/**
 * As `parseTimeText`, but a leading minus is kept: a time on a record's clock that counts from the start of exercise, so
 * rest lies before 0 ("-2:00" = −120 s). NaN when the text is not a time.
 */
export function parseSignedTimeText(text: string): number {
  const s = text.trim();
  return isClockCell(s) ? parseClock(s) : s === "" ? NaN : parseNumberCell(s, ".");
}

/** True when a text cell is a clock time ("m:ss", "h:mm:ss"). */
export function isClockCell(cell: Cell): boolean {
  return typeof cell === "string" && CLOCK.test(cell.trim());
}
