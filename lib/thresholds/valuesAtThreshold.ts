import { FIELD_WORDS, type NumericField } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { fieldSeries, provenanceOf, WindowMeans } from "./indexSeries";
import { interpolateLinear } from "../numeric/interpolate";

/** A threshold as it reaches this module: time and VO2 found by a detection method or a reviewer. */
export interface ThresholdPoint {
  timeS: number;
  vo2MlMin: number;
  /**
   * When the VO2 trend reached the two ends of the threshold's band (`ThresholdEstimate.bandTimes`); absent for a
   * reviewer's threshold, which has no band.
   */
  bandTimes?: { lowS: number; highS: number } | null;
}

/** How values are read at a threshold: `ReadAtTimeOptions` with the window for VE/VCO2 on breath data, seconds. */
export interface ThresholdReadOptions extends ReadAtTimeOptions {
  /** @default VE_VCO2_AT_THRESHOLD_WINDOW_S */
  veVco2WindowS?: number;
}

/**
 * Width of the centred window VE/VCO2 is read over at a threshold on breath data, seconds (our choice, README-thresholds.md
 * round 20): the ratio of the mean VE to the mean VCO2 of the breaths within ±30 s. On invented tests of known truth at
 * moderate breath noise it erred by a median 0.34 and a 90th percentile 1.07 units against 0.51 and 1.61 over ±15 s; a
 * 60-s window also spans most of one cycle of oscillatory ventilation (periods of about 40–90 s, clinical-reference §5).
 */
export const VE_VCO2_AT_THRESHOLD_WINDOW_S = 60;

/**
 * VE/VCO2 at a time: the ratio of the window means of VE and VCO2 (`readAtTime` with VCO2 as the denominator), over
 * `VE_VCO2_AT_THRESHOLD_WINDOW_S` on breath data unless `veVco2WindowS` says otherwise; interpolated in averaged rows.
 */
export function veVco2AtTime(
  test: ConditionedTest,
  timeS: number,
  options: ThresholdReadOptions & { label?: string } = {},
): Measured {
  return readAtTime(test, "veLMin", timeS, "1", {
    mode: options.mode,
    windowS: options.veVco2WindowS ?? VE_VCO2_AT_THRESHOLD_WINDOW_S,
    denominator: "vco2MlMin",
    scale: 1000,
    ...(options.label ? { label: options.label } : {}),
  });
}

export interface ReadAtTimeOptions {
  /**
   * How to read a series at a time:
   * - `interpolate`: linear interpolation in the conditioned (`averaged`) rows;
   * - `centred-window`: mean of the artefact-cleaned breaths within ±windowS/2;
   * - `auto`: `interpolate` when the conditioning averaged the data, `centred-window` on raw breaths.
   * @default "auto"
   */
  mode?: "auto" | "interpolate" | "centred-window";
  /** Width of the centred window, seconds. @default 30 */
  windowS?: number;
}

/** How `readAtTime` reads: the mode asked for, else a centred window over breaths and interpolation on averaged rows. */
export function readAtTimeMode(test: ConditionedTest, options: ReadAtTimeOptions): "interpolate" | "centred-window" {
  if (options.mode === "interpolate" || options.mode === "centred-window") return options.mode;
  return test.averaging.kind === "none" ? "centred-window" : "interpolate";
}

/**
 * Read one field (or the ratio of two fields, as the ratio of their values read the same way) at a time.
 * Method: linear interpolation in the averaged series, or a centred window mean of breaths — labelled in the
 * provenance (implementation choice).
 *
 * Degenerate cases: the time outside the data, or no breath in the window → "not determinable".
 */
export function readAtTime(
  test: ConditionedTest,
  field: NumericField,
  timeS: number,
  unit: string,
  options: ReadAtTimeOptions & {
    denominator?: NumericField;
    scale?: number;
    method?: string;
    label?: string;
    sourceIds?: string[];
  } = {},
): Measured {
  const windowS = options.windowS ?? 30;
  const mode = readAtTimeMode(test, options);
  const scale = options.scale ?? 1;
  const what = options.denominator ? `${FIELD_WORDS[field]}/${FIELD_WORDS[options.denominator]}` : FIELD_WORDS[field];
  const sourceIds = options.sourceIds ?? ["implementation-choice"];
  const read = (f: NumericField): number => {
    if (mode === "interpolate") {
      const s = fieldSeries(test.averaged, f);
      return interpolateLinear(s.t, s.v, timeS);
    }
    return new WindowMeans(fieldSeries(test.clean, f)).mean(timeS - windowS / 2, timeS + windowS / 2).mean;
  };
  const provenance = provenanceOf(
    options.method ?? (mode === "interpolate" ? "interpolate-at-time" : `centred-${windowS}s-mean`),
    options.label ??
      (mode === "interpolate"
        ? `${what} interpolated at ${timeS.toFixed(0)} s`
        : `${what}: mean of breaths within ±${windowS / 2} s of ${timeS.toFixed(0)} s`),
    sourceIds,
    {
      window:
        mode === "interpolate" ? { startS: timeS, endS: timeS } : { startS: timeS - windowS / 2, endS: timeS + windowS / 2 },
      averaging: mode === "interpolate" ? test.averaging.label : `${windowS}-s centred window over breaths`,
      inputs: { timeS },
    },
  );
  const num = read(field);
  const den = options.denominator ? read(options.denominator) : 1;
  const value = (num / den) * scale;
  if (!Number.isFinite(value)) return notDetermined(unit, provenance, `no ${what} data at ${timeS.toFixed(0)} s`);
  return measured(value, unit, provenance);
}

