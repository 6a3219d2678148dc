import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { binByTime } from "../numeric/binByTime";
import { PrefixSums } from "../numeric/linearRegression";
import type { ConditionedTest } from "../signal";
import { exerciseSpan, fieldSeries, pairedSeries, provenanceOf, rollingExtreme, WindowMeans } from "./indexSeries";
import { readAtTime, type ThresholdPoint } from "./valuesAtThreshold";

/** A straight-line fit reported as three measured values. */
export interface LineIndex {
  slope: Measured;
  intercept: Measured;
  r2: Measured;
  /** Breaths used. */
  n: number;
}

export interface VeVco2Options {
  /** Respiratory compensation point (VT2): end of the "to RCP" slope. */
  vt2?: ThresholdPoint | null;
  vt1?: ThresholdPoint | null;
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
   * With no VT2 given, report the whole-exercise slope as the slope "to VT2" when the test shows no respiratory
   * compensation: below the RCP the two are the same line. "No compensation" = VE/VCO2 in the last 30 s no more
   * than `noCompensationRatioRise` above its lowest 30-s value AND PETCO2 in the last 30 s no more than
   * `noCompensationPetco2FallMmHg` below its highest 30-s value (RCP criteria: VE/VCO2 rising, PETCO2 falling —
   * recalled practice; the cut-offs are our choice: on the synthetic banks every test with a true RCP that the
   * methods missed showed a rise ≥ 5.9 %, tests without an RCP ≤ 3 %). Needs PETCO2. @default true
   */
  wholeExerciseWhenNoCompensation?: boolean;
  /** Largest VE/VCO2 rise from nadir to the end still read as no compensation (fraction). @default 0.035 */
  noCompensationRatioRise?: number;
  /** Largest PETCO2 fall from its highest 30-s mean to the end still read as no compensation, mmHg. @default 1 */
  noCompensationPetco2FallMmHg?: number;
}

export interface VeVco2Result {
  /** OLS of VE (L/min) on VCO2 (L/min), start of exercise to VT2 (Ward 2021, secondary). */
  slopeToVt2: LineIndex;
  /** OLS of VE on VCO2 over the whole exercise phase (FRIEND reference method, confirmed). */
  slopeWholeExercise: LineIndex;
  /** Lowest rolling-window VE/VCO2 (ratio of window means) in exercise (Sun et al. 2002, confirmed). */
  nadir: Measured;
  atVt1: Measured;
  issues: Issue[];
}

/** Report an OLS fit over indices [from, to) of prefix sums as a LineIndex with shared provenance. */
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
    const reason = `only ${Math.max(0, n)} points (need ${minPoints})`;
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
 * VE/VCO2 slope (OLS of VE in L/min on VCO2 in L/min; clinical-reference §5.5) from the start of exercise to
 * VT2 (Ward 2021, secondary) and over the whole exercise phase (FRIEND reference standards, confirmed;
 * the two differ by about 4 units, Healthcare 2023, confirmed); lowest VE/VCO2 over a rolling window
 * (Sun et al. 2002 AJRCCM, confirmed); VE/VCO2 at VT1. The "to VT2" slope is fitted on 20-s time-bin means of the
 * breaths (`toVt2BinS`; breath noise in VCO2 flattens a breath-by-breath OLS slope); the whole-exercise slope stays
 * breath by breath. One prefix-sum pass for the whole slope; O(n) for the binned one.
 *
 * Degenerate cases: fewer than 10 breaths in a range → not determinable; VT2 not given → the "to VT2" slope
 * is not determinable.
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
  const slopeWholeExercise = lineIndexFromFit(sums, 0, x.length, units, wholeProv, minPoints);

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
  let slopeToVt2: LineIndex;
  const noComp =
    !vt2 && span && binS > 0 && (options.wholeExerciseWhenNoCompensation ?? true) ? compensationSigns(test, span, pairs) : null;
  const ratioRiseMax = options.noCompensationRatioRise ?? 0.035;
  const petFallMax = options.noCompensationPetco2FallMmHg ?? 1;
  if (
    !vt2 &&
    span &&
    noComp &&
    noComp.ratioRise <= ratioRiseMax &&
    noComp.petco2FallMmHg !== null &&
    noComp.petco2FallMmHg <= petFallMax &&
    x.length >= minPoints
  ) {
    // no respiratory compensation in the test: the slope below the RCP is the whole-exercise line
    const why =
      `no respiratory compensation: VE/VCO2 ends ${(100 * noComp.ratioRise).toFixed(1)} % above its nadir ` +
      `(≤ ${(100 * ratioRiseMax).toFixed(1)} %) and PETCO2 ${noComp.petco2FallMmHg.toFixed(1)} mmHg below its ` +
      `highest 30-s mean (≤ ${petFallMax} mmHg), so the slope below the RCP is the whole-exercise slope`;
    const prov = provenanceOf(
      "ve-vco2-slope-to-vt2-no-compensation",
      `VE/VCO2 slope below the RCP: whole exercise phase (${why})`,
      ["ward-2021", "friend-ve-vco2-slope", "vt-rcp-criteria-recalled", "vt-implementation-choice", "robergs-2010"],
      { window: span, inputs: { ratioRise: noComp.ratioRise, petco2FallMmHg: noComp.petco2FallMmHg } },
    );
    slopeToVt2 = binnedLine(pairs.t, x, pairs.y, span.startS, x.length, binS, prov, units);
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
    let k = 0;
    while (k < pairs.t.length && pairs.t[k] <= vt2.timeS) k++;
    if (binS > 0 && span && k >= minPoints) {
      slopeToVt2 = binnedLine(
        pairs.t,
        x,
        pairs.y,
        span.startS,
        k,
        binS,
        { ...toProv, sourceIds: [...toProv.sourceIds, "robergs-2010"] },
        units,
      );
    } else slopeToVt2 = lineIndexFromFit(sums, 0, k, units, toProv, minPoints);
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
    ? readAtTime(test, "veLMin", options.vt1.timeS, "1", { denominator: "vco2MlMin", scale: 1000 })
    : notDetermined("1", provenanceOf("at-vt1", "VE/VCO2 at VT1", ["common-practice"]), "VT1 not given");
  if (x.length === 0)
    issues.push(
      makeIssue("info", "no-ve-vco2", "No breaths with both VE and VCO2 in exercise: VE/VCO2 indices not determinable."),
    );
  return { slopeToVt2, slopeWholeExercise, nadir, atVt1, issues };
}

/** OLS of y on x over the time-bin means of the first k breaths; n stays the number of breaths used. */
function binnedLine(
  t: number[],
  x: number[],
  y: number[],
  startS: number,
  k: number,
  binS: number,
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
    averaging: `${binS}-s time-bin means of the artefact-cleaned breaths (${bx.length} bins)`,
  };
  return { ...lineIndexFromFit(new PrefixSums(bx, by), 0, bx.length, units, binProv, 3), n: k };
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
  return {
    ratioRise: endRatio / nadir - 1,
    petco2FallMmHg: endPet !== undefined && Number.isFinite(endPet) && Number.isFinite(petMax) ? petMax - endPet : null,
  };
}
