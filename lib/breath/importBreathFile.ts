import { z } from "zod";
import { DEFAULT_STAGE_DURATION_S, makeIssue, type Issue } from "../core";
import {
  CANONICAL_UNIT_OF,
  columnStats,
  factorToCanonical,
  guessUnitFromValues,
  plausibleIn,
  PLAUSIBLE_RANGE,
  PLAUSIBLE_RR_INTERVAL_MS,
  PLAUSIBLE_VO2_PER_KG,
} from "./inferColumnUnit";
import { checkPhysiologicalLimits, isolatedBreaths } from "./checkPhysiologicalLimits";
import { BeatGroup, cleanRrIntervals, RR_NEIGHBOUR_FRACTION, type RrCleaning } from "./heartRateFromRr";
import { columnMappingSchema, type ColumnMapping, type ColumnOverride } from "./mappingProfile";
import { isBlankCell, isClockCell, parseClock, parseNumberCell } from "./parseCell";
import type { Cell } from "./parseDelimited";
import { parseUnitText } from "./parseUnitText";
import { phaseFromText } from "./phaseFromText";
import { readTableLayout, type TableLayout } from "./readTableLayout";
import { recogniseHeader, UNIT_KEYS_BY_FIELD } from "./recogniseHeader";
import { END_TIDAL_FRACTION_NAMES } from "./columnSynonyms";
import {
  FIELD_WORDS,
  PLAIN_COLUMNS,
  type BreathRow,
  type BreathTable,
  type FileFormat,
  type MarkerEvent,
  type NumericField,
  type Phase,
} from "./types";

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
  /** Multiply-by factor applied to reach the canonical unit (1 when none). */
  factor?: number;
  /** Who decided: the plain convention, a recognised spelling, the user's mapping, or nothing (ignored). */
  decidedBy?: "plain-convention" | "recognised-name" | "user" | "none";
  /** Set when the values are kept per kg (BreathRow.vo2MlKgMin) because no body mass was known. */
  storedAs?: "vo2MlKgMin";
}

// the stage lengths a user may give, and the one assumed, live with the other input limits (lib/core/plausibleLimits.ts)
export { DEFAULT_STAGE_DURATION_S, STAGE_DURATION_LIMITS_S } from "../core";

/**
 * Import options (all optional).
 * - `mapping`: header → { field, unit } decisions that replace the automatic ones ("set by user").
 * - `weightKg`: body mass for per-kg VO2 columns (kg). Else read from "Weight: 72 kg" lines or a constant weight column.
 * - `select`: header → value; keep only the rows of one test in a file holding several (e.g. `{ ID: "3" }`).
 * - `stageDurationS`: spacing given to stages when a stage table has no time column. @default 60
 * - `maxGapS`: longest gap between breaths before a warning, s. @default 15
 */

export interface ImportOptions {
  fileName?: string;
  mapping?: ColumnMapping;
  weightKg?: number;
  select?: Record<string, string | number>;
  stageDurationS?: number;
  maxGapS?: number;
}

export interface ImportResult {
  /** null when the file cannot be used; `issues` then says what to fix. */
  table: BreathTable | null;
  columns: ColumnDecision[];
  issues: Issue[];
  /** Layout detected (null when the bytes could not be read as a table). */
  format: FileFormat | null;
  /** Event rows and marker cells, in time order. */
  events: MarkerEvent[];
  /** Body mass used for per-kg columns, or null. */
  weight: { kg: number; from: "options" | "metadata" | "column" } | null;
  /** A column naming the exercise mode (sport, mode, modality), with its values in the rows read, or null. */
  modeNamed: { header: string; values: string[] } | null;
}

/** Headers of a column that names the exercise mode rather than measuring anything (common export names). */
const MODE_HEADER = /^(sport|mode|modality|exercise[ _-]?(mode|type)|activity|ergometer[ _-]?type)$/i;

const optionSchemas = {
  fileName: z.string(),
  mapping: columnMappingSchema,
  weightKg: z.number().positive().max(400),
  select: z.record(z.string(), z.union([z.string(), z.number()])),
  stageDurationS: z.number().positive().max(7200),
  maxGapS: z.number().positive(),
} as const;

/** Normalised header names that mean a generic "load" (may hold watts or, on a treadmill, speed). */
const GENERIC_LOAD_NAMES = new Set(["load", "work", "workload", "ergload", "pow", "level"]);

/** Where a column goes; "rrIntervalMs" (R–R intervals between heartbeats) becomes heart rate, not a column of its own. */
type Target = NumericField | "phase" | "vo2MlKgMin" | "rrIntervalMs";

interface Column {
  decision: ColumnDecision;
  target: Target | null;
  factor: number;
  values?: Float64Array;
  given?: { unit: string; by: string };
  /** Clock-of-day times: seconds subtracted so the record starts at 0. */
  timeOffset?: number;
}

const FIELD_LABEL: Record<Target, string> = { ...FIELD_WORDS, rrIntervalMs: "R–R interval" }; // plain words per field (types.ts)

function failed(issues: Issue[], columns: ColumnDecision[] = [], format: FileFormat | null = null): ImportResult {
  return { table: null, columns, issues, format, events: [], weight: null, modeNamed: null };
}

const NO_VO2_COLUMN = "No VO2 column was found. Add a column named vo2_ml_min (mL/min) or map the VO2 column (e.g. VO2, V'O2).";

function sameCell(cell: Cell, wanted: string | number): boolean {
  if (cell === null) return false;
  const a = String(cell).trim();
  const b = String(wanted).trim();
  if (a === b) return true;
  const x = Number(a);
  const y = Number(b);
  return a.length > 0 && b.length > 0 && Number.isFinite(x) && Number.isFinite(y) && x === y;
}

function findHeader(headers: readonly string[], name: string): number {
  const exact = headers.indexOf(name);
  if (exact >= 0) return exact;
  const lower = name.trim().toLowerCase();
  return headers.findIndex((h) => h.trim().toLowerCase() === lower);
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : Math.abs(x) >= 10 ? x.toFixed(1) : x.toFixed(2));

/**
 * Import a breath-by-breath or stage table from CSV / TSV / semicolon text (decimal comma or point,
 * quoted fields, metadata lines above the header, an optional units row) or an .xlsx workbook.
 * Columns are recognised from common spellings and units, units are checked against the size of the
 * values and against each other (RER = VCO2/VO2 ≈ 0.7–1.3, so VO2 and VCO2 share a unit; VE/VO2 ≈ 20–50),
 * and every decision is returned with its reason. Data problems are returned as issues; the
 * promise never rejects on any input.
 *
 * Units: the table is in canonical units (see `BreathRow`). Plausibility ranges are common practice.
 */
export async function importBreathFile(bytes: Uint8Array, options: ImportOptions = {}): Promise<ImportResult> {
  const issues: Issue[] = [];
  const opts: ImportOptions = {};
  for (const [key, value] of Object.entries(options ?? {})) {
    const schema = optionSchemas[key as keyof typeof optionSchemas];
    if (!schema || value === undefined) continue;
    const parsed = schema.safeParse(value);
    if (parsed.success) (opts as Record<string, unknown>)[key] = parsed.data;
    else
      issues.push(makeIssue("warning", "bad-option", `The import option "${key}" is not valid and was ignored.`, { field: key }));
  }
  const layout = await readTableLayout(bytes, issues);
  if (!layout) return failed(issues);
  return buildTable(layout, opts, issues);
}

