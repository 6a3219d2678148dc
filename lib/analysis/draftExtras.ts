import { DEFAULT_STAGE_DURATION_S } from "../breath";
import type { DraftExtras } from "../interpret";
import {
  DOMAINS_OUT_OF_ORDER,
  LACTATE_METHOD_NAMES,
  RAMP_LAG_SPREAD_S,
  type IndicesResult,
  type LactateThresholdsResult,
  type ThresholdEstimate,
  type ThresholdResult,
} from "../thresholds";
import type { TestRecord } from "./types";

/** Words for how a threshold was found: method agreement, confidence, or the reviewer's override. */
export function thresholdMethodWords(t: ThresholdEstimate, result: ThresholdResult): string {
  if (t.overridden) return `set by the reviewer (${t.overridden.by}): ${t.overridden.reason}`;
  if (t.confidence === "not-determinable" || t.vo2MlMin.value === null)
    return `not determinable: ${t.reason ?? t.vo2MlMin.reason ?? "no method gave an estimate"}`;
  const labels = result.methods.filter((m) => t.methodIds.includes(m.id)).map((m) => m.label);
  const band = t.band ? `, band ${Math.round(t.band.lowMlMin)}–${Math.round(t.band.highMlMin)} mL/min` : "";
  // a confidence below "high" says why (methods that disagree, one method only, a wide band, a stepped protocol, …)
  const why = t.reason && t.confidence !== "high" ? `; why: ${t.reason}` : "";
  return `consensus of ${labels.join(", ") || "the available methods"} (confidence ${t.confidence}${band}${why})`;
}

/** Rounded for prose (display only; the engine keeps full precision). */
const whole = (x: number | null | undefined): number | undefined =>
  x === null || x === undefined || !Number.isFinite(x) ? undefined : Math.round(x);
/** One decimal (speeds in km/h, grades in %), as the domains table shows them. */
const tenth = (x: number | null | undefined): number | undefined =>
  typeof x === "number" && Number.isFinite(x) ? Math.round(x * 10) / 10 : undefined;

/** Everything the draft text needs beyond the interpretation input. */
export function draftExtras(record: TestRecord, thresholds: ThresholdResult, indices: IndicesResult): DraftExtras {
  const at2 = indices.atVt2;
  return {
    testConduct: {
      protocol: record.conduct?.protocol,
      exerciseDurationS: indices.peaks.exerciseDurationS.value ?? undefined,
      // a stage table read without a time column or a stage length given: its durations rest on the 60-s assumption
      ...(record.importIssues.some((i) => i.code === "time-assumed-stage-order" && i.severity === "warning")
        ? { durationAssumed: `stages assumed ${DEFAULT_STAGE_DURATION_S} s apart; set the stage length if they were not` }
        : {}),
      reasonForStopping: record.conduct?.reasonForStopping,
      symptoms: record.conduct?.symptoms,
      peakBorg: record.conduct?.peakBorg,
      apparatusDeadSpaceMl: record.conduct?.apparatusDeadSpaceMl,
      barometricPressureMmHg: record.conduct?.barometricPressureMmHg,
      notes: record.conduct?.notes,
    },
    // the import's own warning that the file cannot hold a complete test is said beside the effort verdict, so an
    // "effort adequate" is never read without it
    ...(record.importIssues.some((i) => i.code === "short-recording")
      ? {
          effortCaution:
            "The recording is shorter than a complete test (see the data-quality issues): the effort verdict and the peak values are not reliable.",
        }
      : {}),
    thresholdMethods: {
      vt1: thresholdMethodWords(thresholds.vt1, thresholds),
      vt2: thresholdMethodWords(thresholds.vt2, thresholds),
    },
    vt1: indices.atVt1 ? { hrBpm: whole(indices.atVt1.hrBpm.value), ...loadAt(indices.atVt1) } : undefined,
    vt2: at2 ? { vo2MlMin: whole(at2.vo2MlMin.value), hrBpm: whole(at2.hrBpm.value), ...loadAt(at2) } : undefined,
    domains: indices.domains.domains.map((d) => ({
      name: d.label,
      hrFromBpm: whole(d.hrBpm.lower?.value),
      hrToBpm: whole(d.hrBpm.upper?.value),
      workFromW: whole(d.workW.lower?.value),
      workToW: whole(d.workW.upper?.value),
      heldFromW: whole(d.workConstantLoadW.lower?.value),
      heldToW: whole(d.workConstantLoadW.upper?.value),
      speedFromKmh: tenth(d.speedKmh.lower?.value),
      speedToKmh: tenth(d.speedKmh.upper?.value),
      gradeFromPct: tenth(d.gradePct.lower?.value),
      gradeToPct: tenth(d.gradePct.upper?.value),
    })),
    domainsWithheld: indices.domains.issues.find((i) => i.code === DOMAINS_OUT_OF_ORDER)?.message,
    ...rampLagWords(indices),
    ...(indices.lactate ? { lactate: draftLactate(indices.lactate) } : {}),
  };
}

