/** Result of `binByTime`: one entry per bin, bins of equal length from `startS`. */
export interface TimeBins {
  /** Bin centres, seconds. */
  centerS: Float64Array;
  /** Mean of each column per bin (NaN when the bin holds no finite value of that column). */
  means: Float64Array[];
  /** Number of samples that went into each bin (counted on the first column). */
  counts: Int32Array;
  binS: number;
}

export interface BinByTimeOptions {
  startS: number;
  endS: number;
  /** Bin length, seconds. @default 10 */
  binS?: number;
  /** Samples to leave out (true = skip), same length as `timeS`. */
  skip?: ArrayLike<boolean>;
}

/**
 * Discrete time-bin averages of several columns sampled at the same (irregular) times — e.g. breaths —
 * with bins [startS + k·binS, startS + (k+1)·binS). Time-bin averaging of breath data is common practice
 * (bins of 10–60 s are the usual choices: Robergs, Dwyer & Astorino 2010, Sports Med 40:95 — confirmed survey).
 * Non-finite values are skipped per column. O(n + bins).
 *
 * @param timeS sample times, ascending
 * @param columns value columns, each the length of timeS
 * @example binByTime([1, 2, 11], [[10, 20, 30]], { startS: 0, endS: 20, binS: 10 }).means[0] // [15, 30]
 */
export function binByTime(timeS: ArrayLike<number>, columns: ArrayLike<number>[], options: BinByTimeOptions): TimeBins {
  const binS = options.binS ?? 10;
  if (!(binS > 0)) throw new Error("binByTime requires binS > 0");
  for (const c of columns) if (c.length !== timeS.length) throw new Error("binByTime requires columns the length of timeS");
  const nBins = Math.max(0, Math.ceil((options.endS - options.startS) / binS));
  const sums = columns.map(() => new Float64Array(nBins));
  const ns = columns.map(() => new Int32Array(nBins));
  const counts = new Int32Array(nBins);
  for (let i = 0; i < timeS.length; i++) {
    const t = timeS[i];
    if (t < options.startS || t >= options.startS + nBins * binS) continue;
    if (options.skip && options.skip[i]) continue;
    const b = Math.floor((t - options.startS) / binS);
    let any = false;
    for (let c = 0; c < columns.length; c++) {
      const v = columns[c][i];
      if (Number.isFinite(v)) {
        sums[c][b] += v;
        ns[c][b] += 1;
        any = true;
      }
    }
    if (any) counts[b] += 1;
  }
  const centerS = new Float64Array(nBins);
  for (let b = 0; b < nBins; b++) centerS[b] = options.startS + (b + 0.5) * binS;
  const means = sums.map((s, c) => {
    const m = new Float64Array(nBins);
    for (let b = 0; b < nBins; b++) m[b] = ns[c][b] > 0 ? s[b] / ns[c][b] : NaN;
    return m;
  });
  return { centerS, means, counts, binS };
}
