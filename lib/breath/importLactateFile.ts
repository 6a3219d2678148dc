import { makeIssue, type Issue } from "../core";
import { factorToCanonical } from "./inferColumnUnit";
import { decodeBytes } from "./decodeBytes";
import { isBlankCell, looksNumeric, parseNumberCell } from "./parseCell";
import { detectDelimiter, parseDelimited, type Grid } from "./parseDelimited";
import { readXlsxGrid } from "./readXlsxGrid";
import { readSimpleColumns } from "./readSimpleColumns";
import { readTableLayout } from "./readTableLayout";
import type { LactateSample } from "./types";

export interface LactateImportOptions {
  /** Time unit when the header gives none and cells are plain numbers. @default "s" */
  timeUnit?: "s" | "min";
  /**
   * Lactate unit when the header gives none. @default undefined: mmol/L, unless the values' magnitude says mg/dL
   * (`LACTATE_MG_DL_RULE`) or leaves it open (then the file is refused with a question).
   */
  lactateUnit?: "mmol/L" | "mg/dL";
}

export interface LactateImportResult {
  samples: LactateSample[];
  issues: Issue[];
}

/** Normalised header names for lactate files (see `COLUMN_SYNONYMS` for the breath table's list). */
const LACTATE_COLUMNS = {
  lactate: ["lactate", "la", "lac", "bla", "lactat", "bloodlactate", "blac", "lactatemmoll"],
  time: ["time", "t", "zeit", "elapsed", "timesample", "sampletime"],
  stage: ["stage", "step", "level", "stageindex", "stagenumber", "stageno"],
  work: ["load", "power", "watts", "watt", "wr", "work", "workrate", "workload"],
  speed: ["speed", "velocity", "beltspeed"],
} as const;

/** Plausible blood lactate, mmol/L (common practice; generous). */
const LACTATE_RANGE: [number, number] = [0.1, 30];

/**
 * Lowest value (as written, no unit) from which a lactate series is not read as mmol/L without a unit: 0.5 mmol/L in
 * mg/dL (0.5 × 9.008 = 4.5). Resting blood lactate is about 0.5–2 mmol/L (common practice, recalled textbook range),
 * i.e. about 4.5–18 mg/dL; 1 mmol/L = 9.008 mg/dL from the molar mass of lactate, 90.08 g/mol (lib/units).
 */
const MG_DL_LOWEST = 4.5;

/**
 * How a lactate column without a unit is read (our choice, on the ranges above):
 * - lowest value < 4.5: mmol/L (a series with a resting or low-intensity sample; in mg/dL it would be < 0.5 mmol/L);
 * - lowest ≥ 4.5 and highest > 30: mg/dL (unambiguous: no blood lactate reaches 30 mmol/L, and the lowest read as
 *   mg/dL is ≥ 0.5 mmol/L, a resting value);
 * - lowest ≥ 4.5, highest ≤ 30, three samples or more: left open, the file is refused with a question (either unit
 *   gives a plausible series: a mg/dL curve from rest, or a mmol/L curve drawn only at high intensity);
 * - fewer than three samples: mmol/L (no threshold is read from them).
 */
export const LACTATE_MG_DL_RULE =
  "a lactate column without a unit is read as mg/dL when its lowest value is at least 4.5 (0.5 mmol/L, a resting value, is 4.5 mg/dL) and its highest is above 30 (no blood lactate reaches 30 mmol/L)";

/**
 * Import blood lactate samples (by time and/or stage, with work rate or speed when given) from CSV/TSV/
 * semicolon text or xlsx. Lactate in mg/dL is converted (÷ 9.008, lib/units); a column without a unit is read by
 * `LACTATE_MG_DL_RULE` (or the caller's `lactateUnit`), and refused with a question when its magnitude leaves the unit
 * open. Samples outside 0.1–30 mmol/L are set aside with a warning; samples with nothing that places them in the test
 * (no time, stage, work rate or speed) are counted in a warning. Never throws.
 */
