import { makeIssue, type Issue } from "../core";
import { formatClock } from "../units";
import { bloodGasMoment } from "./bloodGasMoment";
import { factorToCanonical } from "./inferColumnUnit";
import { isClockCell } from "./parseCell";
import { readSimpleColumns } from "./readSimpleColumns";
import { readTableLayout } from "./readTableLayout";
import type { BloodGasSample } from "./types";

export { bloodGasMoment, bloodGasMomentWords, bloodGasTimeS, type BloodGasMoment } from "./bloodGasMoment";

export interface BloodGasImportOptions {
  /** Time unit when the header gives none and cells are plain numbers (m:ss cells are always read as a clock). @default "s" */
  timeUnit?: "s" | "min";
}

export interface BloodGasImportResult {
  samples: BloodGasSample[];
  issues: Issue[];
}

const BLOOD_GAS_COLUMNS = {
  time: ["time", "t", "zeit", "elapsed", "sampletime"],
  paO2: ["pao2", "po2", "arterialpo2", "pao2art"],
  paCO2: ["paco2", "pco2", "arterialpco2"],
} as const;

/** 1 kPa = 7.50062 mmHg (standard definition, common practice; same factor as lib/units). */
const MMHG_PER_KPA = 7.50062;

/**
 * Plain-number times read as seconds whose largest value is below this (s) are probably minutes: a CPET's peak sample
 * is drawn minutes into the test (our choice, common practice; the analysis checks the times against the test's phases).
 */
const SECONDS_LOOK_LIKE_MINUTES_BELOW_S = 60;

/**
 * Import arterial (or arterialised) blood gases: time (s, min or m:ss), PaO2, PaCO2 and an optional label column
 * ("rest", "peak", "end of exercise", "recovery", "stage 3"; see `bloodGasMoment`). Pressures in kPa are converted to
 * mmHg; a column without a unit is read as kPa when its median is below 30 (PaO2) or 12 (PaCO2), mmHg otherwise
 * (common practice: PaO2 ≈ 10–14 kPa = 75–105 mmHg, PaCO2 ≈ 4.5–6 kPa = 35–45 mmHg). Plain-number times without a
 * unit in the header are read in `options.timeUnit` (seconds by default).
 *
 * A sample without a usable time is never given an invented one: it is kept with `timeS` NaN, and the analysis places it
 * by its label (rest → last minute of rest, peak → end of exercise) or, when the label names no moment, keeps it out of
 * VD/VT with an issue. Never rejects.
 */
