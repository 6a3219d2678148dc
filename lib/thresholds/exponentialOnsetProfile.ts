import { indexAboveWalker } from "./firstIndexAbove";

/**
 * Profile of the residual sum of squares of a break followed by an exponential rise:
 * y = a + b·x + A·(e^((x − τ)/σ) − 1)₊, A ≥ 0 (x in minutes from the first point), over candidate break times τ (s),
 * with the shape σ (minutes) profiled over a fixed grid. Blood lactate rises as a continuous exponential in ramp
 * exercise (Hughson, Weisiger & Swanson 1987, J Appl Physiol 62:1975 — confirmed abstract), and the excess CO2 its
 * buffering releases follows its rate of rise, an exponential that starts at the threshold with a small slope; the
 * family holds the straight hinge as σ grows (A·(e^(u/σ) − 1) → (A/σ)·u), so a sharp corner is still a member. The
 * rigid shape ties the start of the rise to the level of the whole segment above it (the "− 1" keeps the curve
 * continuous at τ), which a free quadratic does not. Least squares with τ and σ fixed (Orr et al. 1982 search the
 * break at the least pooled SSE, confirmed); the grid of σ and the exponential form as a break model are our
 * implementation choice (`vt-joint-profile-choice`). Suffix sums of g = e^((x − x_end)/σ), g², x·g and y·g per σ and
 * the partial-regression identity (the line solved once) make each candidate O(1) per σ (ascending candidates walk the break index on). Points in ascending t (s).
 * Returns NaN where no rising exponential fits (A < 0, or fewer than 3 points above τ).
 * `z` replaces x as the line's regressor (y = a + b·z + A·(e^((x − τ)/σ) − 1)₊): the VT2 profile reads VE against VCO2
 * below the break and an exponential in time above it.
 */
