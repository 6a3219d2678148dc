import type { BriefExerciseReading } from "./briefExercise";
import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { binByTime } from "../numeric/binByTime";
import { centredMovingMean } from "../numeric/centredMovingMean";
import { dilutionCorrectedSlope, PrefixSums, residualLag1 } from "../numeric/linearRegression";
import type { ConditionedTest } from "../signal";
import {
  breathLevelBands,
  exerciseSpan,
  fieldSeries,
  pairedSeries,
  provenanceOf,
  rollingExtreme,
  WindowMeans,
} from "./indexSeries";
import {
  autocorrelatedSlopeScale,
  INDEX_BAND_FACTORS,
  indexBand,
  slopeBand,
  slopeRelativeScale,
  type SlopeIndexName,
} from "./bandCalibration";
import { firstIndexAbove } from "./firstIndexAbove";
import { veVco2AtTime, type ThresholdPoint, type ThresholdReadOptions } from "./valuesAtThreshold";

/** A straight-line fit reported as three measured values. */
export interface LineIndex {
  slope: Measured;
  intercept: Measured;
  r2: Measured;
  /** Breaths used. */
  n: number;
  /**
   * Uncertainty band of the slope: slope × (1 ± factor × relative SE from r² and the points fitted — for the
   * breath-by-breath indices also their residuals' lag-1 autocorrelation), the factor calibrated on invented tests to
   * hold the true slope in about 8 of 10 (`bandCalibration.ts`). Set on the "to VT2" and whole-exercise VE/VCO2 slopes,
   * the OUES fits and the whole ΔVO2/ΔWR; absent elsewhere.
   */
  band?: { low: number; high: number } | null;
  /**
   * Set when the value comes from brief, submaximal exercise (`briefExercise.ts`): how low such readings run and the
   * value that would undo the median. The value itself is not changed.
   */
  briefExercise?: BriefExerciseReading | null;
}

export interface VeVco2Options {
  /** Respiratory compensation point (VT2): end of the "to RCP" slope. */
  vt2?: ThresholdPoint | null;
  /** VT1: where VE/VCO2 at VT1 is read (`veVco2AtTime`). */
  vt1?: ThresholdPoint | null;
  /** How VE/VCO2 at VT1 is read (as `valuesAtThreshold` reads it, so the two agree). */
  readAtTime?: ThresholdReadOptions;
  /** Window for the lowest VE/VCO2, seconds. @default 30 */
  nadirWindowS?: number;
  /**
   * Time-bin length for the "to VT2" slope, s: OLS on the bin means of VE and VCO2 (0 = breath by breath).
   * Breath noise in VCO2 (the regressor) flattens a breath-by-breath OLS slope (regression dilution: about
   * −1.5 to −2 % on the synthetic banks, more over a narrow VCO2 range); bin means remove most of it. Time-bin
   * averaging is common practice (Robergs, Dwyer & Astorino 2010, confirmed survey); 20 s is our choice
   * (chosen on the synthetic bank, checked on the variant model). Stage tables are never binned. @default 20
   */
  toVt2BinS?: number;
  /**
   * Bins in the centred moving mean taken of the VE and VCO2 bin means before any "to VT2" line is fitted (1 = none;
   * odd). Both series get the same weights, so a straight line between them stays exactly that line while the noise in
   * VCO2, which flattens an OLS slope (regression dilution) and scatters it over a narrow VCO2 range, falls by about
   * the window. Rolling time averages are common practice (Robergs, Dwyer & Astorino 2010, confirmed survey); 3 bins
   * (a 60-s rolling mean at 20-s steps) is our choice (5 bins, and 10-s bins × 5, were within 0.2 points on main and
   * variant). VE/VCO2 slope within ±5 % of truth, three 240-test banks per model, moderate noise, 1 → 3: six
   * main/variant banks 87.6 → 90.4 % (low noise 96.1 → 96.7, high 72.1 → 77.2); the models written blind, not used to
   * choose: hold-out 88.5 → 88.9, audit 88.2 → 90.0, cross-check 80.3 → 81.9, second-opinion 84.5 → 86.0 %. @default 3
   */
  toVt2RollingBins?: number;
  /**
   * Corner refinement for the "to VT2" slope, s (0 = plain OLS to VT2): the slope is the lower line of a continuous
   * two-line fit of VE on VCO2 (VE = a + b·VCO2 + d·(VCO2 − VCO2ₖ)₊, d > 0; the RCP as the break of VE against VCO2,
   * common practice) over the bin means up to VT2 + 2 × this, the corner VCO2ₖ taken at the bin within ±this
   * of VT2 with the least squared error. A VT2 estimate a little early or late then neither drops the top of the
   * line nor adds hyperventilation to it. 30 s is our choice (20, 30, 40 and 60 s tried): ±5 % hits at low / moderate /
   * high noise 94 / 81 / 66 → 94 / 83 / 66 % on the main synthetic bank and 98 / 89 / 65 → 98 / 90 / 69 % on the
   * variant model (40 s: 85 % at moderate on main but one to two points lost at low noise on both). @default 30
   */
  cornerSearchS?: number;
  /**
   * With no VT2 given, report the whole-exercise slope as the slope "to VT2" when the test shows no respiratory
   * compensation: below the RCP the two are the same line. "No compensation" = VE/VCO2 in the last 30 s no more
   * than `noCompensationRatioRise` above its lowest 30-s value AND PETCO2 in the last 30 s no more than
   * `noCompensationPetco2FallMmHg` below its highest 30-s value (RCP criteria: VE/VCO2 rising, PETCO2 falling —
   * common practice; the cut-offs are our choice: on the synthetic banks every test with a true RCP that the
   * methods missed showed a rise ≥ 5.9 %, tests without an RCP ≤ 3 %). Needs PETCO2. @default true
   */
  wholeExerciseWhenNoCompensation?: boolean;
  /**
   * With no VT2 given and signs of respiratory compensation, report as the slope "to VT2" the lower line of a continuous
   * two-line fit of VE on VCO2 whose break the fit finds in the second half of the exercise phase (`FREE_BREAK_RANGE`),
   * labelled so, with an info line. The RCP is the break of VE against VCO2 (Beaver, Wasserman & Whipp 1986,
   * confirmed); searching for it without the threshold methods' quality rules is our choice: VT2 no-calls then still
   * give a slope (within ±5 % of truth: six main/variant banks 86.3 → 87.6 %, the four models written blind
   * 80.1–88.3 → 80.3–88.5 %, the second-opinion model 81.4 → 84.5 %). Needs `wholeExerciseWhenNoCompensation` on (it
   * computes the signs). @default true
   */
  fittedBreakWhenNoVt2?: boolean;
  /**
   * Smallest r² of the line below VT2 (on the smoothed bin means) still reported; below it the slope is not determinable
   * with the reason and a warning. 0.5 is our choice: on seven synthetic banks of 240 moderate-noise tests (main twice,
   * variant, and the hold-out, audit, cross-check and second-opinion models written blind) no test with a true RCP fell
   * under 0.7; an early VT2 in a test without one gave 0.46 and a slope of 11 (tests/thresholds/vt1WholeExerciseFallback
   * .test.ts). @default 0.5
   */
  minToVt2R2?: number;
  /** Largest VE/VCO2 rise from nadir to the end still read as no compensation (fraction). @default 0.035 */
  noCompensationRatioRise?: number;
  /** Largest PETCO2 fall from its highest 30-s mean to the end still read as no compensation, mmHg. @default 1 */
  noCompensationPetco2FallMmHg?: number;
}

