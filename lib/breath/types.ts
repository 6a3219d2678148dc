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
