/** Index of the smallest finite value (−1 when none): the best candidate of a profile. */
export function argmin(v: Float64Array): number {
  let b = -1;
  v.forEach((s, j) => {
    if (Number.isFinite(s) && (b < 0 || s < v[b])) b = j;
  });
  return b;
}

/**
 * Independent least squares for checking the profile fits: normal equations from the raw columns, Gauss–Jordan
 * elimination (no suffix sums, no partial-regression identity).
 */
export function bruteSse(cols: number[][], y: number[]): { sse: number; beta: number[] } {
  const k = cols.length;
  const m = cols.map((a) => [...cols.map((b) => a.reduce((s, v, i) => s + v * b[i], 0)), a.reduce((s, v, i) => s + v * y[i], 0)]);
  for (let c = 0; c < k; c++)
    for (let r = 0; r < k; r++) {
      if (r === c) continue;
      const f = m[r][c] / m[c][c];
      for (let q = c; q <= k; q++) m[r][q] -= f * m[c][q];
    }
  const beta = m.map((row, i) => row[k] / row[i]);
  const sse = y.reduce((s, v, i) => s + (v - cols.reduce((f, col, c) => f + beta[c] * col[i], 0)) ** 2, 0);
  return { sse, beta };
}