export interface VeVco2Result {
  /** OLS of VE (L/min) on VCO2 (L/min), start of exercise to VT2 (Ward 2021, secondary). */
  slopeToVt2: LineIndex;
  /**
   * OLS of VE on VCO2 over the whole exercise phase (FRIEND reference method, confirmed); not determinable over a short
   * exercise phase or far below the lowest VE/VCO2 (`wholeSlopeGuard`).
   */
  slopeWholeExercise: LineIndex;
  /** Lowest rolling-window VE/VCO2 (ratio of window means) in exercise (Sun et al. 2002, confirmed). */
  nadir: Measured;
  atVt1: Measured;
  issues: Issue[];
}

/** The points a line was fitted to: its bins when fitted on bin means, else its breaths (or stages); null if unrecorded. */
export function fittedPoints(line: LineIndex): number | null {
  const inputs = line.slope.provenance.inputs ?? {};
  return typeof inputs.bins === "number" ? inputs.bins : typeof inputs.points === "number" ? inputs.points : null;
}

/** Report an OLS fit over indices [from, to) of prefix sums as a LineIndex with shared provenance. */
/** What a line's points pair, by its slope unit, for the reason when there are none. */
const PAIRED_WORDS: Record<string, string> = {
  "1": "VE with VCO2",
  "mL/min/W": "VO2 with a work rate",
  "mL/min per log10(L/min)": "VO2 with VE",
};

export function lineIndexFromFit(
  sums: PrefixSums,
  from: number,
  to: number,
  units: { slope: string; intercept: string },
  prov: Provenance,
  minPoints: number,
): LineIndex {
  const n = to - from;
  if (n < minPoints) {
    // none at all is a missing signal, not a short series: say which values the line needs
    const reason =
      n <= 0 ? `no ${PAIRED_WORDS[units.slope] ?? "paired values"} in the span it reads` : `only ${n} points (need ${minPoints})`;
    return {
      slope: notDetermined(units.slope, prov, reason),
      intercept: notDetermined(units.intercept, prov, reason),
      r2: notDetermined("1", prov, reason),
      n: Math.max(0, n),
    };
  }
  const f = sums.fit(from, to);
  const p = { ...prov, inputs: { ...prov.inputs, points: n } };
  const reason = "the x values have no spread";
  return {
    slope: Number.isFinite(f.slope) ? measured(f.slope, units.slope, p) : notDetermined(units.slope, p, reason),
    intercept: Number.isFinite(f.intercept)
      ? measured(f.intercept, units.intercept, p)
      : notDetermined(units.intercept, p, reason),
    r2: Number.isFinite(f.r2) ? measured(f.r2, "1", p) : notDetermined("1", p, "r² undefined (no spread)"),
    n,
  };
}

/**
 * The same line with its calibrated band, traceable from its provenance inputs:
 * - `residualLag1`: the residuals' lag-1 autocorrelation, which with r² and the points fitted gives the band's relative
 *   scale (`lineBandScale`);
 * - for the VE/VCO2 and OUES lines, whose x (VCO2, log10 VE) carries breath noise, `dilutionCorrected` and
 *   `reliability`: the slope with that noise taken out of the moments (`dilutionCorrectedSlope`). Breath noise in x
 *   flattens a least-squares slope (regression dilution): on invented tests at moderate noise the whole-exercise VE/VCO2
 *   slope read a median −0.9 to −2.0 % on four of six models, 0.0 % on one and +2.6 % on one whose VE and VCO2 noise move
 *   together; OUES down to −5.4 % on the noisiest. The corrected slopes' median errors were −0.8 to +0.8 % on all six
 *   (README-thresholds.md, round 18). The reported value stays the published least-squares slope, which reference values and cut-offs were
 *   built on; the band is centred on the corrected slope and always holds the reported one.
 * The band: centre × (1 ± `INDEX_BAND_FACTORS[family]` × scale), joined with the reported value. x and y are the arrays
 * the line was fitted to over [from, to), in time order. A line not determined is returned unchanged.
 */