function buildTable(layout: TableLayout, opts: ImportOptions, issues: Issue[]): ImportResult {
  const { headers, units } = layout;
  let { rows, lines } = layout;
  const dec = layout.format.decimalMark;
  const formatBase = layout.format;

  // ---- one test out of several -------------------------------------------------------------
  const selectedBy = new Set<number>();
  if (opts.select) {
    const parts: string[] = [];
    for (const [name, wanted] of Object.entries(opts.select)) {
      const idx = findHeader(headers, name);
      if (idx < 0) {
        issues.push(
          makeIssue(
            "warning",
            "select-column-missing",
            `The selection names a column "${name}" that the file does not have; it was not applied.`,
            { column: name },
          ),
        );
        continue;
      }
      selectedBy.add(idx);
      const keep = rows.map((r) => sameCell(r[idx] ?? null, wanted));
      rows = rows.filter((_, i) => keep[i]);
      lines = lines.filter((_, i) => keep[i]);
      parts.push(`${headers[idx]} = ${wanted}`);
    }
    if (rows.length === 0) {
      issues.push(
        makeIssue("error", "no-rows-selected", `No rows match the selection (${parts.join(", ")}). Check the test id.`),
      );
      return failed(issues, [], { ...formatBase, timeFormat: "none" });
    }
    if (parts.length > 0)
      issues.push(
        makeIssue("info", "record-selected", `${rows.length} rows of the test where ${parts.join(" and ")} were kept.`),
      );
  }

  // ---- column decisions ----------------------------------------------------------------------
  const mapping = opts.mapping ?? {};
  for (const name of Object.keys(mapping)) {
    if (findHeader(headers, name) < 0)
      issues.push(
        makeIssue(
          "warning",
          "mapping-header-missing",
          `The column mapping names "${name}", which is not a header of this file; that entry was not used.`,
          { column: name },
        ),
      );
  }
  const columns: Column[] = [];
  const ignored: string[] = [];
  const fractions: string[] = [];
  let bodyMassFromColumn: number | undefined;
  let modeNamed: ImportResult["modeNamed"] = null;
  const n = rows.length;
  for (let i = 0; i < headers.length; i++) {
    const header = headers[i];
    const overrideKey = Object.keys(mapping).find((k) => findHeader([header], k) === 0);
    const override: ColumnOverride | undefined = overrideKey !== undefined ? mapping[overrideKey] : undefined;
    const reading = recogniseHeader(header, PLAIN_COLUMNS);
    const decision: ColumnDecision = { header, index: i, field: null, reason: "", decidedBy: "none" };
    const col: Column = { decision, target: null, factor: 1 };
    columns.push(col);
    let field: NumericField | "phase" | null = null;
    let userUnitText: string | undefined;
    if (override) {
      field = override.field;
      decision.decidedBy = "user";
      userUnitText = override.unit;
      if (field === null) {
        decision.reason = "set by user: ignored";
        continue;
      }
    } else if (reading.kind === "quantity" && reading.field) {
      field = reading.field;
      decision.decidedBy = reading.plain ? "plain-convention" : "recognised-name";
    } else {
      if (reading.kind === "record-id")
        decision.reason = selectedBy.has(i) ? "test identifier (used to select the test)" : "test identifier; not a measurement";
      else if (reading.kind === "derived" && END_TIDAL_FRACTION_NAMES.includes(reading.name)) {
        decision.reason = "end-tidal gas fraction (%), not a partial pressure; not used";
        fractions.push(header);
      } else if (reading.kind === "derived") decision.reason = "derived quantity; recomputed from the measured columns";
      else if (reading.kind === "body-mass") {
        const st = columnStats(rows.map((r) => parseNumberCell(r[i] ?? null, dec)));
        if (st.n > 0 && st.low === st.high && st.median >= 20 && st.median <= 300) {
          bodyMassFromColumn = st.median;
          decision.reason = `body mass ${fmt(st.median)} kg (same on every row)`;
        } else decision.reason = "body mass column (not constant); not a measurement";
      } else if (MODE_HEADER.test(header.trim())) {
        const values = [...new Set(rows.map((r) => String(r[i] ?? "").trim()).filter((v) => v !== ""))].slice(0, 3);
        modeNamed = { header, values };
        decision.reason = `names the exercise mode (${values.join(", ") || "empty"}); not a measurement`;
      } else {
        decision.reason = "not a recognised column name; ignored";
        ignored.push(header);
      }
      if (reading.kind === "record-id" && !selectedBy.has(i)) {
        const distinct = new Set<string>();
        for (const r of rows) if (!isBlankCell(r[i] ?? null)) distinct.add(String(r[i]).trim());
        if (distinct.size > 1) {
          const sample = [...distinct].slice(0, 4).join(", ");
          issues.push(
            makeIssue(
              "error",
              "several-records",
              `The file holds ${distinct.size} tests (column "${header}": ${sample}${distinct.size > 4 ? ", …" : ""}). Choose one test to import (select ${header} = one value).`,
              { column: header },
            ),
          );
        }
      }
      continue;
    }
    // a unit that fits the field, from the user, the units row or the header
    const fits = (u: string | undefined) =>
      u !== undefined &&
      field !== null &&
      (field === "stage" || field === "phase" ? false : UNIT_KEYS_BY_FIELD[field].includes(u))
        ? u
        : undefined;
    if (userUnitText !== undefined) {
      const u = fits(parseUnitText(userUnitText));
      if (u) col.given = { unit: u, by: "set by user" };
      else
        issues.push(
          makeIssue(
            "warning",
            "mapping-unit-unknown",
            `The unit "${userUnitText}" given for "${header}" is not known for ${FIELD_LABEL[field]}; the unit was judged from the values.`,
            { column: header },
          ),
        );
    }
    if (!col.given) {
      const fromUnitsRow = fits(parseUnitText(units[i]));
      const fromHeader = reading.field === field ? fits(reading.unit) : undefined;
      if (fromUnitsRow) col.given = { unit: fromUnitsRow, by: "the units row" };
      else if (fromHeader) col.given = { unit: fromHeader, by: reading.plain ? "the plain column name" : "the header" };
    }
    decideColumn(col, field, rows, lines, dec, reading.name, issues);
  }

  // ---- duplicates: the first column of a field wins -----------------------------------------
  const byTarget = new Map<Target, Column>();
  for (const col of columns) {
    if (!col.target) continue;
    const first = byTarget.get(col.target);
    if (first) {
      issues.push(
        makeIssue(
          "warning",
          "duplicate-column",
          `"${col.decision.header}" gives ${FIELD_LABEL[col.target]} again; the first such column ("${first.decision.header}") was used.`,
          { column: col.decision.header },
        ),
      );
      col.decision.reason = `duplicate of "${first.decision.header}"; ignored`;
      col.decision.field = null;
      col.target = null;
      continue;
    }
    byTarget.set(col.target, col);
  }
  if (fractions.length > 0) {
    const withPressures = byTarget.has("petco2MmHg") || byTarget.has("peto2MmHg");
    issues.push(
      makeIssue(
        withPressures ? "info" : "warning",
        "end-tidal-fraction-not-used",
        `${fractions.map((h) => `"${h}"`).join(" and ")} hold end-tidal gas fractions, not partial pressures, and were not used` +
          (withPressures
            ? "; the end-tidal partial pressures in the file are read instead."
            : ": the end-tidal methods (PETCO2, PETO2) have no data. Export PETCO2/PETO2 in mmHg or kPa, or add a column PET = FET × (barometric pressure − 47 mmHg) / 100."),
        { column: fractions[0] },
      ),
    );
  }
  const rrCol = byTarget.get("rrIntervalMs");
  const hrFromRr = rrCol !== undefined && !byTarget.has("hrBpm");
  if (rrCol) {
    if (hrFromRr) {
      rrCol.decision.field = "hrBpm";
      rrCol.decision.reason += "; heart rate computed as 60 000 / R–R, over the beats of each row";
    } else {
      rrCol.decision.reason += `; heart rate is read from "${byTarget.get("hrBpm")!.decision.header}", so the R–R intervals were not used`;
      byTarget.delete("rrIntervalMs");
      rrCol.target = null;
    }
  }
  if (ignored.length > 0)
    issues.push(
      makeIssue("info", "columns-ignored", `Columns not used: ${ignored.join(", ")}. Map them if they hold a measured quantity.`),
    );

  // several tests in one file: choosing one comes first (what else is missing can only be judged on one test's rows);
  // the column decisions so far (an R–R column read as heart rate) are kept for the column review
  if (issues.some((i) => i.code === "several-records")) {
    // …unless the file has no VO2 column at all (a subject-information sheet keyed by ID): no choice of test makes it
    // usable, so that leads
    if (!byTarget.get("vo2MlMin") && !byTarget.get("vo2MlKgMin"))
      issues.unshift(makeIssue("error", "no-vo2-column", NO_VO2_COLUMN));
    return failed(
      issues,
      columns.map((c) => c.decision),
      { ...formatBase, timeFormat: "none" },
    );
  }

  // ---- per kg → absolute ---------------------------------------------------------------------
  let weight: ImportResult["weight"] = null;
  if (opts.weightKg !== undefined) {
    weight = { kg: opts.weightKg, from: "options" };
    // the file may state another body mass (its details lines or a weight column): the entered one is used, said so
    const fileKg = weightFromMetadata(formatBase.metadata) ?? bodyMassFromColumn;
    if (fileKg !== undefined && Math.abs(fileKg - opts.weightKg) > 0.5)
      issues.push(
        makeIssue(
          "warning",
          "weight-differs-from-file",
          `The file states a body mass of ${fmt(fileKg)} kg; the ${fmt(opts.weightKg)} kg entered is used for every per-kg value. Check which is right.`,
        ),
      );
  } else {
    const metaKg = weightFromMetadata(formatBase.metadata);
    if (metaKg !== undefined) weight = { kg: metaKg, from: "metadata" };
    else if (bodyMassFromColumn !== undefined) weight = { kg: bodyMassFromColumn, from: "column" };
  }
  const perKg = byTarget.get("vo2MlKgMin");
  let convertPerKg = false;
  if (perKg) {
    const absolute = byTarget.get("vo2MlMin");
    if (absolute) {
      perKg.decision.reason += `; absolute VO2 is in "${absolute.decision.header}", so this column is kept per kg only`;
      perKg.decision.field = null;
      perKg.decision.storedAs = "vo2MlKgMin";
    } else if (weight) {
      convertPerKg = true;
      perKg.decision.field = "vo2MlMin";
      perKg.decision.reason += `; multiplied by body mass ${fmt(weight.kg)} kg (${weight.from === "options" ? "as entered" : weight.from === "metadata" ? "from the file's details" : "from the weight column"}) to give mL/min`;
      issues.push(
        makeIssue(
          "info",
          "per-kg-converted",
          `VO2 is given per kg; it was multiplied by the body mass ${fmt(weight.kg)} kg to give mL/min.`,
          { column: perKg.decision.header },
        ),
      );
      if (weight.from !== "options")
        issues.push(
          makeIssue(
            "info",
            "weight-from-file",
            `Body mass ${fmt(weight.kg)} kg was read from the file; enter it in the patient details if it is wrong.`,
          ),
        );
    } else {
      perKg.decision.field = null;
      perKg.decision.storedAs = "vo2MlKgMin";
      perKg.decision.reason += "; kept per kg because no body mass is known";
      issues.push(
        makeIssue(
          "warning",
          "weight-needed",
          "VO2 is given per kg of body mass. Enter the patient's weight to get VO2 in mL/min; until then only per-kg values are available.",
          { column: perKg.decision.header },
        ),
      );
    }
  }

  // ---- cross-checks between columns (RER, VE/VO2) -------------------------------------------
  crossCheckUnits(byTarget, issues);

  // ---- time ----------------------------------------------------------------------------------
  const timeCol = byTarget.get("timeS");
  const stageCol = byTarget.get("stage");
  let timeFormat: FileFormat["timeFormat"] = "none";
  let times: Float64Array;
  let stageOrder = false;
  if (timeCol) {
    const t = readTime(timeCol, rows, dec, !!stageCol, issues, lines);
    times = t.times;
    timeFormat = t.format;
    // a stage length is only for stage tables without a time column: said, not ignored silently
    if (opts.stageDurationS !== undefined)
      issues.push(
        makeIssue(
          "warning",
          "stage-duration-not-used",
          `The file has a time column ("${timeCol.decision.header}"), so the stage duration given (${opts.stageDurationS} s) was not used.`,
        ),
      );
  } else {
    const workCol = byTarget.get("workW") ?? byTarget.get("speedKmh");
    const fewRising = workCol?.values !== undefined && n <= 40 && isNonDecreasing(workCol.values);
    if (stageCol || fewRising) {
      const d = opts.stageDurationS ?? DEFAULT_STAGE_DURATION_S;
      times = new Float64Array(n);
      for (let r = 0; r < n; r++) times[r] = r * d;
      stageOrder = true;
      timeFormat = "stage-order";
      const given = opts.stageDurationS !== undefined;
      issues.push(
        makeIssue(
          given ? "info" : "warning",
          "time-assumed-stage-order",
          given
            ? `The file has no time column; its ${n} rows were read as consecutive stages ${d} s apart, the stage length given.`
            : `The file has no time column; its ${n} rows were read as consecutive stages ${d} s apart, an assumption: durations, ramp rates and time-based checks rest on it. Set the stage length (on the upload form, the "How the file was read" page or with --stage-duration-s) if the stages were longer or shorter.`,
        ),
      );
    } else {
      issues.push(
        makeIssue(
          "error",
          "no-time-column",
          "No time column was found. Add a column named time_s (seconds) or map the time column (e.g. Time, t, mm:ss).",
        ),
      );
      return failed(
        issues,
        columns.map((c) => c.decision),
        { ...formatBase, timeFormat },
      );
    }
  }
  const format: FileFormat = { ...formatBase, timeFormat };

  const vo2Target = byTarget.get("vo2MlMin") ?? byTarget.get("vo2MlKgMin");
  if (!vo2Target) {
    issues.push(makeIssue("error", "no-vo2-column", NO_VO2_COLUMN));
  }
  if (issues.some((i) => i.severity === "error"))
    return failed(
      issues,
      columns.map((c) => c.decision),
      format,
    );

  // ---- rows ----------------------------------------------------------------------------------
  const phaseCol = byTarget.get("phase");
  const phaseCells = phaseCol ? rows.map((r) => r[phaseCol.decision.index] ?? null) : [];
  const phaseFilled = phaseCells.filter((c) => !isBlankCell(c)).length;
  const densePhase = phaseCol !== undefined && phaseFilled >= 0.5 * n;
  const events: MarkerEvent[] = [];
  const unknownPhases = new Map<string, number>();
  let built: BreathRow[] = [];
  let withoutTime = 0;
  let firstWithoutTime: number | undefined;
  const numericCols = [...byTarget.values()].filter(
    (c) => c.target && c.target !== "phase" && c.target !== "timeS" && c.target !== "rrIntervalMs" && c.values,
  );
  const rrOfRow = new Map<BreathRow, number>();
  for (let r = 0; r < n; r++) {
    const timeS = times[r];
    if (!Number.isFinite(timeS)) {
      withoutTime++;
      firstWithoutTime ??= lines[r];
      continue;
    }
    const row: BreathRow = { timeS, sourceRow: lines[r] };
    const rec = row as unknown as Record<string, number | string>;
    for (const c of numericCols) {
      const v = c.values![r];
      if (!Number.isFinite(v)) continue;
      const value = v * c.factor;
      rec[c.target as string] = value;
      if (c.target === "vo2MlKgMin" && convertPerKg && weight) row.vo2MlMin = value * weight.kg;
    }
    if (hrFromRr) rrOfRow.set(row, rrCol.values![r] * rrCol.factor);
    if (phaseCol) {
      const cell = phaseCells[r];
      if (!isBlankCell(cell)) {
        const label = String(cell).trim();
        const phase = phaseFromText(label);
        if (densePhase) {
          if (phase) row.phase = phase;
          else unknownPhases.set(label, (unknownPhases.get(label) ?? 0) + 1);
        } else events.push({ timeS, label, row: lines[r], ...(phase ? { phase } : {}) });
      }
    }
    built.push(row);
  }
  if (withoutTime > 0) {
    issues.push(
      makeIssue(
        "warning",
        "row-without-time",
        `${withoutTime} row(s) have no readable time and were set aside (first at row ${firstWithoutTime}).`,
        { row: firstWithoutTime },
      ),
    );
  }
  if (unknownPhases.size > 0) {
    const names = [...unknownPhases.keys()].slice(0, 5).map((s) => `"${s}"`);
    issues.push(
      makeIssue(
        "warning",
        "unknown-phase",
        `Phase text ${names.join(", ")} names none of rest, warm-up, exercise, recovery; those rows carry no phase.`,
        { column: phaseCol?.decision.header },
      ),
    );
  }
  // event rows inside the data block
  if (layout.eventRows.length > 0) {
    for (const ev of layout.eventRows) {
      const tCell = timeCol ? (ev.cells[timeCol.decision.index] ?? null) : null;
      const t = timeCol ? cellToSeconds(tCell, timeCol, dec) : NaN;
      const label = ev.cells
        .filter((c, j) => !isBlankCell(c) && (!timeCol || j !== timeCol.decision.index))
        .map((c) => String(c).trim())
        .join(" ");
      if (label.length === 0) continue;
      const phase = phaseFromText(label);
      events.push({ timeS: Number.isFinite(t) ? t : NaN, label, row: ev.line, ...(phase ? { phase } : {}) });
    }
    issues.push(
      makeIssue(
        "info",
        "event-rows",
        `${layout.eventRows.length} row(s) hold an event or comment instead of values (first at row ${layout.eventRows[0].line}); they were read as markers.`,
        { row: layout.eventRows[0].line },
      ),
    );
  }

  // ---- time order ----------------------------------------------------------------------------
  const ordered = checkTimeOrder(built, issues);
  if (!ordered)
    return failed(
      issues,
      columns.map((c) => c.decision),
      format,
    );
  built = ordered;

  // ---- one breath carried along a faster clock (e.g. every heartbeat) ------------------------
  const rrClean = hrFromRr ? cleanRrIntervals(built.map((r) => rrOfRow.get(r) ?? NaN)) : undefined;
  const rrByRow = rrClean ? new Map(built.map((r, i) => [r, rrClean.clean[i]])) : undefined;
  const beatRows = built.length;
  built = collapseCarriedForward(built, issues, rrByRow);
  // rows collapsed to one per breath: the note counts breaths
  if (rrClean) noteHeartRateFromRr(built, rrClean, rrCol!.decision.header, built.length < beatRows ? "breaths" : "rows", issues);

  // ---- duplicate time stamps -----------------------------------------------------------------
  built = dropDuplicateTimes(built, issues);

  // ---- sparse markers → phases ---------------------------------------------------------------
  const placedEvents = events.filter((e) => Number.isFinite(e.timeS)).sort((a, b) => a.timeS - b.timeS);
  if (!densePhase && placedEvents.some((e) => e.phase)) applyMarkerPhases(built, placedEvents);

  // ---- shape (from time and stage columns only; the plausibility screen below needs it) --------
  const shape = stageOrder || looksLikeStages(built, !!stageCol) ? "stage" : "breath";

  // ---- plausibility --------------------------------------------------------------------------
  checkPlausibility(built, byTarget, issues, shape === "stage");

  // ---- shape issues --------------------------------------------------------------------------
  if (shape === "stage") {
    issues.push(
      makeIssue(
        "info",
        "stage-table",
        `The rows were read as ${built.length} stages (${stageCol ? "a stage column is present" : stageOrder ? "no time column" : "rows are 25 s or more apart"}), not as single breaths.`,
      ),
    );
  } else {
    const maxGap = opts.maxGapS ?? 15;
    let gaps = 0;
    let longest = 0;
    let at: number | undefined;
    for (let r = 1; r < built.length; r++) {
      const g = built[r].timeS - built[r - 1].timeS;
      if (g > maxGap) {
        gaps++;
        if (g > longest) {
          longest = g;
          at = built[r].sourceRow;
        }
      }
    }
    if (gaps > 0)
      issues.push(
        makeIssue(
          "warning",
          "time-gap",
          `${gaps} gap(s) longer than ${maxGap} s between breaths (longest ${fmt(longest)} s, at row ${at}).`,
          { row: at },
        ),
      );
  }
  const minRows = shape === "stage" ? 3 : 10;
  if (built.length < minRows) {
    issues.push(
      makeIssue(
        "error",
        "too-few-rows",
        `Only ${built.length} usable row(s) were found; at least ${minRows} are needed for ${shape === "stage" ? "a stage test" : "breath-by-breath data"}.`,
      ),
    );
  }
  const vo2Present = built.some((r) => r.vo2MlMin !== undefined || r.vo2MlKgMin !== undefined);
  if (!vo2Present && !issues.some((i) => i.code === "no-vo2-column")) {
    issues.push(
      makeIssue("error", "no-vo2-column", "The VO2 column has no usable values. Check that it holds numbers in mL/min or L/min."),
    );
  }
  const decisions = columns.map((c) => c.decision);
  if (issues.some((x) => x.severity === "error"))
    return { table: null, columns: decisions, issues, format, events: placedEvents, weight, modeNamed };
  // values kept but beyond physiological plausibility, and recordings too short to hold a test (warnings)
  const headerOf = (t: Target) => byTarget.get(t)?.decision.header;
  issues.push(
    ...checkPhysiologicalLimits(built, {
      shape,
      ...(weight ? { weightKg: weight.kg } : {}),
      headers: {
        vo2MlMin: headerOf("vo2MlMin") ?? headerOf("vo2MlKgMin"),
        vo2MlKgMin: headerOf("vo2MlKgMin") ?? headerOf("vo2MlMin"),
        veLMin: headerOf("veLMin"),
        hrBpm: headerOf("hrBpm") ?? headerOf("rrIntervalMs"),
      },
    }),
  );
  const fields = new Set<NumericField | "phase">();
  for (const r of built) {
    for (const k of Object.keys(r)) if (k !== "sourceRow" && k !== "vo2MlKgMin") fields.add(k as NumericField | "phase");
  }
  const table: BreathTable = { shape, rows: built, fields: [...fields] };
  if (built.some((r) => r.vo2MlKgMin !== undefined)) table.vo2PerKg = true;
  return { table, columns: decisions, issues, format, events: placedEvents, weight, modeNamed };
}