/** The lactate thresholds in display words (whole W, 0.1 km/h, lactate 0.1 mmol/L), named as the page names them. */
function draftLactate(lac: LactateThresholdsResult): NonNullable<DraftExtras["lactate"]> {
  const d = lac.axis === "speedKmh" ? 1 : 0;
  return {
    axis: lac.axis === "speedKmh" ? "speed" : "work rate",
    points: lac.points.length,
    recoverySamples: lac.recoveryPoints.length,
    ...(lac.points.some((p) => p.rest) ? { restSamples: lac.points.filter((p) => p.rest).length } : {}),
    ...(lac.peakMmolL !== null ? { peak: `${lac.peakMmolL.toFixed(1)} mmol/L` } : {}),
    ...(lac.relations.length ? { concordance: lac.concordance.note } : {}),
    thresholds: lac.thresholds.map((t) => {
      const rel = lac.relations.find((r) => r.id === t.id);
      const v = t.intensity.value;
      return {
        name: LACTATE_METHOD_NAMES[t.id],
        ...(v !== null ? { value: `${v.toFixed(d)} ${lac.unit}` } : { reason: t.intensity.reason ?? "not determinable" }),
        ...(t.lactateMmolL.value !== null ? { lactate: `${t.lactateMmolL.value.toFixed(1)} mmol/L` } : {}),
        ...(t.hrBpm?.value != null ? { hr: `${t.hrBpm.value.toFixed(0)} bpm` } : {}),
        ...(t.vo2MlMin?.value != null ? { vo2: `${t.vo2MlMin.value.toFixed(0)} mL/min` } : {}),
        ...(rel ? { relation: `${rel.where}: ${rel.verdictShort}` } : {}),
        ...(t.caution ? { caution: t.caution } : {}),
      };
    }),
  };
}

/** The ramp's VO2 lag and the work-rate shift it gives, when the domains were read with one. */
function rampLagWords(indices: IndicesResult): Pick<DraftExtras, "rampLag"> {
  const lagS = indices.domains.lag.value;
  const shift = indices.domains.domains
    .map((d) => d.workConstantLoadW.upper ?? d.workConstantLoadW.lower)
    .find((m) => m && m.value !== null)?.provenance.inputs?.shiftW;
  const perS = lagS !== null && typeof shift === "number" && lagS > 0 ? shift / lagS : null;
  return lagS !== null && typeof shift === "number" && perS !== null
    ? { rampLag: { lagS, shiftW: shift, spreadS: RAMP_LAG_SPREAD_S, spreadW: RAMP_LAG_SPREAD_S * perS } }
    : {};
}

/** Work rate, or treadmill speed and grade, at a threshold, as the draft shows them. */
function loadAt(at: NonNullable<IndicesResult["atVt1"]>): { workW?: number; speedKmh?: number; gradePct?: number } {
  return { workW: whole(at.workW.value), speedKmh: tenth(at.speedKmh.value), gradePct: tenth(at.gradePct.value) };
}
