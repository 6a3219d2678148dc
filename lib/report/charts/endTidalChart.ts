import type { ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers, type ThresholdsSetByReviewer } from "./thresholdMarkers";

export interface EndTidalChartInput {
  /** Time from the start of the record, s (drawn in minutes). */
  timeS: readonly MaybeNumber[];
  /** End-tidal O2 partial pressure, mmHg. */
  peto2MmHg: readonly MaybeNumber[];
  /** End-tidal CO2 partial pressure, mmHg (drawn against the right axis for resolution). */
  petco2MmHg: readonly MaybeNumber[];
  vt1TimeS?: MaybeNumber;
  vt2TimeS?: MaybeNumber;
  /** Thresholds a reviewer set (their markers read "VT1 (reviewer)"). @default none */
  setByReviewer?: ThresholdsSetByReviewer;
}

/**
 * End-tidal gas tensions over time: PETO2 (left axis) and PETCO2 (right axis), both mmHg, x in
 * minutes. PETO2 rising with PETCO2 steady marks VT1; PETCO2 falling marks VT2 (common practice).
 */
export function endTidalChart(input: EndTidalChartInput): ChartSpec {
  const min = 1 / 60;
  return {
    id: "end-tidal",
    title: "End-tidal O2 and CO2 over time",
    x: { label: "Time", unit: "min" },
    y: { label: "PETO2", unit: "mmHg" },
    y2: { label: "PETCO2", unit: "mmHg" },
    series: [
      { name: "PETO2", kind: "points", points: pairSeries(input.timeS, input.peto2MmHg, min) },
      { name: "PETCO2", kind: "points", axis: "y2", points: pairSeries(input.timeS, input.petco2MmHg, min) },
    ],
    markers: thresholdMarkers(input.vt1TimeS, input.vt2TimeS, min, input.setByReviewer),
  };
}
