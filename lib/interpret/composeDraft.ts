import { DRAFT_CAUTION } from "../core/cautions";
import type { SerialComparison } from "./compareTests";
import { andList, formatValue, lowerFirst, unique } from "./format";
import type { InterpretInput, Interpretation, ReferralQuestion, SchemeResult } from "./types";
import { variableInfo, type VariableId } from "./variables";

/**
 * The first sentences of the conclusion: where the stepwise reading ended and, when peak VO2 reads as reduced on one
 * weight basis only, both readings. The stepwise reading grades % predicted on actual body weight, so with a split its
 * end is said as the reading on actual weight, after the two readings: "No exercise limitation identified" must not
 * lead a conclusion whose peak VO2 is reduced on predicted body mass (obesity: per-kg equations such as FRIEND read
 * higher on actual weight — Osman et al., J Am Coll Cardiol 2000, recalled). The draft, the page and the CLI's one-line
 * reading all use this.
 */
export function conclusionLead(interpretation: Interpretation, input: InterpretInput): string[] {
  const end = interpretation.path.end;
  const wb = input.weightBasisSplit;
  if (!wb || !interpretation.effort.peakConclusionsAllowed) return end ? [`${end.label}.`] : [];
  const actual = `on actual body weight (${wb.reducedOnActual ? "reduced" : "not reduced"})`;
  const ideal = `on predicted body mass (${wb.idealWeightKg.toFixed(1)} kg; ${wb.reducedOnActual ? "not reduced" : "reduced"})`;
  // the reduced reading first, so the reader meets it before any "no limitation"
  const readings = wb.reducedOnActual
    ? `${wb.actualPct.toFixed(0)} % of predicted ${actual} and ${wb.idealPct.toFixed(0)} % ${ideal}`
    : `${wb.idealPct.toFixed(0)} % of predicted ${ideal} but ${wb.actualPct.toFixed(0)} % ${actual}`;
  const out = [`Peak VO2 is ${readings}: the reading depends on the weight basis, which the report should state.`];
  if (end) out.push(`On actual body weight: ${lowerFirst(end.label)}.`);
  return out;
}

/** An intensity domain for exercise prescription (from the thresholds layer), all optional ranges. */
export interface IntensityDomain {
  name: string;
  hrFromBpm?: number;
  hrToBpm?: number;
  workFromW?: number;
  workToW?: number;
  /** The same work rates held at constant load (the ramp's one VO2 lag earlier), where the lag was measured. */
  heldFromW?: number;
  heldToW?: number;
  /** Treadmill speed (km/h, one decimal) and grade (%, one decimal) over the domain. */
  speedFromKmh?: number;
  speedToKmh?: number;
  gradeFromPct?: number;
  gradeToPct?: number;
}

export interface DraftExtras {
  testConduct?: {
    protocol?: string;
    exerciseDurationS?: number;
    /** Why the duration is not measured (e.g. stages assumed 60 s apart), said beside it. */
    durationAssumed?: string;
    reasonForStopping?: string;
    symptoms?: string;
    peakBorg?: number;
    notes?: string;
    /** Apparatus dead space subtracted from VD/VT, mL. */
    apparatusDeadSpaceMl?: number;
    /** Barometric pressure used for P(A−a)O2, mmHg. */
    barometricPressureMmHg?: number;
  };
  /**
   * How VT1 / VT2 were found, in words: either the method ("consensus of …", written after "was found by")
   * or a whole predicate starting with a participle ("set by the reviewer (name): reason",
   * "not determinable: reason"), written after "was".
   */
  thresholdMethods?: { vt1?: string; vt2?: string };
  /** A sentence said right after the effort verdict when the data cannot support it (e.g. a recording too short). */
  effortCaution?: string;
  /** VT2 (RCP) values, if found. */
  vt2?: { vo2MlMin?: number; hrBpm?: number; workW?: number; speedKmh?: number; gradePct?: number };
  /** Heart rate and load at VT1 (its VO2 comes from the interpretation values); on a treadmill speed and grade. */
  vt1?: { hrBpm?: number; workW?: number; speedKmh?: number; gradePct?: number };
  domains?: IntensityDomain[];
  /** Why no domain is given when both thresholds are there (they are out of order), in words for the draft. */
  domainsWithheld?: string;
  /**
   * VO2 lag on the ramp (s), the work-rate shift it gives (W), and how far the lag may be off (s) with the work that
   * stands for (W), when measured.
   */
  rampLag?: { lagS: number; shiftW: number; spreadS: number; spreadW: number };
  /** Blood lactate thresholds, already in display words (the thresholds layer names and rounds them). */
  lactate?: DraftLactate;
  comparison?: SerialComparison;
}

