import type { ChartMarker, ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";

export interface LactateChartInput {
  /** Work rate of each sample, W. */
  workW: readonly MaybeNumber[];
  /** Blood lactate, mmol/L. */
  lactateMmolL: readonly MaybeNumber[];
  /** Lactate thresholds found, as work rate (W), with their method label (e.g. "LT1 (baseline + 0.5)"). */
  thresholds?: readonly { workW: number; label: string; kind?: ChartMarker["kind"] }[];
}

/**
 * Blood lactate against work rate: samples as points joined by a line, thresholds as labelled
 * markers at their work rate. Lactate in mmol/L, work rate in W. Threshold methods are the
 * thresholds layer's (each with its own source); this chart only draws them.
 */
export function lactateChart(input: LactateChartInput): ChartSpec {
  const points = pairSeries(input.workW, input.lactateMmolL).sort((a, b) => a[0] - b[0]);
  return {
    id: "lactate",
    title: "Blood lactate against work rate",
    x: { label: "Work rate", unit: "W" },
    y: { label: "Lactate", unit: "mmol/L", min: 0 },
    series: [
      { name: "Lactate", kind: "line", points, style: { dash: "" } },
      { name: "Samples", kind: "points", points, style: { color: "#1b5e6b", shape: "circle", size: 3 } },
    ],
    markers: (input.thresholds ?? []).map((t) => ({ x: t.workW, label: t.label, kind: t.kind ?? "other" })),
  };
}
