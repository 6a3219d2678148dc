import { makeIssue } from "../core";
import type { ConditionedTest } from "../signal";
import { briefExerciseIssue, briefExerciseReading, type BriefExerciseIndex } from "./briefExercise";
import { breathingReserve } from "./breathingReserve";
import { hrGapIssues } from "./channelGaps";
import { dVo2dWr } from "./dVo2dWr";
import { assessEffort, vo2FinalIncrease } from "./effortCriteria";
import { eov } from "./eov";
import { heartRateIndices } from "./heartRateIndices";
import type { IndicesContext, IndicesResult } from "./indexTypes";
import { rampLag } from "./rampLag";
import { intensityDomains } from "./intensityDomains";
import { lactatePointsFromTest, lactateThresholds, type LactateThresholdsResult } from "./lactateThresholds";
import { measurePeaks } from "./measurePeaks";
import { o2Pulse } from "./o2Pulse";
import { oues } from "./oues";
import { spo2 } from "./spo2";
import { valuesAtLactateThresholds } from "./valuesAtLactateThresholds";
import { valuesAtThreshold } from "./valuesAtThreshold";
import { vdVt } from "./vdVt";
import { veVco2Slope, type LineIndex } from "./veVco2Slope";

/**
 * Measure every index of a conditioned test: peaks, effort criteria, VE/VCO2 slope and nadir, OUES,
 * ΔVO2/ΔWR, O2 pulse trajectory, breathing reserve, heart-rate indices, SpO2, VD/VT, EOV, values at VT1/VT2,
 * lactate thresholds and intensity domains. VT1/VT2 come in as inputs (time and VO2). Pure and
 * deterministic; clinical data problems come back as issues, "not determinable" as values with a reason.
 * Each module is a single pass with prefix sums, so the whole call suits interactive use.
 */
