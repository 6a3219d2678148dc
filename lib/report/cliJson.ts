import type { Issue, Measured } from "../core";
import type { AnalysisResult } from "../analysis";
import { ATRIAL_FIBRILLATION_HR_NOTE, BETA_BLOCKER_HR_NOTE, conclusionLead, type InterpretValues } from "../interpret";
import {
  LACTATE_METHOD_ESTIMATES,
  LACTATE_METHOD_NAMES,
  noiseCorrectedSlope,
  slopeToVt2Name,
  type ThresholdEstimate,
} from "../thresholds";

/** The interpretation value that reads each predicted quantity's % predicted (the others are shown, not read). */
const PCT_READ_AS: Record<string, keyof InterpretValues> = {
  vo2PeakMlMin: "peakVo2PctPred",
  vo2PeakMlKgMin: "peakVo2PctPred",
  hrMaxBpm: "hrPctPred",
  o2PulseMaxMlBeat: "o2PulsePctPred",
};

/**
 * The CLI's JSON object: a stable projection of the analysis result, documented by
 * `cli/analyse.schema.json`. Keys are stable: later versions only add keys. A value that cannot be
 * determined is `null`, with its reason in `issues` (code `not-determinable`).
 */
export interface CliAnalysisJson {
  engineVersion: string;
  caution: string;
  durationS: number | null;
  exerciseDurationS: number | null;
  averaging: string;
  peak: {
    method: string;
    windowS: number;
    vo2MlMin: number | null;
    vo2MlKgMin: number | null;
    vco2MlMin: number | null;
    veLMin: number | null;
    rer: number | null;
    hrBpm: number | null;
    workW: number | null;
    /** Treadmill: highest speed (km/h) and grade (%) in exercise; null on a cycle. */
    speedKmh?: number | null;
    gradePct?: number | null;
    o2PulseMlBeat: number | null;
  };
  /**
   * Predicted value per quantity. `notRead`: why the interpretation does not read this % predicted (a minor against an
   * adult equation, VO2 not believable, a beta-blocker or atrial fibrillation for heart rate), or null when it is read.
   */
  predicted: Record<
    string,
    { value: number | null; unit: string; equationId: string; percentPredicted: number | null; notRead: string | null }
  >;
  vt1: CliThreshold;
  vt2: CliThreshold;
  veVco2Slope: {
    toRcp: number | null;
    /** What the slope "to RCP" was fitted to, in words (the RCP, the whole exercise, or a fitted break). */
    toRcpFittedTo: string;
    toRcpIntercept: number | null;
    /** Calibrated band of the slope to RCP (about 8 of 10 invented tests), or null. */
    toRcpBand: { low: number; high: number } | null;
    whole: number | null;
    /** Calibrated band of the whole-exercise slope, centred on the dilution-corrected slope, or null. */
    wholeBand: { low: number; high: number } | null;
    /** The whole-exercise slope corrected for breath noise in VCO2 (the band's centre), or null. */
    wholeNoiseCorrected: number | null;
    wholeIntercept: number | null;
    nadir: number | null;
    /** VE/VCO2 at VT1 (ratio of the window means of VE and VCO2 around VT1), or null. */
    atVt1: number | null;
    /** VE/VCO2 read where the VO2 trend reached the low and the high end of the VT1 band, or null. */
    atVt1BandEnds: { low: number; high: number } | null;
  };
  oues: number | null;
  /** Calibrated band of OUES (whole exercise), or null. */
  ouesBand: { low: number; high: number } | null;
  /** OUES corrected for breath noise in log10 VE (the band's centre), or null. */
  ouesNoiseCorrected: number | null;
  oues90: number | null;
  oues75: number | null;
  dVo2dWr: number | null;
  /** Calibrated band of ΔVO2/ΔWR, or null. */
  dVo2dWrBand: { low: number; high: number } | null;
  o2PulsePattern: string | null;
  /** Why the O2 pulse pattern is null (e.g. HR missing in exercise), or null. */
  o2PulsePatternReason?: string | null;
  breathingReserve: {
    pct: number | null;
    lMin: number | null;
    mvvLMin: number | null;
    mvvMethod: string | null;
    veMvvPct: number | null;
  };
  heartRate: {
    reserveBpm: number | null;
    chronotropicIndex: number | null;
    recovery1MinBpm: number | null;
    percentPredicted: number | null;
  };
  spo2: { restPct: number | null; lowestPct: number | null; fallPct: number | null };
  eov: { definition: string; detected: boolean | null }[];
  lactate: null | {
    axis: string;
    unit: string;
    obla4: { workW: number | null; speedKmh: number | null };
    /**
     * `name` as the page names the method; `reason` when `value` is null; heart rate and VO2 at the threshold (null when
     * not read); the VT it estimates and how it reads against it (`relation`, null without VT1/VT2); `caution` when it
     * reads across a suspect sample.
     */
    thresholds: {
      method: string;
      name: string;
      value: number | null;
      lactateMmolL: number | null;
      reason: string | null;
      hrBpm: number | null;
      vo2MlMin: number | null;
      estimates: "VT1" | "VT2";
      relation: { comparedWith: "VT1" | "VT2"; reading: string; difference: number | null } | null;
      caution: string | null;
    }[];
    relations: string[];
    /** Highest lactate of all samples, recovery samples included, mmol/L. */
    peakMmolL: number | null;
    /** Samples drawn in recovery: peak lactate only, not on the curve. */
    recoverySamples: { lactateMmolL: number; afterEndS: number }[];
    /** Tolerance of the concordance statements, axis units, and how it was set. */
    concordanceTolerance: { value: number; basis: string; sampleSpacing: number | null };
  };
  domains: {
    id: string;
    label: string;
    hrBpm: [number | null, number | null];
    workW: [number | null, number | null];
    workConstantLoadW: [number | null, number | null];
    speedKmh?: [number | null, number | null];
    gradePct?: [number | null, number | null];
  }[];
  /** VO2 lag on the cycle ramp the constant-load work rates are read with, s. */
  domainsRampLagS: number | null;
  interpretation: unknown;
  issues: Issue[];
}

