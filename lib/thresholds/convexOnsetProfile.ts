import { indexAboveWalker } from "./firstIndexAbove";

/**
 * Profile of the residual sum of squares of a break that may curve upward above it:
 * y = a + b·x + d·(x − τ)₊ + q·(x − τ)₊², d ≥ 0, q ≥ 0 (x in minutes from the first point), over candidate break
 * times τ (s). A rise that starts at τ and steepens as it goes — blood lactate, and the excess CO2 its buffering
 * releases, rise curvilinearly above the threshold (Hughson, Weisiger & Swanson 1987, J Appl Physiol 62:1975 —
 * confirmed abstract: a continuous exponential fits ramp lactate better than the threshold model of Beaver, Wasserman &
 * Whipp 1985, J Appl Physiol 59:1936 — secondary) — is then found where it starts rather than where it is steepest. A candidate whose best fit curves downward (q < 0) has no convex fit (NaN); when the
 * slope step is negative (d < 0) the fit is redone with d = 0 (a rise that starts with zero slope). Least squares with
 * the break fixed (Orr et al. 1982 search the break at the least pooled SSE, confirmed). Suffix sums of x⁰…x⁴ and
 * y·x⁰…y·x² and the partial-regression identity (the line solved once, a 2 × 2 system per candidate) make each
 * candidate O(1) with no allocation (ascending candidates walk the break index on). Points in ascending t (s).
 */
export function convexOnsetProfile(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  taus: ArrayLike<number>,
): { sse: Float64Array; n: number } {
  const n = t.length;
  const K = taus.length;
  const sse = new Float64Array(K).fill(NaN);
  if (n < 6) return { sse, n };
  const t0 = t[0];
  const x = Float64Array.from({ length: n }, (_, i) => (t[i] - t0) / 60);
  // suffix sums, index k: points k..n−1 — P[m] = Σ x^m, Q[m] = Σ y·x^m
  const P = [0, 1, 2, 3, 4].map(() => new Float64Array(n + 1));
  const Q = [0, 1, 2].map(() => new Float64Array(n + 1));
  let syy = 0;
  for (let i = n - 1; i >= 0; i--) {
    let p = 1;
    for (let m = 0; m <= 4; m++) {
      P[m][i] = P[m][i + 1] + p;
      if (m <= 2) Q[m][i] = Q[m][i + 1] + y[i] * p;
      p *= x[i];
    }
    syy += y[i] * y[i];
  }
  const [S0, S1, S2] = [P[0][0], P[1][0], P[2][0]];
  const [Y0, Y1] = [Q[0][0], Q[1][0]];
  // the line alone (X = [1, x]): (X'X)⁻¹ in closed form, β and SSE once
  const det = S0 * S2 - S1 * S1;
  if (!(det > 0)) return { sse, n };
  const [g00, g01, g11] = [S2 / det, -S1 / det, S0 / det];
  const b0 = g00 * Y0 + g01 * Y1;
  const b1 = g01 * Y0 + g11 * Y1;
  const sseLine = syy - (b0 * Y0 + b1 * Y1);
  const quad = (u0: number, u1: number, v0: number, v1: number) => u0 * (g00 * v0 + g01 * v1) + u1 * (g01 * v0 + g11 * v1);
  const [P0, P1, P2, P3, P4] = P;
  const [Q0, Q1, Q2] = Q;
  const breakIndex = indexAboveWalker(x);
  for (let j = 0; j < K; j++) {
    const a = (taus[j] - t0) / 60;
    const k = breakIndex(a); // the first point strictly above the break
    if (n - k < 3) continue;
    // plain locals, not an array per candidate (this loop runs for every candidate of every resample)
    const p0 = P0[k];
    const p1 = P1[k];
    const p2 = P2[k];
    const p3 = P3[k];
    const p4 = P4[k];
    const q0 = Q0[k];
    const q1 = Q1[k];
    const q2 = Q2[k];
    // sums over the points above the break of the hinge columns h₁ = x − a, h₂ = (x − a)² and their products
    const h1 = p1 - a * p0;
    const h11 = p2 - 2 * a * p1 + a * a * p0;
    const h12 = p3 - 3 * a * p2 + 3 * a * a * p1 - a * a * a * p0;
    const h22 = p4 - 4 * a * p3 + 6 * a * a * p2 - 4 * a * a * a * p1 + a * a * a * a * p0;
    const xh1 = p2 - a * p1;
    const xh2 = p3 - 2 * a * p2 + a * a * p1;
    const yh1 = q1 - a * q0;
    const yh2 = q2 - 2 * a * q1 + a * a * q0;
    // partial regression on the line (Schur complement): A = H'MH, r = H'My, M = I − X(X'X)⁻¹X'
    const A11 = h11 - quad(h1, xh1, h1, xh1);
    const A12 = h12 - quad(h1, xh1, h11, xh2);
    const A22 = h22 - quad(h11, xh2, h11, xh2);
    const r1 = yh1 - (h1 * b0 + xh1 * b1);
    const r2 = yh2 - (h11 * b0 + xh2 * b1);
    const detA = A11 * A22 - A12 * A12;
    if (!(A22 > 0) || !(detA > 1e-12 * A11 * A22)) continue;
    const d = (A22 * r1 - A12 * r2) / detA;
    const q = (A11 * r2 - A12 * r1) / detA;
    if (!(q >= 0)) continue;
    if (d >= 0) sse[j] = Math.max(0, sseLine - (d * r1 + q * r2));
    else if (r2 >= 0) sse[j] = Math.max(0, sseLine - (r2 * r2) / A22); // d = 0: the curve alone, q = r₂/A₂₂ ≥ 0
  }
  return { sse, n };
}
