import { FIELD_WORDS, type NumericField } from "../breath";
import { makeIssue, measured, notDetermined, type Issue, type Measured } from "../core";
import type { ConditionedTest } from "../signal";
import { fieldSeries, provenanceOf, WindowMeans } from "./indexSeries";
import { interpolateLinear } from "../numeric/interpolate";

/** A threshold as it reaches this module: time and VO2 found by a detection method or a reviewer. */
export interface ThresholdPoint {
  timeS: number;
  vo2MlMin: number;
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
  const mode =
    options.mode === "interpolate" || options.mode === "centred-window"
      ? options.mode
      : test.averaging.kind === "none"
        ? "centred-window"
        : "interpolate";
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
  veVco2: Measured;
  petco2MmHg: Measured;
  rer: Measured;
  issues: Issue[];
}

export interface ValuesAtThresholdOptions extends ReadAtTimeOptions {
  /** Threshold name for labels, e.g. "VT1". */
  name: string;
  weightKg?: number;
  /** Measured peak VO2, mL/min, for the % of peak. */
  peakVo2MlMin?: number | null;
}

/**
 * Values at a ventilatory threshold (VT1 or VT2): VO2 as given by the detection (mL/min, mL/kg/min, % of
 * peak), and HR, work rate, speed, VE/VCO2, PETCO2 and RER read at the threshold time (see `readAtTime`).
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
    veVco2: readAtTime(test, "veLMin", threshold.timeS, "1", {
      mode: options.mode,
      windowS: options.windowS,
      denominator: "vco2MlMin",
      scale: 1000,
    }),
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