/** Whether at least 80 % of the filled cells of column `i` name a phase (rest, warm-up, exercise, recovery). */
function namesPhases(rows: readonly Cell[][], i: number): boolean {
  let filled = 0;
  let named = 0;
  for (const r of rows) {
    const cell = r[i] ?? null;
    if (isBlankCell(cell)) continue;
    filled++;
    if (typeof cell === "string" && phaseFromText(cell) !== undefined) named++;
  }
  return filled > 0 && named >= 0.8 * filled;
}

/** Parse a column's numbers, judge its unit from header / units row / user and the values, and fill `col`. */
function decideColumn(
  col: Column,
  field: NumericField | "phase",
  rows: readonly Cell[][],
  lines: readonly number[],
  dec: "." | ",",
  name: string,
  issues: Issue[],
): void {
  const { decision } = col;
  const i = decision.index;
  const header = decision.header;
  const by =
    decision.decidedBy === "user"
      ? "set by user"
      : decision.decidedBy === "plain-convention"
        ? "plain column convention"
        : `recognised as ${FIELD_LABEL[field]}`;
  let filled = 0;
  for (const r of rows) if (!isBlankCell(r[i] ?? null)) filled++;
  if (filled === 0) {
    decision.reason = `${by}; the column is empty`;
    issues.push(
      makeIssue("info", "empty-column", `The column "${header}" (${FIELD_LABEL[field]}) has no values.`, { column: header }),
    );
    return;
  }
  if (field === "phase") {
    col.target = "phase";
    decision.field = "phase";
    decision.reason = `${by}; text markers read as phases`;
    return;
  }
  if (field === "timeS") {
    col.target = "timeS";
    decision.field = "timeS";
    decision.reason = by; // completed in readTime
    return;
  }
  const values = new Float64Array(rows.length);
  let bad = 0;
  let firstBad: number | undefined;
  for (let r = 0; r < rows.length; r++) {
    const cell = rows[r][i] ?? null;
    const v = parseNumberCell(cell, dec);
    values[r] = v;
    if (Number.isNaN(v) && !isBlankCell(cell)) {
      bad++;
      firstBad ??= lines[r];
    }
  }
  if (field === "stage" && decision.decidedBy !== "user" && bad > 0.8 * filled && namesPhases(rows, i)) {
    // "Stage" is also a common header for the phase of the test (rest, exercise, recovery); a text column whose
    // words name phases is read as the phase column rather than thrown away as a stage number that is not a number
    col.target = "phase";
    decision.field = "phase";
    decision.reason = `${by}, but its text names phases (rest, warm-up, exercise, recovery); read as phases`;
    issues.push(
      makeIssue(
        "info",
        "stage-column-read-as-phase",
        `The column "${header}" holds phase names, not stage numbers; it was read as the phase of the test.`,
        { column: header },
      ),
    );
    return;
  }
  if (bad > 0.8 * filled) {
    decision.reason = `${by}, but the column holds text, not numbers; ignored`;
    issues.push(
      makeIssue(
        "warning",
        "column-not-numeric",
        `The column "${header}" should hold ${FIELD_LABEL[field]} but holds text; it was ignored.`,
        { column: header, row: firstBad },
      ),
    );
    return;
  }
  if (bad > 0) {
    issues.push(
      makeIssue(
        "warning",
        "not-a-number",
        `${bad} cell(s) of "${header}" are not numbers and were left empty (first at row ${firstBad}).`,
        { column: header, row: firstBad },
      ),
    );
  }
  col.values = values;
  if (field === "stage") {
    col.target = "stage";
    decision.field = "stage";
    decision.reason = by;
    return;
  }
  const stats = columnStats(values);
  const guess = guessUnitFromValues(field, stats, !col.given && GENERIC_LOAD_NAMES.has(name));
  let unit: string;
  let reason: string;
  const canonical = CANONICAL_UNIT_OF[field];
  if (col.given && col.given.by === "set by user") {
    unit = col.given.unit;
    reason = `set by user: ${unit}`;
    if (guess && guess.unit !== unit) {
      reason += ` (note: ${guess.because})`;
      issues.push(
        makeIssue(
          "warning",
          "unit-doubtful",
          `${FIELD_LABEL[field]} was set to ${unit} by the user, but ${guess.because}. Check the unit.`,
          { column: header },
        ),
      );
    }
  } else if (col.given) {
    unit = col.given.unit;
    if (guess && guess.unit !== unit && !plausibleIn(field, unit, stats) && plausibleIn(field, guess.unit, stats)) {
      const said = unit;
      unit = guess.unit;
      reason = `${by}; ${col.given.by} says ${said}, but ${guess.because}`;
      issues.push(
        makeIssue(
          "warning",
          "unit-mismatch",
          `${FIELD_LABEL[field]} values look like ${labelOfUnit(guess.unit, field)}, not ${labelOfUnit(said, field)} as ${col.given.by} says; read as ${labelOfUnit(guess.unit, field)}.`,
          {
            column: header,
          },
        ),
      );
    } else {
      reason = `${by}; unit ${labelOfUnit(unit, field)} from ${col.given.by}${plausibleIn(field, unit, stats) ? (guess || PLAUSIBLE_RANGE[field] ? " (values agree)" : "") : ""}`;
      if (!plausibleIn(field, unit, stats)) {
        issues.push(
          makeIssue(
            "warning",
            "unit-doubtful",
            `${FIELD_LABEL[field]} values in "${header}" are not plausible in ${labelOfUnit(unit, field)} as ${col.given.by} says; check the unit.`,
            { column: header },
          ),
        );
      }
    }
  } else if (guess) {
    unit = guess.unit;
    reason = `${by}; no unit given, ${guess.because}`;
    const special =
      ((field === "rrBrMin" || field === "hrBpm") && (unit === "ms" || unit === "s")) || (field === "workW" && unit === "km/h");
    if (unit !== canonical && !special)
      issues.push(
        makeIssue("info", "unit-from-values", `${FIELD_LABEL[field]} in "${header}": ${guess.because}.`, { column: header }),
      );
  } else {
    unit = canonical;
    reason = `${by}; no unit given, taken as ${canonical} (the canonical unit)`;
  }
  if ((field === "rrBrMin" || field === "hrBpm") && (unit === "ms" || unit === "s")) {
    // heart periods: turned into heart rate once all columns are known (an HR column, if any, is preferred)
    col.target = "rrIntervalMs";
    col.factor = unit === "s" ? 1000 : 1;
    decision.unit = `R–R interval, ${unit}`;
    if (unit === "s") decision.factor = 1000;
    decision.reason =
      field === "rrBrMin"
        ? `${reason}; R–R intervals are heart periods, not breathing, so the column is not used as respiratory rate`
        : reason;
    if (field === "rrBrMin")
      issues.push(
        makeIssue(
          "info",
          "rr-interval-not-breathing",
          `"${header}" holds R–R intervals between heartbeats (${unit}), not breaths per minute (${guess?.because ?? `unit ${unit}`}); it was not used as respiratory rate.`,
          { column: header },
        ),
      );
    return;
  }
  if (field === "workW" && unit === "km/h") {
    col.target = "speedKmh";
    decision.field = "speedKmh";
    decision.unit = "km/h";
    decision.factor = 1;
    decision.reason = `${reason}; read as treadmill speed`;
    issues.push(
      makeIssue(
        "info",
        "speed-in-load-column",
        `"${header}" holds treadmill speed (km/h), not work rate: ${guess?.because ?? ""}. Map it to work rate if this is wrong.`,
        { column: header },
      ),
    );
    return;
  }
  if (field === "vo2MlMin" && unit === "per-kg") {
    col.target = "vo2MlKgMin";
    decision.field = null;
    decision.unit = "mL/kg/min";
    decision.factor = 1;
    decision.reason = reason;
    return;
  }
  const factor = factorToCanonical(field, unit);
  if (factor === undefined) {
    decision.reason = `${reason}; unit ${unit} cannot be converted; ignored`;
    return;
  }
  col.target = field;
  col.factor = factor;
  decision.field = field;
  decision.unit = labelOfUnit(unit, field);
  decision.factor = factor;
  decision.reason = factor !== 1 ? `${reason}; converted ×${roundFactor(factor)} to ${canonical}` : reason;
}

