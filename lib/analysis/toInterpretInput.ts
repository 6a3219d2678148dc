import { reasonWithoutLeadIn, type Issue, type Measured } from "../core";
import {
  EOV_CARRY_OVER_CODE,
  IMPLAUSIBLE_DVO2_DWR_ML_MIN_W,
  HR_RECOVERY_1MIN_ABNORMAL_BPM,
  slopeToVt2Name,
  vo2PlateauNotAssessedReason,
  vo2PlateauPresent,
  type IndicesResult,
  type LineIndex,
  type ThresholdResult,
} from "../thresholds";
import {
  getEquation,
  walkExpr,
  OBESITY_BMI_KG_M2,
  populationRange,
  type PredictedSet,
  type PredictedValue,
  type WeightBasisAssessment,
} from "../predicted";
import type { InterpretInput, InterpretValues, UncertainValue } from "../interpret";
import type { PredictedComparisonRow, TestRecord } from "./types";

const v = (m: Measured | null | undefined): number | null => (m && m.value !== null && Number.isFinite(m.value) ? m.value : null);

/**
 * Map the engine's measurements into the interpretation layer's flat input. Pure bookkeeping: no
 * cut-off is applied here (cut-offs live in the interpretation data files).
 */
export function toInterpretInput(
  record: TestRecord,
  thresholds: ThresholdResult,
  indices: IndicesResult,
  predicted: PredictedSet,
  comparisons: PredictedComparisonRow[],
  peakRrBrMin: number | null,
  weightBasis: WeightBasisAssessment | null = null,
  /** A reviewer's word that VO2 was checked (`AnalysisSettings.vo2Checked`): VO2-based values are read after all. */
  vo2Checked: { reason: string } | null = null,
): InterpretInput {
  const pct = (key: string) => comparisons.find((c) => c.key === key)?.percentPredicted ?? null;
  const p = indices.peaks;
  const patient = record.patient;
  const bmi = patient.weightKg && patient.heightCm ? patient.weightKg / (patient.heightCm / 100) ** 2 : null;
  const vt1Vo2 = v(thresholds.vt1.vo2MlMin);
  const predVo2 = predicted.values.vo2PeakMlMin?.value ?? null;
  const oues = indices.oues.fits.find((f) => f.fraction === 1) ?? indices.oues.fits[0];
  const plateauOrFall = indices.o2Pulse.pattern === null ? null : indices.o2Pulse.pattern !== "rising";
  const eov = indices.eov.definitions;
  const eovPresent = eov.some((d) => d.detected === true) ? true : eov.every((d) => d.detected === false) ? false : null;
  // the sample read as peak (the last one in exercise), never a resting or recovery one (vdVt.ts)
  const vdvt = indices.vdVt.findLast((pt) => pt.atPeak) ?? null;
  // the engine's reason beside each value a rule may find missing
  const from: Partial<Record<keyof InterpretValues, Measured | null | undefined>> = {
    peakVo2MlMin: p.vo2MlMin,
    peakVo2MlKgMin: p.vo2MlKgMin,
    vt1Vo2MlMin: thresholds.vt1.vo2MlMin,
    vt1Vo2MlKgMin: thresholds.vt1.vo2MlMin,
    vt1PctPredPeakVo2: thresholds.vt1.vo2MlMin,
    vt1PctPeak: indices.atVt1?.vo2PercentPeak ?? thresholds.vt1.vo2MlMin,
    peakRer: p.rerMax,
    peakHrBpm: p.hrBpm,
    hrPctPred: indices.heartRate.percentPredicted,
    hrReserveBpm: indices.heartRate.reserveBpm,
    chronotropicIndex: indices.heartRate.chronotropicIndex,
    hrr1Bpm: indices.heartRate.recovery1MinBpm,
    dVo2dWr: indices.dVo2dWr.whole.slope,
    veVco2SlopeToRcp: indices.veVco2.slopeToVt2.slope,
    veVco2SlopeWhole: indices.veVco2.slopeWholeExercise.slope,
    veVco2AtVt1: indices.veVco2.atVt1,
    breathingReserveLMin: indices.breathingReserve.reserveLMin,
    breathingReservePct: indices.breathingReserve.reservePercent,
    veMvvPct: indices.breathingReserve.veMvvPercent,
    spo2Fall: indices.spo2.fallPct,
  };
  const reasons: Partial<Record<keyof InterpretValues, string>> = {};
  for (const [k, m] of Object.entries(from) as [keyof InterpretValues, Measured | null | undefined][]) {
    const why = m && m.value === null ? reasonWithoutLeadIn(m.reason) : null;
    if (why) reasons[k] = why;
  }
  const hrr = indices.heartRate;
  // a recovery whose margin holds the cut-off is shown, as borderline, and not read (set in `notRead` below)
  const hrrBorderline =
    hrr.recovery1MinBpm.value !== null && hrr.recovery1MinAbnormal === null
      ? `borderline: ${hrr.recovery1MinBpm.provenance.averaging ? "time-averaged rows" : "the scatter of breath-by-breath heart rate"} spans the ${HR_RECOVERY_1MIN_ABNORMAL_BPM}-bpm cut-off (see the issues)`
      : null;
  // on a beta-blocker HR % predicted and HR reserve are read on one side only (the interpretation does it from
  // `patient.betaBlocker`); the chronotropic index has its own beta-blocker cut-off (rules.json)
  // in atrial fibrillation the ventricular rate is irregular and not set by the sinus node (common practice): heart-rate
  // criteria and indices, and O2 pulse (VO2/HR), are not interpreted
  const irregular = patient.atrialFibrillation === true;
  const HR_READ_KEYS = ["hrPctPred", "hrReserveBpm", "chronotropicIndex", "hrr1Bpm", "o2PulsePctPred", "o2PulsePlateau"] as const;
  if (irregular) for (const k of HR_READ_KEYS) reasons[k] = "atrial fibrillation: heart rate is not read as in sinus rhythm";
  // a child or adolescent is not read against an equation derived in adults only (common practice: paediatric CPET
  // uses paediatric references); the % is still shown, with the extrapolation said beside it
  const adultOnly = (pv: PredictedValue | undefined) => adultEquationForMinor(pv, patient.ageY, patient.sex);
  const minorOn: [string | null, readonly (keyof InterpretValues)[]][] = [
    [adultOnly(predicted.values.vo2PeakMlMin), ["peakVo2PctPred", "vt1PctPredPeakVo2"]],
    [adultOnly(predicted.values.hrMaxBpm), ["hrPctPred", "hrReserveBpm", "chronotropicIndex"]],
    [adultOnly(predicted.values.o2PulseMaxMlBeat), ["o2PulsePctPred"]],
  ];
  const notRead: Partial<Record<keyof InterpretValues, string>> = {};
  if (hrrBorderline) notRead.hrr1Bpm = hrrBorderline;
  for (const [why, keys] of minorOn) if (why) for (const k of keys) notRead[k] = why;
  // a predicted O2 pulse built on an age-predicted maximal heart rate does not describe a beta-blocked heart, which
  // reaches a lower heart rate and so a higher O2 pulse (common practice)
  if (patient.betaBlocker === true && usesPredictedHrMax(predicted.values.o2PulseMaxMlBeat))
    notRead.o2PulsePctPred ??= "it is predicted from an age-predicted maximal heart rate, which does not apply on a beta-blocker";
  // steady-state stage means are not the breath-by-breath ramp the published cut-offs of these indices were set on: a
  // stage above the RCP steepens the VE/VCO2 line, and VO2 per watt runs higher at steady state (common practice)
  if (record.table.shape === "stage") {
    const why = "read from steady-state stage means; its published cut-offs were set on breath-by-breath ramp tests";
    for (const k of ["veVco2SlopeWhole", "veVco2SlopeToRcp", "dVo2dWr"] as const) notRead[k] ??= why;
  }
  // VO2 that rose too little with work to be believed (dVo2dWr.ts) is shown but not read: a leak or a calibration fault
  // must not read as a cardiac limitation or a reduced capacity
  if (indices.dVo2dWr.implausiblyLow && !vo2Checked)
    for (const k of VO2_READ_KEYS)
      notRead[k] ??= "VO2 rose too little with the work rate to be believed (see the issue on ΔVO2/ΔWR)";
  // read at a reviewer's word, ΔVO2/ΔWR itself stays unread: the value that raised the doubt is not evidence of disease
  if (indices.dVo2dWr.implausiblyLow && vo2Checked)
    notRead.dVo2dWr ??= "it is the value that made VO2 doubtful; the other VO2-based values are read at a reviewer's word";
  // no VO2 over the end of exercise (a span set aside by review, or a gap): the highest VO2 before it is shown, not read
  const endMissing = indices.peaks.vo2EndMissingS;
  if (endMissing !== null)
    for (const k of END_OF_EXERCISE_KEYS)
      notRead[k] ??=
        `the last ${Math.round(endMissing)} s of exercise hold no full window of gas values, so the peak may be understated (see the warning on peak VO2)`;
  const plateauWhy = vo2PlateauNotAssessedReason(indices.vo2FinalIncrease);
  if (plateauWhy) reasons.vo2Plateau = plateauWhy;
  const peakEndsEarly = indices.peaks.issues.some((i) => i.code === "peak-vo2-before-end");
  const plateau = vo2PlateauPresent(indices.vo2FinalIncrease);
  if (peakEndsEarly && plateau !== null)
    reasons.vo2Plateau =
      "the highest VO2 window ends well before the end of exercise (see the warning on peak VO2): check those breaths before reading a plateau";
  // the calibrated bands, as the values at each end (everything computed from VT1 moves with it)
  const uncertainty: UncertainValue[] = [];
  const vt1Band = thresholds.vt1.band;
  const peakVo2 = v(p.vo2MlMin);
  if (vt1Vo2 !== null && vt1Band && !thresholds.vt1.overridden) {
    // VE/VCO2 at VT1 as read where the VO2 trend reached each end of the band (valuesAtThreshold)
    const ends = indices.atVt1?.veVco2AtBandEnds ?? null;
    const lowVeVco2 = v(ends?.low);
    const highVeVco2 = v(ends?.high);
    const vt1At = (vo2: number, veVco2: number | null): Partial<InterpretValues> => ({
      vt1Vo2MlMin: vo2,
      vt1Vo2MlKgMin: patient.weightKg ? vo2 / patient.weightKg : null,
      vt1PctPredPeakVo2: predVo2 ? (100 * vo2) / predVo2 : null,
      vt1PctPeak: peakVo2 ? (100 * vo2) / peakVo2 : null,
      ...(veVco2 !== null ? { veVco2AtVt1: veVco2 } : {}),
    });
    uncertainty.push({
      words: `VT1 band ${Math.round(vt1Band.lowMlMin)}–${Math.round(vt1Band.highMlMin)} mL/min`,
      low: vt1At(vt1Band.lowMlMin, lowVeVco2),
      high: vt1At(vt1Band.highMlMin, highVeVco2),
      ...(lowVeVco2 !== null && highVeVco2 !== null
        ? {
            detail: {
              variables: ["veVco2AtVt1"],
              words: `VE/VCO2 ${lowVeVco2.toFixed(1)} and ${highVeVco2.toFixed(1)} at its ends`,
            },
          }
        : {}),
    });
  }
  const slopes: [keyof InterpretValues, string, LineIndex | undefined, number][] = [
    ["veVco2SlopeWhole", "whole-exercise VE/VCO2 slope", indices.veVco2.slopeWholeExercise, 1],
    // named for what it was fitted to (to the RCP, the whole exercise, or a break the fit placed)
    ["veVco2SlopeToRcp", slopeToVt2Name(indices.veVco2.slopeToVt2), indices.veVco2.slopeToVt2, 1],
    ["oues", "OUES", oues, 0],
    ["dVo2dWr", "ΔVO2/ΔWR", indices.dVo2dWr.whole, 1],
  ];
  // an EOV call on breaths whose noise carries over may be noise (eov.ts): say the other category is within reach
  const carryOver = indices.eov.breathNoiseCarryOver;
  // (the warning is only raised on a call, so EOV is present whenever it is there)
  if (carryOver !== null && indices.eov.issues.some((i) => i.code === EOV_CARRY_OVER_CODE))
    uncertainty.push({
      words: `EOV call on breaths whose noise carries over (lag-1 correlation ${carryOver.toFixed(2)}; check the VE trace)`,
      low: { eovPresent: false },
      high: { eovPresent: true },
    });
  // peak RER ± 2 standard errors of its window's breaths (measurePeaks; about a 95 % interval, common practice): the
  // effort verdict says when either end would change it (a verdict resting on the fourth decimal of peak RER)
  const rer = v(p.rerMax);
  const rerSe = p.rerMax.provenance.inputs?.rerSe;
  const rerCarry = p.rerMax.provenance.inputs?.rerCarryOver;
  if (rer !== null && typeof rerSe === "number" && rerSe > 0) {
    const [lo, hi] = [rer - 2 * rerSe, rer + 2 * rerSe];
    const carried =
      typeof rerCarry === "number" ? `, breath noise carrying over with lag-1 correlation ${rerCarry.toFixed(2)}` : "";
    uncertainty.push({
      words: `peak RER ${lo.toFixed(2)}–${hi.toFixed(2)} (±2 standard errors over its window${carried})`,
      low: { peakRer: lo },
      high: { peakRer: hi },
    });
  }
  // an MVV estimated from FEV1: both published multipliers (× 35 and × 40; Otto-Yáñez 2020, confirmed, compares them)
  // give the breathing-reserve values at the band's ends, so a ventilatory reading that one multiplier would change is
  // said as borderline wherever it is read (flow, patterns, schemes)
  const br = indices.breathingReserve;
  const fev1 = record.spirometry?.fev1L;
  const vePeak = v(p.veLMin);
  if ((br.mvvChoice === "fev1x40" || br.mvvChoice === "fev1x35") && fev1 && fev1 > 0 && vePeak !== null) {
    const at = (factor: number): Partial<InterpretValues> => {
      const mvv = fev1 * factor;
      return {
        veMvvPct: (100 * vePeak) / mvv,
        breathingReserveLMin: mvv - vePeak,
        breathingReservePct: 100 * (1 - vePeak / mvv),
      };
    };
    uncertainty.push({
      words: `MVV estimated from FEV1 (${(fev1 * 35).toFixed(0)} L/min at × 35, ${(fev1 * 40).toFixed(0)} L/min at × 40; measure MVV)`,
      low: at(35),
      high: at(40),
    });
  }
  // obesity: per-kg values on actual weight understate capacity (lean or predicted-weight normalisation, Osman et al.
  // 2000, J Am Coll Cardiol — recalled); the reading on predicted body mass goes beside every per-kg category
  const ideal = weightBasis?.ideal;
  const bmiKgM2 = weightBasis?.bmiKgM2 ?? null;
  if (ideal && bmiKgM2 !== null && bmiKgM2 >= OBESITY_BMI_KG_M2 && patient.weightKg && peakVo2 !== null) {
    const basis = `on predicted body mass (${ideal.weightKg.toFixed(0)} kg; BMI ${bmiKgM2.toFixed(1)})`;
    const peakOnIdeal = { peakVo2MlKgMin: ideal.measuredMlKgMin };
    uncertainty.push({
      words: `peak VO2 ${ideal.measuredMlKgMin.toFixed(1)} mL/kg/min ${basis}`,
      low: peakOnIdeal,
      high: peakOnIdeal,
    });
    if (vt1Vo2 !== null) {
      const atOnIdeal = { vt1Vo2MlKgMin: vt1Vo2 / ideal.weightKg };
      uncertainty.push({ words: `AT ${atOnIdeal.vt1Vo2MlKgMin.toFixed(1)} mL/kg/min ${basis}`, low: atOnIdeal, high: atOnIdeal });
    }
  }
  for (const [key, name, line, d] of slopes)
    if (line?.band && v(line.slope) !== null)
      uncertainty.push({
        words: `${name} band ${line.band.low.toFixed(d)}–${line.band.high.toFixed(d)}`,
        low: { [key]: line.band.low },
        high: { [key]: line.band.high },
      });
  // read from brief, submaximal exercise these run low (briefExercise.ts): a category that the median correction would
  // change says so; the value itself is not changed
  for (const [key, name, line, d] of slopes) {
    const value = line ? v(line.slope) : null;
    const brief = line?.briefExercise;
    if (!brief || value === null) continue;
    const rer = brief.peakRer === null ? "no peak RER" : `peak RER ${brief.peakRer.toFixed(2)}`;
    uncertainty.push({
      words: `${name} ${value.toFixed(d)} from ${Math.round(brief.exerciseS)} s of exercise ending at ${rer} (brief, submaximal exercise reads a median ${Math.abs(brief.medianLowPct).toFixed(0)} % low: ${brief.likelyValue.toFixed(d)})`,
      low: { [key]: value },
      high: { [key]: brief.likelyValue },
    });
  }
  const input: InterpretInput = {
    patient: {
      sex: patient.sex,
      ageY: patient.ageY ?? null,
      heightCm: patient.heightCm ?? null,
      weightKg: patient.weightKg ?? null,
      bmi,
      betaBlocker: patient.betaBlocker ?? null,
      atrialFibrillation: patient.atrialFibrillation ?? null,
      haemoglobinGDl: patient.haemoglobinGDl ?? null,
    },
    referral: record.referral,
    ergometer: record.ergometer,
    values: {
      peakVo2MlMin: v(p.vo2MlMin),
      peakVo2MlKgMin: v(p.vo2MlKgMin),
      peakVo2PctPred: pct("peakVo2"),
      peakWorkW: v(p.workW),
      peakSpeedKmh: v(p.speedKmh),
      peakGradePct: v(p.gradePct),
      // one plateau determination for the effort set and the interpretation (`vo2PlateauPresent`)
      // a plateau at the end of exercise when the highest VO2 window ended well before it (`peak-vo2-before-end`) is
      // not read as a limit reached until the breaths are checked (review: ACTES test 11)
      vo2Plateau: peakEndsEarly ? null : plateau,
      vt1Determined: thresholds.vt1.confidence !== "not-determinable" && vt1Vo2 !== null,
      vt1Vo2MlMin: vt1Vo2,
      vt1Vo2MlKgMin: vt1Vo2 !== null && patient.weightKg ? vt1Vo2 / patient.weightKg : null,
      vt1PctPredPeakVo2: vt1Vo2 !== null && predVo2 ? (100 * vt1Vo2) / predVo2 : null,
      vt1PctPeak: v(indices.atVt1?.vo2PercentPeak),
      peakRer: v(p.rerMax),
      peakHrBpm: v(p.hrBpm),
      restHrBpm: v(indices.heartRate.restingBpm),
      hrPctPred: irregular ? null : v(indices.heartRate.percentPredicted),
      hrReserveBpm: irregular ? null : v(indices.heartRate.reserveBpm),
      chronotropicIndex: irregular ? null : v(indices.heartRate.chronotropicIndex),
      // with the 12-bpm cut-off inside its margin the value is shown as borderline and not read (`notRead.hrr1Bpm`)
      hrr1Bpm: irregular ? null : v(indices.heartRate.recovery1MinBpm),
      o2PulsePeakMlBeat: v(p.o2PulseMlBeat),
      o2PulsePctPred: irregular ? null : pct("peakO2Pulse"),
      o2PulsePlateau: irregular ? null : plateauOrFall,
      dVo2dWr: v(indices.dVo2dWr.whole.slope),
      veVco2SlopeToRcp: v(indices.veVco2.slopeToVt2.slope),
      veVco2SlopeWhole: v(indices.veVco2.slopeWholeExercise.slope),
      veVco2Nadir: v(indices.veVco2.nadir),
      veVco2AtVt1: v(indices.veVco2.atVt1),
      petco2RestMmHg: v(p.petco2RestMmHg),
      petco2RiseMmHg: v(p.petco2RiseMmHg),
      oues: oues ? v(oues.slope) : null,
      eovPresent,
      breathingReserveLMin: v(indices.breathingReserve.reserveLMin),
      breathingReservePct: v(indices.breathingReserve.reservePercent),
      veMvvPct: v(indices.breathingReserve.veMvvPercent),
      rrPeak: peakRrBrMin,
      spo2RestPct: v(indices.spo2.restPct),
      spo2Fall: v(indices.spo2.fallPct),
      spo2Min: v(indices.spo2.lowestPct),
      paO2: peakPaO2(record, vdvt),
      vdvtPeak: vdvt ? v(vdvt.vdVt) : null,
      aaGradientPeak: vdvt?.aaGradient ? v(vdvt.aaGradient) : null,
      fev1PctPred: record.spirometry?.fev1PctPred ?? null,
      dlcoPctPred: record.spirometry?.dlcoPctPred ?? null,
      resectedSegments: record.context?.resectedSegments ?? null,
      stairClimbM: record.context?.stairClimbM ?? null,
      shuttleWalkM: record.context?.shuttleWalkM ?? null,
      ischaemicHeartDisease: record.context?.ischaemicHeartDisease ?? null,
    },
    // an equation used outside its derivation population (a child on adult equations) says so wherever its % is read
    predictedEquations: {
      peakVo2: equationWords(predicted.values.vo2PeakMlMin),
      hrMax: equationWords(predicted.values.hrMaxBpm),
      o2Pulse: equationWords(predicted.values.o2PulseMaxMlBeat),
      mvv: indices.breathingReserve.mvvLMin.provenance.label,
    },
    reasons,
    notRead,
    ...(vo2Checked && indices.dVo2dWr.implausiblyLow && indices.dVo2dWr.whole.slope.value !== null
      ? {
          vo2ReadAtReview: `ΔVO2/ΔWR was ${indices.dVo2dWr.whole.slope.value.toFixed(1)} mL/min/W, below ${IMPLAUSIBLE_DVO2_DWR_ML_MIN_W.toFixed(1)}: ${vo2Checked.reason}`,
        }
      : {}),
    // the slope "to VT2" is named for what it was fitted to (the RCP, the whole exercise, or a break the fit placed), in
    // rule texts and the draft as in the values table
    names: { veVco2SlopeToRcp: slopeToVt2Name(indices.veVco2.slopeToVt2) },
    uncertainty,
    ...(thresholds.vt1.confidence === "low" && !thresholds.vt1.overridden ? { vt1LowConfidence: true } : {}),
    ...(thresholds.vt2.confidence === "low" && !thresholds.vt2.overridden ? { vt2LowConfidence: true } : {}),
    ...(weightBasis?.changesConclusion &&
    weightBasis.actual?.percentPredicted != null &&
    weightBasis.ideal?.percentPredicted != null
      ? {
          weightBasisSplit: {
            actualPct: weightBasis.actual.percentPredicted,
            idealPct: weightBasis.ideal.percentPredicted,
            idealWeightKg: weightBasis.ideal.weightKg,
            reducedOnActual: weightBasis.actual.reduced === true,
          },
        }
      : {}),
  };
  // the weight-basis split reads peak VO2 % predicted: not when that is not read
  if (!notRead.peakVo2PctPred) return input;
  const { weightBasisSplit: _split, ...rest } = input;
  void _split;
  return rest;
}

