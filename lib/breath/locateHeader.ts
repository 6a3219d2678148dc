import type { Grid } from "./parseDelimited";
import { isBlankCell, looksNumeric } from "./parseCell";
import { parseUnitText } from "./parseUnitText";

export type HeaderLocation =
  | { ok: true; headerIndex: number; unitsIndex: number | null; dataStart: number; width: number }
  | { ok: false; reason: "no-table-found" | "no-header-row" | "header-only"; headerIndex?: number };

interface RowProfile {
  filled: number;
  numeric: number;
  unitLike: number;
}

function profile(row: readonly (string | number | null)[]): RowProfile {
  let filled = 0;
  let numeric = 0;
  let unitLike = 0;
  for (const c of row) {
    if (isBlankCell(c)) continue;
    filled++;
    if (looksNumeric(c)) numeric++;
    else if (typeof c === "string" && (parseUnitText(c) !== undefined || /^[([].*[)\]]$/.test(c.trim()))) unitLike++;
  }
  return { filled, numeric, unitLike };
}

/**
 * Find the header row of a table that may sit under metadata lines, and an optional units row under
 * it. The data block is the first run of rows that are mostly numeric with the file's usual width;
 * the header is the nearest text row above it. A row directly above the data whose cells are
 * mostly unit spellings ("s", "ml/min", "(l/min)", "bpm") is the units row.
 */
export function locateHeader(grid: Grid): HeaderLocation {
  const profiles = grid.rows.map(profile);
  const isData = (p: RowProfile, width: number) => p.filled >= Math.max(2, Math.ceil(0.6 * width)) && p.numeric >= 0.5 * p.filled;
  const widths = new Map<number, number>();
  for (const p of profiles)
    if (p.filled >= 2 && p.numeric >= 0.5 * p.filled) widths.set(p.filled, (widths.get(p.filled) ?? 0) + 1);
  let width = 0;
  let best = 0;
  for (const [w, n] of widths) if (n > best || (n === best && w > width)) [width, best] = [w, n];
  const textRow = (p: RowProfile) => p.filled >= 2 && p.numeric < 0.5 * p.filled;
  if (width === 0) {
    const h = profiles.findIndex((p) => textRow(p));
    return h >= 0 ? { ok: false, reason: "header-only", headerIndex: h } : { ok: false, reason: "no-table-found" };
  }
  let dataStart = -1;
  for (let i = 0; i < profiles.length; i++) {
    if (!isData(profiles[i], width)) continue;
    const next = profiles[i + 1];
    if (next === undefined || isData(next, width)) {
      dataStart = i;
      break;
    }
  }
  if (dataStart < 0) return { ok: false, reason: "no-table-found" };
  let headerIndex = -1;
  for (let i = dataStart - 1; i >= 0; i--) {
    const p = profiles[i];
    if (textRow(p) && p.filled >= Math.max(2, Math.ceil(0.5 * width))) {
      headerIndex = i;
      break;
    }
  }
  if (headerIndex < 0) return { ok: false, reason: "no-header-row" };
  let unitsIndex: number | null = null;
  const h = profiles[headerIndex];
  if (headerIndex === dataStart - 1 && h.unitLike >= 0.6 * h.filled && headerIndex > 0) {
    // the row found is a units row: the header is the text row just above it
    const above = profiles[headerIndex - 1];
    if (textRow(above) && above.unitLike < 0.5 * above.filled) {
      unitsIndex = headerIndex;
      headerIndex = headerIndex - 1;
    }
  }
  return { ok: true, headerIndex, unitsIndex, dataStart, width };
}
