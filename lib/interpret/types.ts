import type { Ergometer, EvidenceStatus, Issue, Sex } from "../core";

/** Why the test was requested; selects which published schemes are applied. */
export type ReferralQuestion =
  "general" | "heart-failure" | "pre-operative" | "lung-resection" | "pulmonary-hypertension" | "transplant" | "training";

export const REFERRAL_QUESTIONS: readonly ReferralQuestion[] = [
  "general",
  "heart-failure",
  "pre-operative",
  "lung-resection",
  "pulmonary-hypertension",
  "transplant",
  "training",
];

/** A number that may be missing: `null`/`undefined` = not measured or not determinable. */
export type Maybe<T> = T | null | undefined;

/**
 * Flat record of measured values that interpretation reads. Canonical units are in each name.
 * The analysis layer maps the measurement engine's results into this record; every field is optional.
 */
export interface InterpretValues {
  /** Peak VO2, mL/min (highest averaged value at end-exercise). */
  peakVo2MlMin?: Maybe<number>;
  /** Peak VO2 per kg body weight, mL/kg/min. Derived from peakVo2MlMin / weightKg when missing. */
  peakVo2MlKgMin?: Maybe<number>;
  /** Peak VO2 as % of the predicted value (equation named in `predictedEquations.peakVo2`). */
  peakVo2PctPred?: Maybe<number>;
  /** Peak VO2 per kg lean body mass, mL/kg/min (ISHLT criterion when BMI >30). */
  peakVo2LeanMlKgMin?: Maybe<number>;
  /** Peak work rate, W. */
  peakWorkW?: Maybe<number>;
  /** Treadmill: speed and grade read together at the end of exercise, the last stage reached (km/h, %). */
  peakSpeedKmh?: Maybe<number>;
  peakGradePct?: Maybe<number>;
  /** VO2 plateau present at peak (by the lab's plateau definition). */
  vo2Plateau?: Maybe<boolean>;
  /** Whether VT1 (AT) was determined at all. */
  vt1Determined?: Maybe<boolean>;
  /** VO2 at VT1, mL/min. */
  vt1Vo2MlMin?: Maybe<number>;
  /** VO2 at VT1, mL/kg/min. Derived from vt1Vo2MlMin / weightKg when missing. */
  vt1Vo2MlKgMin?: Maybe<number>;
  /** VO2 at VT1 as % of predicted peak VO2. */
  vt1PctPredPeakVo2?: Maybe<number>;
  /** VO2 at VT1 as % of measured peak VO2. */
  vt1PctPeak?: Maybe<number>;
  /** Peak respiratory exchange ratio (dimensionless). */
  peakRer?: Maybe<number>;
  /** Peak heart rate, beats/min. */
  peakHrBpm?: Maybe<number>;
  /** Resting heart rate, beats/min. */
  restHrBpm?: Maybe<number>;
  /** Peak HR as % of predicted maximal HR (equation in `predictedEquations.hrMax`). */
  hrPctPred?: Maybe<number>;
  /** HR reserve = predicted maximal HR − peak HR, beats/min. */
  hrReserveBpm?: Maybe<number>;
  /** Chronotropic index (HRpeak − HRrest)/(HRpred − HRrest), dimensionless. */
  chronotropicIndex?: Maybe<number>;
  /** HR recovery 1 min after stopping = HRpeak − HR(1 min), beats/min. */
  hrr1Bpm?: Maybe<number>;
  /** Peak O2 pulse, mL/beat. */
  o2PulsePeakMlBeat?: Maybe<number>;
  /** Peak O2 pulse as % predicted. */
  o2PulsePctPred?: Maybe<number>;
  /** O2 pulse flat or falling in the late exercise phase. */
  o2PulsePlateau?: Maybe<boolean>;
  /** ΔVO2/ΔWR, mL/min/W (incremental phase). */
  dVo2dWr?: Maybe<number>;
  /** VE/VCO2 slope from start of exercise to RCP (dimensionless). */
  veVco2SlopeToRcp?: Maybe<number>;
  /** VE/VCO2 slope over the whole exercise phase (dimensionless). */
  veVco2SlopeWhole?: Maybe<number>;
  /** Lowest VE/VCO2 (dimensionless). */
  veVco2Nadir?: Maybe<number>;
  /** VE/VCO2 at VT1 (dimensionless). */
  veVco2AtVt1?: Maybe<number>;
  /** Resting PETCO2, mmHg. */
  petco2RestMmHg?: Maybe<number>;
  /** PETCO2 rise from rest to VT1, mmHg. */
  petco2RiseMmHg?: Maybe<number>;
  /** Oxygen uptake efficiency slope, mL/min per log10(L/min) (Baba 1996 form). */
  oues?: Maybe<number>;
  /** Exercise oscillatory ventilation present (by the definition the lab chose). */
  eovPresent?: Maybe<boolean>;
  /** Breathing reserve MVV − VEpeak, L/min. */
  breathingReserveLMin?: Maybe<number>;
  /** Breathing reserve as % of MVV = 100·(1 − VEpeak/MVV). */
  breathingReservePct?: Maybe<number>;
  /** Peak VE as % of MVV. */
  veMvvPct?: Maybe<number>;
  /** Peak breathing frequency, breaths/min. */
  rrPeak?: Maybe<number>;
  /** Resting SpO2, %. */
  spo2RestPct?: Maybe<number>;
  /** Fall of SpO2 from rest to its lowest exercise value, percentage points (positive = fall). */
  spo2Fall?: Maybe<number>;
  /** Lowest SpO2 during exercise, %. */
  spo2Min?: Maybe<number>;
  /** Arterial PO2 at peak, mmHg. */
  paO2?: Maybe<number>;
  /** Dead-space fraction VD/VT at peak (arterial PaCO2 based), dimensionless. */
  vdvtPeak?: Maybe<number>;
  /** Alveolar–arterial PO2 difference of the peak blood gas, mmHg (`vdVt`'s peak point). */
  aaGradientPeak?: Maybe<number>;
  /** FEV1, % predicted. */
  fev1PctPred?: Maybe<number>;
  /** DLCO, % predicted. */
  dlcoPctPred?: Maybe<number>;
  /** Functional lung segments to be resected (lung-resection referral). */
  resectedSegments?: Maybe<number>;
  /** Stair-climb height achieved, m (ACCP 2013 low-technology test). */
  stairClimbM?: Maybe<number>;
  /** Shuttle walk distance, m (ACCP 2013 low-technology test). */
  shuttleWalkM?: Maybe<number>;
  /** Known ischaemic heart disease (pre-operative schemes). */
  ischaemicHeartDisease?: Maybe<boolean>;
}

