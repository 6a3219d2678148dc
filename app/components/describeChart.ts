import type { ChartAxis, ChartSpec } from "@/lib/report/charts/chartSpec";
import { formatClock } from "@/lib/units";

const axisWords = (a: ChartAxis) => (a.unit ? `${a.label} (${a.unit})` : a.label);

function list(items: string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/**
 * A chart's text alternative: what it shows in words, built from the same spec that draws it, so the
 * label cannot drift from the picture. E.g. "Time course: VO2, VCO2, HR and work rate against time (min);
 * marked: VT1 at 8:30, VT2 at 11:05". Marker positions are given as m:ss when the x axis is time in
 * minutes, otherwise as the axis value.
 */
export function describeChart(spec: ChartSpec): string {
  const left = spec.series.filter((s) => (s.axis ?? "y") === "y").map((s) => s.name);
  const right = spec.series.filter((s) => s.axis === "y2").map((s) => s.name);
  const shown = [...left, ...right, ...(spec.refLines ?? []).map((r) => r.label)];
  const parts = [`${spec.title}: ${shown.length > 0 ? list(shown) : axisWords(spec.y)} against ${axisWords(spec.x)}`];
  if (right.length > 0 && spec.y2) parts.push(`${list(right)} on the right axis, ${axisWords(spec.y2)}`);
  const xIsMinutes = spec.x.unit === "min";
  const marks = spec.markers.map((m) => {
    const at = xIsMinutes ? formatClock(m.x * 60) : `${Number.isInteger(m.x) ? m.x : m.x.toFixed(1)} ${spec.x.unit}`.trim();
    return `${m.label} at ${at}`;
  });
  if (marks.length > 0) parts.push(`marked: ${marks.join(", ")}`);
  const bands = [...new Set((spec.bands ?? []).map((b) => b.label))];
  if (bands.length > 0) parts.push(`shaded: ${list(bands)}`);
  if (spec.series.every((s) => s.points.length === 0)) parts.push("no data to plot");
  return parts.join("; ");
}