function roundFactor(f: number): string {
  return Number(f.toPrecision(6)).toString();
}

function labelOfUnit(unit: string, field: NumericField): string {
  if (unit === "per-kg") return "mL/kg/min";
  if (unit === "ms" && field === "rrBrMin") return "ms (R–R interval)";
  return unit;
}

function weightFromMetadata(meta: Record<string, string>): number | undefined {
  for (const [k, v] of Object.entries(meta)) {
    if (!/^(weight|body ?mass|mass|body ?weight)\b/i.test(k.trim())) continue;
    const m = /(\d+(?:[.,]\d+)?)\s*(kg|lb|lbs)?/i.exec(v);
    if (!m) continue;
    let kg = Number(m[1].replace(",", "."));
    if (m[2] && /lb/i.test(m[2])) kg = kg / 2.20462; // 1 kg = 2.20462 lb (exact definition, common practice)
    if (kg >= 20 && kg <= 300) return kg;
  }
  return undefined;
}

/** VCO2 and VO2 must share a unit (RER ≈ 0.7–1.3); VE/VO2 ≈ 20–50 (common practice). */
function crossCheckUnits(byTarget: Map<Target, Column>, issues: Issue[]): void {
  const vo2 = byTarget.get("vo2MlMin");
  const vco2 = byTarget.get("vco2MlMin");
  const ve = byTarget.get("veLMin");
  if (vo2?.values && vco2?.values) {
    const ratio = medianRatio(vco2.values, vco2.factor, vo2.values, vo2.factor);
    if (Number.isFinite(ratio)) {
      if (ratio > 200 || ratio < 1 / 200) {
        const fix = ratio > 200 ? 1 / 1000 : 1000;
        vco2.factor *= fix;
        vco2.decision.factor = vco2.factor;
        vco2.decision.unit = vco2.factor === 1 ? "mL/min" : "L/min";
        vco2.decision.reason += `; but VCO2/VO2 was ${fmt(ratio)}, so VCO2 was put on VO2's unit (${vco2.decision.unit}) to give a plausible RER`;
        issues.push(
          makeIssue(
            "warning",
            "vco2-unit-fixed",
            `VCO2 and VO2 looked like different units (VCO2/VO2 ≈ ${fmt(ratio)}); VCO2 was read in ${vco2.decision.unit} so that RER is plausible. Check both units.`,
            { column: vco2.decision.header },
          ),
        );
      } else if (ratio < 0.6 || ratio > 1.6) {
        // RER lies within about 0.7 (fat) to 1.3 (hard exercise) (common practice); the median of a whole test outside
        // the wider 0.6–1.6 (our choice, room for a short or hard test) points to a column or unit mix-up
        issues.push(
          makeIssue(
            "warning",
            "rer-implausible",
            `The typical RER (VCO2/VO2) is ${ratio.toFixed(2)}: RER lies within about 0.7–1.3, and this is outside even 0.6–1.6. Check that VO2 and VCO2 are in the right columns and units.`,
          ),
        );
      }
    }
  }
  if (vo2?.values && ve?.values) {
    // VE in L/min over VO2 in L/min
    const ratio = medianRatio(ve.values, ve.factor, vo2.values, vo2.factor / 1000);
    if (Number.isFinite(ratio) && (ratio < 10 || ratio > 100)) {
      issues.push(
        makeIssue(
          "warning",
          "ve-vo2-implausible",
          `VE is typically ${fmt(ratio)} times VO2 here; the usual ratio is about 20–50. Check the units of VE and VO2.`,
          { column: ve.decision.header },
        ),
      );
    }
  }
}

