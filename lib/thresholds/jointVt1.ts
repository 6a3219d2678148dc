import { solveLinearSystem } from "../numeric";
import { buildMethodEstimate, seriesWindow, vo2AtTime } from "./consensus";
import { convexOnsetProfile } from "./convexOnsetProfile";
import { exponentialOnsetProfile } from "./exponentialOnsetProfile";
import { indexAboveWalker } from "./firstIndexAbove";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface JointVt1Options {
  /** Last time included for VE and PETO2, s (stay below the RCP: both bend again there). @default series.span.endS */
  endS?: number;
  /**
   * Last time included for the excess-CO2 signal, s. VCO2 − VO2 has no bend of its own at the RCP (that break is
   * ventilatory), so it reads the whole analysed span by default (our choice, round 7 of README-thresholds.md:
   * VT1 moderate-noise P90 lower on every synthetic bank, also with CO2 washout above the RCP modelled). Never
   * earlier than `endS`. @default series.span.endS
   */
  excessCo2EndS?: number;
  /** Fewest bins each side of a candidate break. @default 5 */
  minPointsEachSide?: number;
  /** Step of the candidate break times, s. @default 5 */
  stepS?: number;
  /** Least joint likelihood-ratio statistic (−2 log Λ summed over signals) for a call (our choice). @default 2 */
  minLr?: number;
  /** Temper of the profile weights exp(−temperature·ΔL) (our choice, 0.5 chosen on the synthetic bank). @default 0.5 */
  temperature?: number;
  /**
   * Let each signal curve upward above the break (`convexOnsetProfile`: a rise that starts at τ and steepens, as
   * lactate and the excess CO2 of its buffering do — Hughson et al. 1987, confirmed abstract) when that beats the
   * straight hinge by more than this many log-likelihood units ((n/2)·log SSE); null = straight hinges only. 4 is our
   * choice (README-thresholds.md, round 8: 2 pulled sharp breaks early on the main synthetic model; 4 and 6 equal there).
   * @default 4
   */
  curvedAbovePenalty?: number | null;
  /**
   * Let each signal rise exponentially above the break (`exponentialOnsetProfile`: y = line + A·(e^((t − τ)/σ) − 1)₊,
   * the shape of a lactate rise that is a continuous exponential — Hughson et al. 1987, confirmed abstract) when that
   * beats both the straight hinge and the curve by more than this many log-likelihood units; null = off. 4 is our
   * choice (README-thresholds.md, round 10: the same price as the curve; 3 cost the corner models more).
   * @default 4
   */
  exponentialOnsetPenalty?: number | null;
}

/**
 * Profile of the residual sum of squares of y = Σ β_j·base_j + d·u·max(0, t − τ) over candidate break
 * times τ (least squares with the break fixed; Orr et al. 1982 search the break at the least pooled SSE,
 * confirmed). Points must be in ascending t. O(n·p² + K·p²) with suffix sums (ascending candidates walk the break index on) and the
 * partial-regression identity. When the best hinge
 * coefficient has the wrong sign the profile takes the no-break SSE (constrained fit).
 */
