import type { Ergometer, Issue, Measured, Patient, Spirometry } from "../core";
import type { BloodGasSample, BreathTable, ColumnDecision, LactateSample } from "../breath";
import type { ConditionedTest, ConditioningSettings } from "../signal";
import type { IndicesResult, MvvChoice, ThresholdOverride, ThresholdResult } from "../thresholds";
import type { LabSettings, PredictedSet, PredictedValue, WeightBasisAssessment } from "../predicted";
import type { DraftReport, InterpretInput, InterpretSettings, Interpretation, ReferralQuestion } from "../interpret";

export type { ReferralQuestion } from "../interpret";

/** Test conduct a report needs (entered by the physiologist). */
export interface TestConduct {
  protocol?: string;
  reasonForStopping?: string;
  symptoms?: string;
  peakBorg?: number;
  bloodPressure?: string;
  ecgNotes?: string;
  notes?: string;
  /**
   * Dead space of the breathing apparatus (valve, mouthpiece or mask, and any tubing up to the sampling point), mL.
   * Subtracted from VD/VT as VDapparatus/VT when blood gases are given (`vdVt`).
   */
  apparatusDeadSpaceMl?: number;
  /** Barometric pressure in the laboratory during the test, mmHg (for P(A−a)O2; sea level is assumed without it). */
  barometricPressureMmHg?: number;
}

/** Clinical context entered with the test (used by schemes that need it). */
export interface ClinicalContext {
  ischaemicHeartDisease?: boolean;
  resectedSegments?: number;
  stairClimbM?: number;
  shuttleWalkM?: number;
}

/** What was measured: the analysis is a pure function of this and the settings. */
export interface TestRecord {
  patient: Patient;
  ergometer: Ergometer;
  referral: ReferralQuestion;
  table: BreathTable;
  /** Import decisions and problems, carried into every result. */
  columns: ColumnDecision[];
  importIssues: Issue[];
  /**
   * The uploaded file. `selected`: the one test kept from a file holding several, in words ("ID = 13"), said wherever the
   * file is named, since which record was used is the patient's identity.
   */
  upload?: { fileName: string; sha256: string; sizeBytes: number; selected?: string };
  lactate?: LactateSample[];
  spirometry?: Spirometry;
  bloodGases?: BloodGasSample[];
  conduct?: TestConduct;
  context?: ClinicalContext;
}

/** Every choice a person or lab makes; stored with each analysis version. */
export interface AnalysisSettings {
  conditioning?: ConditioningSettings;
  /** Peak averaging window, seconds. @default 30 */
  peakWindowS?: number;
  /** Equation per quantity and ergometer. @default DEFAULT_LAB_SETTINGS (lib/predicted) */
  labSettings?: LabSettings;
  /** Reviewer overrides of VT1/VT2 (value, reason, who). */
  overrides?: ThresholdOverride[];
  /** How MVV is obtained for the breathing reserve. @default measured when given, else FEV1 × 40 */
  mvvChoice?: MvvChoice;
  /** Cut-off choices where sources disagree, and scheme selection. */
  interpret?: InterpretSettings;
  /** Bootstrap replicates for the threshold confidence band. @default 20 */
  bootstrap?: number;
  /**
   * A reviewer checked the cart and the ergometer and chose to read VO2-based values although VO2 rose implausibly
   * little with the work rate (issue `vo2-too-low-for-work`): the reason, with who. Absent: those values are not read.
   */
  vo2Checked?: { reason: string };
}

/** A measured value set against its prediction. */
export interface PredictedComparisonRow {
  key: string;
  label: string;
  measured: Measured;
  predicted: PredictedValue | null;
  percentPredicted: number | null;
  zScore: number | null;
  beyondLimit: boolean | null;
}

export interface AnalysisResult {
  /** Version of the analysis code, so a signed report can be reproduced. */
  engineVersion: string;
  settings: AnalysisSettings;
  conditioned: ConditionedTest;
  thresholds: ThresholdResult;
  indices: IndicesResult;
  predicted: PredictedSet;
  comparisons: PredictedComparisonRow[];
  /** Peak VO2 read on actual and on predicted (ideal) weight: does the basis change the conclusion? (obesity) */
  weightBasis: WeightBasisAssessment | null;
  interpretInput: InterpretInput;
  interpretation: Interpretation;
  draft: DraftReport;
  /** Every issue raised on the way, import first. */
  issues: Issue[];
}
