import { makeIssue, type Issue } from "../core";
import { factorToCanonical } from "./inferColumnUnit";
import { readSimpleColumns } from "./readSimpleColumns";
import { readTableLayout } from "./readTableLayout";
import type { LactateSample } from "./types";

export interface LactateImportOptions {
  /** Time unit when the header gives none and cells are plain numbers. @default "s" */
  timeUnit?: "s" | "min";
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
 * Import blood lactate samples (by time and/or stage, with work rate or speed when given) from CSV/TSV/
 * semicolon text or xlsx. Lactate in mg/dL is converted (÷ 9.008, lib/units). Samples outside
 * 0.1–30 mmol/L are set aside with a warning. Never rejects.
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
  const laFactor = cols.units.lactate === "mg/dL" ? (factorToCanonical("lactateMmolL", "mg/dL") ?? 1) : 1;
  const timeUnit = cols.units.time ?? options.timeUnit ?? "s";
  const timeFactor = timeUnit === "clock" ? 1 : (factorToCanonical("timeS", timeUnit) ?? 1);
  const speedFactor = cols.units.speed ? (factorToCanonical("speedKmh", cols.units.speed) ?? 1) : 1;
  const samples: LactateSample[] = [];
  let out = 0;
  let firstOut: number | undefined;
  for (let i = 0; i < la.length; i++) {
    const v = la[i] * laFactor;
    if (!Number.isFinite(v)) continue;
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
