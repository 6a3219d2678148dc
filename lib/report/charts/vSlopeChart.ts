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
  /**
   * The V-slope method's own two lines, drawn from the first VO2 it fitted to their crossing and on to the last:
   * VCO2 = s1·VO2 + intercept1 below, s2·VO2 + intercept2 above (mL/min). Null when the method failed.
   */
  fit?: {
    s1: number;
    intercept1: number;
    s2: number;
    intercept2: number;
    fromVo2MlMin: number;
    crossVo2MlMin: number;
    toVo2MlMin: number;
  } | null;
  /**
   * VT1 was set by a reviewer: the marker reads "VT1 (reviewer)", and the fitted lines are named as the automatic
   * V-slope fit with the VO2 where they cross, so a reader of the page or PDF can tell the two apart. @default false
   */
  vt1SetByReviewer?: boolean;
}

/**
 * V-slope plot: VCO2 against VO2 with the identity line (slope 1) for orientation and VT1 as a
 * vertical marker at its VO2, and the V-slope method's two fitted lines when it gave an estimate (the marker is the
 * consensus of all methods, so it need not sit at their crossing; a VT1 set by a reviewer is labelled so, and the lines
 * are then named as the automatic fit). V-slope method: Beaver, Wasserman & Whipp 1986, J Appl Physiol
 * 60:2020 (source id `beaver-1986`, registered by the thresholds layer). Both axes mL/min.
 */
export function vSlopeChart(input: VSlopeChartInput): ChartSpec {
  const f = input.fit ?? null;
  const reviewer = input.vt1SetByReviewer === true;
  const slopes = f ? `S1 ${f.s1.toFixed(2)}, S2 ${f.s2.toFixed(2)}` : "";
  return {
    id: "v-slope",
    title: "V-slope: VCO2 against VO2",
    x: { label: "VO2", unit: "mL/min" },
    y: { label: "VCO2", unit: "mL/min" },
    series: [
      { name: "VCO2 vs VO2", kind: "points", points: pairSeries(input.vo2MlMin, input.vco2MlMin) },
      ...(f
        ? [
            {
              name: reviewer
                ? `automatic V-slope fit (${slopes}; lines cross at ${Math.round(f.crossVo2MlMin)} mL/min)`
                : `V-slope lines (${slopes})`,
              kind: "line" as const,
              points: [
                [f.fromVo2MlMin, f.s1 * f.fromVo2MlMin + f.intercept1],
                [f.crossVo2MlMin, f.s1 * f.crossVo2MlMin + f.intercept1],
                [f.toVo2MlMin, f.s2 * f.toVo2MlMin + f.intercept2],
              ] as [number, number][],
            },
          ]
        : []),
    ],
    markers: thresholdMarkers(input.vt1Vo2MlMin, undefined, 1, { vt1: reviewer }),
    refLines: [{ slope: 1, intercept: 0, label: "slope 1 (VCO2 = VO2)" }],
    ...(reviewer && f ? { note: "VT1 set by the reviewer; the lines are the automatic fit it replaces" } : {}),
  };
}
