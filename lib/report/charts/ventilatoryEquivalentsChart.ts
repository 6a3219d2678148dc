import type { ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers, type ThresholdsSetByReviewer } from "./thresholdMarkers";

export interface VentilatoryEquivalentsChartInput {
  /** Time from the start of the record, s (drawn in minutes). */
  timeS: readonly MaybeNumber[];
  /** VE/VO2, dimensionless (L/L). */
  veVo2: readonly MaybeNumber[];
  /** VE/VCO2, dimensionless (L/L). */
  veVco2: readonly MaybeNumber[];
  /** VT1 time, s. */
  vt1TimeS?: MaybeNumber;
  /** VT2 (respiratory compensation point) time, s. */
  vt2TimeS?: MaybeNumber;
  /** Thresholds a reviewer set (their markers read "VT1 (reviewer)"). @default none */
  setByReviewer?: ThresholdsSetByReviewer;
}

/**
 * Ventilatory equivalents over time: VE/VO2 and VE/VCO2 (x in minutes). VT1 is classically where
 * VE/VO2 rises without a rise in VE/VCO2, VT2 where VE/VCO2 rises too (Wasserman et al., Principles
 * of Exercise Testing and Interpretation; common practice).
 */
export function ventilatoryEquivalentsChart(input: VentilatoryEquivalentsChartInput): ChartSpec {
  const min = 1 / 60;
  return {
    id: "ventilatory-equivalents",
    title: "Ventilatory equivalents over time",
    x: { label: "Time", unit: "min" },
    y: { label: "VE/VO2 and VE/VCO2", unit: "" },
    series: [
      { name: "VE/VO2", kind: "points", points: pairSeries(input.timeS, input.veVo2, min) },
      { name: "VE/VCO2", kind: "points", points: pairSeries(input.timeS, input.veVco2, min) },
    ],
    markers: thresholdMarkers(input.vt1TimeS, input.vt2TimeS, min, input.setByReviewer),
  };
}
