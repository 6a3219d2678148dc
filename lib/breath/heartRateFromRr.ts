/**
 * Heart rate from R–R intervals (the time between two heartbeats, ms), for files that record the heart
 * period beat by beat instead of a heart-rate column.
 *
 * Heart rate over a group of beats is 60 000 × beats / Σ R–R (beats per minute): the mean of the periods,
 * not the mean of the instantaneous rates, so a long interval weighs by the time it lasted (common practice).
 *
 * Before averaging, beats that cannot be normal sinus beats are set aside:
 * - an interval outside `PLAUSIBLE_RR_INTERVAL_MS` (200–2400 ms, i.e. 25–300 beats/min; common practice);
 * - an interval more than `RR_NEIGHBOUR_FRACTION` (20 %) away from the median of its neighbours (up to
 *   `RR_NEIGHBOURS` plausible beats on each side): a premature beat and its compensatory pause, or a missed or
 *   an extra detection. A fixed-percentage rule against the preceding or surrounding beats is the usual
 *   editing of R–R series in heart-rate-variability work (common practice; the 20 % figure is recalled, not
 *   checked against a source). During a ramp heart rate changes by well under 20 % over ten beats, so
 *   normal beats are not removed by it.
 */
import { PLAUSIBLE_RR_INTERVAL_MS } from "./inferColumnUnit";

/** Largest relative distance of an interval from the median of its neighbours (common practice; recalled). */
export const RR_NEIGHBOUR_FRACTION = 0.2;
/** Neighbours on each side used for the local median (our choice). */
export const RR_NEIGHBOURS = 5;

export interface RrCleaning {
  /** The intervals kept, ms; NaN where a beat had no value or was set aside. */
  clean: Float64Array;
  /** Beats with a value. */
  beats: number;
  /** Beats outside the plausible range. */
  outOfRange: number;
  /** Beats more than 20 % from the median of their neighbours. */
  irregular: number;
}

function median(values: number[]): number {
  const s = values.sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Sets aside implausible and irregular beats (see the module comment). Input NaN = no value. */
export function cleanRrIntervals(rrMs: ArrayLike<number>): RrCleaning {
  const n = rrMs.length;
  const [lo, hi] = PLAUSIBLE_RR_INTERVAL_MS;
  const plausible = new Float64Array(n);
  let beats = 0;
  let outOfRange = 0;
  for (let i = 0; i < n; i++) {
    const v = rrMs[i];
    if (!Number.isFinite(v)) {
      plausible[i] = NaN;
      continue;
    }
    beats++;
    if (v < lo || v > hi) {
      outOfRange++;
      plausible[i] = NaN;
    } else plausible[i] = v;
  }
  const clean = new Float64Array(n);
  let irregular = 0;
  const around: number[] = [];
  for (let i = 0; i < n; i++) {
    const v = plausible[i];
    clean[i] = v;
    if (Number.isNaN(v)) continue;
    around.length = 0;
    for (let j = i - 1, k = 0; j >= 0 && k < RR_NEIGHBOURS; j--) {
      if (Number.isNaN(plausible[j])) continue;
      around.push(plausible[j]);
      k++;
    }
    for (let j = i + 1, k = 0; j < n && k < RR_NEIGHBOURS; j++) {
      if (Number.isNaN(plausible[j])) continue;
      around.push(plausible[j]);
      k++;
    }
    // fewer than four neighbours: no local rhythm to judge against; the beat is kept
    if (around.length < 4) continue;
    const m = median(around);
    if (Math.abs(v - m) > RR_NEIGHBOUR_FRACTION * m) {
      clean[i] = NaN;
      irregular++;
    }
  }
  return { clean, beats, outOfRange, irregular };
}

/** Accumulates kept intervals and gives the heart rate over them, beats/min (undefined when none). */
export class BeatGroup {
  private sum = 0;
  private count = 0;
  add(rrMs: number): void {
    if (Number.isNaN(rrMs)) return;
    this.sum += rrMs;
    this.count++;
  }
  rateBpm(): number | undefined {
    return this.count > 0 ? (60000 * this.count) / this.sum : undefined;
  }
  reset(): void {
    this.sum = 0;
    this.count = 0;
  }
}
