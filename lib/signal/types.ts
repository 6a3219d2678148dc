import type { Vo2Fall } from "./vo2Falls";
import type { Issue } from "../core";
import type { BreathRow, NumericField, Phase, TableShape } from "../breath";

/** A span of the test in one phase. `source` says how it was found. */
export interface PhaseSpan {
  phase: Phase;
  startS: number;
  endS: number;
  source: "markers" | "work-rate" | "speed" | "vo2" | "reviewer" | "assumed";
}

/** A breath (or one value of it) set aside by artefact rejection, with the reason shown to the user. */
export interface RemovedBreath {
  /** Index in the imported table's rows. */
  index: number;
  timeS: number;
  sourceRow?: number;
  field: NumericField;
  value: number;
  reason: string;
  /** Set aside by a reviewer's span (`SetAsideSpan`), not by an automatic screen. */
  byReview?: true;
}

/** How the series were averaged; recorded on every number derived from them. */
export interface AveragingSpec {
  kind: "none" | "time-bin" | "rolling-time" | "breath-count" | "middle-of-seven";
  /** Window length for time-based kinds, seconds. */
  seconds?: number;
  /** Window length for breath-count kinds, breaths. */
  breaths?: number;
  /** Plain words, e.g. "30-s rolling time window". */
  label: string;
}

/**
 * Artefact-breath rule: a breath is set aside when a checked field lies more than `k` SD from the
 * local mean (or median) of the `halfWindow` breaths on each side, excluding the breath itself.
 */
export interface ArtefactRule {
  /** @default 4 */
  k: number;
  /** Breaths on each side. @default 5 */
  halfWindow: number;
  /** @default ["vo2MlMin", "vco2MlMin", "veLMin"] */
  fields: NumericField[];
  /** Centre of the local window. @default "mean" */
  centre: "mean" | "median";
  /** false turns the local-deviation rule off (RER and range screens still apply). @default true */
  enabled: boolean;
}

/** Everything conditioning used, as plain data, so a result can be reproduced. */
export interface ConditioningRecord {
  averaging: AveragingSpec;
  artefacts: ArtefactRule;
  /** Breaths with RER outside [min, max] are set aside. @default { min: 0.5, max: 2 } */
  rer: { min: number; max: number };
  /** Spans a reviewer set aside (ends included), with the channel and the reason. @default [] */
  setAside?: SetAsideSpan[];
}

/** A span of the record a reviewer set aside as faulty (a leak, a cough run, an ECG artefact): its `channel`'s values are not used. */
export interface SetAsideSpan {
  startS: number;
  endS: number;
  /** Why, and by whom ("mask leak seen on the test log, by J. Smith"). */
  reason: string;
  /**
   * What is set aside: the gas and ventilation values (a leak, a cough run) or the heart rate (an ECG artefact, double
   * counting). @default "gas"
   */
  channel?: "gas" | "heart-rate";
}

/** The imported table after conditioning: what every measurement in lib/thresholds starts from. */
export interface ConditionedTest {
  shape: TableShape;
  /** Artefacts removed, not averaged, time order. */
  clean: BreathRow[];
  removed: RemovedBreath[];
  /** `clean` averaged according to `averaging`. */
  averaged: BreathRow[];
  averaging: AveragingSpec;
  phases: PhaseSpan[];
  /** The incremental (loaded) exercise phase, or null when it cannot be found. */
  exercise: { startS: number; endS: number } | null;
  /** Estimated ramp rate of the incremental phase (W/min), null without a work-rate signal. */
  rampRateWPerMin: number | null;
  issues: Issue[];
  /** The settings actually used (defaults filled in). */
  settings?: ConditioningRecord;
  /** Coefficient of determination of the ramp-rate regression (null without one). */
  rampRateR2?: number | null;
  /** A sustained fall of VO2 in exercise at a held or rising load (`findVo2Fall`), or null / absent. */
  vo2Fall?: Vo2Fall | null;
}
