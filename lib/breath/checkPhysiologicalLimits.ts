import { makeIssue, type Issue } from "../core";
import type { BreathRow } from "./types";

/** One upper and/or lower limit of physiological plausibility, canonical unit. */
export interface PhysiologicalLimit {
  min?: number;
  max?: number;
}

/**
 * Limits beyond which a value is not expected in a clinical exercise test (physiological plausibility,
 * common practice: source `physiological-plausibility` in lib/breath/sources.ts). They are a screen for
 * unit slips and column mix-ups, not reference values: values beyond them are kept and flagged.
 * The import's own range screen (`PLAUSIBLE_RANGE`, lib/breath/inferColumnUnit.ts) already sets aside
 * values that are impossible (VO2 > 8000 mL/min, VE > 300 L/min, HR < 25 or > 240 beats/min), so at import
 * the limits below catch the band between "not expected" and "impossible".
 */
export const PHYSIOLOGICAL_LIMITS = {
  /** VO2 above ~7000 mL/min: beyond the highest values reported in elite endurance athletes (common practice). */
  vo2MlMin: { max: 7000 },
  /** VO2 above ~90 mL/kg/min: beyond the highest values reported in elite endurance athletes (common practice; recalled). */
  vo2MlKgMin: { max: 90 },
  /** VE above ~300 L/min (common practice). */
  veLMin: { max: 300 },
  /** HR above 230 beats/min lies above 220 − age for any age tested (Fox formula, confirmed); below 25 is not a beating heart at rest or in exercise (common practice). */
  hrBpm: { min: 25, max: 230 },
} as const satisfies Record<string, PhysiologicalLimit>;

type LimitedField = keyof typeof PHYSIOLOGICAL_LIMITS;

/**
 * Shortest recording that can hold an exercise test, s: 8 min, the lower end of the 8–12 min incremental
 * phase the ERS statement recommends (Radtke et al. 2019, Eur Respir Rev 28:180101, confirmed; source
 * `radtke-2019` in lib/core/sources.ts). A whole recording shorter than the incremental phase alone cannot
 * hold a complete test (rest, unloaded exercise, incremental phase, recovery).
 */
export const MIN_TEST_DURATION_S = 8 * 60;

export interface PhysiologicalLimitOptions {
  /** Breath-by-breath or stage rows. Stage rows each stand for a stage, so one typical stage spacing is added to the span. @default "breath" */
  shape?: "breath" | "stage";
  /** Body mass for the per-kg check of absolute VO2, kg. Without it only a per-kg VO2 column is checked. */
  weightKg?: number;
  /** Column header per field, used to name the column in the message. @default the field's plain name */
  headers?: Partial<Record<LimitedField, string>>;
  /** Limits that replace the defaults, per field. @default PHYSIOLOGICAL_LIMITS */
  limits?: Partial<Record<LimitedField, PhysiologicalLimit>>;
  /** Shortest plausible recording, s. @default MIN_TEST_DURATION_S (480 s) */
  minDurationS?: number;
}

const LABEL: Record<LimitedField, { name: string; unit: string }> = {
  vo2MlMin: { name: "VO2", unit: "mL/min" },
  vo2MlKgMin: { name: "VO2 per kg", unit: "mL/kg/min" },
  veLMin: { name: "VE", unit: "L/min" },
  hrBpm: { name: "Heart rate", unit: "beats/min" },
};

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : String(Math.round(x * 10) / 10));

/**
 * Physiological plausibility screen of an imported table (common practice): values beyond the limits of
 * `PHYSIOLOGICAL_LIMITS` (VO2 > 7000 mL/min or > 90 mL/kg/min, VE > 300 L/min, HR > 230 or < 25
 * beats/min) and a recording shorter than `MIN_TEST_DURATION_S` (8 min, ERS 2019) each give one warning
 * naming the column, the limit, how many rows pass it and the first row. Values are kept: the user
 * decides whether the column or its unit is wrong. One pass over the rows, O(n). Rows are not mutated.
 *
 * Degenerate cases: no rows → no issue; a field absent from every row → no issue for it; a single row
 * spans 0 s (a stage row: one spacing is unknown, so 0 s) and is flagged as short.
 *
 * @example rows at 0, 60, 120 s with VO2 8000 mL/min (stage rows) → "VO2 … above 7000 mL/min" and a
 *   recording of 180 s (120 s span + one 60-s stage) < 480 s → two warnings
 */
