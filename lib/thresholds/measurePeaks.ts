import type { BreathRow, NumericField } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured, type Provenance } from "../core";
import { medianRowIntervalS, type ConditionedTest } from "../signal";
import { formatClock } from "../units";
import { CARRY_OVER_WARNING } from "./eov";
import {
  exerciseSpan,
  fieldSeries,
  lastCoveredWindowEnd,
  provenanceOf,
  restSpan,
  rollingExtreme,
  WindowMeans,
  type TimeSpan,
} from "./indexSeries";
import { channelGaps, describeChannelGap } from "./channelGaps";
import { readAtTime, type ThresholdPoint } from "./valuesAtThreshold";

/** Plain names of the fields read as ratios over the peak VO2 window, for the "not determinable" reasons. */
const RATIO_FIELD_LABEL: Partial<Record<NumericField, string>> = { vo2MlMin: "VO2", vco2MlMin: "VCO2", hrBpm: "HR" };

export interface MeasurePeaksOptions {
  /** Averaging window for peak values, seconds. @default 30 */
  windowS?: number;
  /** Resting values are the mean of the last `restLastS` seconds of the rest phase. @default 60 */
  restLastS?: number;
  /** Body mass, kg, for per-kg values. */
  weightKg?: number;
  /** VT1, for PETCO2 at VT1. */
  vt1?: ThresholdPoint | null;
  /**
   * Lag-1 correlation of the breath noise (`EovResult.breathNoiseCarryOver`; null or absent = not read). Above
   * `CARRY_OVER_WARNING` it widens the standard error of peak RER to that of fewer independent breaths (`rerSpread`).
   */
  noiseCarryOver?: number | null;
}

export interface PeakValues {
  windowS: number;
  vo2MlMin: Measured;
  vo2MlKgMin: Measured;
  vco2MlMin: Measured;
  veLMin: Measured;
  /** RER over the peak-VO2 window (ratio of window means). */
  rerAtPeakVo2: Measured;
  /** Highest rolling-window RER during exercise. */
  rerMax: Measured;
  hrBpm: Measured;
  /** Highest work rate reached in the exercise phase. */
  workW: Measured;
  speedKmh: Measured;
  gradePct: Measured;
  /** O2 pulse over the peak-VO2 window, mL/beat. */
  o2PulseMlBeat: Measured;
  petco2RestMmHg: Measured;
  petco2AtVt1MmHg: Measured;
  petco2PeakMmHg: Measured;
  /** PETCO2 at VT1 minus resting PETCO2 (not determined without VT1). */
  petco2RiseMmHg: Measured;
  spo2LowestPct: Measured;
  /**
   * Seconds of the end of exercise after the last full peak window of VO2 (a span set aside by review, or a gap in the
   * file), when longer than the peak window (our choice: one window's worth of missing end); null otherwise. Peak VO2 is then the highest before them and may understate the peak (`peak-vo2-end-missing`).
   */
  vo2EndMissingS: number | null;
  testDurationS: Measured;
  exerciseDurationS: Measured;
  issues: Issue[];
}

/**
 * Peak values over a named window: highest `windowS`-s rolling average of each variable in the exercise
 * phase (common practice; Robergs, Dwyer & Astorino 2010 survey), ratios (RER, O2 pulse) as the ratio of
 * window means over the same window. Work rate, speed and grade: the highest value reached. Resting
 * values: mean of the last `restLastS` s of rest (implementation choice). Prefix sums: O(n log n).
 *
 * Degenerate cases: a variable absent, or no full window → "not determinable" with the reason.
 */
/**
 * A peak-VO2 window ending more than this before the end of exercise is flagged (`peak-vo2-before-end`): three 30-s
 * windows, our choice. On the six synthetic models (invented data, 120 moderate-noise tests each, no artefact bursts
 * placed) 60 s flagged 27 of 720 tests, 90 s 6 (0.8 %); the real ACTES test 4 (a burst of six high breaths, found by a
 * clinical review) ends 113 s early.
 */
export const PEAK_VO2_EARLY_S = 90;