export function withIndexBand(
  line: LineIndex,
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  from: number,
  to: number,
  family: SlopeIndexName,
): LineIndex {
  const slope = line.slope.value;
  const intercept = line.intercept.value;
  if (slope === null || intercept === null) return line;
  const lag1 = residualLag1(x, y, from, to, slope, intercept);
  // ΔVO2/ΔWR: x is the ergometer's work rate, set by the protocol, not measured breath by breath: nothing to correct
  const corrected = family === "dVo2dWr" ? null : dilutionCorrectedSlope(x, y, from, to);
  const inputs = {
    ...line.slope.provenance.inputs,
    residualLag1: Number.isFinite(lag1) ? lag1 : null,
    ...(corrected
      ? {
          dilutionCorrected: Number.isFinite(corrected.slope) ? corrected.slope : null,
          reliability: Number.isFinite(corrected.reliability) ? corrected.reliability : null,
        }
      : {}),
  };
  const re = (m: Measured): Measured => ({ ...m, provenance: { ...m.provenance, inputs } });
  const banded: LineIndex = { ...line, slope: re(line.slope), intercept: re(line.intercept), r2: re(line.r2) };
  return {
    ...banded,
    band: indexBand(bandCentre(banded) ?? slope, slope, lineBandScale(banded), INDEX_BAND_FACTORS[family]),
  };
}

/** A line's slope corrected for breath noise in its x, when `withIndexBand` recorded one; else null. */
export function noiseCorrectedSlope(line: LineIndex | undefined): number | null {
  const c = line?.slope.provenance.inputs?.dilutionCorrected;
  return typeof c === "number" && Number.isFinite(c) ? c : null;
}

/** Where a line's band is centred: its dilution-corrected slope when one was recorded (`withIndexBand`), else its slope. */
export function bandCentre(line: LineIndex): number | null {
  return noiseCorrectedSlope(line) ?? line.slope.value;
}

/**
 * The relative scale a line's band is built on: `autocorrelatedSlopeScale` when its provenance records the residuals'
 * lag-1 autocorrelation (`withIndexBand`), else `slopeRelativeScale` from r² and the points fitted; null without one.
 */
export function lineBandScale(line: LineIndex): number | null {
  const inputs = line.slope.provenance.inputs ?? {};
  const lag1 = inputs.residualLag1;
  if (typeof lag1 !== "number") return slopeRelativeScale(line.r2.value, fittedPoints(line));
  const scale = autocorrelatedSlopeScale(line.r2.value, fittedPoints(line), lag1);
  // a dilution-corrected centre divides the moments by the reliability, and its scatter grows about as much (Fuller 1987,
  // recalled; the factors are calibrated with this scale)
  const reliability = inputs.reliability;
  return scale !== null && noiseCorrectedSlope(line) !== null && typeof reliability === "number" && reliability > 0
    ? scale / reliability
    : scale;
}

/**
 * A short name for the slope "to VT2" that says what it was fitted to: the RCP, the whole exercise phase when the test
 * shows no respiratory compensation, or a break the fit placed itself when VT2 was not determinable. Screens, report and
 * chart legend use it so a slope with no RCP behind it is never labelled "to RCP".
 */
export function slopeToVt2Name(line: LineIndex): string {
  switch (line.slope.provenance.method) {
    case "ve-vco2-slope-to-vt2-no-compensation": {
      // the bin length as the fit wrote it into its averaging (`binnedAveraging`; 20 s by default, `toVt2BinS`)
      const binS = /^(\d+(?:\.\d+)?)-s time-bin means/.exec(line.slope.provenance.averaging ?? "")?.[1];
      return `VE/VCO2 slope, whole exercise on ${binS ? `${binS}-s ` : ""}bin means (no respiratory compensation reached)`;
    }
    case "ve-vco2-slope-below-fitted-break":
      return "VE/VCO2 slope to a fitted break (RCP not determinable)";
    default:
      return "VE/VCO2 slope, start of exercise to RCP";
  }
}

/**
 * VE/VCO2 slope (OLS of VE in L/min on VCO2 in L/min; clinical-reference §5.5) from the start of exercise to
 * VT2 (Ward 2021, secondary) and over the whole exercise phase (FRIEND reference standards, confirmed;
 * the two differ by about 4 units, Healthcare 2023, confirmed); lowest VE/VCO2 over a rolling window
 * (Sun et al. 2002 AJRCCM, confirmed); VE/VCO2 at VT1. The "to VT2" slope is fitted on 20-s time-bin means of the
 * breaths (`toVt2BinS`; breath noise in VCO2 flattens a breath-by-breath OLS slope), smoothed alike by a 3-bin centred
 * moving mean (`toVt2RollingBins`), as the lower line of a continuous
 * two-line fit with its corner within ±30 s of VT2 (`cornerSearchS`); with no VT2 and no sign of respiratory
 * compensation it is the whole-exercise line, labelled so (`wholeExerciseWhenNoCompensation`); with no VT2 but signs of
 * compensation, the lower line of a two-line fit whose break the fit places itself (`fittedBreakWhenNoVt2`). The whole-exercise
 * slope stays breath by breath. One prefix-sum pass for the whole slope; O(n) for the binned one.
 *
 * Degenerate cases: fewer than 10 breaths in a range → not determinable; a "to VT2" line (below VT2, below a fitted
 * break, or over the whole exercise) that does not rise or has r² < 0.5 (`minToVt2R2`) → not determinable with the
 * reason and a warning. The whole-exercise slope over an exercise phase shorter than `MIN_WHOLE_SLOPE_EXERCISE_S`, or
 * below `MIN_WHOLE_SLOPE_TO_NADIR` × the lowest VE/VCO2 → not determinable with the reason and a warning
 * (ve-vco2-slope-whole-short-exercise, ve-vco2-slope-whole-below-nadir). The "to VT2" slope carries a calibrated band
 * (`slopeBand`, README-thresholds.md round 17).
 */