function medianRatio(a: Float64Array, fa: number, b: Float64Array, fb: number): number {
  const r: number[] = [];
  for (let i = 0; i < a.length; i++) {
    const x = a[i] * fa;
    const y = b[i] * fb;
    if (Number.isFinite(x) && Number.isFinite(y) && y > 0 && x > 0) r.push(x / y);
  }
  if (r.length === 0) return NaN;
  r.sort((p, q) => p - q);
  return r[Math.floor(r.length / 2)];
}

function cellToSeconds(cell: Cell, col: Column, dec: "." | ","): number {
  if (isClockCell(cell)) return parseClock(cell) - (col.timeOffset ?? 0);
  const v = parseNumberCell(cell, dec);
  return v * col.factor - (col.timeOffset ?? 0);
}

function readTime(
  col: Column,
  rows: readonly Cell[][],
  dec: "." | ",",
  hasStage: boolean,
  issues: Issue[],
  lines: readonly number[],
): { times: Float64Array; format: FileFormat["timeFormat"] } {
  const i = col.decision.index;
  const n = rows.length;
  const times = new Float64Array(n);
  let clock = 0;
  let threePart = 0;
  let filled = 0;
  for (const r of rows) {
    const c = r[i] ?? null;
    if (isBlankCell(c)) continue;
    filled++;
    if (isClockCell(c)) {
      clock++;
      if (String(c).split(":").length === 3) threePart++;
    }
  }
  let format: FileFormat["timeFormat"];
  const by = col.decision.reason;
  if (clock > 0.5 * filled) {
    for (let r = 0; r < n; r++) {
      const c = rows[r][i] ?? null;
      times[r] = isClockCell(c) ? parseClock(c) : parseNumberCell(c, dec);
    }
    format = threePart > 0.5 * clock ? "h:mm:ss" : "m:ss";
    col.decision.unit = format;
    col.decision.reason = `${by}; times written as ${format}, converted to seconds`;
  } else {
    for (let r = 0; r < n; r++) times[r] = parseNumberCell(rows[r][i] ?? null, dec);
    let unit = col.given?.unit;
    let reason: string;
    if (unit === "clock") unit = "s"; // workbook durations arrive as seconds
    if (unit) reason = `unit ${unit} from ${col.given!.by}`;
    else {
      const steps: number[] = [];
      let max = -Infinity;
      for (let r = 1; r < n; r++) {
        const d = times[r] - times[r - 1];
        if (Number.isFinite(d) && d > 0) steps.push(d);
        if (Number.isFinite(times[r])) max = Math.max(max, times[r]);
      }
      steps.sort((a, b) => a - b);
      const step = steps.length > 0 ? steps[Math.floor(steps.length / 2)] : NaN;
      if (step < 0.2) {
        unit = "min";
        reason = `no unit given; rows are typically ${fmt(step)} apart, too close for seconds between breaths, so read as minutes`;
      } else if (step >= 0.5 && step <= 5 && max <= 60 && (hasStage || n <= 30)) {
        unit = "min";
        reason = `no unit given; ${n} stage rows ${fmt(step)} apart ending at ${fmt(max)} look like minutes`;
      } else {
        unit = "s";
        reason = "no unit given; taken as seconds";
      }
      if (unit === "min")
        issues.push(
          makeIssue("info", "unit-from-values", `Time in "${col.decision.header}": ${reason}.`, { column: col.decision.header }),
        );
    }
    const factor = factorToCanonical("timeS", unit) ?? 1;
    for (let r = 0; r < n; r++) times[r] *= factor;
    col.factor = factor;
    col.decision.unit = unit;
    col.decision.factor = factor;
    col.decision.reason = `${by}; ${reason}${factor !== 1 ? `; converted ×${roundFactor(factor)} to s` : ""}`;
    format = unit === "min" ? "minutes" : unit === "ms" ? "milliseconds" : "seconds";
  }
  // clock of day (first time ≥ 1 h on an h:mm:ss clock, or a workbook date) → count from the first row
  let first = NaN;
  for (let r = 0; r < n; r++) {
    if (Number.isFinite(times[r])) {
      first = times[r];
      break;
    }
  }
  if ((format === "h:mm:ss" && first >= 3600) || first >= 86400) {
    let offset = 0;
    for (let r = 1; r < n; r++) {
      if (!Number.isFinite(times[r])) continue;
      if (times[r] + offset < first - 43200) offset += 86400; // past midnight
      times[r] += offset;
    }
    for (let r = 0; r < n; r++) times[r] -= first;
    col.timeOffset = first;
    format = "clock-of-day";
    col.decision.reason += "; clock-of-day times counted from the first row";
    issues.push(
      makeIssue(
        "info",
        "time-made-relative",
        `Times are clock times of day; they were counted from the first row (${lines.length > 0 ? `row ${lines[0]}` : "start"}).`,
        { column: col.decision.header },
      ),
    );
  }
  return { times, format };
}

