import { makeIssue, type Issue } from "../core";

/**
 * Incremental phase shorter than this, s, is brief: ERS 2019 advises an 8–12 min incremental phase (Radtke et al. 2019,
 * Eur Respir Rev 28:180101 — confirmed, clinical-reference §5.1 [S18b]).
 */
export const BRIEF_EXERCISE_S = 480;

/**
 * Peak RER at or above which a brief test counts as a maximal one for this rule: 1.10, the effort criterion of
 * heart-failure prognosis (JACC HF 2020 — confirmed, `hf-rer-1.10` in effortCriteria.ts). On invented tests, complete
 * tests with an exercise phase of 5–8 min read OUES a median −0.2 to −1.9 % from the truth (peak RER a median 1.08–1.20),
 * cuts that reached RER 1.10 a median −0.2 to −1.9 % from 300 s on: the low reading comes from stopping early, not from
 * the ramp being short (`BRIEF_EXERCISE_LOW_READING`).
 */
export const BRIEF_EXERCISE_MAXIMAL_RER = 1.1;

/**
 * How far OUES and the VE/VCO2 slopes read below the complete test's noise-free value when the incremental phase stops
 * early, by the length of the exercise phase detected. Our measurement on invented data (not a published figure): 240
 * moderate-noise tests of six synthetic models (40 each of main, variant, hold-out, audit, cross-check, second-opinion),
 * each cut 180, 240, 300, 360, 420, 480 and 600 s into the ramp where the cut came at least 60 s before the ramp's end;
 * the cuts reading peak RER below 1.10, binned by the exercise phase the conditioning found; median signed error in % of
 * the complete test's value (OUES over 100 % of exercise, the slope to the true RCP, the whole-exercise slope to peak;
 * README-thresholds.md, round 21). `ouesQuartilePct`: a quarter of the cuts read at least this low. The complete tests
 * read −1.1 % (OUES), −0.2 % (to the RCP) and −0.8 % (whole). The whole-exercise slope of a brief test lacks the steeper
 * part above the RCP that the complete test's includes.
 */
export const BRIEF_EXERCISE_LOW_READING: readonly {
  fromS: number;
  toS: number;
  tests: number;
  ouesMedianPct: number;
  ouesQuartilePct: number;
  slopeToRcpMedianPct: number;
  slopeWholeMedianPct: number;
}[] = [
  {
    fromS: 180,
    toS: 240,
    tests: 237,
    ouesMedianPct: -26.3,
    ouesQuartilePct: -37.0,
    slopeToRcpMedianPct: -5.8,
    slopeWholeMedianPct: -15.9,
  },
  {
    fromS: 240,
    toS: 300,
    tests: 231,
    ouesMedianPct: -19.5,
    ouesQuartilePct: -30.0,
    slopeToRcpMedianPct: -3.5,
    slopeWholeMedianPct: -14.8,
  },
  {
    fromS: 300,
    toS: 360,
    tests: 215,
    ouesMedianPct: -14.9,
    ouesQuartilePct: -25.6,
    slopeToRcpMedianPct: -2.9,
    slopeWholeMedianPct: -13.3,
  },
  {
    fromS: 360,
    toS: 420,
    tests: 196,
    ouesMedianPct: -11.1,
    ouesQuartilePct: -21.5,
    slopeToRcpMedianPct: -1.7,
    slopeWholeMedianPct: -12.8,
  },
  {
    fromS: 420,
    toS: 480,
    tests: 162,
    ouesMedianPct: -8.3,
    ouesQuartilePct: -18.8,
    slopeToRcpMedianPct: -1.3,
    slopeWholeMedianPct: -11.6,
  },
];

export type BriefExerciseIndex = "oues" | "veVco2SlopeToRcp" | "veVco2SlopeWhole";

/** A value read from brief, submaximal exercise: how low such readings run, and the value that would undo the median. */
export interface BriefExerciseReading {
  exerciseS: number;
  /** Peak RER of the test (null when not measured). */
  peakRer: number | null;
  /** Median signed error of such readings, % (negative: below the complete test's). */
  medianLowPct: number;
  /** The value divided by (1 + median/100): where the median reading of a complete test would sit. */
  likelyValue: number;
}

/**
 * The brief-exercise reading of an index, or null when the exercise phase lasted `BRIEF_EXERCISE_S` or longer, under
 * 180 s (the index is then withheld), or the effort reached `BRIEF_EXERCISE_MAXIMAL_RER`.
 */
export function briefExerciseReading(
  index: BriefExerciseIndex,
  value: number | null,
  exerciseS: number,
  peakRer: number | null,
): BriefExerciseReading | null {
  if (value === null || !Number.isFinite(value) || !(exerciseS < BRIEF_EXERCISE_S)) return null;
  if (peakRer !== null && peakRer >= BRIEF_EXERCISE_MAXIMAL_RER) return null;
  const row = BRIEF_EXERCISE_LOW_READING.find((r) => exerciseS >= r.fromS && exerciseS < r.toS);
  if (!row) return null;
  const medianLowPct =
    index === "oues" ? row.ouesMedianPct : index === "veVco2SlopeToRcp" ? row.slopeToRcpMedianPct : row.slopeWholeMedianPct;
  return { exerciseS, peakRer, medianLowPct, likelyValue: value / (1 + medianLowPct / 100) };
}

const INDEX_WORDS: Record<BriefExerciseIndex, { name: string; decimals: number }> = {
  oues: { name: "OUES", decimals: 0 },
  veVco2SlopeWhole: { name: "whole-exercise VE/VCO2 slope", decimals: 1 },
  veVco2SlopeToRcp: { name: "VE/VCO2 slope to the RCP", decimals: 1 },
};

/**
 * One warning for the indices read from brief, submaximal exercise (`indices-brief-exercise`): where the test stopped,
 * how low each runs on the invented cuts, and the value with the median undone; null when there is none.
 */
export function briefExerciseIssue(
  readings: { index: BriefExerciseIndex; value: number; reading: BriefExerciseReading }[],
): Issue | null {
  if (readings.length === 0) return null;
  const first = readings[0].reading;
  const row = BRIEF_EXERCISE_LOW_READING.find((r) => first.exerciseS >= r.fromS && first.exerciseS < r.toS)!;
  const rer = first.peakRer === null ? "no peak RER" : `peak RER ${first.peakRer.toFixed(2)}`;
  const each = readings.map(({ index, value, reading }) => {
    const { name, decimals } = INDEX_WORDS[index];
    const quartile = index === "oues" ? `, a quarter of them ${Math.abs(row.ouesQuartilePct).toFixed(0)} % or more` : "";
    return `${name} ${value.toFixed(decimals)} (${Math.abs(reading.medianLowPct).toFixed(1)} % low${quartile}; ${reading.likelyValue.toFixed(decimals)} with that undone)`;
  });
  return makeIssue(
    "warning",
    "indices-brief-exercise",
    `The exercise phase lasted ${Math.round(first.exerciseS)} s and ended at ${rer}: under the 8 min ERS advises and below RER ` +
      `${BRIEF_EXERCISE_MAXIMAL_RER.toFixed(2)}. Indices read over exercise stopped this early run low (on invented tests stopped ` +
      `${row.fromS}–${row.toS} s into the ramp, median against the complete test): ${each.join("; ")}. A class or verdict that ` +
      `would differ with the median undone says so.`,
  );
}