export interface InterpretPatient {
  sex?: Sex;
  ageY?: Maybe<number>;
  heightCm?: Maybe<number>;
  weightKg?: Maybe<number>;
  /** Body-mass index, kg/m². Derived from weight and height when missing. */
  bmi?: Maybe<number>;
  betaBlocker?: Maybe<boolean>;
  /** Atrial fibrillation or another irregular rhythm during the test (`Patient.atrialFibrillation`). */
  atrialFibrillation?: Maybe<boolean>;
  /** Haemoglobin, g/dL. */
  haemoglobinGDl?: Maybe<number>;
}

/** Short names of the reference equations behind % predicted values, shown beside them (e.g. "Hansen 1984"). */
export interface PredictedEquationLabels {
  peakVo2?: string;
  hrMax?: string;
  o2Pulse?: string;
  mvv?: string;
  fev1?: string;
  dlco?: string;
}

/** Which side of a cut-off a one-sided value is read on: "high" reads values at or above it, "low" at or below it. */
export interface OneSidedReading {
  side: "high" | "low";
  reason: string;
}

export interface InterpretInput {
  patient: InterpretPatient;
  referral: ReferralQuestion;
  ergometer?: Ergometer;
  values: InterpretValues;
  predictedEquations?: PredictedEquationLabels;
  /**
   * Why a value is missing, by value name (e.g. `vo2Plateau`: the rise lies within its noise of the cut-off): shown
   * after "not available" wherever a rule reads that value, so a reader sees why a step could not be assessed.
   */
  reasons?: Partial<Record<keyof InterpretValues, string>>;
  /**
   * Values that are shown but not interpreted, with why (e.g. a child's % of an adult equation; every VO2-based value
   * when VO2 rose too little with work to be believed): rules, flows, patterns and schemes read them as missing with
   * that reason; the draft still prints the measured value and says it is not read.
   */
  notRead?: Partial<Record<keyof InterpretValues, string>>;
  /**
   * Values read on one side only, with why (e.g. a beta-blocked patient's heart rate: one that reaches the predicted
   * range still counts as a sign of effort, one short of it is not read because the drug lowers it). A comparison whose
   * value lies on the other side of its cut-off is "not assessable" with that reason, never false.
   */
  readOneSided?: Partial<Record<keyof InterpretValues, OneSidedReading>>;
  /**
   * VO2-based values read although VO2 rose implausibly little with the work rate, at a reviewer's word: what was
   * measured and what the reviewer said was checked. The draft's conclusion says it under the findings.
   */
  vo2ReadAtReview?: string;
  /**
   * What a value was measured as, by value name, where that differs from the variable's usual label: e.g.
   * `veVco2SlopeToRcp` named "VE/VCO2 slope to a fitted break (RCP not determinable)" when no RCP was found
   * (`slopeToVt2Name` in the thresholds layer). Rule texts and the draft use it in place of the label, so a value is
   * called the same everywhere it is shown.
   */
  names?: Partial<Record<keyof InterpretValues, string>>;
  /**
   * Measurements that carry an uncertainty band: the values at each end of the band (every value that moves with it,
   * e.g. VT1 in mL/min, per kg and as % of predicted peak VO2). A scheme whose category would differ at an end of the
   * band says so beside its category; nothing else reads them.
   */
  uncertainty?: UncertainValue[];
  /**
   * VT1 found by the methods with low confidence (and not set by a reviewer): a conclusion graded on VT1 says it should
   * be confirmed on review.
   */
  vt1LowConfidence?: boolean;
  /** VT2 found with low confidence (and not set by a reviewer): a prescription from it says to confirm it. */
  vt2LowConfidence?: boolean;
  /**
   * Peak VO2 reads as reduced on one weight basis and not on the other (actual against predicted body mass, the same
   * limit as the rule peak-vo2-reduced): the conclusion says both, so "reduced" never stands without its basis.
   */
  weightBasisSplit?: { actualPct: number; idealPct: number; idealWeightKg: number; reducedOnActual: boolean };
}