function isNonDecreasing(values: Float64Array): boolean {
  let last = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < last) return false;
    last = v;
  }
  return true;
}

/**
 * Time order: a single row out of order (a glitch) is set aside with a warning; time that goes
 * backwards and stays there (two records joined, a restarted clock) refuses the table.
 */
function checkTimeOrder(rows: BreathRow[], issues: Issue[]): BreathRow[] | null {
  const kept: BreathRow[] = [];
  let glitches = 0;
  let firstGlitch: number | undefined;
  let backwards = 0;
  let firstBackwards: number | undefined;
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i];
    const last = kept[kept.length - 1];
    if (!last || row.timeS >= last.timeS) {
      kept.push(row);
      continue;
    }
    const next = rows[i + 1];
    const beforeLast = kept[kept.length - 2];
    if (next && next.timeS >= last.timeS) {
      glitches++;
      firstGlitch ??= row.sourceRow;
    } else if (beforeLast && row.timeS >= beforeLast.timeS && (!next || next.timeS >= row.timeS)) {
      glitches++;
      firstGlitch ??= last.sourceRow;
      kept[kept.length - 1] = row;
    } else {
      backwards++;
      firstBackwards ??= row.sourceRow;
      kept.push(row);
    }
  }
  if (backwards > 0) {
    issues.push(
      makeIssue(
        "error",
        "time-goes-backwards",
        `Time goes backwards at row ${firstBackwards}${backwards > 1 ? ` (and ${backwards - 1} more place(s))` : ""}. The file may hold two tests joined together; export one test, or select it.`,
        { row: firstBackwards, column: "time" },
      ),
    );
    return null;
  }
  if (glitches > 0) {
    issues.push(
      makeIssue("warning", "time-glitch", `${glitches} row(s) out of time order were set aside (first at row ${firstGlitch}).`, {
        row: firstGlitch,
      }),
    );
  }
  return kept;
}

