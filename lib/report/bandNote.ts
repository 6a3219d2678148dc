import { noiseCorrectedSlope, type LineIndex } from "../thresholds/veVco2Slope";
import { formatNumber } from "../units/format";

/**
 * The words written beside a slope that carries a calibrated band, at the slope's own precision: "band a–b", and where
 * the band is centred on a slope corrected for breath noise in its x (whole-exercise VE/VCO2, OUES) that slope too,
 * "corrected for breath noise c". "" without a band. The page and the report use the same words; what the band means
 * is stated once beside them (`BAND_MEANING`).
 */
export function bandNote(line: LineIndex | undefined, decimals: number): string {
  if (!line?.band || line.slope.value === null) return "";
  const low = formatNumber(line.band.low, decimals);
  const high = formatNumber(line.band.high, decimals);
  // a band inside one step of the last digit shown ("28.0–28.0") says that, not a range of one number
  const words = [low === high ? "band narrower than the last digit shown" : `band ${low}–${high}`];
  const corrected = noiseCorrectedSlope(line);
  if (corrected !== null) words.push(`corrected for breath noise ${formatNumber(corrected, decimals)}`);
  return words.join("; ");
}
