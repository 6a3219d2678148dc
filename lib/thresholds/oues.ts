import { makeIssue, notDetermined, type Issue } from "../core";
import { PrefixSums } from "../numeric/linearRegression";
import type { ConditionedTest } from "../signal";
import { breathLevelBands, exerciseSpan, pairedSeries, provenanceOf } from "./indexSeries";
import { lineIndexFromFit, MIN_WHOLE_SLOPE_EXERCISE_S, withIndexBand, type LineIndex } from "./veVco2Slope";

export interface OuesOptions {
  /** Fractions of exercise duration (from its start) to fit over. @default [1, 0.9, 0.75] */
  fractions?: number[];
}

export interface OuesFit extends LineIndex {
  /** Fraction of exercise duration used. */
  fraction: number;
}

export interface OuesResult {
  fits: OuesFit[];
  issues: Issue[];
}

/**
 * Oxygen uptake efficiency slope (Baba et al. 1996 JACC, confirmed): VO2 (mL/min) = a·log10 VE (L/min) + b;
 * OUES = a, in mL/min per log10(L/min), fitted over the first 100%, 90% and 75% of exercise duration.
 * One prefix-sum pass; each fraction is a prefix range, O(1) after O(n) (the band's residual pass is O(n) per fit).
 * Breath-by-breath fits carry a calibrated band (`withIndexBand`, README-thresholds.md round 18).
 *
 * Degenerate cases: breaths with VE ≤ 0 are skipped; fewer than 10 breaths (3 stages) → not determinable; a breath
 * recording whose exercise phase is shorter than `MIN_WHOLE_SLOPE_EXERCISE_S` (180 s) → not determinable with a warning
 * (on invented tests of six models cut 90 / 120 / 180 / 240 s into the ramp OUES read a median −49 / −41 / −32 / −26 %
 * from the complete test's noise-free OUES; complete tests −1.1 %; README-thresholds.md round 20).
 */
export function oues(test: ConditionedTest, options: OuesOptions = {}): OuesResult {
  const fractions = options.fractions ?? [1, 0.9, 0.75];
  const issues: Issue[] = [];
  const span = exerciseSpan(test);
  const raw = pairedSeries(test.clean, "veLMin", "vo2MlMin", span);
  const t: number[] = [];
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < raw.x.length; i++) {
    if (raw.x[i] > 0) {
      t.push(raw.t[i]);
      x.push(Math.log10(raw.x[i]));
      y.push(raw.y[i]);
    }
  }
  const sums = new PrefixSums(x, y);
  const minPoints = test.shape === "stage" ? 3 : 10;
  const bands = breathLevelBands(test);
  // as for the whole-exercise VE/VCO2 slope (veVco2Slope.ts): no OUES from a breath recording of under 3 min of exercise
  const exerciseS = span ? span.endS - span.startS : NaN;
  const short = test.shape === "breath" && exerciseS < MIN_WHOLE_SLOPE_EXERCISE_S;
  const fits = fractions.map((fraction): OuesFit => {
    const endS = span ? span.startS + fraction * (span.endS - span.startS) : 0;
    let k = 0;
    while (k < t.length && t[k] <= endS) k++;
    const prov = provenanceOf(
      `oues-${Math.round(fraction * 100)}`,
      `OUES: VO2 = a·log10(VE) + b over the first ${Math.round(fraction * 100)}% of exercise`,
      ["baba-1996"],
      {
        window: span ? { startS: span.startS, endS } : undefined,
        averaging: "breath by breath (artefact-cleaned)",
        inputs: { fraction },
      },
    );
    const line = lineIndexFromFit(sums, 0, k, { slope: "mL/min per log10(L/min)", intercept: "mL/min" }, prov, minPoints);
    if (short && line.slope.value !== null) {
      const why = `the exercise phase lasted only ${Math.round(exerciseS)} s (< ${MIN_WHOLE_SLOPE_EXERCISE_S} s; fitted ${line.slope.value.toFixed(0)})`;
      return {
        fraction,
        slope: notDetermined("mL/min per log10(L/min)", line.slope.provenance, why),
        intercept: notDetermined("mL/min", line.slope.provenance, why),
        r2: notDetermined("1", line.slope.provenance, why),
        n: line.n,
      };
    }
    return { fraction, ...(bands ? withIndexBand(line, x, y, 0, k, "oues") : line) };
  });
  if (short && fits.some((f) => f.slope.reason?.startsWith("the exercise phase lasted only")))
    issues.push(
      makeIssue(
        "warning",
        "oues-short-exercise",
        `OUES not determinable: the exercise phase lasted only ${Math.round(exerciseS)} s (< ${MIN_WHOLE_SLOPE_EXERCISE_S} s). Over the first minutes VE and VO2 still lag the work rate and span a narrow range: on invented tests cut 90 / 120 / 180 s into the ramp OUES read a median 49 / 41 / 32 % below the complete test's.`,
      ),
    );
  if (x.length === 0)
    issues.push(makeIssue("info", "no-ve-vo2", "No breaths with both VE and VO2 in exercise: OUES not determinable."));
  return { fits, issues };
}