export function veVco2Slope(test: ConditionedTest, options: VeVco2Options = {}): VeVco2Result {
  const issues: Issue[] = [];
  const span = exerciseSpan(test);
  const nadirWindowS = options.nadirWindowS ?? 30;
  const pairs = pairedSeries(test.clean, "vco2MlMin", "veLMin", span);
  const x = pairs.x.map((v) => v / 1000);
  const sums = new PrefixSums(x, pairs.y);
  const units = { slope: "1", intercept: "L/min" };
  const minPoints = test.shape === "stage" ? 3 : 10;
  const wholeProv = provenanceOf(
    "ve-vco2-slope-whole",
    "VE/VCO2 slope: OLS of VE on VCO2, whole exercise phase",
    ["friend-ve-vco2-slope", "healthcare-2023-slope-methods"],
    {
      window: span ?? undefined,
      averaging: "breath by breath (artefact-cleaned)",
    },
  );
  const wholeFit = lineIndexFromFit(sums, 0, x.length, units, wholeProv, minPoints);
  const wholeBanded = breathLevelBands(test) ? withIndexBand(wholeFit, x, pairs.y, 0, x.length, "veVco2Whole") : wholeFit;

  const vt2 = options.vt2;
  const toProv = provenanceOf(
    "ve-vco2-slope-to-vt2",
    "VE/VCO2 slope: OLS of VE on VCO2, start of exercise to VT2 (RCP)",
    ["ward-2021", "healthcare-2023-slope-methods"],
    {
      window: span && vt2 ? { startS: span.startS, endS: vt2.timeS } : undefined,
      averaging: "breath by breath (artefact-cleaned)",
    },
  );
  const binS = test.shape === "stage" ? 0 : (options.toVt2BinS ?? 20);
  const rollBins = options.toVt2RollingBins ?? 3;
  if (!Number.isInteger(rollBins) || rollBins < 1 || rollBins % 2 === 0)
    throw new Error("veVco2Slope: toVt2RollingBins must be an odd positive integer");
  const rollHalf = (rollBins - 1) / 2;
  let slopeToVt2: LineIndex;
  const noComp =
    !vt2 && span && binS > 0 && (options.wholeExerciseWhenNoCompensation ?? true) ? compensationSigns(test, span, pairs) : null;
  const ratioRiseMax = options.noCompensationRatioRise ?? 0.035;
  const petFallMax = options.noCompensationPetco2FallMmHg ?? 1;
  // the signs, when they say the test shows no respiratory compensation (PETCO2 needed)
  const noCompensation =
    noComp &&
    noComp.ratioRise <= ratioRiseMax &&
    noComp.petco2FallMmHg !== null &&
    noComp.petco2FallMmHg <= petFallMax &&
    x.length >= minPoints
      ? { ratioRise: noComp.ratioRise, petco2FallMmHg: noComp.petco2FallMmHg }
      : null;
  // with signs of compensation but no VT2: the break a two-line fit finds for itself (only then is it searched for)
  const freeBreak =
    noComp && span && !noCompensation && (options.fittedBreakWhenNoVt2 ?? true)
      ? freeBreakLine(pairs.t, x, pairs.y, span, binS, rollHalf)
      : null;
  if (noCompensation && span) {
    // no respiratory compensation in the test: the line below the RCP runs over the whole exercise phase. It is fitted
    // on time-bin means like every "to VT2" slope, so it is not the breath-by-breath whole-exercise slope (FRIEND
    // method), which breath noise in VCO2 flattens; the label says exactly what was fitted.
    const pet = noCompensation.petco2FallMmHg;
    const why =
      `no respiratory compensation: VE/VCO2 in the last 30 s ${(100 * noCompensation.ratioRise).toFixed(1)} % above its nadir ` +
      `(≤ ${(100 * ratioRiseMax).toFixed(1)} %) and PETCO2 in the last 30 s ` +
      `${pet < 0.05 ? "not below its highest 30-s mean" : `${pet.toFixed(1)} mmHg below its highest 30-s mean`} (≤ ${petFallMax} mmHg)`;
    const prov = provenanceOf(
      "ve-vco2-slope-to-vt2-no-compensation",
      `VE/VCO2 slope below the RCP: whole exercise phase (${why})`,
      ["ward-2021", "friend-ve-vco2-slope", "common-practice", "implementation-choice", "robergs-2010"],
      { window: span, inputs: { ratioRise: noCompensation.ratioRise, petco2FallMmHg: pet } },
    );
    const line = binnedLine(pairs.t, x, pairs.y, span.startS, x.length, binS, rollHalf, prov, units);
    const bins = line.slope.provenance.inputs?.points;
    const label =
      `VE/VCO2 slope below the RCP: OLS of VE on VCO2 over the whole exercise phase ` +
      `(${Math.round(span.startS)}-${Math.round(span.endS)} s) on ${binS}-s time-bin means of the breaths` +
      `${typeof bins === "number" ? ` (${bins} bins)` : ""}${rollingWords(rollHalf)}, because the test shows ${why}. ` +
      `The whole-exercise slope is the same range fitted breath by breath, which breath noise in VCO2 flattens, so the two can differ`;
    slopeToVt2 = relabel(line, label);
  } else if (freeBreak && span) {
    // VT2 not determinable, yet VE/VCO2 shows compensation: the slope below the break that a two-line fit of VE on VCO2
    // finds for itself in the second half of the incremental phase, labelled so and flagged for review
    const p: Provenance = {
      ...toProv,
      method: "ve-vco2-slope-below-fitted-break",
      label:
        `VE/VCO2 slope below the break of VE against VCO2 found by a continuous two-line fit in the second half of the ` +
        `exercise phase (at ${Math.round(freeBreak.cornerS)} s), because VT2 was not determinable`,
      sourceIds: [...toProv.sourceIds, "robergs-2010", "implementation-choice"],
      window: { startS: span.startS, endS: freeBreak.cornerS },
      inputs: { cornerS: freeBreak.cornerS, bins: freeBreak.bins },
      averaging: binnedAveraging(binS, freeBreak.bins, rollHalf),
    };
    slopeToVt2 = cornerLine(freeBreak, pairs.t, p);
    issues.push(
      makeIssue(
        "info",
        "ve-vco2-slope-below-fitted-break",
        `VT2 was not determinable, so the VE/VCO2 slope "to VT2" (${freeBreak.slope.toFixed(1)}) is the lower line of a two-line fit of VE on VCO2 whose break the fit placed at ${Math.round(freeBreak.cornerS)} s; check it against the VE/VCO2 chart.`,
      ),
    );
  } else if (!vt2) {
    const reason = noComp
      ? `VT2 (respiratory compensation point) not given and the test shows signs of compensation (VE/VCO2 ends ${(100 * noComp.ratioRise).toFixed(1)} % above its nadir${noComp.petco2FallMmHg === null ? ", PETCO2 missing" : `, PETCO2 ${noComp.petco2FallMmHg.toFixed(1)} mmHg below its highest`}): set VT2 by review`
      : "VT2 (respiratory compensation point) not given";
    slopeToVt2 = {
      slope: notDetermined("1", toProv, reason),
      intercept: notDetermined("L/min", toProv, reason),
      r2: notDetermined("1", toProv, reason),
      n: 0,
    };
  } else {
    const k = firstIndexAbove(pairs.t, vt2.timeS);
    if (binS > 0 && span && k >= minPoints) {
      const binProv = { ...toProv, sourceIds: [...toProv.sourceIds, "robergs-2010"] };
      const cornerS = options.cornerSearchS ?? 30;
      const refined =
        cornerS > 0 ? cornerRefinedLine(pairs.t, x, pairs.y, span.startS, vt2.timeS, binS, cornerS, 2 * cornerS, rollHalf) : null;
      if (refined) {
        const p: Provenance = {
          ...binProv,
          label:
            `VE/VCO2 slope: lower line of a continuous two-line fit of VE on VCO2 (bin means to VT2 + ${2 * cornerS} s), ` +
            `corner within ±${cornerS} s of VT2`,
          sourceIds: [...binProv.sourceIds, "implementation-choice"],
          window: { startS: span.startS, endS: refined.cornerS },
          inputs: {
            cornerS: refined.cornerS,
            vt2S: vt2.timeS,
            bins: refined.bins,
            points: firstIndexAbove(pairs.t, refined.cornerS),
          },
          averaging: binnedAveraging(binS, refined.bins, rollHalf),
        };
        slopeToVt2 = cornerLine(refined, pairs.t, p);
      } else slopeToVt2 = binnedLine(pairs.t, x, pairs.y, span.startS, k, binS, rollHalf, binProv, units);
    } else slopeToVt2 = lineIndexFromFit(sums, 0, k, units, toProv, minPoints);
  }
  {
    // every branch: ventilation rises with CO2 output in exercise (common practice), so a flat or falling line, or one
    // that VE follows only loosely, is not a VE/VCO2 slope but too little or too noisy data (below an early VT2, below a
    // fitted break, or over a short exercise phase)
    const fitted = slopeToVt2.slope.value;
    const r2 = slopeToVt2.r2.value;
    const minR2 = options.minToVt2R2 ?? 0.5;
    const notRising = fitted !== null && !(fitted > 0);
    if (notRising || (fitted !== null && r2 !== null && r2 < minR2)) {
      const where = vt2
        ? `below VT2 (${Math.round(vt2.timeS)} s)`
        : slopeToVt2.slope.provenance.method === "ve-vco2-slope-below-fitted-break"
          ? "below the fitted break"
          : "over the exercise phase";
      const check = vt2 ? "check VT2 by review" : "check the exercise phase and VT2 by review";
      const reason = notRising
        ? `the line of VE on VCO2 ${where} does not rise (slope ${fitted.toFixed(1)}): too few or too noisy data; ${check}`
        : `VE follows VCO2 only loosely ${where} (r² ${r2!.toFixed(2)} < ${minR2}; slope ${fitted.toFixed(1)}): too little VCO2 range or too noisy data; ${check}`;
      const prov = slopeToVt2.slope.provenance;
      slopeToVt2 = {
        slope: notDetermined("1", prov, reason),
        intercept: notDetermined("L/min", prov, reason),
        r2: notDetermined("1", prov, reason),
        n: slopeToVt2.n,
      };
      // the line set aside is not offered for review as a fitted-break slope either
      const offered = issues.findIndex((i) => i.code === "ve-vco2-slope-below-fitted-break");
      if (offered >= 0) issues.splice(offered, 1);
      issues.push(
        makeIssue(
          "warning",
          notRising ? "ve-vco2-slope-not-rising" : "ve-vco2-slope-loose-fit",
          `VE/VCO2 slope to VT2 not determinable: ${reason}.`,
        ),
      );
    }
  }

  const nadirProv = provenanceOf(
    `ve-vco2-nadir-${nadirWindowS}s`,
    `lowest VE/VCO2: ratio of ${nadirWindowS}-s rolling window means in exercise`,
    ["sun-2002"],
    { averaging: `${nadirWindowS}-s rolling time window over breaths` },
  );
  const ve = new WindowMeans(fieldSeries(test.clean, "veLMin", span));
  const vco2 = new WindowMeans(fieldSeries(test.clean, "vco2MlMin", span));
  const best = span
    ? rollingExtreme(pairs.t, nadirWindowS, span.startS, (a, b) => (1000 * ve.mean(a, b).mean) / vco2.mean(a, b).mean, "min")
    : null;
  const nadir = best
    ? measured(best.value, "1", { ...nadirProv, window: { startS: best.startS, endS: best.endS } })
    : notDetermined("1", nadirProv, "no window with VE and VCO2 in exercise");
  const atVt1 = options.vt1
    ? veVco2AtTime(test, options.vt1.timeS, options.readAtTime)
    : notDetermined("1", provenanceOf("at-vt1", "VE/VCO2 at VT1", ["common-practice"]), "VT1 not given");
  if (x.length === 0)
    issues.push(
      makeIssue("info", "no-ve-vco2", "No breaths with both VE and VCO2 in exercise: VE/VCO2 indices not determinable."),
    );
  // the band of the slope "to VT2": its relative standard error from r² and the points (bins) fitted, widened by a
  // factor calibrated on invented tests (README-thresholds.md, round 17)
  if (slopeToVt2.slope.value !== null)
    slopeToVt2 = { ...slopeToVt2, band: slopeBand(slopeToVt2.slope.value, slopeToVt2.r2.value, fittedPoints(slopeToVt2)) };
  // stage means are read at steady state: the on-kinetics behind the duration rule do not apply to them
  const whole = wholeSlopeGuard(wholeBanded, span, nadir, test.shape === "breath");
  if (whole.issue) issues.push(whole.issue);
  return { slopeToVt2, slopeWholeExercise: whole.line, nadir, atVt1, issues };
}

