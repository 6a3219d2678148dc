import type { ChartMarker, ChartSeries, ChartSpec, PointShape } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers, type ThresholdsSetByReviewer } from "./thresholdMarkers";

export interface LactateChartInput {
  /** Work rate of each sample, W (the x axis unless `speedKmh` is given). */
  workW?: readonly MaybeNumber[];
  /** Treadmill speed of each sample, km/h: the x axis when given. */
  speedKmh?: readonly MaybeNumber[];
  /** Blood lactate, mmol/L. */
  lactateMmolL: readonly MaybeNumber[];
  /**
   * Lactate thresholds found, at their work rate (W) or speed (km/h), with their method name as the page writes it
   * (e.g. "OBLA (4 mmol/L)"). With `lactateMmolL` a threshold is drawn as a point on the curve named in the legend
   * (labels never overlap); without it, as a labelled vertical marker.
   */
  thresholds?: readonly {
    workW?: number;
    speedKmh?: number;
    label: string;
    lactateMmolL?: number;
    kind?: ChartMarker["kind"];
  }[];
  /** VT1 and VT2 on the same axis (W or km/h), drawn as markers; null or missing draws none. */
  vt1?: MaybeNumber;
  vt2?: MaybeNumber;
  setByReviewer?: ThresholdsSetByReviewer;
  /** A plain-words note under the chart (e.g. recovery samples left off the curve). */
  note?: string;
}

/** Threshold point looks: inks and shapes apart from the samples' circles, so they read in greyscale. */
const THRESHOLD_LOOKS: { color: string; shape: PointShape; size: number }[] = [
  { color: "#a44a1c", shape: "square", size: 5 },
  { color: "#5b3f7d", shape: "triangle", size: 5 },
  { color: "#5a6b1e", shape: "diamond", size: 5 },
  { color: "#35404a", shape: "cross", size: 5 },
  { color: "#8a5a00", shape: "circle", size: 7 },
];

/**
 * Blood lactate against work rate (or speed): samples as points joined by a line; each lactate threshold as a point
 * on the curve named in the legend by its method name (value in the name), and VT1/VT2 as vertical markers on the same
 * axis. Lactate in mmol/L, work rate in W, speed in km/h. Threshold methods are the thresholds layer's (each with its
 * own source); this chart only draws them.
 */
export function lactateChart(input: LactateChartInput): ChartSpec {
  const bySpeed = input.speedKmh !== undefined;
  const xs = (bySpeed ? input.speedKmh : input.workW) ?? [];
  const points = pairSeries(xs, input.lactateMmolL).sort((a, b) => a[0] - b[0]);
  const unit = bySpeed ? "km/h" : "W";
  const at = (t: NonNullable<LactateChartInput["thresholds"]>[number]) => (bySpeed ? t.speedKmh : t.workW);
  const series: ChartSeries[] = [
    { name: "Lactate", kind: "line", points, style: { dash: "" } },
    { name: "Samples", kind: "points", points, style: { color: "#1b5e6b", shape: "circle", size: 3 } },
  ];
  const markers: ChartMarker[] = [];
  let k = 0;
  for (const t of input.thresholds ?? []) {
    const x = at(t);
    if (typeof x !== "number" || !Number.isFinite(x)) continue;
    if (typeof t.lactateMmolL === "number" && Number.isFinite(t.lactateMmolL)) {
      const look = THRESHOLD_LOOKS[k++ % THRESHOLD_LOOKS.length];
      series.push({ name: t.label, kind: "points", points: [[x, t.lactateMmolL]], style: look });
    } else markers.push({ x, label: t.label, kind: t.kind ?? "other" });
  }
  const vts = thresholdMarkers(input.vt1, input.vt2, 1, input.setByReviewer);
  markers.push(...vts);
  // a VT outside the sampled range widens the axis so its marker is drawn (ends rounded out to 10 W / 1 km/h)
  const x: ChartSpec["x"] = bySpeed ? { label: "Speed", unit } : { label: "Work rate", unit };
  if (points.length > 0 && vts.length > 0) {
    const step = bySpeed ? 1 : 10;
    const lo = Math.min(points[0][0], ...vts.map((m) => m.x));
    const hi = Math.max(points[points.length - 1][0], ...vts.map((m) => m.x));
    if (lo < points[0][0] || hi > points[points.length - 1][0]) {
      x.min = Math.floor(lo / step) * step;
      x.max = Math.ceil(hi / step) * step;
    }
  }
  return {
    id: "lactate",
    title: bySpeed ? "Blood lactate against speed" : "Blood lactate against work rate",
    x,
    y: { label: "Lactate", unit: "mmol/L", min: 0 },
    series,
    markers,
    ...(input.note ? { note: input.note } : {}),
  };
}