export function checkPhysiologicalLimits(rows: readonly BreathRow[], options: PhysiologicalLimitOptions = {}): Issue[] {
  const issues: Issue[] = [];
  if (rows.length === 0) return issues;
  const limits = { ...PHYSIOLOGICAL_LIMITS, ...options.limits } as Record<LimitedField, PhysiologicalLimit>;
  const weight = options.weightKg !== undefined && options.weightKg > 0 ? options.weightKg : undefined;

  const perKgColumn = rows.some((r) => r.vo2MlKgMin !== undefined);
  const valueOf: Record<LimitedField, (r: BreathRow) => number | undefined> = {
    vo2MlMin: (r) => r.vo2MlMin,
    // a per-kg column is checked as given; else absolute VO2 divided by the body mass, when known
    vo2MlKgMin: (r) =>
      perKgColumn ? r.vo2MlKgMin : weight !== undefined && r.vo2MlMin !== undefined ? r.vo2MlMin / weight : undefined,
    veLMin: (r) => r.veLMin,
    hrBpm: (r) => r.hrBpm,
  };

  for (const field of Object.keys(LABEL) as LimitedField[]) {
    const { min, max } = limits[field];
    let above = 0;
    let below = 0;
    let highest = -Infinity;
    let lowest = Infinity;
    let firstRow: number | undefined;
    for (const r of rows) {
      const v = valueOf[field](r);
      if (v === undefined || !Number.isFinite(v)) continue;
      if (max !== undefined && v > max) {
        above++;
        if (v > highest) highest = v;
        firstRow ??= r.sourceRow;
      } else if (min !== undefined && v < min) {
        below++;
        if (v < lowest) lowest = v;
        firstRow ??= r.sourceRow;
      }
    }
    if (above === 0 && below === 0) continue;
    const { name, unit } = LABEL[field];
    const header = options.headers?.[field];
    const derived = field === "vo2MlKgMin" && !perKgColumn;
    const where = header ? `"${header}"` : name;
    const parts: string[] = [];
    if (above > 0) parts.push(`${above} value(s) above ${max} ${unit} (highest ${fmt(highest)})`);
    if (below > 0) parts.push(`${below} value(s) below ${min} ${unit} (lowest ${fmt(lowest)})`);
    const subject = `${name}${derived ? ` (VO2 ÷ body mass ${fmt(weight!)} kg)` : ""} in ${where}: ${parts.join(" and ")}${firstRow !== undefined ? `, first at row ${firstRow}` : ""}`;
    // A few isolated breaths (a cough, a sigh, a swallow) beyond the limit are artefacts, which conditioning sets
    // aside; a column whose values lie there in more than 1 % of rows (at least 3) points to a wrong column or unit.
    const count = above + below;
    const isolated = options.shape !== "stage" && isolatedBreaths(count, rows.length);
    issues.push(
      isolated
        ? makeIssue(
            "info",
            "beyond-physiological-limit",
            `${subject}. Isolated breaths beyond physiological plausibility (common practice) are artefacts; the artefact screen of conditioning sets such breaths aside.`,
            { column: header, row: firstRow, field },
          )
        : makeIssue(
            "warning",
            "beyond-physiological-limit",
            `${subject}. This is beyond physiological plausibility for an exercise test (common practice): check the column and its unit; results computed from it are not reliable.`,
            { column: header, row: firstRow, field },
          ),
    );
  }

  const minDurationS = options.minDurationS ?? MIN_TEST_DURATION_S;
  const spanS = recordingSpanS(rows, options.shape ?? "breath");
  if (spanS < minDurationS) {
    issues.push(
      makeIssue(
        "warning",
        "short-recording",
        `The recording covers ${fmt(spanS / 60)} min (${rows.length} ${options.shape === "stage" ? "stage(s)" : "row(s)"}); an exercise test has an incremental phase of 8–12 min on its own (ERS statement, Radtke et al. 2019, confirmed). This file cannot hold a complete test: peak values and effort criteria read from it are not reliable.${timeLooksLikeMinutes(rows.length, spanS, options.shape ?? "breath") ? ` ${rows.length} breaths in ${fmt(spanS)} s would be about ${Math.round((60 * rows.length) / spanS)} a minute: the time column is probably in minutes, not seconds; check its unit.` : ""}`,
      ),
    );
  }
  return issues;
}

/**
 * Breath rows faster than 120 a minute on average over a short recording: no one breathes that fast for long (exercise
 * breathing reaches about 40–60 breaths/min, common practice), so the time column is more likely in minutes read as
 * seconds. 120 is our choice (twice the fastest exercise breathing).
 */
function timeLooksLikeMinutes(rowCount: number, spanS: number, shape: "breath" | "stage"): boolean {
  return shape === "breath" && rowCount >= 20 && spanS > 0 && (60 * rowCount) / spanS > 120;
}

/**
 * A few isolated breaths beyond a screen are routine artefacts (a swallow, a cough, a sigh); more than 1 % of the
 * breaths, and at least 3, point to a measurement or mapping problem. The 1 % / 3-breath split is our choice; the
 * plausibility screens, the import range check and the RER screen of conditioning share it.
 */
export function isolatedBreaths(count: number, breaths: number): boolean {
  return count < Math.max(3, 0.01 * breaths);
}

/** Time covered by the rows, s: last − first time; stage rows add their median spacing (each row is a stage). */
function recordingSpanS(rows: readonly BreathRow[], shape: "breath" | "stage"): number {
  let first = Infinity;
  let last = -Infinity;
  for (const r of rows) {
    if (r.timeS < first) first = r.timeS;
    if (r.timeS > last) last = r.timeS;
  }
  const span = last - first;
  if (shape !== "stage" || rows.length < 2) return span;
  const steps: number[] = [];
  for (let i = 1; i < rows.length; i++) steps.push(rows[i].timeS - rows[i - 1].timeS);
  steps.sort((a, b) => a - b);
  return span + steps[Math.floor(steps.length / 2)];
}
