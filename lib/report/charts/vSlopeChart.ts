import type { ChartSpec } from "./chartSpec";
import { pairSeries, type MaybeNumber } from "./pairSeries";
import { thresholdMarkers } from "./thresholdMarkers";

export interface VSlopeChartInput {
  /** VO2 per breath or per averaging interval, mL/min. */
  vo2MlMin: readonly MaybeNumber[];
  /** VCO2 at the same indices, mL/min. */
  vco2MlMin: readonly MaybeNumber[];
  /** VT1 as VO2, mL/min (null: not determinable, no marker). */
  vt1Vo2MlMin?: MaybeNumber;
}

/**
 * V-slope plot: VCO2 against VO2 with the identity line (slope 1) for orientation and VT1 as a
 * vertical marker at its VO2. V-slope method: Beaver, Wasserman & Whipp 1986, J Appl Physiol
 * 60:2020 (source id `beaver-1986`, registered by the thresholds layer). Both axes mL/min.
 */
export function vSlopeChart(input: VSlopeChartInput): ChartSpec {
  return {
    id: "v-slope",
    title: "V-slope: VCO2 against VO2",
    x: { label: "VO2", unit: "mL/min" },
    y: { label: "VCO2", unit: "mL/min" },
    series: [{ name: "VCO2 vs VO2", kind: "points", points: pairSeries(input.vo2MlMin, input.vco2MlMin) }],
    markers: thresholdMarkers(input.vt1Vo2MlMin, undefined),
    refLines: [{ slope: 1, intercept: 0, label: "slope 1 (VCO2 = VO2)" }],
  };
}