/** One measurement's band as the interpretation reads it. */
export interface UncertainValue {
  /** The band in words, e.g. "VT1 band 731–902 mL/min". */
  words: string;
  low: Partial<InterpretValues>;
  high: Partial<InterpretValues>;
  /**
   * More words for the schemes whose bands read one of `variables` (e.g. VE/VCO2 at VT1 at the ends of the VT1 band,
   * said only where VE/VCO2 at VT1 is graded).
   */
  detail?: { variables: (keyof InterpretValues)[]; words: string };
}

/** The lab's choices where published cut-offs disagree, and which schemes to add or drop. */
export interface InterpretSettings {
  /** choice id → option id (see `listCutoffChoices()`); unlisted choices take their documented default. */
  choices?: Record<string, string>;
  /** Scheme ids to apply in addition to those the referral question selects. */
  addSchemes?: string[];
  /** Scheme ids to leave out. */
  removeSchemes?: string[];
}

export type Outcome = boolean | null;

/** One comparison as evaluated: the patient's value against a cut-off. */
export interface ComparisonTrace {
  variable: string;
  label: string;
  unit: string;
  value: number | string | boolean | null;
  op: string;
  cutoff: number | string | boolean | readonly string[];
  outcome: Outcome;
  text: string;
}

export interface ChoiceUse {
  choiceId: string;
  optionId: string;
}

export interface RuleResult {
  ruleId: string;
  /** true = finding present, false = absent, null = not assessable (input missing or effort inadequate). */
  outcome: Outcome;
  /** Label of the finding when present / absent. */
  label: string;
  labelFalse: string;
  /** Readable line with the patient's values, e.g. "Peak VO2 62 % predicted (Hansen 1984) < 85 → reduced". */
  text: string;
  comparisons: ComparisonTrace[];
  sourceIds: string[];
  status: EvidenceStatus;
  choicesUsed: ChoiceUse[];
  note?: string;
}

export interface EffortResult {
  /** Verdict key from effort.json, e.g. "maximal", "physiological-limit", "submaximal", "not-assessable". */
  verdict: string;
  label: string;
  severity: number;
  /** Whether conclusions from peak (effort-dependent) values may be drawn. */
  peakConclusionsAllowed: boolean;
  /** The verdict rests on a physiological limit reached instead of peak RER (effort.json `restsOnLimit`). */
  restsOnLimit: boolean;
  criteria: RuleResult[];
  /** The criteria with the patient's values as one readable line; the verdict is in `label` (not repeated here). */
  text: string;
  /** Where an end of a measurement's band gives another verdict, in words ("the peak RER 1.02–1.08 (…) reaches …"). */
  borderline?: string;
}

export interface PathStep {
  nodeId: string;
  title: string;
  checks: RuleResult[];
  /** Outcome key of the branch taken, e.g. "reduced", "not-assessable". */
  outcome: string;
  /** Finding in plain words for this step. */
  finding: string;
  /** The step's checks and finding as one readable line; the step's `title` is not repeated here. */
  text: string;
  /**
   * Where an end of a measurement's uncertainty band (`InterpretInput.uncertainty`) takes another branch at this step,
   * in words ("the VT1 band 731–902 mL/min reaches \"AT reduced\""); absent when none does.
   */
  borderline?: string;
  /** Where cases of other outcomes also hold at this step (criteria in conflict), in words; the first case is taken. */
  conflict?: string;
  sourceIds: string[];
  status: EvidenceStatus;
  next: string | null;
}