export function segmentedProfile(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  base: ArrayLike<number>[],
  u: ArrayLike<number> | null,
  taus: ArrayLike<number>,
  sign: "positive" | "negative" | "any" = "any",
): { sse: Float64Array; sseSingle: number; hinge: Float64Array; n: number } {
  const n = t.length;
  const p = base.length;
  const K = taus.length;
  const sse = new Float64Array(K).fill(NaN);
  const hinge = new Float64Array(K).fill(NaN);
  const uu = (i: number) => (u ? u[i] : 1);
  if (n < p + 2) return { sse, sseSingle: NaN, hinge, n };
  const gram: number[][] = [];
  const bty: number[] = [];
  let syy = 0;
  for (let i = 0; i < n; i++) syy += y[i] * y[i];
  for (let a = 0; a < p; a++) {
    gram.push(new Array<number>(p).fill(0));
    let s = 0;
    for (let i = 0; i < n; i++) s += base[a][i] * y[i];
    bty.push(s);
    for (let b = 0; b < p; b++) {
      let g = 0;
      for (let i = 0; i < n; i++) g += base[a][i] * base[b][i];
      gram[a][b] = g;
    }
  }
  const single = solveLinearSystem(gram, bty);
  const sseSingle = single ? Math.max(0, syy - single.reduce((s, b, j) => s + b * bty[j], 0)) : NaN;
  // suffix sums (index k: points k..n−1), one pass over the points
  const sCUT = base.map(() => new Float64Array(n + 1));
  const sCU = base.map(() => new Float64Array(n + 1));
  const sUUTT = new Float64Array(n + 1);
  const sUUT = new Float64Array(n + 1);
  const sUU = new Float64Array(n + 1);
  const sYUT = new Float64Array(n + 1);
  const sYU = new Float64Array(n + 1);
  for (let i = n - 1; i >= 0; i--) {
    const ui = uu(i);
    const ti = t[i];
    for (let c = 0; c < p; c++) {
      sCUT[c][i] = sCUT[c][i + 1] + base[c][i] * ui * ti;
      sCU[c][i] = sCU[c][i + 1] + base[c][i] * ui;
    }
    sUUTT[i] = sUUTT[i + 1] + ui * ui * ti * ti;
    sUUT[i] = sUUT[i + 1] + ui * ui * ti;
    sUU[i] = sUU[i + 1] + ui * ui;
    sYUT[i] = sYUT[i + 1] + y[i] * ui * ti;
    sYU[i] = sYU[i + 1] + y[i] * ui;
  }
  // With the break fixed, the hinge column h enters by the partial-regression (Schur complement) identity:
  // SSE(τ) = SSE_single − (h'My)² / (h'Mh), M = I − X(X'X)⁻¹X', d = h'My / h'Mh — the same least-squares fit as
  // solving the (p+1)² normal equations, with (X'X)⁻¹ and β_single computed once (no allocation per candidate).
  const ginv: number[][] = [];
  for (let c = 0; c < p; c++) {
    const e = new Array<number>(p).fill(0);
    e[c] = 1;
    const col = solveLinearSystem(gram, e);
    if (!col || !single) return { sse, sseSingle, hinge, n };
    ginv.push(col);
  }
  const hx = new Float64Array(p);
  // typed copies of β and (X'X)⁻¹ (row-major) for the candidate loop, the hot path of every resample
  const beta = Float64Array.from(single as number[]);
  const gi = new Float64Array(p * p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) gi[a * p + b] = ginv[a][b];
  const breakIndex = indexAboveWalker(t);
  for (let j = 0; j < K; j++) {
    const tau = taus[j];
    const k = breakIndex(tau);
    if (n - k < 2) {
      sse[j] = sseSingle;
      continue;
    }
    let hMy = sYUT[k] - tau * sYU[k];
    const hh = sUUTT[k] - 2 * tau * sUUT[k] + tau * tau * sUU[k];
    let hMh = hh;
    if (p === 2) {
      // the usual base [1, t] unrolled (the same operations in the same order as the general loops below)
      const h0 = sCUT[0][k] - tau * sCU[0][k];
      const h1 = sCUT[1][k] - tau * sCU[1][k];
      hMy -= h0 * beta[0];
      hMy -= h1 * beta[1];
      hMh -= h0 * gi[0] * h0;
      hMh -= h0 * gi[1] * h1;
      hMh -= h1 * gi[2] * h0;
      hMh -= h1 * gi[3] * h1;
    } else {
      for (let c = 0; c < p; c++) {
        hx[c] = sCUT[c][k] - tau * sCU[c][k];
        hMy -= hx[c] * beta[c];
      }
      for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) hMh -= hx[a] * gi[a * p + b] * hx[b];
    }
    if (!(hMh > 1e-10 * hh)) {
      sse[j] = sseSingle;
      continue;
    }
    const d = hMy / hMh;
    hinge[j] = d;
    if ((sign === "positive" && !(d > 0)) || (sign === "negative" && !(d < 0))) {
      sse[j] = sseSingle;
      continue;
    }
    sse[j] = Math.max(0, sseSingle - (hMy * hMy) / hMh);
  }
  return { sse, sseSingle, hinge, n };
}