export interface ValuesAtThreshold {
  timeS: Measured;
  vo2MlMin: Measured;
  vo2MlKgMin: Measured;
  /** VO2 at the threshold as % of the measured peak VO2. (% of predicted is added by the analysis layer.) */
  vo2PercentPeak: Measured;
  hrBpm: Measured;
  workW: Measured;
  speedKmh: Measured;
  /** Treadmill grade at the threshold, % (a speed means little for prescription without its grade). */
  gradePct: Measured;
  veVco2: Measured;
  /**
   * VE/VCO2 read (as `veVco2`) when the VO2 trend reached the low and the high end of the threshold's band: what the
   * ratio would be had the threshold lain at either end. null without band times (a reviewer's threshold).
   */
  veVco2AtBandEnds: { low: Measured; high: Measured } | null;
  petco2MmHg: Measured;
  rer: Measured;
  issues: Issue[];
}

export interface ValuesAtThresholdOptions extends ThresholdReadOptions {
  /** Threshold name for labels, e.g. "VT1". */
  name: string;
  weightKg?: number;
  /** Measured peak VO2, mL/min, for the % of peak. */
  peakVo2MlMin?: number | null;
}

/**
 * Values at a ventilatory threshold (VT1 or VT2): VO2 as given by the detection (mL/min, mL/kg/min, % of
 * peak), and HR, work rate, speed, VE/VCO2, PETCO2 and RER read at the threshold time (see `readAtTime`; VE/VCO2 over its
 * own window, `veVco2AtTime`), and VE/VCO2 at the two ends of the threshold's band.
 * Reading values at the threshold time is common practice.
 */
export function valuesAtThreshold(
  test: ConditionedTest,
  threshold: ThresholdPoint,
  options: ValuesAtThresholdOptions,
): ValuesAtThreshold {
  const issues: Issue[] = [];
  const name = options.name;
  const base = provenanceOf(`${name.toLowerCase()}-as-given`, `${name} as detected or set by the reviewer`, ["common-practice"], {
    window: { startS: threshold.timeS, endS: threshold.timeS },
  });
  const vo2 = measured(threshold.vo2MlMin, "mL/min", base);
  const w = options.weightKg;
  const vo2Kg =
    w && w > 0
      ? measured(threshold.vo2MlMin / w, "mL/kg/min", { ...base, inputs: { weightKg: w } })
      : notDetermined("mL/kg/min", base, "body mass not given");
  const pk = options.peakVo2MlMin;
  const pct =
    pk && pk > 0
      ? measured((100 * threshold.vo2MlMin) / pk, "%", {
          ...base,
          method: `${name.toLowerCase()}-percent-peak`,
          label: `${name} VO2 as % of measured peak VO2`,
          inputs: { peakVo2MlMin: pk },
        })
      : notDetermined("%", base, "peak VO2 not determinable");
  const read = (field: NumericField, unit: string, denominator?: NumericField) =>
    readAtTime(test, field, threshold.timeS, unit, { mode: options.mode, windowS: options.windowS, denominator });
  const out: ValuesAtThreshold = {
    timeS: measured(threshold.timeS, "s", base),
    vo2MlMin: vo2,
    vo2MlKgMin: vo2Kg,
    vo2PercentPeak: pct,
    hrBpm: read("hrBpm", "1/min"),
    workW: read("workW", "W"),
    speedKmh: read("speedKmh", "km/h"),
    gradePct: read("gradePct", "%"),
    veVco2: veVco2AtTime(test, threshold.timeS, options),
    veVco2AtBandEnds: threshold.bandTimes
      ? {
          low: veVco2AtTime(test, threshold.bandTimes.lowS, {
            ...options,
            label: `VE/VCO2 at the low end of the ${name} band (${threshold.bandTimes.lowS.toFixed(0)} s)`,
          }),
          high: veVco2AtTime(test, threshold.bandTimes.highS, {
            ...options,
            label: `VE/VCO2 at the high end of the ${name} band (${threshold.bandTimes.highS.toFixed(0)} s)`,
          }),
        }
      : null,
    petco2MmHg: read("petco2MmHg", "mmHg"),
    rer: read("vco2MlMin", "1", "vo2MlMin"),
    issues,
  };
  const ex = test.exercise;
  if (ex && (threshold.timeS < ex.startS || threshold.timeS > ex.endS)) {
    issues.push(
      makeIssue(
        "warning",
        `${name.toLowerCase()}-outside-exercise`,
        `${name} lies outside the incremental exercise phase; check the threshold.`,
        { timeS: threshold.timeS },
      ),
    );
  }
  return out;
}

/**
 * VE/VCO2 at the ends of the threshold's band in words ("at the VT1 band's ends 31.2 and 34.0"), or null when the
 * threshold has no band or either reading is missing. One wording for the page and the report.
 */
export function veVco2BandEndsWords(at: ValuesAtThreshold | null | undefined, name: string): string | null {
  const low = at?.veVco2AtBandEnds?.low.value ?? null;
  const high = at?.veVco2AtBandEnds?.high.value ?? null;
  if (low === null || high === null || !Number.isFinite(low) || !Number.isFinite(high)) return null;
  return `at the ${name} band's ends ${low.toFixed(1)} and ${high.toFixed(1)}`;
}