export interface GraphEnd {
  key: string;
  label: string;
  severity: number;
}

export interface PathResult {
  steps: PathStep[];
  end: GraphEnd | null;
}

export interface PatternFeatureResult {
  ruleId: string;
  expected: boolean;
  weight: number;
  key: boolean;
  /** "for" when the finding matches the pattern, "against" when it contradicts it, "not-assessable" otherwise. */
  evidence: "for" | "against" | "not-assessable";
  text: string;
}

export interface PatternResult {
  patternId: string;
  label: string;
  /** Always "consistent with ..." wording, never a diagnosis. */
  statement: string;
  /**
   * Why the support level differs from what the feature weights alone would give (no key feature for the
   * pattern, or weak support set aside because the stepwise interpretation found no limitation).
   */
  supportNote?: string;
  /** Findings of a strong or moderate pattern that an end of an uncertainty band would reverse, in words. */
  borderline?: string;
  support: "strong" | "moderate" | "weak" | "not-supported" | "not-assessable";
  /** Weighted share of assessable features that fit, 0..1 (null when nothing assessable). */
  score: number | null;
  for: PatternFeatureResult[];
  against: PatternFeatureResult[];
  notAssessable: PatternFeatureResult[];
  sourceIds: string[];
  status: EvidenceStatus;
}

export interface BandResult {
  key: string;
  label: string;
  severity: number;
}

export interface SchemeAxisResult {
  axisId: string;
  label: string;
  /** Null when not assessable or when the value falls between published bands. */
  category: BandResult | null;
  text: string;
  reason?: string;
  sourceIds: string[];
  status: EvidenceStatus;
  inCombination: boolean;
  population?: string;
  /**
   * The other categories an end of a measurement's uncertainty band falls in, in words ("the VE/VCO2 slope band
   * 39.2–46.5 reaches Ventilatory class IV …"); absent when the whole band stays in the category.
   */
  bandReaches?: string;
  /** Severities of the other categories an end of an uncertainty band falls in (absent when none). */
  bandReachesSeverities?: number[];
  /**
   * The category is a floor: a worse band could not be decided (an input not recorded) and this milder one holds
   * whatever that input is ("at least intermediate").
   */
  atLeast?: boolean;
  /**
   * The axis waits on a yes/no input not recorded, and each answer gives a known category: "depends on ischaemic heart
   * disease (not recorded): low risk (…) if absent; intermediate risk (…) if present". The category is then null.
   */
  dependsOn?: string;
}

export interface SchemeResult {
  schemeId: string;
  name: string;
  sourceIds: string[];
  status: EvidenceStatus;
  kind: "bands" | "graph";
  axes: SchemeAxisResult[];
  /** Graph schemes: the path through the algorithm. */
  path?: PathResult;
  overall: (BandResult & { basis: string }) | null;
  /** How the overall category is made: "worst" of the graded axes, or one axis ("axis:<id>"); absent for none. */
  overallMode?: string;
  /**
   * The overall result in words, the one line every view shows: the category with its basis; for a scheme
   * that publishes no combined category, "Graded variable by variable (the scheme gives no combined
   * category)"; otherwise why no category could be given.
   */
  overallText: string;
  /** Highest severity in this scheme (for ordering); number of levels is `maxSeverity + 1`. */
  maxSeverity: number;
  notes: string[];
  choicesUsed: ChoiceUse[];
}

export interface CutoffChoiceOption {
  id: string;
  label: string;
  sourceIds: string[];
  status: EvidenceStatus;
  note?: string;
}

export interface CutoffChoice {
  id: string;
  label: string;
  description: string;
  defaultOptionId: string;
  options: CutoffChoiceOption[];
}

export interface SettingUsed {
  choiceId: string;
  label: string;
  optionId: string;
  optionLabel: string;
  isDefault: boolean;
  sourceIds: string[];
  status: EvidenceStatus;
}

export interface Interpretation {
  referral: ReferralQuestion;
  effort: EffortResult;
  path: PathResult;
  patterns: PatternResult[];
  schemes: SchemeResult[];
  /** Every rule evaluated, by id (for the UI's "how was this found?"). */
  rules: Record<string, RuleResult>;
  issues: Issue[];
  settingsUsed: SettingUsed[];
  sourceIds: string[];
}