/** Age below which a patient is a child or adolescent for reference equations (years; common practice). */
export const ADULT_AGE_Y = 18;

/**
 * Why a minor is not read against this predicted value: it (or an equation it draws on) was derived only in adults
 * (youngest age in its derivation population ≥ `ADULT_AGE_Y`) and the patient is younger than `ADULT_AGE_Y`. Null
 * otherwise (adults outside an equation's age range stay read, with "extrapolated" beside the value).
 */
function adultEquationForMinor(
  pv: PredictedValue | undefined,
  ageY: number | undefined,
  sex: "male" | "female" | undefined,
): string | null {
  if (!pv || pv.value === null || ageY === undefined || ageY >= ADULT_AGE_Y) return null;
  for (const id of pv.usedEquationIds) {
    const eq = getEquation(id);
    const min = populationRange(eq, "ageY", sex)?.min;
    if (min !== undefined && min >= ADULT_AGE_Y)
      return `${eq.label} was derived in adults (from ${min} y); a patient of ${Math.floor(ageY)} y is not read against it`;
  }
  return null;
}

/** The values that rest on measured VO2: shown, not interpreted, while VO2 rose too little with work to be believed. */
const VO2_READ_KEYS = [
  "peakVo2MlMin",
  "peakVo2MlKgMin",
  "peakVo2PctPred",
  "peakVo2LeanMlKgMin",
  "vo2Plateau",
  "vt1Vo2MlMin",
  "vt1Vo2MlKgMin",
  "vt1PctPredPeakVo2",
  "vt1PctPeak",
  "o2PulsePeakMlBeat",
  "o2PulsePctPred",
  "o2PulsePlateau",
  "dVo2dWr",
  "oues",
] as const satisfies readonly (keyof InterpretValues)[];