const CARRY_FIELDS = ["vo2MlMin", "vco2MlMin", "veLMin", "vo2MlKgMin"] as const;

/**
 * When VO2 repeats the same value on most consecutive rows, the file carries each breath along on a
 * faster clock (for example every heartbeat). One row per breath is kept: the first row of each run.
 * With R–R intervals (`rrByRow`, cleaned), each kept row's heart rate is taken over the beats of its run;
 * without a faster clock, over the row's own interval.
 */
function collapseCarriedForward(rows: BreathRow[], issues: Issue[], rrByRow?: Map<BreathRow, number>): BreathRow[] {
  const perRow = () => {
    if (rrByRow)
      for (const r of rows) {
        const rr = rrByRow.get(r) ?? NaN;
        if (!Number.isNaN(rr)) r.hrBpm = 60000 / rr;
      }
    return rows;
  };
  if (rows.length < 50) return perRow();
  const field = CARRY_FIELDS.find((f) => rows.some((r) => r[f] !== undefined));
  if (!field) return perRow();
  let pairs = 0;
  let same = 0;
  for (let i = 1; i < rows.length; i++) {
    const a = rows[i - 1][field];
    const b = rows[i][field];
    if (a === undefined || b === undefined) continue;
    pairs++;
    if (a === b && rows[i].timeS !== rows[i - 1].timeS) same++;
  }
  if (pairs === 0 || same < 0.4 * pairs) return perRow();
  const kept: BreathRow[] = [];
  const beats = new BeatGroup();
  const closeRun = () => {
    const run = kept[kept.length - 1];
    const rate = beats.rateBpm();
    if (run && rate !== undefined) run.hrBpm = rate;
    beats.reset();
  };
  let last: number | undefined;
  for (const r of rows) {
    const v = r[field];
    if (v !== undefined && v !== last) {
      closeRun();
      kept.push(r);
    }
    // beats of rows without the carried value still belong to the breath before them
    if (rrByRow && kept.length > 0) beats.add(rrByRow.get(r) ?? NaN);
    if (v !== undefined) last = v;
  }
  closeRun();
  issues.push(
    makeIssue(
      "info",
      "values-carried-forward",
      `${FIELD_LABEL[field]} repeats the same value on ${Math.round((100 * same) / pairs)} % of consecutive rows: the file carries each breath along on a faster clock (e.g. every heartbeat). One row per breath was kept (${kept.length} of ${rows.length}).`,
    ),
  );
  return kept;
}