/**
 * Shortest exercise phase over which the whole-exercise VE/VCO2 slope is reported, s. Over the first minutes of a ramp
 * VCO2 spans a narrow range, so breath noise in it flattens the least-squares slope (regression dilution) and the
 * on-kinetics of VE and VCO2 tilt the line. 180 s is our choice, measured on invented tests (six synthetic models × 120
 * tests at low, moderate and high noise, the breath table cut 60–480 s into the ramp, the truth kept as the complete
 * test's noise-free slope to peak): cut at 60 / 90 / 120 / 150 / 180 s the slope read a median
 * −49 / −37 / −28 / −23 / −21 % from it (10th percentile −87 to −55 %), within ±10 % in only 10–18 % of tests; against
 * the slope below the RCP, which a test stopped early can at most show, still −43 to −12 %. It matches the shortest
 * exercise phase over which a VO2 plateau is assessed (`MIN_PLATEAU_EXERCISE_S`, effortCriteria.ts). No complete test
 * of the six models is shorter than 262 s; an exercise test has an incremental phase of 8–12 min (ERS statement,
 * Radtke et al. 2019, Eur Respir Rev — confirmed).
 */
export const MIN_WHOLE_SLOPE_EXERCISE_S = 180;

/**
 * Smallest whole-exercise slope still reported, as a fraction of the lowest VE/VCO2 ratio (nadir). Along a line
 * VE = a + b·VCO2 the ratio is b + a/VCO2, so a slope far below every ratio in the test needs a large positive intercept:
 * the line of a narrow VCO2 range flattened by breath noise, not the test's VE–VCO2 relation (logical check, common
 * practice). 0.6 is our choice, measured on the same invented tests: on the 720 complete tests the slope fell below
 * 0.6 × nadir in 3 (one model at moderate and high noise, slopes 26–38 % below the truth), none within ±10 % of the
 * truth, and next lowest 0.83 × nadir elsewhere (0.7 would withhold 5); on the six demo cases and their exported
 * variants the lowest was 0.87 (ventilatory limitation). It caught 24 % of all cut tests, among them the
 * heart-failure demo stopped 233 s into the ramp (slope 17.0, nadir 40.6: 0.42; complete test 39.8).
 */