export function measurePeaks(test: ConditionedTest, options: MeasurePeaksOptions = {}): PeakValues {
  const windowS = options.windowS ?? 30;
  const restLastS = options.restLastS ?? 60;
  const issues: Issue[] = [];
  const rows = test.clean;
  const span = exerciseSpan(test);
  if (!test.exercise)
    issues.push(
      makeIssue(
        "warning",
        "exercise-phase-unknown",
        "The incremental exercise phase was not found; peak values use the whole record.",
      ),
    );
  const stage = test.shape === "stage";
  const averaging = stage ? "stage values" : `${windowS}-s rolling time window over breaths`;
  const peakLabel = (what: string, word: string) =>
    stage ? `${word} stage value of ${what}` : `${what}: ${word} ${windowS}-s rolling average in exercise`;
  const peakProv = (what: string, kind: "max" | "min" = "max"): Provenance =>
    provenanceOf(
      `${kind === "max" ? "peak" : "lowest"}-${stage ? "stage" : `rolling-${windowS}s`}`,
      peakLabel(what, kind === "max" ? "highest" : "lowest"),
      ["peak-rolling-average"],
      { averaging },
    );

  const means = new Map<NumericField | "vo2MlKgMin", WindowMeans>();
  const meansOf = (f: NumericField | "vo2MlKgMin") => {
    let m = means.get(f);
    if (!m) {
      m = new WindowMeans(fieldSeries(rows, f, span));
      means.set(f, m);
    }
    return m;
  };
  const ends = (f: NumericField | "vo2MlKgMin") => fieldSeries(rows, f, span).t;
  const spanStart = span?.startS ?? 0;

  const peakOf = (
    f: NumericField | "vo2MlKgMin",
    unit: string,
    what: string,
    kind: "max" | "min" = "max",
  ): { m: Measured; win: TimeSpan | null } => {
    const prov = peakProv(what, kind);
    if (!span) return { m: notDetermined(unit, prov, "no data"), win: null };
    const best = rollingExtreme(ends(f), windowS, spanStart, (a, b) => meansOf(f).mean(a, b).mean, kind);
    if (!best)
      return { m: notDetermined(unit, prov, `no ${stage ? "stage" : `${windowS}-s window`} of ${what} in exercise`), win: null };
    const win = { startS: best.startS, endS: best.endS };
    return {
      m: measured(best.value, unit, { ...prov, window: win, inputs: { breaths: meansOf(f).mean(win.startS, win.endS).count } }),
      win,
    };
  };
  const ratioOver = (
    num: NumericField,
    den: NumericField,
    win: TimeSpan | null,
    unit: string,
    method: string,
    label: string,
    sourceIds: string[],
    scale = 1,
  ) => {
    const prov = provenanceOf(method, label, sourceIds, { averaging, window: win ?? undefined });
    if (!win) return notDetermined(unit, prov, "peak-VO2 window not determinable");
    const n = meansOf(num).mean(win.startS, win.endS);
    const d = meansOf(den).mean(win.startS, win.endS);
    const v = (n.mean / d.mean) * scale;
    if (Number.isFinite(v)) return measured(v, unit, prov);
    // name the missing channel, e.g. "no HR in the peak VO2 window (21:28–21:58)"
    const missing = [num, den].filter((f) => !((f === num ? n : d).count > 0)).map((f) => RATIO_FIELD_LABEL[f] ?? f);
    const where = `the peak VO2 window (${formatClock(win.startS)}–${formatClock(win.endS)})`;
    return notDetermined(
      unit,
      prov,
      missing.length > 0 ? `no ${missing.join(" or ")} in ${where}` : `${label}: not a finite ratio in ${where}`,
    );
  };
  const maxOf = (f: NumericField, unit: string, what: string) => {
    const prov = provenanceOf("max-value", `${what}: highest value reached in exercise`, ["common-practice"]);
    const s = fieldSeries(rows, f, span);
    if (s.v.length === 0) return notDetermined(unit, prov, `no ${what} data`);
    let k = 0;
    for (let i = 1; i < s.v.length; i++) if (s.v[i] > s.v[k]) k = i;
    return measured(s.v[k], unit, { ...prov, window: { startS: s.t[k], endS: s.t[k] } });
  };

  // treadmill: speed and grade read together at the end of exercise, the last stage reached (common practice: a treadmill
  // test reports the stage it ended in). A protocol that lowers the grade as the speed rises would otherwise report a
  // speed and a grade never walked together, and no single cost equation ranks walking and running stages alike.
  const treadmillPeak = (): { speedKmh: Measured; gradePct: Measured } => {
    const loaded = span ? rows.filter((r) => r.speedKmh !== undefined && r.timeS >= span.startS && r.timeS <= span.endS) : [];
    if (loaded.length === 0) return { speedKmh: maxOf("speedKmh", "km/h", "speed"), gradePct: maxOf("gradePct", "%", "grade") };
    const at = loaded[loaded.length - 1];
    const prov = (what: string) =>
      provenanceOf(
        "treadmill-end-of-exercise",
        `${what} at the end of exercise (the last stage reached; speed and grade read together)`,
        ["common-practice"],
        { window: { startS: at.timeS, endS: at.timeS } },
      );
    return {
      speedKmh: measured(at.speedKmh!, "km/h", prov("speed")),
      gradePct:
        at.gradePct !== undefined
          ? measured(at.gradePct, "%", prov("grade"))
          : notDetermined("%", prov("grade"), "no grade at the end of exercise"),
    };
  };

  const w = options.weightKg;
  // VO2 given per kg in the file and no body mass yet: the peak per kg straight from that column
  const perKgOnly = !rows.some((r) => r.vo2MlMin !== undefined) && !(w && w > 0) && rows.some((r) => r.vo2MlKgMin !== undefined);
  const vo2Found = peakOf("vo2MlMin", "mL/min", "VO2");
  // in an incremental test VO2 is highest at its end (common practice); a peak window that ends long before it is more
  // often a burst of artefactual breaths or a misplaced end of exercise than a real early peak
  const early = !stage && span && vo2Found.win ? span.endS - vo2Found.win.endS : 0;
  // no VO2 over the end of exercise (set aside by review, or missing): the highest before it is not the peak
  // judged by the last covered window, so a few breaths left after a span do not hide the gap
  const lastWindowEnd = !stage && span ? lastCoveredWindowEnd(ends("vo2MlMin"), windowS, spanStart) : null;
  const endGap = !stage && span && lastWindowEnd !== null ? span.endS - lastWindowEnd : 0;
  const vo2EndMissingS = endGap > windowS && vo2Found.m.value !== null ? endGap : null;
  if (vo2EndMissingS !== null)
    issues.push(
      makeIssue(
        "warning",
        "peak-vo2-end-missing",
        `The last ${Math.round(vo2EndMissingS)} s of exercise (to ${formatClock(span!.endS)}) hold no full ${windowS}-s window of VO2${test.settings?.setAside?.length ? " (set aside by review, or missing from the file)" : " (missing from the file)"}: peak VO2 (${Math.round(vo2Found.m.value!)} mL/min) and the values read in its window are the highest before that and may understate the peak. They are shown, not read against predicted values or cut-offs, and neither are peak RER and ventilation.`,
        { field: "peak.vo2MlMin", timeS: span!.endS - vo2EndMissingS },
      ),
    );
  else if (early > PEAK_VO2_EARLY_S && vo2Found.m.value !== null)
    issues.push(
      makeIssue(
        "warning",
        "peak-vo2-before-end",
        `The highest ${windowS}-s VO2 (${Math.round(vo2Found.m.value)} mL/min, ${formatClock(vo2Found.win!.startS)}–${formatClock(vo2Found.win!.endS)}) ends ${Math.round(early)} s before the end of exercise, where VO2 is usually highest. Check the breaths in that window for artefacts (a burst of high values, a mask or sampling fault; set them aside by hand if so) and that the exercise phase ends where the load stopped: peak VO2 and the values read in its window (RER, O2 pulse) depend on it.`,
        { field: "peak.vo2MlMin" },
      ),
    );
  // say what is missing: the body mass, not the VO2
  const vo2 = perKgOnly
    ? {
        ...vo2Found,
        m: notDetermined(
          "mL/min",
          vo2Found.m.provenance,
          "VO2 is given per kg only and the body mass is not known; enter the weight",
        ),
      }
    : vo2Found;
  const vo2Kg = perKgOnly
    ? peakOf("vo2MlKgMin", "mL/kg/min", "VO2 per kg (as given in the file)").m
    : vo2.m.value !== null && w && w > 0
      ? measured(vo2.m.value / w, "mL/kg/min", { ...vo2.m.provenance, inputs: { ...vo2.m.provenance.inputs, weightKg: w } })
      : notDetermined(
          "mL/kg/min",
          vo2.m.provenance,
          vo2.m.value === null ? (vo2.m.reason ?? "peak VO2 not determinable") : "body mass not given",
        );

  // HR missing up to the end of exercise: the highest HR may lie in the gap, so no peak HR is claimed (channelGaps.ts)
  const peakHr = (): Measured => {
    const endGap = channelGaps(test, "hrBpm").find((g) => g.reachesExerciseEnd);
    return endGap
      ? notDetermined("1/min", peakProv("HR"), `${describeChannelGap(endGap)}: the highest HR may lie in the gap`)
      : peakOf("hrBpm", "1/min", "HR").m;
  };
  const rerMaxProv = peakProv("RER");
  const rerBest = span
    ? rollingExtreme(
        ends("vco2MlMin"),
        windowS,
        spanStart,
        (a, b) => meansOf("vco2MlMin").mean(a, b).mean / meansOf("vo2MlMin").mean(a, b).mean,
        "max",
      )
    : null;
  const rerMax = rerBest
    ? measured(rerBest.value, "1", {
        ...rerMaxProv,
        window: { startS: rerBest.startS, endS: rerBest.endS },
        inputs: { ...rerMaxProv.inputs, ...rerSpread(rows, rerBest.startS, rerBest.endS, options.noiseCarryOver ?? null) },
      })
    : notDetermined("1", rerMaxProv, "no window with both VO2 and VCO2 in exercise");

  // resting and peak PETCO2
  const rest = restSpan(test, restLastS);
  const restProv = provenanceOf(
    "rest-mean",
    `PETCO2: mean of the last ${restLastS} s of rest`,
    ["implementation-choice", "guazzi-2012-petco2"],
    {
      window: rest ?? undefined,
    },
  );
  const restPetco2 = rest ? new WindowMeans(fieldSeries(rows, "petco2MmHg", rest)).mean(rest.startS, rest.endS).mean : NaN;
  const petco2Rest = Number.isFinite(restPetco2)
    ? measured(restPetco2, "mmHg", restProv)
    : notDetermined("mmHg", restProv, rest ? "no PETCO2 at rest" : "no rest phase marked");
  const petco2Peak = peakOf("petco2MmHg", "mmHg", "PETCO2");
  const vt1Prov = provenanceOf("at-vt1", "PETCO2 at VT1", ["common-practice"]);
  const petco2AtVt1 = options.vt1
    ? readAtTime(test, "petco2MmHg", options.vt1.timeS, "mmHg")
    : notDetermined("mmHg", vt1Prov, "VT1 not given");
  // the rise that grades heart failure is from rest to the anaerobic threshold (3-8 mmHg normally; Guazzi et al.,
  // Circulation 2012, recalled): the highest exercise window is not it, since PETCO2 can peak late or on a noisy window
  // (review: the heart-failure demo rose 0.4 mmHg to VT1 but 8.4 mmHg to its highest window)
  const riseProv = provenanceOf(
    "petco2-rise",
    "PETCO2 rise: PETCO2 at VT1 minus resting mean",
    ["implementation-choice", "guazzi-2012-petco2"],
    {
      inputs: { restMmHg: petco2Rest.value, atVt1MmHg: petco2AtVt1.value },
    },
  );
  const petco2Rise =
    petco2Rest.value !== null && petco2AtVt1.value !== null
      ? measured(petco2AtVt1.value - petco2Rest.value, "mmHg", riseProv)
      : notDetermined(
          "mmHg",
          riseProv,
          petco2Rest.reason ?? (options.vt1 ? (petco2AtVt1.reason ?? "no PETCO2 at VT1") : "VT1 not determined"),
        );

  const durProv = (label: string) => provenanceOf("duration", label, ["common-practice"]);
  // a stage row stands for a whole stage: the first stage's length is counted too (rows equally spaced; whether a stage
  // is labelled at its start, centre or end, n stages span n × the spacing)
  const stageS = test.shape === "stage" && rows.length > 1 ? medianRowIntervalS(rows.map((r) => r.timeS)) : 0;
  const stageWords = stageS > 0 ? `, plus one stage (${Math.round(stageS)} s)` : "";
  const testDuration =
    rows.length > 1
      ? measured(rows[rows.length - 1].timeS - rows[0].timeS + stageS, "s", {
          ...durProv(`test duration: first to last row${stageWords}`),
          window: { startS: rows[0].timeS, endS: rows[rows.length - 1].timeS },
        })
      : notDetermined("s", durProv("test duration"), "fewer than two rows");
  const exerciseDuration = test.exercise
    ? measured(test.exercise.endS - test.exercise.startS + stageS, "s", {
        ...durProv(`incremental exercise phase: start to end${stageWords}`),
        window: test.exercise,
      })
    : notDetermined("s", durProv("exercise duration"), "the incremental exercise phase was not found");

  return {
    windowS,
    vo2MlMin: vo2.m,
    vo2MlKgMin: vo2Kg,
    vco2MlMin: peakOf("vco2MlMin", "mL/min", "VCO2").m,
    veLMin: peakOf("veLMin", "L/min", "VE").m,
    rerAtPeakVo2: ratioOver(
      "vco2MlMin",
      "vo2MlMin",
      vo2.win,
      "1",
      "rer-at-peak-vo2",
      "RER over the peak-VO2 window (ratio of means)",
      ["peak-rolling-average"],
    ),
    rerMax,
    hrBpm: peakHr(),
    workW: maxOf("workW", "W", "work rate"),
    ...treadmillPeak(),
    o2PulseMlBeat: ratioOver(
      "vo2MlMin",
      "hrBpm",
      vo2.win,
      "mL/beat",
      "o2-pulse-at-peak-vo2",
      "O2 pulse (VO2/HR) over the peak-VO2 window",
      ["o2-pulse-definition", "peak-rolling-average"],
    ),
    petco2RestMmHg: petco2Rest,
    petco2AtVt1MmHg: petco2AtVt1,
    petco2PeakMmHg: petco2Peak.m,
    petco2RiseMmHg: petco2Rise,
    spo2LowestPct: peakOf("spo2Pct", "%", "SpO2", "min").m,
    vo2EndMissingS,
    testDurationS: testDuration,
    exerciseDurationS: exerciseDuration,
    issues,
  };
}

