import type { BloodGasSample, LactateSample } from "../breath";
import type { Issue, Patient, Spirometry } from "../core";
import type { MvvChoice, BreathingReserveResult } from "./breathingReserve";
import type { DVo2dWrResult } from "./dVo2dWr";
import type { EffortAssessment, EffortCriteriaSet, Vo2FinalIncrease } from "./effortCriteria";
import type { EovOptions, EovResult } from "./eov";
import type { HeartRateIndices } from "./heartRateIndices";
import type { IntensityDomainsResult } from "./intensityDomains";
import type { LactateThresholdsOptions, LactateThresholdsResult } from "./lactateThresholds";
import type { PeakValues } from "./measurePeaks";
import type { O2PulseResult } from "./o2Pulse";
import type { OuesResult } from "./oues";
import type { DesaturationDefinitionId, Spo2Result } from "./spo2";
import type { ThresholdPoint, ThresholdReadOptions, ValuesAtThreshold } from "./valuesAtThreshold";
import type { VdVtPoint } from "./vdVt";
import type { VeVco2Result } from "./veVco2Slope";

/** Everything `measureIndices` needs besides the conditioned test. Every field but `patient` is optional. */
export interface IndicesContext {
  patient: Patient;
  spirometry?: Spirometry;
  /** Predicted HRmax from the chosen equation; without it 220 − age (Fox, as used by Cole 1999). */
  predictedHrMaxBpm?: number;
  predictedHrMaxEquationId?: string;
  /** Why the chosen HRmax equation gave no value (e.g. it needs sex): HR % predicted then stays empty with it. */
  predictedHrMaxNotDeterminedReason?: string;
  vt1?: ThresholdPoint | null;
  vt2?: ThresholdPoint | null;
  /** Peak averaging window, s. @default 30 */
  peakWindowS?: number;
  /** @default "measured" when spirometry has MVV, else "fev1x40" */
  mvvChoice?: MvvChoice;
  lactate?: LactateSample[];
  lactateOptions?: Omit<LactateThresholdsOptions, "vt1" | "vt2">;
  bloodGases?: BloodGasSample[];
  /** Apparatus dead space, mL, subtracted from VD/VT (`vdVt`); absent = not known, not subtracted. */
  apparatusDeadSpaceMl?: number;
  /** Barometric pressure, mmHg, for P(A−a)O2 (`vdVt`); absent = sea level assumed, said in an issue. */
  barometricPressureMmHg?: number;
  /** EOV detection settings (both published rules are always reported). */
  eovDefinition?: EovOptions;
  /** Headline desaturation definition. @default "hadeli-2001" */
  desaturationDefinition?: DesaturationDefinitionId;
  /** Effort criteria set id or a custom set. @default "ers-2019" */
  effortSet?: string | EffortCriteriaSet;
  /** How values are read at VT1/VT2 and blood-gas times. @default { mode: "auto", windowS: 30, veVco2WindowS: 60 } */
  readAtTime?: ThresholdReadOptions;
  /** ΔVO2/ΔWR lag exclusion, s. @default 60 */
  dVo2dWrLagS?: number;
}

export interface IndicesResult {
  peaks: PeakValues;
  vo2FinalIncrease: Vo2FinalIncrease;
  effort: EffortAssessment;
  veVco2: VeVco2Result;
  oues: OuesResult;
  dVo2dWr: DVo2dWrResult;
  o2Pulse: O2PulseResult;
  breathingReserve: BreathingReserveResult;
  heartRate: HeartRateIndices;
  spo2: Spo2Result;
  vdVt: VdVtPoint[];
  eov: EovResult;
  atVt1: ValuesAtThreshold | null;
  atVt2: ValuesAtThreshold | null;
  lactate: LactateThresholdsResult | null;
  domains: IntensityDomainsResult;
  /** Every module's issues, in module order. */
  issues: Issue[];
}