export const MIN_WHOLE_SLOPE_TO_NADIR = 0.6;

/**
 * The whole-exercise slope, or the same line made not determinable with the reason and a warning when the exercise phase
 * is shorter than `MIN_WHOLE_SLOPE_EXERCISE_S` or the slope lies below `MIN_WHOLE_SLOPE_TO_NADIR` × the lowest VE/VCO2.
 */
function wholeSlopeGuard(
  line: LineIndex,
  span: { startS: number; endS: number } | null,
  nadir: Measured,
  checkDuration: boolean,
): { line: LineIndex; issue: Issue | null } {
  const slope = line.slope.value;
  if (slope === null || !span) return { line, issue: null };
  const exerciseS = span.endS - span.startS;
  const lowest = nadir.value;
  const intercept = line.intercept.value;
  let code: string;
  let reason: string;
  if (checkDuration && exerciseS < MIN_WHOLE_SLOPE_EXERCISE_S) {
    code = "ve-vco2-slope-whole-short-exercise";
    reason =
      `the exercise phase lasted only ${Math.round(exerciseS)} s (< ${MIN_WHOLE_SLOPE_EXERCISE_S} s; fitted slope ${slope.toFixed(1)}): ` +
      `over so short a stretch VCO2 spans too narrow a range, and VE and VCO2 still lag the work rate, so the line reads far too low`;
  } else if (lowest !== null && slope < MIN_WHOLE_SLOPE_TO_NADIR * lowest) {
    code = "ve-vco2-slope-whole-below-nadir";
    reason =
      `the fitted line (slope ${slope.toFixed(1)}${intercept === null ? "" : `, intercept ${intercept.toFixed(1)} L/min`}) lies far below ` +
      `the lowest VE/VCO2 of the test (${lowest.toFixed(1)}; slope < ${MIN_WHOLE_SLOPE_TO_NADIR} × lowest): a line over too narrow ` +
      `a VCO2 range, flattened by breath noise, not the test's VE–VCO2 relation; check the exercise phase`;
  } else return { line, issue: null };
  const inputs = { ...line.slope.provenance.inputs, exerciseS, nadir: lowest, fittedSlope: slope, fittedIntercept: intercept };
  const prov: Provenance = {
    ...line.slope.provenance,
    sourceIds: [...line.slope.provenance.sourceIds, "implementation-choice"],
    inputs,
  };
  return {
    line: {
      slope: notDetermined("1", prov, reason),
      intercept: notDetermined("L/min", prov, reason),
      r2: notDetermined("1", prov, reason),
      n: line.n,
    },
    issue: makeIssue("warning", code, `VE/VCO2 slope (whole exercise) not determinable: ${reason}.`),
  };
}