/** The lactate thresholds for the draft text: each method named as the page names it, values with their units. */
export interface DraftLactate {
  /** What the samples were placed by: "work rate" or "speed". */
  axis: string;
  /** Points on the lactate curve. */
  points: number;
  /** Samples drawn in recovery (peak lactate only, not on the curve). */
  recoverySamples: number;
  /** Resting samples (before exercise, or at 0 W / 0 km/h) among `points`: shown, not on the curve the methods read. */
  restSamples?: number;
  /** Highest lactate of all samples, "8.5 mmol/L". */
  peak?: string;
  /** How concordance with VT1/VT2 is read (tolerance and its basis), one sentence; said once before the methods. */
  concordance?: string;
  thresholds: {
    /** Method name, e.g. "OBLA (4 mmol/L)". */
    name: string;
    /** Intensity with unit, e.g. "192 W"; missing when not determinable. */
    value?: string;
    /** Lactate at the threshold, e.g. "4.0 mmol/L". */
    lactate?: string;
    /** Heart rate at the threshold, e.g. "165 bpm". */
    hr?: string;
    /** VO2 at the threshold, e.g. "2210 mL/min". */
    vo2?: string;
    /**
     * Where it lies against the VT it estimates and the verdict, e.g. "2 W (1.1%) below VT2 (194 W): concordant within
     * 10 W", or "62 W (53.9%) above VT1 (115 W), near VT2 (194 W): check both".
     */
    relation?: string;
    /** Set when the method reads across a suspect sample: the sentence naming it. */
    caution?: string;
    /** Why it is not determinable. */
    reason?: string;
  }[];
}

export interface DraftSection {
  id: string;
  title: string;
  paragraphs: string[];
}

export interface DraftReport {
  status: "draft";
  /** Shown at the top of every rendering. */
  banner: string;
  sections: DraftSection[];
  caution: string;
  sourceIds: string[];
}

/** The draft mark (one text for the whole product, lib/core/cautions.ts). */
export const DRAFT_BANNER = DRAFT_CAUTION;
export const COMPOSED_TEXT_CAUTION =
  "This text was composed automatically from measured values and published cut-offs. Results must be reviewed by a qualified clinician; local protocols and licensed practice prevail. Cut-offs marked as recalled have not been checked against the primary publication.";

const REFERRAL_TEXT: Record<ReferralQuestion, string> = {
  general: "Assessment of exercise capacity and of the cause of exercise limitation.",
  "heart-failure": "Functional and prognostic assessment in heart failure.",
  "pre-operative": "Pre-operative assessment of cardiopulmonary fitness and perioperative risk.",
  "lung-resection": "Physiological assessment before lung resection.",
  "pulmonary-hypertension": "Functional and risk assessment in pulmonary hypertension.",
  transplant: "Assessment in the context of heart-transplant listing.",
  training: "Assessment of fitness and intensity domains for exercise training.",
};

/** "a", "a and b", "a, b and c". */
/** Plain names of the predicted quantities, for the extrapolation sentence of the conclusion. */
const PREDICTED_WORDS = { peakVo2: "peak VO2", hrMax: "maximal heart rate", o2Pulse: "O2 pulse" } as const;

/**
 * The plain note beside every heart rate compared with a predicted maximum (% predicted, HR reserve) when the patient
 * takes a beta-blocker: predicted-HRmax equations do not describe a beta-blocked heart, so a heart rate short of them is
 * not read (the drug lowers it), while one that reaches the predicted range despite the drug still counts as a sign of
 * effort (common practice; `InterpretInput.readOneSided`).
 */
export const BETA_BLOCKER_HR_NOTE =
  "on a beta-blocker: a heart rate short of the age-predicted maximum is not read, as the drug lowers it; one that reaches the predicted range still counts as a sign of effort";

/** Why a beta-blocked heart rate is read on one side only, in the rule texts (`InterpretInput.readOneSided`). */
export const BETA_BLOCKER_ONE_SIDED =
  "the patient takes a beta-blocker, which lowers heart rate: only a heart rate that reaches the cut-off is read";

/** Beside a beta-blocked peak heart rate that met the effort criterion (common practice). */
export const BETA_BLOCKER_HR_REACHED_NOTE = "reached despite a beta-blocker: counted as a sign of effort";

/**
 * Beside heart rates in atrial fibrillation. Ventricular rate in atrial fibrillation is irregular and not set by the
 * sinus node, so age-predicted maxima, heart-rate reserve, chronotropic index, heart-rate recovery and O2 pulse (VO2/HR)
 * do not mean what they mean in sinus rhythm (common practice).
 */
export const ATRIAL_FIBRILLATION_HR_NOTE =
  "atrial fibrillation: heart rate is not read against predicted values, and heart-rate indices and O2 pulse are not interpreted";

/**
 * Beside a heart-rate reserve of zero or less (predicted maximum − peak HR): the peak heart rate reached or passed the
 * predicted maximum, which is a prediction with a scatter of its own, so "−8 bpm" reads as no reserve left, not as an
 * error. Null for a positive reserve or none.
 */
export function hrReserveNote(reserveBpm: number | null): string | null {
  if (reserveBpm === null || !Number.isFinite(reserveBpm) || Math.round(reserveBpm) > 0) return null;
  const over = -Math.round(reserveBpm);
  return over === 0
    ? "peak heart rate at the predicted maximum: no heart-rate reserve left"
    : `peak heart rate ${over} bpm above the predicted maximum: no heart-rate reserve left (the predicted maximum is an estimate with its own scatter)`;
}

