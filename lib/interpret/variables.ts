/**
 * The variables that interpretation rules may read, with unit, display label and decimals.
 * This list is the vocabulary of the rule data files (reference-equations/interpretation/*.json):
 * a rule naming a variable that is not here is refused at load. No cut-offs live here.
 *
 * `effortDependent` marks values that only mean what they say when the test was maximal
 * (peak values, HR reserve, breathing reserve); when effort is not shown to be maximal,
 * conclusions that rest on them are reported as not assessable.
 */
export interface VariableInfo {
  label: string;
  /** Display unit ("" for dimensionless, booleans and categories). */
  unit: string;
  kind: "number" | "boolean" | "string";
  /** Decimals for display. @default 0 */
  decimals?: number;
  effortDependent?: boolean;
  /** Key into `InterpretInput.predictedEquations` naming the reference equation behind a % predicted value. */
  predictedKey?: "peakVo2" | "hrMax" | "o2Pulse" | "mvv" | "fev1" | "dlco";
  /** Category values in plain words, for string variables (default: the value with hyphens as spaces). */
  values?: Readonly<Record<string, string>>;
  /** For string variables: the group of patients a met `==` test names ("men"); shown as "men: …". */
  groups?: Readonly<Record<string, string>>;
}

export const VARIABLES = {
  // patient and context
  sex: { label: "Sex", unit: "", kind: "string", groups: { male: "men", female: "women" } },
  ageY: { label: "Age", unit: "y", kind: "number" },
  heightCm: { label: "Height", unit: "cm", kind: "number" },
  weightKg: { label: "Weight", unit: "kg", kind: "number", decimals: 1 },
  bmi: { label: "BMI", unit: "kg/m²", kind: "number", decimals: 1 },
  betaBlocker: { label: "Beta-blocker", unit: "", kind: "boolean" },
  haemoglobinGDl: { label: "Haemoglobin", unit: "g/dL", kind: "number", decimals: 1 },
  referral: { label: "Referral question", unit: "", kind: "string" },
  effortVerdict: { label: "Effort", unit: "", kind: "string" },
  ischaemicHeartDisease: { label: "Ischaemic heart disease", unit: "", kind: "boolean" },
  // aerobic capacity
  peakVo2MlMin: { label: "Peak VO2", unit: "mL/min", kind: "number", effortDependent: true },
  peakVo2MlKgMin: { label: "Peak VO2", unit: "mL/kg/min", kind: "number", decimals: 1, effortDependent: true },
  peakVo2PctPred: { label: "Peak VO2", unit: "% predicted", kind: "number", effortDependent: true, predictedKey: "peakVo2" },
  peakVo2LeanMlKgMin: {
    label: "Peak VO2 per kg lean body mass",
    unit: "mL/kg/min",
    kind: "number",
    decimals: 1,
    effortDependent: true,
  },
  peakWorkW: { label: "Peak work rate", unit: "W", kind: "number", effortDependent: true },
  peakSpeedKmh: {
    label: "Treadmill speed at the end of exercise",
    unit: "km/h",
    kind: "number",
    decimals: 1,
    effortDependent: true,
  },
  peakGradePct: {
    label: "Treadmill grade at the end of exercise",
    unit: "%",
    kind: "number",
    decimals: 1,
    effortDependent: true,
  },
  vo2Plateau: { label: "VO2 plateau", unit: "", kind: "boolean" },
  // anaerobic threshold (VT1)
  vt1Determined: { label: "VT1 determined", unit: "", kind: "boolean" },
  vt1Vo2MlMin: { label: "VO2 at VT1", unit: "mL/min", kind: "number" },
  vt1Vo2MlKgMin: { label: "VO2 at VT1", unit: "mL/kg/min", kind: "number", decimals: 1 },
  vt1PctPredPeakVo2: { label: "VO2 at VT1", unit: "% of predicted peak VO2", kind: "number", predictedKey: "peakVo2" },
  vt1PctPeak: { label: "VO2 at VT1", unit: "% of measured peak VO2", kind: "number", effortDependent: true },
  // effort
  peakRer: { label: "Peak RER", unit: "", kind: "number", decimals: 2, effortDependent: true },
  // heart rate
  peakHrBpm: { label: "Peak HR", unit: "bpm", kind: "number", effortDependent: true },
  restHrBpm: { label: "Resting HR", unit: "bpm", kind: "number" },
  hrPctPred: { label: "Peak HR", unit: "% predicted", kind: "number", effortDependent: true, predictedKey: "hrMax" },
  hrReserveBpm: { label: "HR reserve", unit: "bpm", kind: "number", effortDependent: true, predictedKey: "hrMax" },
  chronotropicIndex: { label: "Chronotropic index", unit: "", kind: "number", decimals: 2, effortDependent: true },
  hrr1Bpm: { label: "HR recovery at 1 min", unit: "bpm", kind: "number" },
  // cardiovascular
  o2PulsePeakMlBeat: { label: "Peak O2 pulse", unit: "mL/beat", kind: "number", decimals: 1, effortDependent: true },
  o2PulsePctPred: { label: "Peak O2 pulse", unit: "% predicted", kind: "number", effortDependent: true, predictedKey: "o2Pulse" },
  o2PulsePlateau: { label: "O2 pulse flat or falling", unit: "", kind: "boolean" },
  dVo2dWr: { label: "ΔVO2/ΔWR", unit: "mL/min/W", kind: "number", decimals: 1 },
  // ventilatory efficiency
  veVco2SlopeToRcp: { label: "VE/VCO2 slope (start to RCP)", unit: "", kind: "number", decimals: 1 },
  veVco2SlopeWhole: { label: "VE/VCO2 slope (whole exercise)", unit: "", kind: "number", decimals: 1 },
  veVco2Nadir: { label: "VE/VCO2 nadir", unit: "", kind: "number", decimals: 1 },
  veVco2AtVt1: { label: "VE/VCO2 at VT1", unit: "", kind: "number", decimals: 1 },
  petco2RestMmHg: { label: "Resting PETCO2", unit: "mmHg", kind: "number", decimals: 1 },
  // highest exercise PETCO2 minus the resting mean (lib/thresholds/measurePeaks.ts), the "rise during exercise" of the sheets
  petco2RiseMmHg: { label: "PETCO2 rise from rest to VT1", unit: "mmHg", kind: "number", decimals: 1 },
  oues: { label: "OUES", unit: "mL/min per log10(L/min)", kind: "number" },
  eovPresent: { label: "Exercise oscillatory ventilation", unit: "", kind: "boolean" },
  // ventilation
  breathingReserveLMin: { label: "Breathing reserve", unit: "L/min", kind: "number", decimals: 1, effortDependent: true },
  breathingReservePct: {
    label: "Breathing reserve",
    unit: "% of MVV",
    kind: "number",
    effortDependent: true,
    predictedKey: "mvv",
  },
  veMvvPct: { label: "Peak VE/MVV", unit: "%", kind: "number", effortDependent: true, predictedKey: "mvv" },
  rrPeak: { label: "Peak breathing frequency", unit: "/min", kind: "number", effortDependent: true },
  fev1PctPred: { label: "FEV1", unit: "% predicted", kind: "number", predictedKey: "fev1" },
  dlcoPctPred: { label: "DLCO", unit: "% predicted", kind: "number", predictedKey: "dlco" },
  // gas exchange
  spo2RestPct: { label: "Resting SpO2", unit: "%", kind: "number" },
  // one decimal, as the indices show the fall (a difference of averaged readings); common practice
  spo2Fall: { label: "SpO2 fall from rest", unit: "% points", kind: "number", decimals: 1 },
  spo2Min: { label: "Lowest SpO2 during exercise", unit: "%", kind: "number" },
  paO2: { label: "Peak PaO2", unit: "mmHg", kind: "number" },
  vdvtPeak: { label: "Peak VD/VT", unit: "", kind: "number", decimals: 2 },
  aaGradientPeak: { label: "Peak P(A−a)O2", unit: "mmHg", kind: "number", decimals: 0 },
  // lung resection
  resectedSegments: { label: "Functional segments to be resected", unit: "segments", kind: "number" },
  stairClimbM: { label: "Stair-climb height", unit: "m", kind: "number" },
  shuttleWalkM: { label: "Shuttle walk distance", unit: "m", kind: "number" },
  // derived by rules data (derived.json), never input
  ppoFev1PctPred: { label: "Predicted post-operative FEV1", unit: "% predicted", kind: "number", predictedKey: "fev1" },
  ppoDlcoPctPred: { label: "Predicted post-operative DLCO", unit: "% predicted", kind: "number", predictedKey: "dlco" },
  ppoPeakVo2MlKgMin: { label: "Predicted post-operative peak VO2", unit: "mL/kg/min", kind: "number", decimals: 1 },
  ppoPeakVo2PctPred: { label: "Predicted post-operative peak VO2", unit: "% predicted", kind: "number", predictedKey: "peakVo2" },
} as const satisfies Record<string, VariableInfo>;

export type VariableId = keyof typeof VARIABLES;

export const VARIABLE_IDS = Object.keys(VARIABLES) as VariableId[];

/** Look up a variable's display information (unknown ids are a programming mistake). */
export function variableInfo(id: string): VariableInfo {
  const info = (VARIABLES as Record<string, VariableInfo>)[id];
  if (!info) throw new Error(`unknown interpretation variable ${id}`);
  return info;
}