export interface CliThreshold {
  vo2MlMin: number | null;
  vo2MlKgMin: number | null;
  timeS: number | null;
  hrBpm: number | null;
  workW: number | null;
  /** Treadmill speed at the threshold time, km/h; null on a cycle. */
  speedKmh?: number | null;
  pctPeak: number | null;
  /** VO2 at the threshold as % of the predicted peak VO2 (lab's equation). */
  pctPredictedPeak: number | null;
  confidence: string;
  band: { lowMlMin: number; highMlMin: number } | null;
  methods: { id: string; vo2MlMin: number | null; quality: string }[];
  overridden: boolean;
  reason: string | null;
}

const val = (m: Measured | null | undefined): number | null =>
  m && m.value !== null && Number.isFinite(m.value) ? m.value : null;

/** Two readings as { low, high } when both are numbers, else null. */
const bandEnds = (ends: { low: Measured; high: Measured } | null | undefined): { low: number; high: number } | null => {
  const low = val(ends?.low);
  const high = val(ends?.high);
  return low !== null && high !== null ? { low, high } : null;
};

export function toCliJson(result: AnalysisResult, caution: string): CliAnalysisJson {
  const ix = result.indices;
  const p = ix.peaks;
  const issues: Issue[] = [...result.issues];
  // a value that cannot be determined is null in the JSON, with its reason in `issues` pointing at its key
  const nd = (what: string, field: string, m: Measured | null | undefined) => {
    if (m && m.value === null)
      issues.push({
        severity: "info",
        code: "not-determinable",
        message: `${what}: ${m.reason ?? "not determinable"}`,
        where: { field },
      });
    return val(m);
  };
  const predVo2 = result.predicted.values.vo2PeakMlMin?.value ?? null;
  const threshold = (t: ThresholdEstimate, at: AnalysisResult["indices"]["atVt1"]): CliThreshold => {
    if (t.vo2MlMin.value === null)
      issues.push({
        severity: "info",
        code: "not-determinable",
        message: `${t.which.toUpperCase()}: ${t.reason ?? t.vo2MlMin.reason ?? "not determinable"}`,
        where: { field: `${t.which}.vo2MlMin` },
      });
    return {
      vo2MlMin: val(t.vo2MlMin),
      vo2MlKgMin: val(at?.vo2MlKgMin),
      timeS: t.timeS,
      hrBpm: val(at?.hrBpm) ?? val(t.hrBpm),
      workW: val(at?.workW) ?? val(t.workW),
      speedKmh: val(at?.speedKmh) ?? val(t.speedKmh),
      pctPeak: val(at?.vo2PercentPeak),
      pctPredictedPeak: t.vo2MlMin.value !== null && predVo2 ? (100 * t.vo2MlMin.value) / predVo2 : null,
      confidence: t.confidence,
      band: t.band,
      methods: result.thresholds.methods
        .filter((m) => m.which === t.which)
        .map((m) => ({ id: m.id, vo2MlMin: val(m.vo2MlMin), quality: m.quality })),
      overridden: Boolean(t.overridden),
      reason: t.reason ?? null,
    };
  };
  const ouesFit = (f: number) => ix.oues.fits.find((x) => Math.abs(x.fraction - f) < 1e-9);
  const oues = (f: number) => val(ouesFit(f)?.slope);
  const ouesWhole = ouesFit(1);
  const predicted: CliAnalysisJson["predicted"] = {};
  const seen = new Set(issues.map((i) => `${i.code}|${i.message}`));
  const addOnce = (i: Issue) => {
    if (!seen.has(`${i.code}|${i.message}`)) issues.push(i);
    seen.add(`${i.code}|${i.message}`);
  };
  for (const [q, pv] of Object.entries(result.predicted.values)) {
    if (!pv) continue;
    // each predicted value's own cautions (outside the derivation population, input missing) and its reason when null
    // a missing patient detail stops one predicted value, not the analysis: an error there is a warning here
    for (const i of pv.issues) addOnce(i.severity === "error" ? { ...i, severity: "warning" } : i);
    if (pv.value === null)
      addOnce({
        severity: "info",
        code: "not-determinable",
        message: `Predicted ${q} (${pv.equationLabel}): ${pv.reason ?? "not determinable"}`,
        where: { field: `predicted.${q}.value` },
      });
    const cmp = result.comparisons.find((c) => c.predicted?.quantity === q);
    predicted[q] = {
      value: pv.value,
      unit: pv.unit,
      equationId: pv.equationId,
      percentPredicted: cmp?.percentPredicted ?? null,
      notRead: cmp?.percentPredicted != null ? notReadReason(result, q) : null,
    };
  }
  const lac = ix.lactate;
  const obla = lac?.thresholds.find((t) => t.id === "obla-4");
  const oblaOn = (axis: "workW" | "speedKmh"): number | null => {
    if (!lac || lac.axis !== axis) return null;
    const field = `lactate.obla4.${axis}`;
    if (!obla) {
      issues.push({
        severity: "info",
        code: "not-determinable",
        message: "Lactate 4 mmol/L (OBLA): not computed",
        where: { field },
      });
      return null;
    }
    return nd("Lactate 4 mmol/L (OBLA)", field, obla.intensity);
  };
  if (lac && lac.axis !== "workW") {
    // obla4.workW is null because OBLA is given as a speed: said in words, marked by its field so the text summary
    // does not list it as missing
    const onSpeed = obla?.intensity.value ?? null;
    issues.push({
      severity: "info",
      code: "not-determinable",
      message: `Lactate 4 mmol/L (OBLA) as a work rate: the lactate samples are placed by speed (the file gives no work rate), so OBLA is given as a speed${onSpeed !== null ? ` (${onSpeed.toFixed(1)} km/h)` : ""}.`,
      where: { field: "lactate.obla4.workW" },
    });
  }
  // on a treadmill the load is speed and grade: a missing work rate is expected there, a missing speed is not
  const treadmill = result.conditioned.clean.some((r) => typeof r.speedKmh === "number");
  const json: CliAnalysisJson = {
    engineVersion: result.engineVersion,
    caution,
    durationS: val(p.testDurationS),
    exerciseDurationS: val(p.exerciseDurationS),
    averaging: result.conditioned.averaging.label,
    peak: {
      method: p.vo2MlMin.provenance.label,
      windowS: p.windowS,
      vo2MlMin: nd("Peak VO2", "peak.vo2MlMin", p.vo2MlMin),
      vo2MlKgMin: nd("Peak VO2 per kg", "peak.vo2MlKgMin", p.vo2MlKgMin),
      vco2MlMin: val(p.vco2MlMin),
      veLMin: val(p.veLMin),
      rer: nd("Peak RER", "peak.rer", p.rerMax),
      hrBpm: nd("Peak HR", "peak.hrBpm", p.hrBpm),
      workW: treadmill ? val(p.workW) : nd("Peak work rate", "peak.workW", p.workW),
      speedKmh: treadmill ? nd("Peak speed", "peak.speedKmh", p.speedKmh) : val(p.speedKmh),
      gradePct: val(p.gradePct),
      o2PulseMlBeat: nd("Peak O2 pulse", "peak.o2PulseMlBeat", p.o2PulseMlBeat),
    },
    predicted,
    vt1: threshold(result.thresholds.vt1, ix.atVt1),
    vt2: threshold(result.thresholds.vt2, ix.atVt2),
    veVco2Slope: {
      toRcp: nd("VE/VCO2 slope to RCP", "veVco2Slope.toRcp", ix.veVco2.slopeToVt2.slope),
      toRcpFittedTo: slopeToVt2Name(ix.veVco2.slopeToVt2),
      toRcpIntercept: val(ix.veVco2.slopeToVt2.intercept),
      toRcpBand: ix.veVco2.slopeToVt2.band ?? null,
      whole: nd("VE/VCO2 slope, whole exercise", "veVco2Slope.whole", ix.veVco2.slopeWholeExercise.slope),
      wholeBand: ix.veVco2.slopeWholeExercise.band ?? null,
      wholeNoiseCorrected: noiseCorrectedSlope(ix.veVco2.slopeWholeExercise),
      wholeIntercept: val(ix.veVco2.slopeWholeExercise.intercept),
      nadir: val(ix.veVco2.nadir),
      atVt1: val(ix.veVco2.atVt1),
      atVt1BandEnds: bandEnds(ix.atVt1?.veVco2AtBandEnds),
    },
    oues: nd("OUES", "oues", ouesWhole?.slope),
    ouesBand: ouesWhole?.band ?? null,
    ouesNoiseCorrected: noiseCorrectedSlope(ouesWhole),
    oues90: oues(0.9),
    oues75: oues(0.75),
    dVo2dWr: nd("ΔVO2/ΔWR", "dVo2dWr", ix.dVo2dWr.whole.slope),
    dVo2dWrBand: ix.dVo2dWr.whole.band ?? null,
    o2PulsePattern: ix.o2Pulse.pattern,
    o2PulsePatternReason: ix.o2Pulse.pattern === null ? (ix.o2Pulse.patternReason ?? null) : null,
    breathingReserve: {
      pct: nd("Breathing reserve", "breathingReserve.pct", ix.breathingReserve.reservePercent),
      lMin: val(ix.breathingReserve.reserveLMin),
      mvvLMin: val(ix.breathingReserve.mvvLMin),
      mvvMethod: ix.breathingReserve.mvvChoice,
      veMvvPct: val(ix.breathingReserve.veMvvPercent),
    },
    heartRate: {
      reserveBpm: nd("HR reserve", "heartRate.reserveBpm", ix.heartRate.reserveBpm),
      chronotropicIndex: nd("Chronotropic index", "heartRate.chronotropicIndex", ix.heartRate.chronotropicIndex),
      recovery1MinBpm: nd("HR recovery at 1 min", "heartRate.recovery1MinBpm", ix.heartRate.recovery1MinBpm),
      percentPredicted: val(ix.heartRate.percentPredicted),
    },
    spo2: { restPct: val(ix.spo2.restPct), lowestPct: val(ix.spo2.lowestPct), fallPct: val(ix.spo2.fallPct) },
    eov: ix.eov.definitions.map((d) => ({ definition: d.id, detected: d.detected })),
    lactate: lac
      ? {
          axis: lac.axis,
          unit: lac.unit,
          obla4: {
            workW: oblaOn("workW"),
            speedKmh: oblaOn("speedKmh"),
          },
          thresholds: lac.thresholds.map((t) => ({
            method: t.id,
            name: LACTATE_METHOD_NAMES[t.id],
            value: val(t.intensity),
            lactateMmolL: val(t.lactateMmolL),
            reason: t.intensity.value === null ? (t.intensity.reason ?? "not determinable") : null,
            hrBpm: t.hrBpm ? val(t.hrBpm) : null,
            vo2MlMin: t.vo2MlMin ? val(t.vo2MlMin) : null,
            estimates: LACTATE_METHOD_ESTIMATES[t.id],
            relation: ((r) => (r ? { comparedWith: r.comparedWith, reading: r.reading, difference: r.difference } : null))(
              lac.relations.find((r) => r.id === t.id),
            ),
            caution: t.caution ?? null,
          })),
          relations: lac.relations.map((r) => r.statement),
          peakMmolL: lac.peakMmolL,
          recoverySamples: lac.recoveryPoints.map((p) => ({ lactateMmolL: p.lactateMmolL, afterEndS: p.recoveryS ?? NaN })),
          concordanceTolerance: {
            value: lac.concordance.value,
            basis: lac.concordance.basis,
            sampleSpacing: lac.concordance.sampleSpacing,
          },
        }
      : null,
    domainsRampLagS: val(ix.domains.lag),
    domains: ix.domains.domains.map((d) => ({
      id: d.id,
      label: d.label,
      hrBpm: [val(d.hrBpm.lower), val(d.hrBpm.upper)],
      workW: [val(d.workW.lower), val(d.workW.upper)],
      workConstantLoadW: [val(d.workConstantLoadW.lower), val(d.workConstantLoadW.upper)],
      speedKmh: [val(d.speedKmh.lower), val(d.speedKmh.upper)],
      gradePct: [val(d.gradePct.lower), val(d.gradePct.upper)],
    })),
    interpretation: {
      referral: result.interpretation.referral,
      effort: {
        verdict: result.interpretation.effort.verdict,
        label: result.interpretation.effort.label,
        text: result.interpretation.effort.text,
      },
      path: result.interpretation.path,
      lead: conclusionLead(result.interpretation, result.interpretInput),
      patterns: result.interpretation.patterns,
      schemes: result.interpretation.schemes,
      settingsUsed: result.interpretation.settingsUsed,
    },
    issues,
  };
  return json;
}

/** Why the interpretation does not read the % predicted of quantity `q`, in words; null when it reads it. */
function notReadReason(result: AnalysisResult, q: string): string | null {
  const key = PCT_READ_AS[q];
  if (!key) return null;
  const why = result.interpretInput.notRead?.[key];
  if (why) return why;
  const patient = result.interpretInput.patient;
  if (key === "hrPctPred" || key === "o2PulsePctPred") {
    if (patient.atrialFibrillation === true) return ATRIAL_FIBRILLATION_HR_NOTE;
    if (key === "hrPctPred" && patient.betaBlocker === true) return BETA_BLOCKER_HR_NOTE;
  }
  return null;
}