export async function importLactateFile(bytes: Uint8Array, options: LactateImportOptions = {}): Promise<LactateImportResult> {
  const issues: Issue[] = [];
  const layout = await readTableLayout(bytes, issues);
  if (!layout) return { samples: [], issues };
  const cols = readSimpleColumns(layout, LACTATE_COLUMNS, [], issues);
  const la = cols.values.lactate;
  if (!la) {
    issues.push(makeIssue("error", "no-lactate-column", "No lactate column was found. Name it lactate_mmol_l (or Lactate, La)."));
    return { samples: [], issues };
  }
  const { time, stage, work, speed } = cols.values;
  if (!time && !stage && !work && !speed) {
    issues.push(
      makeIssue(
        "error",
        "lactate-no-position",
        "The lactate samples have no time, stage, work rate or speed column, so they cannot be placed in the test.",
      ),
    );
    return { samples: [], issues };
  }
  // the unit: the header's (bracket, trailing token, or a name like lactate_mmol_l), else the caller's, else magnitude
  const header = cols.headers.lactate ?? "";
  const headerUnit = cols.units.lactate ?? (/mmol/i.test(header) ? "mmol/L" : /mg.?dl/i.test(header) ? "mg/dL" : undefined);
  let unit = headerUnit ?? options.lactateUnit;
  if (!unit) {
    const given = Array.from(la).filter((v) => Number.isFinite(v) && v > 0);
    const lo = given.length ? Math.min(...given) : NaN;
    const hi = given.length ? Math.max(...given) : NaN;
    if (lo >= MG_DL_LOWEST && hi > LACTATE_RANGE[1]) {
      unit = "mg/dL";
      issues.push(
        makeIssue(
          "info",
          "lactate-unit-inferred",
          `The lactate column gives no unit; its values (${fmt(lo)}–${fmt(hi)}) were read as mg/dL: as mmol/L the highest would exceed any blood lactate (30 mmol/L) and the lowest would be far above a resting value (about 0.5–2 mmol/L). If they are mmol/L, name the unit in the header (e.g. "lactate (mmol/L)").`,
        ),
      );
    } else if (lo >= MG_DL_LOWEST && given.length >= 3) {
      issues.push(
        makeIssue(
          "error",
          "lactate-unit-unclear",
          `The lactate column gives no unit, and its lowest value, ${fmt(lo)}, is far above a resting blood lactate in mmol/L (about 0.5–2 mmol/L). Are the values in mg/dL (${fmt(lo)} mg/dL = ${fmt(lo / 9.008)} mmol/L)? Name the unit in the header, e.g. "lactate (mg/dL)" or "lactate (mmol/L)", or choose it where the file is read (the lactate form's unit; on the command line --lactate-unit mg/dL or mmol/L). No threshold is read until the unit is known.`,
        ),
      );
      return { samples: [], issues };
    } else unit = "mmol/L";
  } else if (headerUnit && options.lactateUnit && headerUnit !== options.lactateUnit)
    issues.push(
      makeIssue(
        "warning",
        "lactate-unit-conflict",
        `The header "${header}" gives the lactate unit ${headerUnit}; the unit chosen (${options.lactateUnit}) was not used.`,
      ),
    );
  const laFactor = unit === "mg/dL" ? (factorToCanonical("lactateMmolL", "mg/dL") ?? 1) : 1;
  const timeUnit = cols.units.time ?? options.timeUnit ?? "s";
  // minutes chosen by the user where the header names another unit: said, as the lactate unit is (never ignored silently);
  // seconds are the default every form sends, so choosing them says nothing
  if (cols.units.time && options.timeUnit === "min" && cols.units.time !== "min")
    issues.push(
      makeIssue(
        "info",
        "lactate-time-unit-from-header",
        `The time header gives the unit ${cols.units.time}; the time unit chosen (${options.timeUnit}) was not used.`,
      ),
    );
  const timeFactor = timeUnit === "clock" ? 1 : (factorToCanonical("timeS", timeUnit) ?? 1);
  const speedFactor = cols.units.speed ? (factorToCanonical("speedKmh", cols.units.speed) ?? 1) : 1;
  const samples: LactateSample[] = [];
  let out = 0;
  let firstOut: number | undefined;
  // rows with a lactate value and nothing that places it in the test: counted and said, never dropped silently
  const unplaced: number[] = [];
  const lacCol = layout.headers.indexOf(header);
  // a row holding only a lactate value is not a data row of the table (too few cells): find such rows in the grid
  const grid = await readGrid(bytes);
  const dataLines = new Set(layout.lines);
  const afterHeader = layout.format.unitsRow ?? layout.format.headerRow;
  if (grid && lacCol >= 0)
    grid.rows.forEach((cells, r) => {
      const line = grid.lines[r];
      if (line <= afterHeader || dataLines.has(line)) return;
      const c = cells[lacCol] ?? null;
      const others = cells.filter((x, j) => j !== lacCol && !isBlankCell(x ?? null));
      if (looksNumeric(c) && others.length === 0 && Number.isFinite(parseNumberCell(c, layout.format.decimalMark)))
        unplaced.push(line);
    });
  for (let i = 0; i < la.length; i++) {
    const v = la[i] * laFactor;
    if (!Number.isFinite(v)) continue;
    const placed = [time, stage, work, speed].some((col) => col && Number.isFinite(col[i]));
    if (!placed) {
      unplaced.push(cols.lines[i]);
      continue;
    }
    if (v < LACTATE_RANGE[0] || v > LACTATE_RANGE[1]) {
      out++;
      firstOut ??= cols.lines[i];
      continue;
    }
    const s: LactateSample = { lactateMmolL: v };
    if (time && Number.isFinite(time[i])) s.timeS = time[i] * timeFactor;
    if (stage && Number.isFinite(stage[i])) s.stage = stage[i];
    if (work && Number.isFinite(work[i])) s.workW = work[i];
    if (speed && Number.isFinite(speed[i])) s.speedKmh = speed[i] * speedFactor;
    samples.push(s);
  }
  if (out > 0)
    issues.push(
      makeIssue(
        "warning",
        "implausible-values",
        `${out} lactate value(s) lie outside ${LACTATE_RANGE[0]}–${LACTATE_RANGE[1]} mmol/L and were set aside (first at row ${firstOut}).`,
        { row: firstOut },
      ),
    );
  if (unplaced.length > 0) {
    unplaced.sort((a, b) => a - b);
    issues.push(
      makeIssue(
        "warning",
        "lactate-without-position",
        `${unplaced.length} lactate sample(s) (row${unplaced.length === 1 ? "" : "s"} ${unplaced.join(", ")}) give no time, stage, work rate or speed and were left out.`,
        { row: unplaced[0] },
      ),
    );
  }
  if (laFactor !== 1 && samples.length > 0)
    issues.push(
      makeIssue(
        "info",
        "lactate-converted",
        `Lactate was given in mg/dL and converted to mmol/L (÷ ${+(1 / laFactor).toFixed(3)}, from the molar mass of lactate) for every threshold read from it.`,
      ),
    );
  if (samples.length === 0) issues.push(makeIssue("error", "too-few-rows", "No usable lactate samples were found."));
  return { samples, issues };
}

const fmt = (v: number) => String(Math.round(v * 10) / 10);

/** The file's cells as read (text or the workbook's sheet), to find rows the table layout set aside. */
async function readGrid(bytes: Uint8Array): Promise<Grid | null> {
  const decoded = decodeBytes(bytes);
  if (decoded.kind === "text") return parseDelimited(decoded.text, detectDelimiter(decoded.text.split(/\r\n|\n|\r/)));
  if (decoded.kind === "xlsx") {
    const x = await readXlsxGrid(bytes);
    return x.ok ? x.grid : null;
  }
  return null;
}