/** The notes a heart rate read against a predicted maximum needs for this patient (beta-blocker, atrial fibrillation). */
export function heartRateNotes(patient: { betaBlocker?: boolean | null; atrialFibrillation?: boolean | null }): string[] {
  return [
    ...(patient.atrialFibrillation === true ? [ATRIAL_FIBRILLATION_HR_NOTE] : []),
    ...(patient.betaBlocker === true ? [BETA_BLOCKER_HR_NOTE] : []),
  ];
}

/** Words that already form a predicate ("set by …", "not determinable: …") and take "was", not "was found by". */
const PREDICATE_START = /^(set|found|entered|placed|moved|chosen|taken|not)\b/i;

/** "VT1 was found by consensus of …" / "VT1 was set by the reviewer (name): reason." */
function thresholdMethodSentence(name: string, words: string): string {
  const w = words.trim().replace(/[.\s]+$/, "");
  return PREDICATE_START.test(w) ? `${name} was ${w}.` : `${name} was found by ${w}.`;
}

/**
 * The lactate paragraphs of the thresholds section: what the curve was made of (and the recovery samples kept off it),
 * then one sentence per method — value, lactate, heart rate and VO2 there, where it lies against the VT it estimates, and
 * a caution when it reads across a suspect sample — or why it is not determinable.
 */
function lactateParagraphs(l: DraftLactate): string[] {
  const rec =
    l.recoverySamples > 0
      ? ` ${l.recoverySamples} sample${l.recoverySamples === 1 ? "" : "s"} drawn in recovery ${l.recoverySamples === 1 ? "counts" : "count"} towards peak lactate only and ${l.recoverySamples === 1 ? "is" : "are"} not on the curve.`
      : "";
  const rest = l.restSamples ? ` (${l.restSamples} at rest, shown but not on the exercise curve the methods read)` : "";
  const out = [
    `Blood lactate thresholds from ${l.points} point${l.points === 1 ? "" : "s"}${rest} against ${l.axis}${l.peak ? `; peak lactate ${l.peak}` : ""}.${rec}${l.concordance ? ` ${l.concordance}` : ""}`,
  ];
  for (const t of l.thresholds) {
    if (t.value === undefined) {
      out.push(`${t.name}: not determinable${t.reason ? ` (${t.reason})` : ""}.`);
      continue;
    }
    const at = [t.lactate ? `lactate ${t.lactate}` : "", t.hr ? `heart rate ${t.hr}` : "", t.vo2 ? `VO2 ${t.vo2}` : ""]
      .filter(Boolean)
      .join(", ");
    const caution = t.caution ? ` Caution: ${t.caution}.` : "";
    out.push(`${t.name} at ${t.value}${at ? ` (${at})` : ""}${t.relation ? `, ${t.relation}` : ""}.${caution}`);
  }
  return out;
}

function sentenceCase(s: string): string {
  return s.length ? s[0].toUpperCase() + s.slice(1) : s;
}

/**
 * Compose a draft report from an interpretation: referral question, test conduct and effort, results
 * against predicted, thresholds, the stepwise interpretation, limitation patterns, scheme results,
 * exercise prescription from intensity domains, serial comparison and conclusion. Plain clinical
 * English in editable sections (title + paragraphs); always `status: "draft"` with the draft banner.
 * Wording is "consistent with", never a diagnosis.
 */
