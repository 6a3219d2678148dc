import type { ChartMarker } from "./chartSpec";
import type { MaybeNumber } from "./pairSeries";

/** Which thresholds a reviewer set by hand (an override); their markers say so. */
export interface ThresholdsSetByReviewer {
  vt1?: boolean;
  vt2?: boolean;
}

/** A threshold marker's label: "VT1", or "VT1 (reviewer)" when a reviewer set it, so it is never read as the automatic one. */
export function thresholdMarkerLabel(which: "VT1" | "VT2", setByReviewer = false): string {
  return setByReviewer ? `${which} (reviewer)` : which;
}

/**
 * Markers for the first and second ventilatory thresholds at positions already in the chart's x unit;
 * a missing threshold (not determinable) draws no marker. A threshold the reviewer set is labelled "(reviewer)".
 */
export function thresholdMarkers(
  vt1: MaybeNumber,
  vt2: MaybeNumber,
  scale = 1,
  setByReviewer: ThresholdsSetByReviewer = {},
): ChartMarker[] {
  const out: ChartMarker[] = [];
  if (typeof vt1 === "number" && Number.isFinite(vt1))
    out.push({ x: vt1 * scale, label: thresholdMarkerLabel("VT1", setByReviewer.vt1), kind: "vt1" });
  if (typeof vt2 === "number" && Number.isFinite(vt2))
    out.push({ x: vt2 * scale, label: thresholdMarkerLabel("VT2", setByReviewer.vt2), kind: "vt2" });
  return out;
}