export function exponentialOnsetProfile(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  taus: ArrayLike<number>,
  sigmasMin: readonly number[] = EXPONENTIAL_ONSET_SIGMAS_MIN,
  z?: ArrayLike<number>,
): { sse: Float64Array; sigmaMin: Float64Array; n: number } {
  const n = t.length;
  const K = taus.length;
  const sse = new Float64Array(K).fill(NaN);
  const sigmaMin = new Float64Array(K).fill(NaN);
  if (n < 6) return { sse, sigmaMin, n };
  const t0 = t[0];
  const S = sigmasMin.length;
  const buf = scratch(n + 3 * (n + 1) + 4 * (n + 1) * S + 2 * S);
  let off = 0;
  const take = (len: number) => buf.subarray(off, (off += len));
  const x = take(n);
  for (let i = 0; i < n; i++) x[i] = (t[i] - t0) / 60;
  const xEnd = x[n - 1];
  const zz = z ?? x;
  // line alone (X = [1, z]), once
  let S0 = 0;
  let S1 = 0;
  let S2 = 0;
  let Y0 = 0;
  let Y1 = 0;
  let syy = 0;
  const P0 = take(n + 1);
  const P1 = take(n + 1);
  const QY = take(n + 1);
  P0[n] = 0;
  P1[n] = 0;
  QY[n] = 0;
  for (let i = n - 1; i >= 0; i--) {
    S0 += 1;
    S1 += zz[i];
    S2 += zz[i] * zz[i];
    Y0 += y[i];
    Y1 += y[i] * zz[i];
    syy += y[i] * y[i];
    P0[i] = P0[i + 1] + 1;
    P1[i] = P1[i + 1] + zz[i];
    QY[i] = QY[i + 1] + y[i];
  }
  const det = S0 * S2 - S1 * S1;
  if (!(det > 0)) return { sse, sigmaMin, n };
  const [g00, g01, g11] = [S2 / det, -S1 / det, S0 / det];
  const b0 = g00 * Y0 + g01 * Y1;
  const b1 = g01 * Y0 + g11 * Y1;
  const sseLine = syy - (b0 * Y0 + b1 * Y1);
  // candidates on an even grid (the usual case): e^((a − x_end)/σ) by one multiplication per candidate
  const stepMin = K > 1 ? (taus[1] - taus[0]) / 60 : 0;
  let even = K > 1 && stepMin > 0;
  for (let j = 2; even && j < K; j++) even = Math.abs((taus[j] - taus[j - 1]) / 60 - stepMin) < 1e-9;
  // per shape σ, suffix sums of g = e^((x − x_end)/σ), g², z·g and y·g, stored shape-minor ([k·S + s]) so that one
  // candidate reads all shapes from adjacent memory
  const E1 = take((n + 1) * S);
  const E2 = take((n + 1) * S);
  const EX = take((n + 1) * S);
  const EY = take((n + 1) * S);
  const c = take(S);
  const ratio = take(S);
  for (let s = 0; s < S; s++) {
    const sigma = sigmasMin[s];
    const at = n * S + s;
    E1[at] = E2[at] = EX[at] = EY[at] = 0;
    ratio[s] = even ? Math.exp(stepMin / sigma) : NaN;
    c[s] = Math.exp(((taus[0] - t0) / 60 - xEnd) / sigma);
    for (let i = n - 1; i >= 0; i--) {
      const g = Math.exp((x[i] - xEnd) / sigma);
      const here = i * S + s;
      const next = here + S;
      E1[here] = E1[next] + g;
      E2[here] = E2[next] + g * g;
      EX[here] = EX[next] + zz[i] * g;
      EY[here] = EY[next] + y[i] * g;
    }
  }
  const breakIndex = indexAboveWalker(x);
  for (let j = 0; j < K; j++) {
    // c = e^((a − x_end)/σ) at this candidate: the running product on an even grid
    if (j > 0) for (let s = 0; s < S; s++) c[s] = even ? c[s] * ratio[s] : Math.exp(((taus[j] - t0) / 60 - xEnd) / sigmasMin[s]);
    const k = breakIndex((taus[j] - t0) / 60); // the first point strictly above τ
    if (n - k < 3) continue;
    const p0 = P0[k];
    const p1 = P1[k];
    const qy = QY[k];
    let best = NaN;
    let bestSigma = NaN;
    for (let s = 0; s < S; s++) {
      // column scaled by e^(−(x_end − a)/σ) (the fit is scale-free): h = g − c above τ
      const cs = c[s];
      const at = k * S + s;
      const e1 = E1[at];
      const sh = e1 - cs * p0;
      const shh = E2[at] - 2 * cs * e1 + cs * cs * p0;
      const sxh = EX[at] - cs * p1;
      const syh = EY[at] - cs * qy;
      const hMh = shh - (sh * (g00 * sh + g01 * sxh) + sxh * (g01 * sh + g11 * sxh));
      if (!(hMh > 1e-12 * shh)) continue;
      const hMy = syh - (sh * b0 + sxh * b1);
      if (!(hMy > 0)) continue; // A ≥ 0: a rise
      const v = Math.max(0, sseLine - (hMy * hMy) / hMh);
      if (!(v >= best)) {
        best = v;
        bestSigma = sigmasMin[s];
      }
    }
    sse[j] = best;
    sigmaMin[j] = bestSigma;
  }
  return { sse, sigmaMin, n };
}

/**
 * Shapes σ of the exponential rise, minutes (our choice): from a rise that doubles its slope every ≈ 30 s to one close
 * to a straight line over a 10-min ramp.
 */
export const EXPONENTIAL_ONSET_SIGMAS_MIN: readonly number[] = [0.5, 0.7, 1, 1.4, 2, 2.8, 4, 5.6, 8];

let scratchBuffer = new Float64Array(0);
/** A reused work buffer (these profiles run for every resample; fresh large typed arrays cost more than the sums). */
function scratch(size: number): Float64Array {
  if (scratchBuffer.length < size) scratchBuffer = new Float64Array(Math.max(size, 2 * scratchBuffer.length));
  return scratchBuffer;
}