export function measureIndices(test: ConditionedTest, ctx: IndicesContext): IndicesResult {
  const windowS = ctx.peakWindowS ?? 30;
  const weightKg = ctx.patient.weightKg;
  const vt1 = ctx.vt1 ?? null;
  const vt2 = ctx.vt2 ?? null;
  // breath noise that carries over (a smoothed export) widens the peak RER's standard error (measurePeaks.ts)
  const ev = eov(test, ctx.eovDefinition);
  const peaks = measurePeaks(test, { windowS, weightKg, vt1, noiseCarryOver: ev.breathNoiseCarryOver });
  const atVt1 = vt1
    ? valuesAtThreshold(test, vt1, { ...ctx.readAtTime, name: "VT1", weightKg, peakVo2MlMin: peaks.vo2MlMin.value })
    : null;
  const atVt2 = vt2
    ? valuesAtThreshold(test, vt2, { ...ctx.readAtTime, name: "VT2", weightKg, peakVo2MlMin: peaks.vo2MlMin.value })
    : null;
  const br = breathingReserve(peaks.veLMin, ctx.spirometry, { mvvChoice: ctx.mvvChoice });
  const hr = heartRateIndices(test, {
    peakHr: peaks.hrBpm,
    predictedHrMaxBpm: ctx.predictedHrMaxBpm,
    predictedHrMaxEquationId: ctx.predictedHrMaxEquationId,
    predictedHrMaxNotDeterminedReason: ctx.predictedHrMaxNotDeterminedReason,
    ageY: ctx.patient.ageY,
    betaBlocker: ctx.patient.betaBlocker,
  });
  const plateau = vo2FinalIncrease(test, { windowS, weightKg });

  let lactate: LactateThresholdsResult | null = null;
  const lp = lactatePointsFromTest(test, ctx.lactate);
  if (lp.points.length > 0) {
    const axisVt = (a: typeof atVt1) => (a ? (lp.axis === "workW" ? a.workW.value : a.speedKmh.value) : null);
    lactate = lactateThresholds(lp.points, lp.axis, { ...ctx.lactateOptions, vt1: axisVt(atVt1), vt2: axisVt(atVt2) });
    lactate.issues.unshift(...lp.issues);
    // heart rate and VO2 at each lactate threshold, read as the values at VT1/VT2 are
    valuesAtLactateThresholds(test, lactate, ctx.readAtTime);
  }
  const lactatePeak = lp.points.length > 0 ? Math.max(...lp.points.map((p) => p.lactateMmolL)) : null;

  const effort = assessEffort(
    {
      rerPeak: peaks.rerMax.value,
      hrPercentPredicted: hr.percentPredicted.value,
      hrReserveBpm: hr.reserveBpm.value,
      veMvvPercent: br.veMvvPercent.value,
      vo2FinalIncreaseMlKgMin: plateau.increaseMlKgMin.value,
      vo2FinalIncreaseMlMin: plateau.increaseMlMin.value,
      lactatePeakMmolL: lactatePeak,
    },
    ctx.effortSet,
    { vo2FinalIncreaseMlKgMin: plateau.seMlKgMin.value, vo2FinalIncreaseMlMin: plateau.seMlMin.value },
    // on a beta-blocker HR need not reach a predicted maximum: an HR criterion counts only when met (common practice)
    ctx.patient.betaBlocker ? ["hrPercentPredicted", "hrReserveBpm"] : [],
  );
  // the slope "to the RCP" is not fitted to a VT2 that does not lie above VT1 (the RCP follows the AT; common practice):
  // it then goes as without a VT2 (README-thresholds.md round 20)
  const vt2InOrder = vt2 && vt1 && !(vt2.vo2MlMin > vt1.vo2MlMin && vt2.timeS > vt1.timeS) ? null : vt2;
  const veVco2 = veVco2Slope(test, { vt1, vt2: vt2InOrder, nadirWindowS: windowS, readAtTime: ctx.readAtTime });
  if (vt2 && !vt2InOrder)
    veVco2.issues.push(
      makeIssue(
        "warning",
        "ve-vco2-slope-vt2-out-of-order",
        "VT2 does not lie above VT1: the VE/VCO2 slope to the RCP is not fitted to it, but read as when VT2 is not determinable.",
      ),
    );
  const ouesR = oues(test);
  // indices read from brief, submaximal exercise run low (briefExercise.ts): each says so and how far
  const exerciseS = test.exercise ? test.exercise.endS - test.exercise.startS : NaN;
  const brief: [BriefExerciseIndex, LineIndex | undefined][] = [
    ["oues", ouesR.fits.find((f) => f.fraction === 1)],
    ["veVco2SlopeWhole", veVco2.slopeWholeExercise],
    ["veVco2SlopeToRcp", veVco2.slopeToVt2],
  ];
  const briefReadings: Parameters<typeof briefExerciseIssue>[0] = [];
  for (const [index, line] of brief) {
    const reading = line ? briefExerciseReading(index, line.slope.value, exerciseS, peaks.rerMax.value) : null;
    if (!line || !reading) continue;
    line.briefExercise = reading;
    briefReadings.push({ index, value: line.slope.value as number, reading });
  }
  const briefIssue = briefExerciseIssue(briefReadings);
  const dv = dVo2dWr(test, { vt1, vt2, lagS: ctx.dVo2dWrLagS });
  const o2p = o2Pulse(test);
  const sp = spo2(test, { windowS, definition: ctx.desaturationDefinition });
  const vd = vdVt(test, ctx.bloodGases, ctx.readAtTime, ctx.apparatusDeadSpaceMl, ctx.barometricPressureMmHg);
  const domains = intensityDomains(atVt1, atVt2, peaks, rampLag(test, vt1?.timeS ?? null));
  const issues = [
    ...peaks.issues,
    ...(atVt1?.issues ?? []),
    ...(atVt2?.issues ?? []),
    ...br.issues,
    ...hrGapIssues(test),
    ...hr.issues,
    ...veVco2.issues,
    ...ouesR.issues,
    ...(briefIssue ? [briefIssue] : []),
    ...dv.issues,
    ...o2p.issues,
    ...sp.issues,
    ...vd.issues,
    ...ev.issues,
    ...(lactate?.issues ?? lp.issues),
    ...domains.issues,
  ];
  return {
    peaks,
    vo2FinalIncrease: plateau,
    effort,
    veVco2,
    oues: ouesR,
    dVo2dWr: dv,
    o2Pulse: o2p,
    breathingReserve: br,
    heartRate: hr,
    spo2: sp,
    vdVt: vd.points,
    eov: ev,
    atVt1,
    atVt2,
    lactate,
    domains,
    issues,
  };
}