/**
 * VT1 by a joint profile likelihood over candidate break times (our implementation choice, source
 * `vt-joint-profile-choice`, built on the multisegment regression of Orr et al. 1982, confirmed, and on the
 * signals of the modified V-slope — Sue 1988, confirmed — and of ventilatory equivalents / end-tidal O2 —
 * common practice, secondary). For every candidate time τ (5-s grid) three least-squares fits, each a line in
 * time plus an upward hinge at τ — or a rise that steepens above τ (`convexOnsetProfile`, `curvedAbovePenalty`) or an
 * exponential rise from τ (`exponentialOnsetProfile`, `exponentialOnsetPenalty`) when that fits better by more than its
 * penalty — give residual sums of squares SSE_s(τ): excess CO2 (VCO2 − VO2: the
 * excess-CO2 start of the modified V-slope), VE (VE starts rising faster than VO2) and PETO2 (PETO2 starts
 * rising). VE and PETO2 read data up to `endS` (below the RCP); excess CO2, which does not bend at the RCP,
 * reads up to `excessCo2EndS` (the whole analysed span by default). The joint criterion
 * L(τ) = Σ_s (n_s/2)·log SSE_s(τ) gives each signal its own unknown noise variance; a signal without a break adds a flat profile. The estimate is the median of the tempered
 * profile weights exp(−½·(L(τ) − min L)) over τ (more stable than the minimum under noise — our choice,
 * chosen on the synthetic bank); VO2 from the VO2 trend at that time. Confidence rests on the likelihood ratio
 * against no break, the number of signals that bend and the width of the profile (10th–90th percentile).
 * O(n + K) per signal and shape (the exponential: per shape σ of its grid).
 */
export function jointVt1(series: ThresholdSeries, options: JointVt1Options = {}): MethodEstimate {
  const endS = options.endS ?? series.span.endS;
  const step = options.stepS ?? 5;
  const minLr = options.minLr ?? 2;
  const temper = options.temperature ?? 0.5;
  const windowTo = (lastS: number) =>
    seriesWindow(series, series.span.startS, lastS).filter((i) => Number.isFinite(series.vo2MlMin[i]));
  const win = windowTo(endS);
  const m = Math.max(3, Math.min(options.minPointsEachSide ?? 5, Math.floor(win.length / 3)));
  const window = { startS: series.span.startS, endS };
  const base = {
    id: "vt1-joint-profile",
    which: "vt1" as const,
    label: "Joint profile: one break time shared by excess CO2, VE and PETO2",
    series,
    window,
    sourceIds: [
      "vt-joint-profile-choice",
      "orr-1982-multisegment",
      "sue-1988-modified-v-slope",
      "vt-equivalents-criteria",
      "hughson-1987-lactate-continuous",
      "vt-implementation-choice",
    ],
  };
  if (win.length < 2 * m + 1) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: win.length },
      quality: "failed",
      reasons: [`not determinable: only ${win.length} bins below the upper limit (need ${2 * m + 1})`],
    });
  }
  const taus = candidateBreakTimes(series, win, m, step);
  const excessEndS = Math.max(endS, options.excessCo2EndS ?? series.span.endS);
  const winExcess = excessEndS > endS ? windowTo(excessEndS) : win;
  const pen = options.curvedAbovePenalty === undefined ? 4 : options.curvedAbovePenalty;
  const penExp = options.exponentialOnsetPenalty === undefined ? 4 : options.exponentialOnsetPenalty;
  const shapes = { curvedAbovePenalty: pen, exponentialOnsetPenalty: penExp };
  const signals = [
    lineSignal("excessCo2", series, winExcess, (i) => series.vco2MlMin[i] - series.vo2MlMin[i], taus, shapes),
    lineSignal("ve", series, win, (i) => series.veLMin[i], taus, shapes),
    lineSignal("peto2", series, win, (i) => series.peto2MmHg[i], taus, shapes),
  ].filter((s) => s.p.n >= 2 * m + 1 && s.p.sseSingle > 0);
  const summary = summariseJointProfile(signals, taus, temper, series);
  if (!summary) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { signals: signals.length, candidates: taus.length },
      quality: "failed",
      reasons: ["not determinable: no signal with a usable two-segment fit"],
    });
  }
  const { tau, vo2At, lowS, highS, widthFraction, lr, bending, fit } = summary;
  fit.excessCo2EndS = excessEndS;
  const jAt = taus.indexOf(tau);
  const shapeNames = (mark: number) => signals.filter((s) => s.curved[jAt] === mark).map((s) => SIGNAL_LABEL[s.name] ?? s.name);
  const curvedNames = shapeNames(1);
  const exponentialNames = shapeNames(2);
  for (const s of signals) fit[`${s.name}CurvedAbove`] = s.curved[jAt];
  const reasons: string[] = [];
  let quality: MethodQuality;
  if (!(lr >= minLr)) {
    quality = "failed";
    reasons.push(
      `not determinable: no shared upward break (joint likelihood ratio ${lr.toFixed(1)} < ${minLr}; ${bending} of ${signals.length} signals bend)`,
    );
  } else {
    reasons.push(
      `${bending} of ${signals.length} signals bend upward at ${Math.round(tau)} s (joint likelihood ratio ${lr.toFixed(1)}); profile 10–90 % ${Math.round(lowS)}–${Math.round(highS)} s`,
    );
    if (excessEndS > endS)
      reasons.push(`excess CO2 read to ${Math.round(excessEndS)} s, VE and PETO2 to ${Math.round(endS)} s (below the RCP)`);
    if (curvedNames.length > 0) reasons.push(`${curvedNames.join(", ")} rise curvilinearly above the break (fitted as a curve)`);
    if (exponentialNames.length > 0)
      reasons.push(`${exponentialNames.join(", ")} rise exponentially above the break (fitted as an exponential)`);
    quality = bending >= 2 && widthFraction <= 0.15 ? "good" : bending >= 1 && widthFraction <= 0.3 ? "fair" : "poor";
    if (quality !== "good") reasons.push(bending < 2 ? "fewer than two signals bend clearly" : "wide profile");
  }
  return buildMethodEstimate({
    ...base,
    vo2MlMin: quality === "failed" ? null : vo2At,
    timeS: quality === "failed" ? null : tau,
    fit,
    quality,
    reasons,
  });
}