export function composeDraft(input: InterpretInput, interpretation: Interpretation, extras: DraftExtras = {}): DraftReport {
  const v = input.values;
  const pred = input.predictedEquations ?? {};
  const val = (id: VariableId, x: number | null | undefined) => {
    const info = variableInfo(id);
    return `${formatValue(id, x ?? null)}${info.unit && x !== null && x !== undefined ? ` ${info.unit}` : ""}`;
  };
  const have = (x: unknown) => x !== null && x !== undefined;
  // a value shown but not interpreted (`InterpretInput.notRead`): printed as measured, with why it is not read
  const notRead = input.notRead ?? {};
  const pctWords = (id: "peakVo2PctPred" | "hrPctPred" | "o2PulsePctPred", x: number | null | undefined, what: string) =>
    notRead[id]
      ? `% of predicted not read: ${notRead[id]}`
      : have(x)
        ? `${formatValue(id, x ?? null)} % of predicted${what}`
        : null;
  const sections: DraftSection[] = [];

  sections.push({ id: "referral", title: "Referral question", paragraphs: [REFERRAL_TEXT[interpretation.referral]] });

  const conduct: string[] = [];
  const tc = extras.testConduct;
  if (tc) {
    const bits: string[] = [];
    if (tc.protocol) bits.push(`Protocol: ${tc.protocol}.`);
    if (input.ergometer) bits.push(`Ergometer: ${input.ergometer}.`);
    if (have(tc.exerciseDurationS))
      // whole seconds first, so 1079.6 s reads "18 min 0 s", never "17 min 60 s"
      bits.push(
        `Exercise lasted ${Math.floor(Math.round(tc.exerciseDurationS!) / 60)} min ${Math.round(tc.exerciseDurationS!) % 60} s${tc.durationAssumed ? ` (${tc.durationAssumed})` : ""}.`,
      );
    if (tc.reasonForStopping) bits.push(`The test was stopped because of ${tc.reasonForStopping}.`);
    if (tc.symptoms) bits.push(`Symptoms: ${tc.symptoms}.`);
    if (have(tc.peakBorg)) bits.push(`Peak perceived exertion (Borg): ${tc.peakBorg}.`);
    if (have(tc.apparatusDeadSpaceMl)) bits.push(`Apparatus dead space ${tc.apparatusDeadSpaceMl} mL (subtracted from VD/VT).`);
    if (have(tc.barometricPressureMmHg)) bits.push(`Barometric pressure ${tc.barometricPressureMmHg} mmHg (for P(A−a)O2).`);
    if (tc.notes) bits.push(tc.notes);
    if (bits.length) conduct.push(bits.join(" "));
  } else if (input.ergometer) conduct.push(`Ergometer: ${input.ergometer}.`);
  const e = interpretation.effort;
  // a referral scheme that reads peak RER against a stricter cut-off for its own purpose (heart-failure prognosis: RER
  // ≥ 1.10, JACC HF 2020 — confirmed) says so on the effort line, so "maximal" is not read past it
  const stricterRer = interpretation.schemes
    .map((s) => ({ s, axis: s.axes.find((a) => a.axisId === "rer" && a.category && a.category.severity > 0) }))
    .find((x) => x.axis);
  const rerNote =
    stricterRer && e.verdict === "maximal" ? ` For the ${stricterRer.s.name}: ${stricterRer.axis!.category!.label}.` : "";
  conduct.push(`Effort: ${e.label}.${rerNote}${e.borderline ? ` Near a cut-off: ${e.borderline}.` : ""}`);
  if (extras.effortCaution) conduct.push(extras.effortCaution);
  conduct.push(`Criteria: ${e.criteria.map((c) => c.text).join("; ")}.`);
  if (!e.peakConclusionsAllowed) {
    conduct.push(
      "Because maximal effort was not demonstrated, peak values may understate capacity and no conclusion is drawn from them; only effort-independent variables (VE/VCO2 slope, OUES and VT1) are interpreted.",
    );
  }
  sections.push({ id: "conduct", title: "Test conduct and effort", paragraphs: conduct });

  const results: string[] = [];
  if (have(v.peakVo2MlMin) || have(v.peakVo2PctPred)) {
    const parts = [val("peakVo2MlMin", v.peakVo2MlMin)];
    if (have(v.peakVo2MlKgMin)) parts.push(val("peakVo2MlKgMin", v.peakVo2MlKgMin));
    const pctVo2 = pctWords("peakVo2PctPred", v.peakVo2PctPred, pred.peakVo2 ? ` (${pred.peakVo2})` : "");
    if (pctVo2) parts.push(pctVo2);
    results.push(`Peak VO2 ${parts.join(", ")}.`);
    if (notRead.peakVo2MlMin) results.push(`VO2-based values are shown but not interpreted: ${notRead.peakVo2MlMin}.`);
  }
  if (have(v.peakWorkW)) results.push(`Peak work rate ${val("peakWorkW", v.peakWorkW)}.`);
  else if (have(v.peakSpeedKmh))
    results.push(
      `Final treadmill stage ${val("peakSpeedKmh", v.peakSpeedKmh)}${have(v.peakGradePct) ? ` at ${val("peakGradePct", v.peakGradePct)} grade` : ""}.`,
    );
  if (have(v.peakHrBpm)) {
    // on a beta-blocker the % predicted is said only when it met the effort criterion (read one side only)
    const blocked = input.patient.betaBlocker === true;
    const reachedOnBlocker =
      blocked && interpretation.effort.criteria.some((c) => c.ruleId === "hr-reached" && c.outcome === true);
    const pctHr = !blocked || reachedOnBlocker ? pctWords("hrPctPred", v.hrPctPred, pred.hrMax ? `, ${pred.hrMax}` : "") : null;
    const against = [
      ...(pctHr ? [pctHr] : []),
      ...(reachedOnBlocker ? [BETA_BLOCKER_HR_REACHED_NOTE] : heartRateNotes(input.patient)),
    ];
    results.push(
      `Peak heart rate ${val("peakHrBpm", v.peakHrBpm)}${against.length ? ` (${against.join("; ")})` : ""}${have(v.hrr1Bpm) ? `; recovery at 1 min ${val("hrr1Bpm", v.hrr1Bpm)}${notRead.hrr1Bpm ? ` (${notRead.hrr1Bpm})` : ""}` : ""}.`,
    );
  }
  if (have(v.o2PulsePeakMlBeat)) {
    const pctO2Pulse = pctWords(
      "o2PulsePctPred",
      v.o2PulsePctPred,
      pred.o2Pulse?.includes("extrapolated") ? `, ${pred.o2Pulse}` : "",
    );
    results.push(
      `Peak O2 pulse ${val("o2PulsePeakMlBeat", v.o2PulsePeakMlBeat)}${pctO2Pulse ? ` (${pctO2Pulse})` : ""}${v.o2PulsePlateau && !notRead.o2PulsePlateau ? ", flattening late in exercise" : ""}${input.patient.atrialFibrillation === true ? " (atrial fibrillation: not interpreted)" : ""}.`,
    );
  }
  const slopes: string[] = [];
  if (have(v.veVco2SlopeWhole))
    slopes.push(`VE/VCO2 slope ${formatValue("veVco2SlopeWhole", v.veVco2SlopeWhole)} (whole exercise)`);
  // named for what it was fitted to (`InterpretInput.names`: the RCP, the whole exercise or a break the fit placed), as
  // the values table names it; never "to RCP" when no RCP was found
  if (have(v.veVco2SlopeToRcp))
    slopes.push(
      `${input.names?.veVco2SlopeToRcp ?? variableInfo("veVco2SlopeToRcp").label} ${formatValue("veVco2SlopeToRcp", v.veVco2SlopeToRcp)}`,
    );
  if (have(v.veVco2Nadir)) slopes.push(`nadir VE/VCO2 ${formatValue("veVco2Nadir", v.veVco2Nadir)}`);
  if (have(v.oues)) slopes.push(`OUES ${val("oues", v.oues)}`);
  if (have(v.petco2RestMmHg)) slopes.push(`resting PETCO2 ${val("petco2RestMmHg", v.petco2RestMmHg)}`);
  if (slopes.length) results.push(`Ventilatory efficiency: ${slopes.join(", ")}.`);
  const slopeNotRead =
    (have(v.veVco2SlopeWhole) ? notRead.veVco2SlopeWhole : undefined) ??
    (have(v.veVco2SlopeToRcp) ? notRead.veVco2SlopeToRcp : undefined);
  if (slopeNotRead) results.push(`The VE/VCO2 slope is shown but not interpreted: ${slopeNotRead}.`);
  const vent: string[] = [];
  if (have(v.veMvvPct))
    vent.push(`peak VE ${formatValue("veMvvPct", v.veMvvPct)} % of MVV${pred.mvv ? ` (MVV: ${pred.mvv})` : ""}`);
  if (have(v.breathingReserveLMin)) vent.push(`breathing reserve ${val("breathingReserveLMin", v.breathingReserveLMin)}`);
  if (have(v.rrPeak)) vent.push(`peak breathing frequency ${val("rrPeak", v.rrPeak)}`);
  if (vent.length) results.push(`Ventilation: ${vent.join(", ")}.`);
  const gas: string[] = [];
  if (have(v.spo2RestPct)) gas.push(`SpO2 at rest ${val("spo2RestPct", v.spo2RestPct)}`);
  if (have(v.spo2Min)) gas.push(`lowest ${val("spo2Min", v.spo2Min)}`);
  if (have(v.spo2Fall)) gas.push(`fall ${val("spo2Fall", v.spo2Fall)}`);
  if (have(v.paO2)) gas.push(`peak PaO2 ${val("paO2", v.paO2)}`);
  if (have(v.vdvtPeak)) gas.push(`peak VD/VT ${formatValue("vdvtPeak", v.vdvtPeak)}`);
  if (gas.length) results.push(`Oxygenation and gas exchange: ${gas.join(", ")}.`);
  if (!results.length) results.push("No peak values were available.");
  sections.push({ id: "results", title: "Results against predicted", paragraphs: results });

  const thr: string[] = [];
  if (v.vt1Determined === false) thr.push("VT1 (anaerobic threshold) could not be determined.");
  else if (have(v.vt1Vo2MlMin) || have(v.vt1Vo2MlKgMin)) {
    const parts: string[] = [];
    if (have(v.vt1Vo2MlMin)) parts.push(val("vt1Vo2MlMin", v.vt1Vo2MlMin));
    if (have(v.vt1Vo2MlKgMin)) parts.push(val("vt1Vo2MlKgMin", v.vt1Vo2MlKgMin));
    if (have(v.vt1PctPredPeakVo2) && !notRead.vt1PctPredPeakVo2)
      parts.push(`${formatValue("vt1PctPredPeakVo2", v.vt1PctPredPeakVo2)} % of predicted peak VO2`);
    if (extras.vt1?.hrBpm !== undefined) parts.push(`heart rate ${extras.vt1.hrBpm} bpm`);
    const load1 = loadWords(extras.vt1);
    if (load1) parts.push(load1);
    thr.push(`VT1 at VO2 ${parts.join(", ")}.`);
  } else thr.push("No VT1 value was supplied.");
  if (extras.thresholdMethods?.vt1) thr.push(thresholdMethodSentence("VT1", extras.thresholdMethods.vt1));
  if (extras.vt2?.vo2MlMin !== undefined) {
    thr.push(
      `VT2 (respiratory compensation point) at VO2 ${formatValue("vt1Vo2MlMin", extras.vt2.vo2MlMin)} mL/min${extras.vt2.hrBpm !== undefined ? `, heart rate ${extras.vt2.hrBpm} bpm` : ""}${loadWords(extras.vt2) ? `, ${loadWords(extras.vt2)}` : ""}.`,
    );
  }
  if (extras.thresholdMethods?.vt2) thr.push(thresholdMethodSentence("VT2", extras.thresholdMethods.vt2));
  if (extras.lactate) thr.push(...lactateParagraphs(extras.lactate));
  sections.push({ id: "thresholds", title: "Thresholds and how they were found", paragraphs: thr });

  sections.push({
    id: "pathway",
    title: "Step-by-step interpretation",
    // an effort judged on heart rate alone says so where the flow calls it adequate; a step an uncertainty band would
    // turn says so beside its finding
    paragraphs: interpretation.path.steps.map(
      (s) =>
        `${s.title}: ${sentenceCase(s.finding)}${s.nodeId === "effort" && interpretation.issues.some((i) => i.code === "effort-rests-on-heart-rate") ? " (on heart rate alone; see the data-quality warning)" : ""}${s.borderline ? `; borderline: ${s.borderline}` : ""}.`,
    ),
  });

  const supported = interpretation.patterns.filter(
    (p) => p.support === "strong" || p.support === "moderate" || p.support === "weak",
  );
  const pat: string[] = [];
  if (!supported.length) pat.push("No limitation pattern is supported by the data available.");
  for (const p of supported.slice(0, 3)) {
    const forText = p.for.map((f) => f.text.split(" → ").pop()).join("; ");
    const againstText = p.against.map((f) => f.text.split(" → ").pop()).join("; ");
    pat.push(`${p.statement} For: ${forText || "none"}.${againstText ? ` Against: ${againstText}.` : ""}`);
  }
  sections.push({ id: "patterns", title: "Limitation pattern", paragraphs: pat });

  if (interpretation.schemes.length) {
    const sch: string[] = [];
    for (const s of interpretation.schemes) {
      const overall = s.overallText;
      const details = s.kind === "graph" ? s.path!.steps.map((st) => `${st.title}: ${st.finding}`) : s.axes.map((a) => a.text);
      sch.push(`${s.name}: ${overall}. ${details.join("; ")}.`);
    }
    sections.push({ id: "schemes", title: "Published schemes", paragraphs: sch });
  }

  const domains = extras.domains ?? [];
  if (domains.length || interpretation.referral === "training") {
    const rx: string[] = [];
    if (!domains.length)
      rx.push(extras.domainsWithheld ?? "Intensity domains were not available; a prescription needs VT1 and VT2.");
    for (const d of domains) {
      // Open-ended ranges in the words of the domains table: "up to 122", "from 158" (common practice).
      const range = (lo: number | undefined, hi: number | undefined, unit: string) =>
        lo !== undefined && hi !== undefined
          ? `${lo}–${hi} ${unit}`
          : lo === undefined
            ? `up to ${hi} ${unit}`
            : `from ${lo} ${unit}`;
      // in atrial fibrillation the ventricular rate is no training target (common practice)
      const hrTargets = input.patient.atrialFibrillation !== true;
      const hr =
        hrTargets && (d.hrFromBpm !== undefined || d.hrToBpm !== undefined)
          ? `heart rate ${range(d.hrFromBpm, d.hrToBpm, "bpm")}`
          : "";
      const held = d.heldFromW !== undefined || d.heldToW !== undefined ? range(d.heldFromW, d.heldToW, "W") : "";
      const w =
        d.workFromW !== undefined || d.workToW !== undefined
          ? `work rate ${range(d.workFromW, d.workToW, "W")} on the ramp${held ? ` (${held} at constant load)` : ""}`
          : "";
      // on a treadmill the speed is prescribed with its grade
      const speed =
        d.speedFromKmh !== undefined || d.speedToKmh !== undefined ? `speed ${range(d.speedFromKmh, d.speedToKmh, "km/h")}` : "";
      const grade =
        d.gradeFromPct !== undefined || d.gradeToPct !== undefined ? `grade ${range(d.gradeFromPct, d.gradeToPct, "%")}` : "";
      rx.push(`${d.name}: ${[hr, w, speed, grade].filter(Boolean).join(", ") || "no range available"}.`);
    }
    if (domains.length)
      rx.push(
        input.patient.atrialFibrillation === true
          ? "Ranges derive from this test's thresholds; in atrial fibrillation heart rate is not given as a training target."
          : "Ranges derive from this test's thresholds; medication changes (notably beta-blockers) alter heart-rate targets.",
      );
    if (domains.some((d) => d.workFromW !== undefined || d.workToW !== undefined))
      rx.push(
        extras.rampLag
          ? `Work rates are read from the ramp. VO2 lagged this ramp by about ${Math.round(extras.rampLag.lagS)} s, so the work rate held at constant load for the same intensity is about ${Math.round(extras.rampLag.shiftW)} W lower (in brackets). The lag is fitted on this test and may be off by ${extras.rampLag.spreadS} s (${Math.round(extras.rampLag.spreadW)} W here), so those work rates are approximate: set constant-load training by heart rate, which the lag does not shift, and expect work at the VT2 bound to be harder at constant load than on the ramp.`
          : "Work rates are read from the ramp: VO2 lags a ramp, so constant-load training at these work rates sits at a higher intensity than the threshold itself (common practice); the lag could not be measured on this test.",
      );
    const unsure = [input.vt1LowConfidence ? "VT1" : "", input.vt2LowConfidence ? "VT2" : ""].filter(Boolean);
    if (domains.length && unsure.length)
      rx.push(
        `${andList(unsure)} ${unsure.length > 1 ? "were" : "was"} found with low confidence: confirm on review before prescribing from ${unsure.length > 1 ? "them" : "it"}.`,
      );
    sections.push({ id: "prescription", title: "Exercise prescription (intensity domains)", paragraphs: rx });
  }

  if (extras.comparison) {
    sections.push({
      id: "serial",
      title: "Comparison with the previous test",
      paragraphs: [
        `Reference population for test–retest variability: ${extras.comparison.populationLabel}.`,
        ...extras.comparison.items.filter((i) => i.change !== null).map((i) => i.text),
      ],
    });
  }

  const concl: string[] = conclusionLead(interpretation, input);
  // Only moderately or strongly supported patterns reach the conclusion; weak ones stay in the pattern section.
  const leading = supported.find((p) => p.support === "strong" || p.support === "moderate");
  // deconditioning says "no sign of a specific disease": not while another limitation has moderate or strong support
  const others = supported.filter((p) => p !== leading && (p.support === "strong" || p.support === "moderate"));
  const leadStatement =
    leading?.patternId === "deconditioning" && others.length
      ? leading.statement.replace(/ with no sign of a specific [^)]*\)/, ")")
      : leading?.statement;
  if (leading) concl.push(leading.borderline ? `${leadStatement} Read with: ${leading.borderline}.` : leadStatement!);
  // patterns with the same support as the leading one are not ranked apart on a small score difference: each is said
  const peers = leading ? supported.filter((p) => p !== leading && p.support === leading.support) : [];
  for (const p of peers)
    concl.push(
      `${p.statement.replace(/^The findings are consistent with/, "They are equally consistent with")}${p.borderline ? ` Read with: ${p.borderline}.` : ""}`,
    );
  const alsoFit = others.filter((p) => !peers.includes(p));
  if (leading?.patternId === "deconditioning" && alsoFit.length) {
    const list = andList(alsoFit.map((p) => `${p.label.toLowerCase()} (${p.support} support)`));
    concl.push(
      `${list.charAt(0).toUpperCase()}${list.slice(1)} also ${alsoFit.length > 1 ? "fit" : "fits"}, so a specific cause is not excluded.`,
    );
  }
  // a step of the stepwise reading that an uncertainty band would turn (an MVV estimated from FEV1 that one multiplier
  // reads as ventilatory limitation) is said here too, unless the leading pattern already said that band
  for (const step of interpretation.path.steps) {
    if (!step.borderline) continue;
    const parts = step.borderline.split("; ").filter((part) => !leading?.borderline?.includes(part.split(" reaches ")[0]));
    if (parts.length) concl.push(`${step.title} is borderline: ${parts.join("; ")}.`);
  }
  const combined = interpretation.schemes.filter((s) => s.overall && s.schemeId !== "peak-vo2-grade");
  for (const s of combined) {
    const caveats = conclusionCaveats(s, interpretation, input);
    concl.push(`${s.name}: ${s.overall!.label}.${caveats.length ? ` Read with: ${caveats.join("; ")}.` : ""}`);
  }
  // a combined scheme that waits on a yes/no input not recorded (ischaemic heart disease) says what each answer gives
  for (const s of interpretation.schemes) {
    if (s.overall || s.kind !== "bands" || !s.overallMode) continue;
    const waiting = s.axes.filter((a) => a.inCombination && a.dependsOn);
    if (waiting.length)
      concl.push(
        `${s.name}: ${waiting.map((a) => a.dependsOn).join("; ")}. Record it with the clinical context to settle the category.`,
      );
  }
  // a referral whose schemes publish no combined category (pulmonary hypertension's risk table) gives its graded rows;
  // beside schemes that do (heart failure: Weber, ventilatory class), the heart-failure prognostic table's adverse rows
  // are named (oscillatory ventilation, a small PETCO2 rise), so a prognostic marker graded only in the schemes section
  // is not missing from the conclusion
  for (const s of interpretation.schemes) {
    if (s.schemeId === "peak-vo2-grade" || s.kind !== "bands" || s.overall) continue;
    if (combined.length === 0) {
      const rows = s.axes.filter((a) => a.category).map((a) => `${a.label}: ${a.category!.label}`);
      if (rows.length) concl.push(`${s.name}: ${rows.join("; ")}.`);
      continue;
    }
    // rows the conclusion already states (Weber class, ventilatory class, the peak-RER caution) are not repeated
    if (s.schemeId !== "hf-prognostic-table") continue;
    const adverse = s.axes
      .filter((a) => a.category && a.category.severity > 0 && !concl.some((line) => line.includes(a.category!.label)))
      .map((a) => `${a.label}: ${a.category!.label}`);
    if (adverse.length) concl.push(`${s.name}, markers outside the favourable band: ${adverse.join("; ")}.`);
  }
  if (!e.peakConclusionsAllowed) concl.push("Capacity could not be established because effort was submaximal.");
  // a reading withheld for a doubted VO2 says why where the reader looks first
  if (notRead.peakVo2MlMin)
    concl.push(
      `VO2-based values are not interpreted: ${notRead.peakVo2MlMin}. Check the cart and the ergometer, and repeat the test if the fault is confirmed.`,
    );
  if (input.vo2ReadAtReview)
    concl.push(`VO2-based values were read at a reviewer's word, although ${input.vo2ReadAtReview}. Read them with that doubt.`);
  const pctKey = { peakVo2: "peakVo2PctPred", hrMax: "hrPctPred", o2Pulse: "o2PulsePctPred" } as const;
  const adultOnly = (["peakVo2", "hrMax", "o2Pulse"] as const).filter((k) => notRead[pctKey[k]]?.includes("derived in adults"));
  if (adultOnly.length)
    concl.push(
      `The predicted ${andList(adultOnly.map((k) => PREDICTED_WORDS[k]))} come from equations derived in adults: for a patient of this age their "% of predicted" is shown but not read, and no finding is graded on it; use a paediatric reference.`,
    );
  const extrapolated = (["peakVo2", "hrMax", "o2Pulse"] as const).filter(
    (k) => pred[k]?.includes("extrapolated") && !adultOnly.includes(k),
  );
  if (extrapolated.length)
    concl.push(
      `The predicted ${andList(extrapolated.map((k) => PREDICTED_WORDS[k]))} come from equations derived outside this patient's population (extrapolated): every "% of predicted" above, and any finding graded on it, is read with that in mind.`,
    );
  sections.push({ id: "conclusion", title: "Conclusion", paragraphs: concl });

  const nonDefault = interpretation.settingsUsed.filter((s) => !s.isDefault);
  const caution = [COMPOSED_TEXT_CAUTION];
  if (nonDefault.length)
    caution.push(`Lab choices differing from the defaults: ${nonDefault.map((s) => `${s.label}: ${s.optionLabel}`).join("; ")}.`);
  sections.push({ id: "caution", title: "Caution", paragraphs: caution });

  return {
    status: "draft",
    banner: DRAFT_BANNER,
    sections: [{ id: "status", title: DRAFT_BANNER, paragraphs: [] }, ...sections],
    caution: COMPOSED_TEXT_CAUTION,
    sourceIds: unique([...interpretation.sourceIds, ...(extras.comparison?.sourceIds ?? [])]),
  };
}

