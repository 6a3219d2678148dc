import type { ThresholdSeries } from "../../lib/thresholds/thresholdTypes";

/**
 * A binned threshold series built by hand for tests (invented numbers): 20-s bins at the given times, the VO2 and
 * VCO2 trends equal to the signals (noise-free), the analysed span from the first to the last bin. End-tidal
 * pressures default to missing (NaN).
 */
export function handBuiltSeries(s: {
  timeS: Float64Array;
  vo2MlMin: Float64Array;
  vco2MlMin: Float64Array;
  veLMin: Float64Array;
  peto2MmHg?: Float64Array;
  petco2MmHg?: Float64Array;
}): ThresholdSeries {
  const n = s.timeS.length;
  return {
    binS: 20,
    timeS: s.timeS,
    vo2MlMin: s.vo2MlMin,
    vco2MlMin: s.vco2MlMin,
    veLMin: s.veLMin,
    peto2MmHg: s.peto2MmHg ?? new Float64Array(n).fill(NaN),
    petco2MmHg: s.petco2MmHg ?? new Float64Array(n).fill(NaN),
    vo2Trend: s.vo2MlMin,
    vco2Trend: s.vco2MlMin,
    span: { startS: s.timeS[0], endS: s.timeS[n - 1] },
    spikesRemoved: 0,
    timeAveragedRowsS: null,
    averaging: "20-s bins (hand-built test series)",
  };
}