const SIGNAL_LABEL: Record<string, string> = { excessCo2: "excess CO2", ve: "VE", peto2: "PETO2" };

/**
 * A signal linear in time below the break, rising faster above it: a straight hinge, or — when it fits better by
 * more than its penalty in log-likelihood units ((n/2)·log SSE + penalty) — a rise that steepens (`convexOnsetProfile`,
 * `curvedAbovePenalty`) or an exponential rise (`exponentialOnsetProfile`, `exponentialOnsetPenalty`). `curved` marks
 * the shape taken at each candidate: 0 straight, 1 curve, 2 exponential.
 */
function lineSignal(
  name: string,
  series: ThresholdSeries,
  win: number[],
  value: (i: number) => number,
  taus: number[],
  shapes: { curvedAbovePenalty: number | null; exponentialOnsetPenalty: number | null },
): { name: string; p: ReturnType<typeof segmentedProfile>; curved: Uint8Array } {
  const idx = win.filter((i) => Number.isFinite(value(i)));
  const ts = idx.map((i) => series.timeS[i]);
  const t0 = ts.length ? ts[0] : 0;
  const ys = idx.map(value);
  const p = segmentedProfile(ts, ys, [ts.map(() => 1), ts.map((t) => (t - t0) / 60)], null, taus, "positive");
  const curved = new Uint8Array(taus.length);
  if (p.n === 0) return { name, p, curved };
  if (shapes.curvedAbovePenalty !== null)
    takeShapeWithPenalty(p, convexOnsetProfile(ts, ys, taus).sse, shapes.curvedAbovePenalty, curved, 1);
  if (shapes.exponentialOnsetPenalty !== null)
    takeShapeWithPenalty(p, exponentialOnsetProfile(ts, ys, taus).sse, shapes.exponentialOnsetPenalty, curved, 2);
  return { name, p, curved };
}

/**
 * Let another shape above the break replace a signal's straight hinge at each candidate where it fits better by more
 * than `penalty` log-likelihood units: a shape with penalty c costs (n/2)·log(SSE·e^(2c/n)) = (n/2)·log SSE + c. The
 * profile's SSE takes the penalised value there and `marks` records `mark` (both joint profiles; our choice).
 */
