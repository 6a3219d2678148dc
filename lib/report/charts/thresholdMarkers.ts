import type { ChartMarker } from "./chartSpec";
import type { MaybeNumber } from "./pairSeries";

/**
 * Markers for the first and second ventilatory thresholds at positions already in the chart's x unit;
 * a missing threshold (not determinable) draws no marker.
 */
export function thresholdMarkers(vt1: MaybeNumber, vt2: MaybeNumber, scale = 1): ChartMarker[] {
  const out: ChartMarker[] = [];
  if (typeof vt1 === "number" && Number.isFinite(vt1)) out.push({ x: vt1 * scale, label: "VT1", kind: "vt1" });
  if (typeof vt2 === "number" && Number.isFinite(vt2)) out.push({ x: vt2 * scale, label: "VT2", kind: "vt2" });
  return out;
}
