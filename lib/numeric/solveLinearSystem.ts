/**
 * Solve a small dense linear system A·x = b by Gaussian elimination with partial pivoting
 * (standard numerics, common practice). Inputs are not modified.
 * Degenerate cases: a (near-)singular matrix → null.
 *
 * @example solveLinearSystem([[2, 0], [0, 4]], [2, 8]) // [1, 2]
 */
export function solveLinearSystem(a: readonly (readonly number[])[], b: readonly number[]): number[] | null {
  const n = b.length;
  if (a.length !== n) throw new Error("solveLinearSystem requires a square matrix matching b");
  const m = a.map((row, i) => [...row, b[i]]);
  let scale = 0;
  for (const row of a) for (const v of row) scale = Math.max(scale, Math.abs(v));
  const tiny = (scale || 1) * 1e-12;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[pivot][col])) pivot = r;
    if (!(Math.abs(m[pivot][col]) > tiny)) return null;
    if (pivot !== col) [m[pivot], m[col]] = [m[col], m[pivot]];
    for (let r = col + 1; r < n; r++) {
      const f = m[r][col] / m[col][col];
      if (f === 0) continue;
      for (let c = col; c <= n; c++) m[r][c] -= f * m[col][c];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let c = r + 1; c < n; c++) s -= m[r][c] * x[c];
    x[r] = s / m[r][r];
  }
  return x.every(Number.isFinite) ? x : null;
}