export function takeShapeWithPenalty(
  p: ReturnType<typeof segmentedProfile>,
  sse: Float64Array,
  penalty: number,
  marks: Uint8Array,
  mark: number,
): void {
  if (p.n === 0) return;
  const factor = Math.exp((2 * penalty) / p.n);
  for (let j = 0; j < marks.length; j++)
    if (sse[j] * factor < p.sse[j]) {
      p.sse[j] = sse[j] * factor;
      marks[j] = mark;
    }
}

/** The shared reading of a joint break-time profile (VT1 and VT2 joint methods). */
export interface JointProfileSummary {
  /** Median of the tempered profile weights, s. */
  tau: number;
  vo2At: number;
  /** 10th and 90th percentiles of the tempered profile, s. */
  lowS: number;
  highS: number;
  /** Profile width in VO2 as a fraction of the VO2 at the break. */
  widthFraction: number;
  /** Joint likelihood ratio of the break against single lines, and how many signals bend (ratio ≥ 4). */
  lr: number;
  bending: number;
  fit: Record<string, number | null>;
}

/**
 * Sum the signals' profiles Σ (n_s/2)·log SSE_s(τ), weight the candidates by exp(−temper·ΔL), take the
 * weighted median as the break and the 10–90 % range as its width (our implementation choice, see
 * README-thresholds.md). Null when no candidate has a finite criterion.
 */
export function summariseJointProfile(
  signals: { name: string; p: ReturnType<typeof segmentedProfile> }[],
  taus: number[],
  temper: number,
  series: ThresholdSeries,
): JointProfileSummary | null {
  const crit = new Float64Array(taus.length);
  for (const s of signals)
    for (let j = 0; j < taus.length; j++) crit[j] += (s.p.n / 2) * Math.log(Math.max(s.p.sse[j], 1e-12 * s.p.sseSingle));
  let best = -1;
  for (let j = 0; j < taus.length; j++) if (Number.isFinite(crit[j]) && (best < 0 || crit[j] < crit[best])) best = j;
  if (best < 0 || signals.length === 0) return null;
  const fit: Record<string, number | null> = { signals: signals.length, candidates: taus.length };
  const w = Array.from(crit, (c) => (Number.isFinite(c) ? Math.exp(-temper * (c - crit[best])) : 0));
  const total = w.reduce((a, b) => a + b, 0);
  const at = (q: number) => {
    let acc = 0;
    for (let j = 0; j < taus.length; j++) {
      acc += w[j];
      if (acc >= q * total) return j;
    }
    return taus.length - 1;
  };
  const jMed = at(0.5);
  const tau = taus[jMed];
  let lr = 0;
  let bending = 0;
  for (const s of signals) {
    const lrS = s.p.n * Math.log(s.p.sseSingle / Math.max(s.p.sse[jMed], 1e-12 * s.p.sseSingle));
    fit[`${s.name}LikelihoodRatio`] = lrS;
    lr += lrS;
    if (lrS >= 4) bending++;
  }
  const vo2At = vo2AtTime(series, tau);
  const lowS = taus[at(0.1)];
  const highS = taus[at(0.9)];
  const widthFraction = (vo2AtTime(series, highS) - vo2AtTime(series, lowS)) / vo2At;
  Object.assign(fit, {
    breakS: tau,
    breakVo2: vo2At,
    minimumS: taus[best],
    profileLowS: lowS,
    profileHighS: highS,
    profileWidthFraction: widthFraction,
    likelihoodRatio: lr,
    signalsBending: bending,
  });
  return { tau, vo2At, lowS, highS, widthFraction, lr, bending, fit };
}

/** Candidate break times on a `stepS` grid, leaving at least `m` bins on each side (both joint profiles). */
export function candidateBreakTimes(series: ThresholdSeries, win: number[], m: number, stepS: number): number[] {
  const tFirst = series.timeS[win[m - 1]];
  const tLast = series.timeS[win[win.length - m]];
  const taus: number[] = [];
  for (let t = tFirst; t <= tLast + 1e-9; t += stepS) taus.push(t);
  if (taus.length < 2) taus.push(tLast);
  return taus;
}
