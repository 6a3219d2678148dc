import type { Issue, Measured } from "../core";

/** Which ventilatory threshold: VT1 (anaerobic/gas-exchange threshold) or VT2 (respiratory compensation point). */
export type ThresholdWhich = "vt1" | "vt2";

/** How sure the engine is of a threshold. "not-determinable" carries a reason. */
export type ThresholdConfidence = "high" | "moderate" | "low" | "not-determinable";

/** Verdict on one method's fit. */
export type MethodQuality = "good" | "fair" | "poor" | "failed";

/**
 * The binned series every ventilatory-threshold method reads (built by `buildThresholdSeries`).
 * Arrays share one index: one entry per time bin with data; NaN where a signal is missing.
 */
export interface ThresholdSeries {
  binS: number;
  /** Bin centres, s. */
  timeS: Float64Array;
  vo2MlMin: Float64Array;
  vco2MlMin: Float64Array;
  veLMin: Float64Array;
  peto2MmHg: Float64Array;
  petco2MmHg: Float64Array;
  /** Local linear trend of VO2 (±3 bins) at each bin, mL/min: maps times to VO2 and back. */
  vo2Trend: Float64Array;
  /** Local linear trend of VCO2 (±3 bins), mL/min. */
  vco2Trend: Float64Array;
  /** Span analysed: ramp start + excluded lead-in to ramp end, s. */
  span: { startS: number; endS: number };
  /** Breaths set aside as spikes before binning. */
  spikesRemoved: number;
  /** Median spacing of the exercise rows, s, when they are time averages of the cart rather than single breaths; else null. */
  timeAveragedRowsS: number | null;
  /** Plain words for the smoothing, recorded in every provenance. */
  averaging: string;
}

/** One method's answer for one threshold, with the data span, the fit and a quality verdict. */
export interface MethodEstimate {
  /** Stable method id, e.g. `vt1-v-slope`. */
  id: string;
  which: ThresholdWhich;
  label: string;
  /** Threshold time, s (null when not determinable). */
  timeS: number | null;
  /** VO2 at the threshold, mL/min (value null + reason when not determinable). */
  vo2MlMin: Measured;
  /** Data span the method used, s. */
  window: { startS: number; endS: number };
  /** Fit numbers a reader can check (slopes, breakpoint, F statistic, points each side). */
  fit: Record<string, number | null>;
  quality: MethodQuality;
  /** Why the verdict: each acceptance rule passed or failed, in plain words. */
  reasons: string[];
  sourceIds: string[];
}

/** A reviewer's decision replacing the automatic threshold. Give `timeS` or `vo2MlMin`. */
export interface ThresholdOverride {
  which: ThresholdWhich;
  timeS?: number;
  vo2MlMin?: number;
  reason: string;
  /** Who decided (name or user id). */
  by: string;
  /** When, ISO 8601 (optional; kept for the audit trail). */
  atIso?: string;
}

/** The reported threshold: consensus of the methods, or a reviewer's override. */
export interface ThresholdEstimate {
  which: ThresholdWhich;
  timeS: number | null;
  vo2MlMin: Measured;
  /** Work rate, HR and speed at the threshold time (interpolated). */
  workW: Measured;
  hrBpm: Measured;
  speedKmh: Measured;
  confidence: ThresholdConfidence;
  /** Plausible range: agreeing methods' spread joined with the resampling interval. */
  band: { lowMlMin: number; highMlMin: number } | null;
  /**
   * When the smoothed VO2 trend the methods read first reached the band's low and high end, seconds (kept on either side
   * of `timeS`); null without a band. Values read there say what the band means for them (VE/VCO2 at VT1).
   */
  bandTimes?: { lowS: number; highS: number } | null;
  /** Methods that agreed and made the estimate. */
  methodIds: string[];
  /** Why not determinable, or why confidence is reduced. */
  reason?: string;
  /** Block-bootstrap summary (10th–90th percentile of the consensus VO2 over resamples), when run. */
  bootstrap?: {
    replicates: number;
    lowMlMin: number | null;
    medianMlMin: number | null;
    highMlMin: number | null;
    noCallFraction: number;
  } | null;
  /** Present when a reviewer set the value; `automatic` keeps what the engine found. */
  overridden?: {
    by: string;
    reason: string;
    atIso?: string;
    automatic: { timeS: number | null; vo2MlMin: number | null; confidence: ThresholdConfidence };
  };
}

export interface ThresholdResult {
  vt1: ThresholdEstimate;
  vt2: ThresholdEstimate;
  methods: MethodEstimate[];
  issues: Issue[];
  /** The smoothing and span behind every method. */
  series: { binS: number; span: { startS: number; endS: number } | null; averaging: string; bins: number };
}