/** Where the fitted break may lie when no VT2 is given: this share of the exercise phase (our choice: 0.35–0.95, 0.25–0.95
 * and 0.45–0.90 were within 0.2 points of it on the synthetic banks). */
const FREE_BREAK_RANGE = [0.5, 0.95] as const;

/**
 * The lower line of a continuous two-line fit of VE on VCO2 over the bin means of the whole exercise phase, its break
 * searched over `FREE_BREAK_RANGE` of the phase (`cornerRefinedLine`, upper line steeper), or null.
 */
function freeBreakLine(
  t: number[],
  x: number[],
  y: number[],
  span: { startS: number; endS: number },
  binS: number,
  rollHalf: number,
): ReturnType<typeof cornerRefinedLine> {
  const len = span.endS - span.startS;
  const [lo, hi] = FREE_BREAK_RANGE;
  return cornerRefinedLine(t, x, y, span.startS, span.startS + ((lo + hi) / 2) * len, binS, ((hi - lo) / 2) * len, len, rollHalf);
}

/** The lower line of a corner fit as a LineIndex; n = the breaths up to the corner. */
function cornerLine(fit: NonNullable<ReturnType<typeof cornerRefinedLine>>, t: number[], prov: Provenance): LineIndex {
  return {
    slope: measured(fit.slope, "1", prov),
    intercept: measured(fit.intercept, "L/min", prov),
    r2: measured(fit.r2, "1", prov),
    n: firstIndexAbove(t, fit.cornerS),
  };
}

/** The smoothing of a "to VT2" line in words ("" without it). */
function rollingWords(rollHalf: number): string {
  return rollHalf > 0 ? `, then a centred ${2 * rollHalf + 1}-bin moving mean of VE and VCO2 alike` : "";
}

/** The averaging of a "to VT2" line fitted on bin means, for its provenance. */
function binnedAveraging(binS: number, bins: number, rollHalf: number): string {
  return `${binS}-s time-bin means of the artefact-cleaned breaths (${bins} bins)${rollingWords(rollHalf)}`;
}

/** The same line with another provenance label on each of its values. */
function relabel(line: LineIndex, label: string): LineIndex {
  const re = (m: Measured): Measured => ({ ...m, provenance: { ...m.provenance, label } });
  return { ...line, slope: re(line.slope), intercept: re(line.intercept), r2: re(line.r2) };
}

/** OLS of y on x over the time-bin means of the first k breaths; n stays the number of breaths used. */
function binnedLine(
  t: number[],
  x: number[],
  y: number[],
  startS: number,
  k: number,
  binS: number,
  rollHalf: number,
  prov: Provenance,
  units: { slope: string; intercept: string },
): LineIndex {
  const bins = binByTime(t.slice(0, k), [x.slice(0, k), y.slice(0, k)], { startS, endS: t[k - 1] + 1e-9, binS });
  const bx: number[] = [];
  const by: number[] = [];
  for (let b = 0; b < bins.counts.length; b++)
    if (bins.counts[b] > 0 && Number.isFinite(bins.means[0][b]) && Number.isFinite(bins.means[1][b])) {
      bx.push(bins.means[0][b]);
      by.push(bins.means[1][b]);
    }
  const binProv: Provenance = {
    ...prov,
    averaging: binnedAveraging(binS, bx.length, rollHalf),
  };
  const sx = Array.from(centredMovingMean(bx, rollHalf));
  const sy = Array.from(centredMovingMean(by, rollHalf));
  return { ...lineIndexFromFit(new PrefixSums(sx, sy), 0, sx.length, units, binProv, 3), n: k };
}

/**
 * Signs of respiratory compensation over the exercise span from 30-s window means (10-s steps, O(n log n)):
 * VE/VCO2 in the last 30 s relative to its lowest window (fraction) and PETCO2 in the last 30 s below its highest
 * window (mmHg; null without PETCO2).
 */
function compensationSigns(
  test: ConditionedTest,
  span: { startS: number; endS: number },
  pairs: { t: number[] },
): { ratioRise: number; petco2FallMmHg: number | null } | null {
  if (pairs.t.length < 10 || span.endS - span.startS < 90) return null;
  const ve = new WindowMeans(fieldSeries(test.clean, "veLMin", span));
  const vco2 = new WindowMeans(fieldSeries(test.clean, "vco2MlMin", span));
  const petSeries = fieldSeries(test.clean, "petco2MmHg", span);
  const pet = petSeries.t.length >= 10 ? new WindowMeans(petSeries) : null;
  const ratio = (a: number, b: number) => ve.mean(a, b).mean / vco2.mean(a, b).mean;
  let nadir = Infinity;
  let petMax = -Infinity;
  for (let a = span.startS; a + 30 <= span.endS + 1e-9; a += 10) {
    const r = ratio(a, a + 30);
    if (Number.isFinite(r)) nadir = Math.min(nadir, r);
    const p = pet?.mean(a, a + 30).mean;
    if (p !== undefined && Number.isFinite(p)) petMax = Math.max(petMax, p);
  }
  const endRatio = ratio(span.endS - 30, span.endS);
  if (!Number.isFinite(nadir) || !Number.isFinite(endRatio)) return null;
  const endPet = pet?.mean(span.endS - 30, span.endS).mean;
  // the last 30 s are a window too (off the 10-s grid): a last window above the highest grid window is a fall of 0,
  // never a negative fall; the same for a last VE/VCO2 below the grid nadir
  return {
    ratioRise: Math.max(0, endRatio / nadir - 1),
    petco2FallMmHg:
      endPet !== undefined && Number.isFinite(endPet) && Number.isFinite(petMax) ? Math.max(0, petMax - endPet) : null,
  };
}

