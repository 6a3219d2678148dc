import type { ChartRefLine, ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers, type ThresholdsSetByReviewer } from "./thresholdMarkers";

export interface VeVsVco2ChartInput {
  /** VCO2, mL/min (drawn in L/min so the slope is dimensionless). */
  vco2MlMin: readonly MaybeNumber[];
  /** VE, L/min. */
  veLMin: readonly MaybeNumber[];
  /** Fitted VE/VCO2 slope line: VE (L/min) = slope · VCO2 (L/min) + interceptLMin. */
  fit?: { slope: number; interceptLMin: number; label?: string } | null;
  /** VT2 (respiratory compensation point) as VCO2, mL/min. */
  vt2Vco2MlMin?: MaybeNumber;
  /** Thresholds a reviewer set (their markers read "VT1 (reviewer)"). @default none */
  setByReviewer?: ThresholdsSetByReviewer;
}

/**
 * VE against VCO2 with the fitted VE/VCO2 slope line (both in L/min). The slope is an index of
 * ventilatory efficiency; the thresholds layer owns the fit and its sources, this chart only draws it.
 */
export function veVsVco2Chart(input: VeVsVco2ChartInput): ChartSpec {
  const refLines: ChartRefLine[] = input.fit
    ? [
        {
          slope: input.fit.slope,
          intercept: input.fit.interceptLMin,
          label: input.fit.label ?? `fitted slope ${input.fit.slope.toFixed(1)}`,
        },
      ]
    : [];
  return {
    id: "ve-vs-vco2",
    title: "VE against VCO2",
    x: { label: "VCO2", unit: "L/min" },
    y: { label: "VE", unit: "L/min" },
    series: [{ name: "VE vs VCO2", kind: "points", points: pairSeries(input.vco2MlMin, input.veLMin, 1 / 1000) }],
    markers: thresholdMarkers(undefined, input.vt2Vco2MlMin, 1 / 1000, input.setByReviewer),
    refLines,
  };
}