/**
 * The breath-to-breath spread of RER inside the peak window: the breaths counted and the standard error of their mean RER,
 * SD / √n_eff. With breath noise that carries over (lag-1 correlation ρ > 0, as in a smoothed export) n breaths hold as
 * much as n_eff = n·(1 − ρ)/(1 + ρ) independent ones, the effective size of the mean of an AR(1) series (standard
 * time-series result, e.g. Bretherton et al. 1999, J Climate 12:1990 — recalled). Read only where the breaths look
 * exported smoothed (ρ above `CARRY_OVER_WARNING`, 0.3: with breath-by-breath noise the estimate scatters about 0 by
 * ±0.1); otherwise n_eff = n. ρ is capped at 0.9. On time-averaged rows the rows' own spread. Null with fewer than 3 (a stage value).
 */
function rerSpread(
  rows: readonly BreathRow[],
  startS: number,
  endS: number,
  carryOver: number | null,
): { rerBreaths: number; rerSe: number | null; rerCarryOver?: number } {
  const r: number[] = [];
  for (const row of rows)
    if (row.timeS >= startS && row.timeS <= endS && (row.vo2MlMin ?? 0) > 0 && typeof row.vco2MlMin === "number")
      r.push(row.vco2MlMin / (row.vo2MlMin as number));
  if (r.length < 3) return { rerBreaths: r.length, rerSe: null };
  const mean = r.reduce((a, b) => a + b, 0) / r.length;
  const sd = Math.sqrt(r.reduce((a, b) => a + (b - mean) ** 2, 0) / (r.length - 1));
  const rho = carryOver !== null && carryOver > CARRY_OVER_WARNING ? Math.min(0.9, carryOver) : 0;
  const nEff = (r.length * (1 - rho)) / (1 + rho);
  return { rerBreaths: r.length, rerSe: sd / Math.sqrt(nEff), ...(rho > 0 ? { rerCarryOver: rho } : {}) };
}
