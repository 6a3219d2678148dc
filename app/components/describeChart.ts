import type { ChartAxis, ChartSpec } from "@/lib/report/charts/chartSpec";
import { formatClock, formatNumber } from "@/lib/units";

const axisWords = (a: ChartAxis) => (a.unit ? `${a.label} (${a.unit})` : a.label);

function list(items: string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/** Decimals for a marker position: whole mL/min, W and bpm; litres per minute to 0.01; otherwise 0.1. */
function markerDecimals(unit: string): number {
  if (unit === "mL/min" || unit === "W" || unit === "bpm" || unit === "beats/min") return 0;
  if (unit === "L/min") return 2;
  return 1;
}

/**
 * A chart's text alternative: what it shows in words, built from the same spec that draws it, so the
 * label cannot drift from the picture. E.g. "Time course. Shows VO2, VCO2, Heart rate and Work rate
 * against Time (min); Heart rate and Work rate on the right axis (beats/min, W); marked: VT1 at 10:22,
 * VT2 at 13:29; shaded: rest, exercise and recovery". Marker positions are m:ss when the x axis is time
 * in minutes, otherwise the axis value with its unit.
 */
export function describeChart(spec: ChartSpec): string {
  const left = spec.series.filter((s) => (s.axis ?? "y") === "y").map((s) => s.name);
  const right = spec.series.filter((s) => s.axis === "y2").map((s) => s.name);
  const shown = [...left, ...right, ...(spec.refLines ?? []).map((r) => r.label)];
  const parts = [`${spec.title}. Shows ${shown.length > 0 ? list(shown) : axisWords(spec.y)} against ${axisWords(spec.x)}`];
  if (right.length > 0 && spec.y2) parts.push(`${list(right)} on the right axis${spec.y2.unit ? ` (${spec.y2.unit})` : ""}`);
  const xIsMinutes = spec.x.unit === "min";
  const marks = spec.markers.map((m) => {
    const at = xIsMinutes ? formatClock(m.x * 60) : `${formatNumber(m.x, markerDecimals(spec.x.unit))} ${spec.x.unit}`.trim();
    return `${m.label} at ${at}`;
  });
  if (marks.length > 0) parts.push(`marked: ${marks.join(", ")}`);
  const bands = [...new Set((spec.bands ?? []).map((b) => b.label))];
  if (bands.length > 0) parts.push(`shaded: ${list(bands)}`);
  if (spec.series.every((s) => s.points.length === 0)) parts.push("no data to plot");
  return parts.join("; ");
}