/**
 * What the one-line scheme result in the conclusion must carry with it, so a category is never stated more firmly
 * than the section that grades it: the classes an end of a measurement's uncertainty band reaches (including an index
 * read from brief exercise with its median shortfall undone), a VT1 found with low confidence where the category reads
 * VT1, and, where the heart-failure prognostic table grades peak RER as short of a maximal test (its `rer` axis:
 * RER ≥ 1.10, JACC HF 2020, in schemes.json), that caution beside every category graded on peak VO2.
 */
function conclusionCaveats(s: SchemeResult, interpretation: Interpretation, input: InterpretInput): string[] {
  const out: string[] = [];
  const graded = s.axes.filter((a) => a.inCombination && a.category);
  // a band that reaches another class, where that class could change the overall one: the deciding axis of an axis-mode
  // scheme; under "worst of", a worse class, or a better one on the only axis holding the overall class (a band that only
  // crosses a cut-off inside its class stays in the schemes section)
  const overall = s.overall!;
  for (const a of graded) {
    if (!a.bandReaches || !/ reaches /.test(a.bandReaches)) continue;
    if (s.overallMode?.startsWith("axis:") && s.overallMode !== `axis:${a.axisId}`) continue;
    if (s.overallMode === "worst") {
      const reached = a.bandReachesSeverities ?? [];
      const worse = reached.some((x) => x > overall.severity);
      const alone = !graded.some((b) => b !== a && b.category!.severity >= overall.severity);
      const better = alone && a.category!.severity === overall.severity && reached.some((x) => x < overall.severity);
      if (!worse && !better) continue;
    }
    out.push(a.bandReaches);
  }
  // under "worst of", an axis that could not be graded might have given a worse class (ISHLT's lean-mass row at BMI > 30)
  if (s.overallMode === "worst" && overall.severity < s.maxSeverity) {
    const unread = s.axes.filter((a) => a.inCombination && !a.category && a.reason);
    if (unread.length) out.push(`not graded, and able to give a worse class: ${unread.map((a) => a.label).join("; ")}`);
  }
  const readsVt1 = graded.some((a) => /^(at|tier|at-ischaemia)$/.test(a.axisId) || /\bAT\b|VT1/.test(a.label));
  if (readsVt1 && input.vt1LowConfidence)
    out.push("VT1 was found with low confidence: confirm it on review before relying on this");
  const rerAxis = interpretation.schemes.find((x) => x.schemeId === "hf-prognostic-table")?.axes.find((a) => a.axisId === "rer");
  const rer = input.values.peakRer;
  if (graded.some((a) => a.axisId.startsWith("peak")) && rerAxis?.category && rerAxis.category.severity > 0)
    out.push(`${rerAxis.category.label}${typeof rer === "number" ? ` (peak RER ${rer.toFixed(2)})` : ""}`);
  return out;
}

/** The load at a threshold in words: the work rate, or on a treadmill the speed with its grade. */
function loadWords(at: { workW?: number; speedKmh?: number; gradePct?: number } | undefined): string {
  if (!at) return "";
  if (at.workW !== undefined) return `${at.workW} W`;
  if (at.speedKmh === undefined) return "";
  return `${at.speedKmh.toFixed(1)} km/h${at.gradePct !== undefined ? ` at ${at.gradePct.toFixed(1)} % grade` : ""}`;
}