export async function importBloodGasFile(bytes: Uint8Array, options: BloodGasImportOptions = {}): Promise<BloodGasImportResult> {
  const issues: Issue[] = [];
  const layout = await readTableLayout(bytes, issues);
  if (!layout) return { samples: [], issues };
  const cols = readSimpleColumns(layout, BLOOD_GAS_COLUMNS, ["label", "sample", "point", "condition", "site", "comment"], issues);
  if (!cols.values.paO2 && !cols.values.paCO2) {
    issues.push(
      makeIssue(
        "error",
        "no-blood-gas-column",
        "No PaO2 or PaCO2 column was found. Name them PaO2 and PaCO2 (with mmHg or kPa).",
      ),
    );
    return { samples: [], issues };
  }
  const factorOf = (key: "paO2" | "paCO2", kPaBelow: number): number => {
    const v = cols.values[key];
    if (!v) return 1;
    const unit = cols.units[key];
    if (unit === "kPa") return MMHG_PER_KPA;
    if (unit === "mmHg") return 1;
    const sorted = [...v].filter(Number.isFinite).sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)];
    if (median < kPaBelow) {
      issues.push(
        makeIssue(
          "info",
          "unit-from-values",
          `${key === "paO2" ? "PaO2" : "PaCO2"} has no unit; values around ${median} look like kPa and were converted to mmHg.`,
          { column: cols.headers[key] },
        ),
      );
      return MMHG_PER_KPA;
    }
    return 1;
  };
  const fO2 = factorOf("paO2", 30);
  const fCO2 = factorOf("paCO2", 12);

  // time: the header's unit wins, then the form's choice; m:ss cells are already seconds
  const time = cols.values.time;
  const timeColumn = time ? layout.headers.indexOf(cols.headers.time) : -1;
  const isClock = (i: number) => timeColumn >= 0 && isClockCell(layout.rows[i]?.[timeColumn] ?? null);
  const headerUnit = cols.units.time;
  const plainUnit = headerUnit ?? options.timeUnit ?? "s";
  const plainFactor = plainUnit === "clock" ? 1 : (factorToCanonical("timeS", plainUnit) ?? 1);

  const samples: BloodGasSample[] = [];
  const plainTimes: number[] = [];
  const byLabel: number[] = [];
  const unplaced: { line: number; label?: string }[] = [];
  for (let i = 0; i < cols.lines.length; i++) {
    const o2 = cols.values.paO2?.[i];
    const co2 = cols.values.paCO2?.[i];
    const label = cols.labels?.[i];
    const raw = time?.[i];
    const hasTime = raw !== undefined && Number.isFinite(raw);
    const clock = hasTime && isClock(i);
    const s: BloodGasSample = { timeS: hasTime ? raw * (clock ? 1 : plainFactor) : Number.NaN };
    if (o2 !== undefined && Number.isFinite(o2)) s.paO2MmHg = o2 * fO2;
    if (co2 !== undefined && Number.isFinite(co2)) s.paCO2MmHg = co2 * fCO2;
    if (label) s.label = label;
    if (s.paO2MmHg === undefined && s.paCO2MmHg === undefined) continue;
    samples.push(s);
    if (hasTime && !clock) plainTimes.push(raw);
    else if (!hasTime) {
      if (bloodGasMoment(label)) byLabel.push(cols.lines[i]);
      else unplaced.push({ line: cols.lines[i], label });
    }
  }

  if (!time)
    issues.push(
      makeIssue(
        byLabel.length > 0 ? "info" : "warning",
        "no-time-column",
        byLabel.length > 0
          ? "The blood-gas file has no time column. Each sample is placed by its label when the test is analysed " +
              "(rest → the last minute of rest, peak or end of exercise → the last 30 s of exercise, stage N → the end of " +
              "that stage); a recovery sample is kept but not used for VD/VT."
          : "The blood-gas file has no time column and no label naming a moment of the test.",
      ),
    );
  else if (byLabel.length > 0)
    issues.push(
      makeIssue(
        "info",
        "blood-gas-placed-by-label",
        `${byLabel.length} blood-gas sample(s) have no time (first at row ${byLabel[0]}); they are placed by their label when the test is analysed.`,
        { row: byLabel[0] },
      ),
    );
  if (unplaced.length > 0)
    issues.push(
      makeIssue(
        "warning",
        "blood-gas-without-time",
        `${unplaced.length} blood-gas sample(s) have neither a time nor a label naming a moment of the test (first at row ` +
          `${unplaced[0].line}${unplaced[0].label ? `, label "${unplaced[0].label}"` : ""}). They are kept but not used for ` +
          "VD/VT. Give each sample a time, or a label such as rest, peak, end of exercise, recovery or stage 3.",
        { row: unplaced[0].line },
      ),
    );
  if (plainTimes.length > 0 && !headerUnit) {
    const largest = Math.max(...plainTimes);
    const inSeconds = plainUnit === "s";
    if (inSeconds && largest * plainFactor < SECONDS_LOOK_LIKE_MINUTES_BELOW_S)
      issues.push(
        makeIssue(
          "warning",
          "blood-gas-time-unit",
          `The blood-gas times have no unit and were read as seconds; the last sample would then be drawn at ` +
            `${formatClock(largest)}, within the first minute. If the times are minutes, choose "minutes" and read the file again.`,
          { column: cols.headers.time },
        ),
      );
    else
      issues.push(
        makeIssue(
          "info",
          "blood-gas-time-unit",
          `The blood-gas times have no unit and were read as ${inSeconds ? "seconds" : "minutes"}, as chosen on the form.`,
          { column: cols.headers.time },
        ),
      );
  }
  return { samples, issues };
}