/** True when a predicted value's equation is built on the predicted maximal heart rate (e.g. O2 pulse = VO2 ÷ HRmax). */
function usesPredictedHrMax(pv: PredictedValue | undefined): boolean {
  if (!pv) return false;
  let found = false;
  walkExpr(getEquation(pv.equationId).form, (node) => {
    if ("ref" in node && node.ref.quantity === "hrMaxBpm") found = true;
  });
  return found;
}

/** The values read from the peak window or the end of exercise (not read when that end holds no gas values). */
const END_OF_EXERCISE_KEYS = [
  "peakVo2MlMin",
  "peakVo2MlKgMin",
  "peakVo2PctPred",
  "peakVo2LeanMlKgMin",
  "vo2Plateau",
  "vt1PctPeak",
  "o2PulsePeakMlBeat",
  "o2PulsePctPred",
  "o2PulsePlateau",
  "peakRer",
  "veMvvPct",
  "breathingReserveLMin",
  "breathingReservePct",
  "rrPeak",
] as const satisfies readonly (keyof InterpretValues)[];

/** An equation's label, with "extrapolated" when the patient lies outside the population it was derived in. */
function equationWords(p: { equationLabel: string; issues: readonly Issue[] } | undefined): string | undefined {
  if (!p) return undefined;
  const outside = p.issues.some((i) => i.code === "outside-derivation-population");
  return outside ? `${p.equationLabel}; extrapolated: the patient is outside its derivation population` : p.equationLabel;
}

/**
 * PaO2 of the sample read as peak (the VD/VT peak point's sample, matched by time or by its label); without one, the
 * last sample with a PaO2 whose time or label does not put it in recovery.
 */
function peakPaO2(record: TestRecord, peak: { timeS: number; label?: string; placedBy: "time" | "label" } | null): number | null {
  const gases = (record.bloodGases ?? []).filter((g) => typeof g.paO2MmHg === "number");
  if (peak) {
    const same = gases.find((g) => (peak.placedBy === "label" ? (g.label ?? undefined) === peak.label : g.timeS === peak.timeS));
    if (same) return same.paO2MmHg ?? null;
  }
  const notRecovery = gases.filter((g) => !/recover|post/i.test(g.label ?? ""));
  return notRecovery.length > 0 ? (notRecovery[notRecovery.length - 1].paO2MmHg ?? null) : null;
}