/**
 * Continuous two-line fit of y on x over time-bin means up to `vt2S + extendS`, each series then smoothed by the same
 * centred moving mean over 2·`smoothHalfWidth` + 1 bins: y = a + b·x + d·(x − xc)₊ on the smoothed bin means, the
 * corner xc = the smoothed x interpolated at times within ±`searchS` of `vt2S` on a 5-s grid, least squared error,
 * upper line steeper (d > 0). A noise-free straight line is fitted exactly; a noise-free corner is rounded over the
 * smoothing window (lower-line error within ±0.3 % at P10/P90 on the main synthetic bank). Needs ≥ 3 bins below the
 * corner and ≥ 2 above it. Returns the lower line (slope b, intercept a, r² of the bins below the corner) or null.
 * O(n + bins × candidates).
 */
function cornerRefinedLine(
  t: number[],
  x: number[],
  y: number[],
  startS: number,
  vt2S: number,
  binS: number,
  searchS: number,
  extendS: number,
  smoothHalfWidth: number,
): { slope: number; intercept: number; r2: number; cornerS: number; bins: number } | null {
  let k = 0;
  while (k < t.length && t[k] <= vt2S + extendS) k++;
  if (k < 3) return null;
  const nb = Math.max(0, Math.ceil((t[k - 1] + 1e-9 - startS) / binS));
  const tb = binByTime(t.slice(0, k), [t.slice(0, k), x.slice(0, k), y.slice(0, k)], { startS, endS: t[k - 1] + 1e-9, binS });
  const keep: number[] = [];
  for (let b = 0; b < nb; b++)
    if (tb.counts[b] > 0 && Number.isFinite(tb.means[1][b]) && Number.isFinite(tb.means[2][b])) keep.push(b);
  if (keep.length < 5) return null;
  const bt = keep.map((b) => tb.means[0][b]);
  // VE and VCO2 alike: the same centred moving mean of the bin means (a straight line between them stays that line)
  const smoothed = (col: number) =>
    Array.from(
      centredMovingMean(
        keep.map((b) => tb.means[col][b]),
        smoothHalfWidth,
      ),
    );
  const bx = smoothed(1);
  const by = smoothed(2);
  const xAt = (tau: number) => {
    let j = 0;
    while (j < bt.length - 2 && bt[j + 1] < tau) j++;
    return bx[j] + ((bx[j + 1] - bx[j]) * (tau - bt[j])) / (bt[j + 1] - bt[j]);
  };
  let best: { sse: number; a: number; b: number; xc: number; tau: number } | null = null;
  for (let tau = vt2S - searchS; tau <= vt2S + searchS + 1e-9; tau += 5) {
    if (tau <= bt[0] || tau >= bt[bt.length - 1]) continue;
    const xc = xAt(tau);
    let below = 0;
    for (const v of bx) if (v <= xc) below++;
    if (below < 3 || bx.length - below < 2) continue;
    // the hinge column from the smoothed bin means too: breath-level hinge values carry the breath noise of VCO2 into
    // it (E[(x − xc)₊] > 0 below the corner), which cost 1.5 points of ±5 % hits on the six main/variant banks
    const zm = bx.map((v) => Math.max(0, v - xc));
    const f = hingeLeastSquares(bx, by, zm);
    if (f && f.d > 0 && (!best || f.sse < best.sse)) best = { sse: f.sse, a: f.a, b: f.b, xc, tau };
  }
  if (!best) return null;
  let my = 0;
  let n = 0;
  for (let i = 0; i < bx.length; i++)
    if (bx[i] <= best.xc) {
      my += by[i];
      n++;
    }
  my /= n;
  let ssr = 0;
  let sst = 0;
  for (let i = 0; i < bx.length; i++)
    if (bx[i] <= best.xc) {
      ssr += (by[i] - best.a - best.b * bx[i]) ** 2;
      sst += (by[i] - my) ** 2;
    }
  return { slope: best.b, intercept: best.a, r2: sst > 0 ? 1 - ssr / sst : NaN, cornerS: best.tau, bins: n };
}

/** Least squares of y = a + b·x + d·z by the 3 × 3 normal equations (Cramer's rule); null if singular. */
function hingeLeastSquares(x: number[], y: number[], zs: number[]): { a: number; b: number; d: number; sse: number } | null {
  const n = x.length;
  let sx = 0,
    sz = 0,
    sy = 0,
    sxx = 0,
    sxz = 0,
    szz = 0,
    sxy = 0,
    szy = 0;
  for (let i = 0; i < n; i++) {
    const z = zs[i];
    sx += x[i];
    sz += z;
    sy += y[i];
    sxx += x[i] * x[i];
    sxz += x[i] * z;
    szz += z * z;
    sxy += x[i] * y[i];
    szy += z * y[i];
  }
  const det3 = (m: number[][]) =>
    m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) -
    m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) +
    m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  const A = [
    [n, sx, sz],
    [sx, sxx, sxz],
    [sz, sxz, szz],
  ];
  const rhs = [sy, sxy, szy];
  const D = det3(A);
  if (!(Math.abs(D) > 1e-12)) return null;
  const col = (c: number) => det3(A.map((row, i) => row.map((v, j) => (j === c ? rhs[i] : v)))) / D;
  const a = col(0);
  const b = col(1);
  const d = col(2);
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (y[i] - a - b * x[i] - d * zs[i]) ** 2;
  return { a, b, d, sse };
}