/** Says how heart rate was made from R–R intervals and how many beats were set aside. */
function noteHeartRateFromRr(rows: readonly BreathRow[], c: RrCleaning, header: string, noun: string, issues: Issue[]): void {
  const aside = c.outOfRange + c.irregular;
  const pct = c.beats > 0 ? (100 * aside) / c.beats : 0;
  const without = rows.filter((r) => r.hrBpm === undefined).length;
  const [lo, hi] = PLAUSIBLE_RR_INTERVAL_MS;
  const parts = [
    `Heart rate was computed from the R–R intervals in "${header}" (60 000 / R–R in ms, over the beats of each row).`,
    aside > 0
      ? `${aside} of ${c.beats} beats (${pct.toFixed(1)} %) were set aside: ${c.outOfRange} outside ${lo}–${hi} ms and ${c.irregular} more than ${100 * RR_NEIGHBOUR_FRACTION} % from the median of their neighbours (premature beats, pauses or missed detections).`
      : `All ${c.beats} beats were regular enough to keep.`,
  ];
  if (without > 0) {
    // the stretches without heart rate, by time, so a reader knows which readings they touch
    const spans: [number, number][] = [];
    for (let i = 0; i < rows.length; i++) {
      if (rows[i].hrBpm !== undefined) continue;
      const last = spans[spans.length - 1];
      if (last && i > 0 && rows[i - 1].hrBpm === undefined) last[1] = rows[i].timeS;
      else spans.push([rows[i].timeS, rows[i].timeS]);
    }
    const longest = spans.sort((x, y) => y[1] - y[0] - (x[1] - x[0])).slice(0, 3);
    const said = longest.map(([a, b]) => (b > a ? `${Math.round(a)}–${Math.round(b)} s` : `${Math.round(a)} s`)).join(", ");
    parts.push(
      `${without} of ${rows.length} ${noun} have no heart rate (no kept beat in their span${spans.length > 3 ? "; longest stretches" : ""}: ${said}).`,
    );
  }
  // more than 5 % of beats set aside, or more than 10 % of rows without heart rate (both our choice): arrhythmia, poor
  // detection or a lost ECG signal; heart-rate indices need a look
  const severity = pct > 5 || without > 0.1 * rows.length ? "warning" : "info";
  if (severity === "warning") parts.push("Check the ECG: heart-rate indices from this record may not be reliable.");
  issues.push(makeIssue(severity, "hr-from-rr-intervals", parts.join(" "), { column: header }));
}

function dropDuplicateTimes(rows: BreathRow[], issues: Issue[]): BreathRow[] {
  const kept: BreathRow[] = [];
  let dups = 0;
  let first: number | undefined;
  for (const r of rows) {
    const last = kept[kept.length - 1];
    if (last && r.timeS === last.timeS) {
      dups++;
      first ??= r.sourceRow;
      continue;
    }
    kept.push(r);
  }
  if (dups > 0)
    issues.push(
      makeIssue(
        "warning",
        "duplicate-time",
        `${dups} row(s) repeat the time stamp of the row before (first at row ${first}); the first row of each time was kept.`,
        { row: first },
      ),
    );
  return kept;
}

/**
 * Sparse markers: each phase marker holds until the next one. Rows before the first marker are rest
 * when the first marker starts warm-up or exercise.
 */
function applyMarkerPhases(rows: BreathRow[], events: readonly MarkerEvent[]): void {
  const marks = events.filter((e) => e.phase);
  const before: Phase | undefined = marks[0]?.phase === "warmup" || marks[0]?.phase === "exercise" ? "rest" : undefined;
  let m = -1;
  for (const r of rows) {
    while (m + 1 < marks.length && marks[m + 1].timeS <= r.timeS) m++;
    if (r.phase !== undefined) continue;
    if (m >= 0) r.phase = marks[m].phase as Phase;
    else if (before) r.phase = before;
  }
}

function checkPlausibility(rows: BreathRow[], byTarget: Map<Target, Column>, issues: Issue[], stageRows: boolean): void {
  const ranges: [Target, [number, number], string][] = [];
  for (const [field, range] of Object.entries(PLAUSIBLE_RANGE) as [NumericField, [number, number]][])
    ranges.push([field, range, CANONICAL_UNIT_OF[field]]);
  ranges.push(["vo2MlKgMin", PLAUSIBLE_VO2_PER_KG, "mL/kg/min"]);
  for (const [field, [lo, hi], unit] of ranges) {
    let present = 0;
    let out = 0;
    let firstRow: number | undefined;
    for (const r of rows) {
      const rec = r as unknown as Record<string, number | undefined>;
      const v = rec[field];
      if (v === undefined) continue;
      present++;
      if (v < lo || v > hi) {
        out++;
        firstRow ??= r.sourceRow;
        delete rec[field];
      }
    }
    if (out === 0) continue;
    const header =
      byTarget.get(field)?.decision.header ?? (field === "vo2MlMin" ? byTarget.get("vo2MlKgMin")?.decision.header : undefined);
    if (out > 0.5 * present) {
      // a column mostly outside its range is in another unit: its few in-range values are as wrong as the rest (per-kg
      // VCO2 of the hardest breaths read as mL/min gives RER ≈ 0.01 and removes those breaths' VO2), so none is kept
      for (const r of rows) delete (r as unknown as Record<string, number | undefined>)[field];
      issues.push(
        makeIssue(
          "warning",
          "column-mostly-implausible",
          `Most ${FIELD_LABEL[field]} values (${out} of ${present}) lie outside ${lo}–${hi} ${unit}: the unit is probably wrong, so the whole column was set aside. Give the unit in the header (e.g. "${FIELD_LABEL[field]} (${unit})") or set it on the column review page.`,
          { column: header, row: firstRow, field },
        ),
      );
    } else {
      // a few isolated breaths (a swallow, a cough, a mask leak) are an info line; more, or any stage row, a warning
      const isolated = !stageRows && isolatedBreaths(out, present);
      issues.push(
        makeIssue(
          isolated ? "info" : "warning",
          "implausible-values",
          `${out} ${isolated ? "isolated " : ""}${FIELD_LABEL[field]} value(s) lie outside ${lo}–${hi} ${unit} and were set aside (first at row ${firstRow}).`,
          { column: header, row: firstRow, field },
        ),
      );
    }
  }
}

/** Stage data: one row per stage (a stage column with ~one row per stage), or rows typically ≥ 25 s apart. */
function looksLikeStages(rows: readonly BreathRow[], hasStage: boolean): boolean {
  if (rows.length < 2) return false;
  if (hasStage) {
    const distinct = new Set(rows.map((r) => r.stage).filter((s) => s !== undefined));
    if (distinct.size > 0 && rows.length <= 1.5 * distinct.size) return true;
  }
  const steps: number[] = [];
  for (let i = 1; i < rows.length; i++) steps.push(rows[i].timeS - rows[i - 1].timeS);
  steps.sort((a, b) => a - b);
  return steps[Math.floor(steps.length / 2)] >= 25 && rows.length <= 200;
}
