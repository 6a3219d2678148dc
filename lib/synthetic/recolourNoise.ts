/**
 * Breath noise made to carry over from one breath to the next (invented data only).
 *
 * The six synthetic models draw breath noise that is nearly independent from breath to breath (lag-1 correlation of the
 * residuals −0.08 to +0.21 at every level). Some real exports are not: in the open ACTES recordings (Chabert et al.
 * 2022, PhysioNet, ODC-By 1.0) the late-ramp VO2 residuals around a 15-breath running median have a lag-1 correlation of
 * 0.43–0.67 (median 0.54; `tests/synthetic/noiseRealism.test.ts`), as a cart that averages two breaths would give.
 * Breath-by-breath noise itself has been described as uncorrelated (Lamarra, Whipp, Ward & Wasserman 1987, J Appl
 * Physiol; recalled), so the correlation may come from the export rather than the lungs; a serious tool must cope with
 * both. This re-colours a test's noise as a first-order autoregression with the same spread, to measure that.
 */
import type { BreathRow, BreathTable, NumericField } from "../breath";

/** The breath channels whose noise is re-coloured; the protocol channels (time, work, speed, grade, stage) are not. */
export const RECOLOURED_FIELDS: readonly NumericField[] = [
  "vo2MlMin",
  "vco2MlMin",
  "veLMin",
  "hrBpm",
  "rrBrMin",
  "vtL",
  "peto2MmHg",
  "petco2MmHg",
  "spo2Pct",
];

/**
 * The noisy table with each channel's noise e (noisy − noise-free, breath by breath) replaced by
 * c_i = ρ·c_{i−1} + √(1 − ρ²)·e_i, c_0 = e_0: an AR(1) filter that keeps the variance of white noise and gives it a
 * lag-1 correlation ρ (common practice). Artefact breaths are smeared over the next few breaths, as averaging would.
 * The two tables must be the same breaths (as every generator returns them); ρ = 0 returns a copy.
 */
export function recolourNoise(noisy: BreathTable, noiseFree: BreathTable, rho: number): BreathTable {
  if (!(rho >= 0 && rho < 1)) throw new RangeError(`recolourNoise: rho must be in [0, 1), got ${rho}`);
  if (noisy.rows.length !== noiseFree.rows.length) throw new RangeError("recolourNoise: the two tables differ in breaths");
  const rows: BreathRow[] = noisy.rows.map((r) => ({ ...r }));
  const k = Math.sqrt(1 - rho * rho);
  for (const field of RECOLOURED_FIELDS) {
    let carried: number | null = null;
    for (let i = 0; i < rows.length; i++) {
      const a = noisy.rows[i][field];
      const b = noiseFree.rows[i][field];
      if (typeof a !== "number" || typeof b !== "number" || !Number.isFinite(a) || !Number.isFinite(b)) continue;
      const e = a - b;
      carried = carried === null ? e : rho * carried + k * e;
      rows[i][field] = b + carried;
    }
  }
  return { ...noisy, rows };
}
