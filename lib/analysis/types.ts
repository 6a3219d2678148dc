import type { Issue, Measured, Patient, Ergometer, Spirometry } from "../core";
import type { BreathTable, ColumnDecision, LactateSample, BloodGasSample } from "../breath";
import type { AveragingSpec, ConditionedTest } from "../signal";

/** Test conduct a report needs (entered by the physiologist). */
export interface TestConduct {
  reasonForStopping?: string;
  symptoms?: string;
  peakBorg?: number;
  bloodPressure?: string;
  ecgNotes?: string;
  protocol?: string;
}

export type ReferralQuestion =
  "general" | "heart-failure" | "pre-operative" | "lung-resection" | "pulmonary-hypertension" | "transplant" | "training";

/** What was measured: the analysis is a pure function of this and the settings. */
export interface TestRecord {
  patient: Patient;
  ergometer: Ergometer;
  referral: ReferralQuestion;
  table: BreathTable;
  /** Import decisions and problems, carried into every result. */
  columns: ColumnDecision[];
  importIssues: Issue[];
  upload?: { fileName: string; sha256: string; sizeBytes: number };
  lactate?: LactateSample[];
  spirometry?: Spirometry;
  bloodGases?: BloodGasSample[];
  conduct?: TestConduct;
}

/** Every choice a person or lab makes; stored with each analysis version. */
export interface AnalysisSettings {
  averaging?: AveragingSpec;
  /** Peak averaging window, seconds. @default 30 */
  peakWindowS?: number;
}

export interface PeakValues {
  vo2MlMin: Measured;
  vo2MlKgMin: Measured;
}

export interface AnalysisResult {
  /** Version of the analysis code, so a signed report can be reproduced. */
  engineVersion: string;
  durationS: Measured;
  peak: PeakValues;
  conditioned: Pick<ConditionedTest, "exercise" | "phases" | "averaging" | "rampRateWPerMin" | "removed">;
  issues: Issue[];
}
