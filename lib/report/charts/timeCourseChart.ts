import type { ChartBand, ChartSeries, ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers, type ThresholdsSetByReviewer } from "./thresholdMarkers";

export interface TimeCourseChartInput {
  /** Time from the start of the record, s (drawn in minutes). */
  timeS: readonly MaybeNumber[];
  /** VO2, mL/min (left axis). */
  vo2MlMin: readonly MaybeNumber[];
  /** VCO2, mL/min (left axis). */
  vco2MlMin?: readonly MaybeNumber[];
  /** Heart rate, bpm (right axis). */
  hrBpm?: readonly MaybeNumber[];
  /** Work rate, W (right axis). */
  workW?: readonly MaybeNumber[];
  vt1TimeS?: MaybeNumber;
  vt2TimeS?: MaybeNumber;
  /** Shaded spans, s, e.g. the exercise phase. */
  spans?: readonly { startS: number; endS: number; label: string }[];
  /** Spans a reviewer set aside, s (shaded darker, labelled "set aside" or "HR set aside"). @default none */
  setAside?: readonly { startS: number; endS: number; channel?: "gas" | "heart-rate" }[];
  /** Thresholds a reviewer set (their markers read "VT1 (reviewer)"). @default none */
  setByReviewer?: ThresholdsSetByReviewer;
}

/**
 * Time course of the test: VO2 and VCO2 as points against the left axis (mL/min), heart rate and
 * work rate as lines against the right axis (beats/min and W share it: both run 0-250 in adults),
 * x in minutes, VT1/VT2 markers and shaded phases. Series with no data are left out.
 */
export function timeCourseChart(input: TimeCourseChartInput): ChartSpec {
  const min = 1 / 60;
  const series: ChartSeries[] = [{ name: "VO2", kind: "points", points: pairSeries(input.timeS, input.vo2MlMin, min) }];
  if (input.vco2MlMin) series.push({ name: "VCO2", kind: "points", points: pairSeries(input.timeS, input.vco2MlMin, min) });
  const right: ChartSeries[] = [];
  if (input.hrBpm)
    right.push({ name: "Heart rate", kind: "line", axis: "y2", points: pairSeries(input.timeS, input.hrBpm, min) });
  if (input.workW) right.push({ name: "Work rate", kind: "line", axis: "y2", points: pairSeries(input.timeS, input.workW, min) });
  const all = [...series, ...right].filter((s) => s.points.length > 0);
  const hasRight = all.some((s) => s.axis === "y2");
  // each axis names only the signals drawn on it (a file without VCO2, or without work rate)
  const drawn = new Set(all.map((s) => s.name));
  const leftLabel = ["VO2", "VCO2"].filter((n) => drawn.has(n)).join(" and ");
  const onRight = [
    ["Heart rate", "bpm"],
    ["Work rate", "W"],
  ].filter(([n]) => drawn.has(n));
  const rightLabel = onRight.map(([n], i) => (i === 0 ? n : n.toLowerCase())).join(" and ");
  const rightUnit = onRight.map(([, unit]) => unit).join(", ");
  const bands: ChartBand[] = [
    ...(input.spans ?? []).map((s) => ({ from: s.startS * min, to: s.endS * min, label: s.label })),
    ...(input.setAside ?? []).map((s): ChartBand => ({
      from: s.startS * min,
      to: s.endS * min,
      label: s.channel === "heart-rate" ? "HR set aside" : "set aside",
      kind: "set-aside",
    })),
  ];
  return {
    id: "time-course",
    title: "Time course",
    x: { label: "Time", unit: "min" },
    y: { label: leftLabel || "VO2", unit: "mL/min" },
    ...(hasRight ? { y2: { label: rightLabel, unit: rightUnit, min: 0 } } : {}),
    series: all,
    markers: thresholdMarkers(input.vt1TimeS, input.vt2TimeS, min, input.setByReviewer),
    bands,
  };
}
