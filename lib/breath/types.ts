/**
 * The canonical breath (or stage) table. One unit per column, fixed by the column's name.
 * A row is one breath (breath-by-breath data) or one stage/interval (stage data).
 */
export type Phase = "rest" | "warmup" | "exercise" | "recovery";
export const PHASES: readonly Phase[] = ["rest", "warmup", "exercise", "recovery"];

export interface BreathRow {
  /** Seconds from the start of the record (may be negative when the file counts from exercise start). */
  timeS: number;
  vo2MlMin?: number;
  vco2MlMin?: number;
  veLMin?: number;
  hrBpm?: number;
  workW?: number;
  speedKmh?: number;
  gradePct?: number;
  rrBrMin?: number;
  vtL?: number;
  peto2MmHg?: number;
  petco2MmHg?: number;
  spo2Pct?: number;
  phase?: Phase;
  stage?: number;
  lactateMmolL?: number;
  /**
   * Oxygen uptake per kg of body mass (mL/kg/min), kept when the file gives VO2 only per kg and no
   * body mass was available to convert it to mL/min.
   */
  vo2MlKgMin?: number;
  /** 1-based line number in the uploaded file, for issues that point back at it. */
  sourceRow?: number;
}

/** Numeric columns of a breath row, in the plain column convention's order. */
export const NUMERIC_FIELDS = [
  "timeS",
  "vo2MlMin",
  "vco2MlMin",
  "veLMin",
  "hrBpm",
  "workW",
  "speedKmh",
  "gradePct",
  "rrBrMin",
  "vtL",
  "peto2MmHg",
  "petco2MmHg",
  "spo2Pct",
  "stage",
  "lactateMmolL",
] as const;
export type NumericField = (typeof NUMERIC_FIELDS)[number];

/** Each field in plain words, for messages and labels shown to users. */
export const FIELD_WORDS: Record<NumericField | "phase" | "vo2MlKgMin", string> = {
  timeS: "time",
  vo2MlMin: "VO2",
  vco2MlMin: "VCO2",
  veLMin: "VE",
  hrBpm: "heart rate",
  workW: "work rate",
  speedKmh: "speed",
  gradePct: "grade",
  rrBrMin: "respiratory rate",
  vtL: "tidal volume",
  peto2MmHg: "PETO2",
  petco2MmHg: "PETCO2",
  spo2Pct: "SpO2",
  stage: "stage",
  lactateMmolL: "lactate",
  phase: "phase",
  vo2MlKgMin: "VO2 per kg",
};

/**
 * The plain column convention (README): header names carry their unit; files in this
 * convention import with no mapping step.
 */
export const PLAIN_COLUMNS: Record<string, NumericField | "phase"> = {
  time_s: "timeS",
  vo2_ml_min: "vo2MlMin",
  vco2_ml_min: "vco2MlMin",
  ve_l_min: "veLMin",
  hr_bpm: "hrBpm",
  work_w: "workW",
  speed_kmh: "speedKmh",
  grade_pct: "gradePct",
  rr_br_min: "rrBrMin",
  vt_l: "vtL",
  peto2_mmhg: "peto2MmHg",
  petco2_mmhg: "petco2MmHg",
  spo2_pct: "spo2Pct",
  phase: "phase",
  stage: "stage",
  lactate_mmol_l: "lactateMmolL",
};

export type TableShape = "breath" | "stage";

export interface BreathTable {
  shape: TableShape;
  rows: BreathRow[];
  /** Which canonical fields carry data in at least one row. */
  fields: (NumericField | "phase")[];
  /** True when rows carry `vo2MlKgMin` (VO2 given per kg of body mass). */
  vo2PerKg?: boolean;
}

/** One blood lactate sample, by time and/or stage. */
export interface LactateSample {
  timeS?: number;
  stage?: number;
  /** Work rate at the sample (W), when known (stage protocols). */
  workW?: number;
  /** Treadmill speed at the sample (km/h), when known. */
  speedKmh?: number;
  lactateMmolL: number;
}

/** Arterial (or arterialised) blood gas sample at a time point. */
export interface BloodGasSample {
  timeS: number;
  paO2MmHg?: number;
  paCO2MmHg?: number;
  /** Label as the lab wrote it, e.g. "rest", "peak". */
  label?: string;
}

/** A labelled moment in the record (event row or sparse marker cell), e.g. "start of exercise". */
export interface MarkerEvent {
  timeS: number;
  label: string;
  /** Phase the label names, when it names one. */
  phase?: Phase;
  /** 1-based line in the file. */
  row?: number;
}

/** How the file was laid out, as detected on import (shown to the user, stored with the record). */
export interface FileFormat {
  /** csv (comma), semicolon, tsv (tab), pipe, whitespace (aligned columns) or xlsx. */
  kind: "csv" | "semicolon" | "tsv" | "pipe" | "whitespace" | "xlsx";
  /** Text encoding detected (xlsx: "xlsx"). */
  encoding: "utf-8" | "utf-16le" | "utf-16be" | "windows-1252" | "xlsx";
  decimalMark: "." | ",";
  /** 1-based line (or sheet row) of the header. */
  headerRow: number;
  /** 1-based line of a units row directly under the header, or null. */
  unitsRow: number | null;
  /** Number of non-empty lines above the header (patient details, dates, "Key: value" lines). */
  metadataLines: number;
  /** "Key: value" pairs found above the header (keys as written). */
  metadata: Record<string, string>;
  /** How the time column was written. */
  timeFormat: "seconds" | "minutes" | "milliseconds" | "m:ss" | "h:mm:ss" | "clock-of-day" | "stage-order" | "none";
  /** Worksheet used (xlsx only). */
  sheet?: string;
}
