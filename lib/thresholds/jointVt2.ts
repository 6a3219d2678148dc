import { buildMethodEstimate, seriesWindow } from "./consensus";
import { exponentialOnsetProfile, EXPONENTIAL_ONSET_SIGMAS_MIN } from "./exponentialOnsetProfile";
import { candidateBreakTimes, segmentedProfile, summariseJointProfile, takeShapeWithPenalty } from "./jointVt1";
import type { MethodEstimate, MethodQuality, ThresholdSeries } from "./thresholdTypes";

export interface JointVt2Options {
  /** First time included, s. @default series.span.startS */
  startS?: number;
  /** Fewest bins each side of a candidate break. @default 3 */
  minPointsEachSide?: number;
  /** Step of the candidate break times, s. @default 5 */
  stepS?: number;
  /** Least joint likelihood-ratio statistic (−2 log Λ summed over signals) for a call (our choice). @default 4 */
  minLr?: number;
  /** Temper of the profile weights exp(−temperature·ΔL) (our choice, as for VT1). @default 0.5 */
  temperature?: number;
  /**
   * PETCO2 enters from this fraction of the analysed span: it rises in early exercise while VD/VT falls and is
   * near flat during isocapnic buffering, so a straight line below the break only holds later in the test (our
   * choice; a line from the ramp start put the break early on both synthetic models). @default 0.3
   */
  petco2FromFraction?: number;
  /**
   * Let VE depart from its line in VCO2 as an exponential in time above the break (`exponentialOnsetProfile` with VCO2
   * as the line's regressor) when that beats the straight hinge by more than this many log-likelihood units (our
   * choice, as for VT1); null = straight hinge only. PETCO2 keeps its straight hinge. @default 4
   */
  exponentialOnsetPenalty?: number | null;
}

/**
 * VT2 (respiratory compensation point) by a joint profile likelihood over break times (our implementation
 * choice, source `vt-joint-profile-choice`, on the multisegment regression of Orr et al. 1982, confirmed). One
 * break time τ is shared by two signals of the respiratory compensation: VE rising out of proportion to VCO2
 * (VE = a + b·VCO2 + d·max(0, t − τ), d > 0: the VE-against-VCO2 break of Beaver, Wasserman & Whipp 1986,
 * confirmed, written in time so it can be pooled) and PETCO2 starting to fall (line in time plus a falling hinge;
 * recalled practice, `vt-rcp-criteria-recalled`). VE may instead depart from its line as A·(e^((t − τ)/σ) − 1)₊
 * (`exponentialOnsetPenalty`): the compensation follows the metabolic acidosis (recalled physiology), and blood lactate
 * rises as a continuous exponential in ramp exercise (Hughson, Weisiger & Swanson 1987, confirmed abstract); a straight
 * line fitted over such a convex rise meets the lower line after the onset, not at it. Criterion
 * L(τ) = Σ_s (n_s/2)·log SSE_s(τ) on a 5-s grid (each signal its own noise variance; prefix sums); value = median of
 * the tempered profile weights exp(−½ ΔL), VO2 from the VO2 trend. Verdict from the likelihood ratio against no break, the signals that bend and the profile's
 * 10–90 % width. Pooling two noisy signals calls the RCP where each alone is too weak. O(n + K log n) per signal.
 */
export function jointVt2(series: ThresholdSeries, options: JointVt2Options = {}): MethodEstimate {
  const startS = options.startS ?? series.span.startS;
  const step = options.stepS ?? 5;
  const minLr = options.minLr ?? 4;
  const temper = options.temperature ?? 0.5;
  const win = seriesWindow(series, startS, series.span.endS).filter(
    (i) => Number.isFinite(series.veLMin[i]) && Number.isFinite(series.vco2MlMin[i]),
  );
  const m = options.minPointsEachSide ?? 3;
  const window = { startS, endS: series.span.endS };
  const base = {
    id: "vt2-joint-profile",
    which: "vt2" as const,
    label: "Joint profile: one break time shared by VE against VCO2 and PETCO2",
    series,
    window,
    sourceIds: [
      "vt-joint-profile-choice",
      "orr-1982-multisegment",
      "beaver-1986-v-slope",
      "vt-rcp-criteria-recalled",
      "hughson-1987-lactate-continuous",
      "vt-implementation-choice",
    ],
  };
  if (win.length < 2 * m + 3) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { points: win.length },
      quality: "failed",
      reasons: [`not determinable: only ${win.length} bins of VE and VCO2 (need ${2 * m + 3})`],
    });
  }
  const taus = candidateBreakTimes(series, win, m, step);
  const t0 = series.timeS[win[0]];
  const minutes = (i: number) => (series.timeS[i] - t0) / 60;
  const penExp = options.exponentialOnsetPenalty === undefined ? 4 : options.exponentialOnsetPenalty;
  const signals: { name: string; p: ReturnType<typeof segmentedProfile> }[] = [];
  // candidates where VE took the exponential departure
  const veExponential = new Uint8Array(taus.length);
  {
    const t = win.map((i) => series.timeS[i]);
    const ve = win.map((i) => series.veLMin[i]);
    const vco2L = win.map((i) => series.vco2MlMin[i] / 1000);
    const p = segmentedProfile(t, ve, [win.map(() => 1), vco2L], null, taus, "positive");
    if (penExp !== null)
      takeShapeWithPenalty(
        p,
        exponentialOnsetProfile(t, ve, taus, EXPONENTIAL_ONSET_SIGMAS_MIN, vco2L).sse,
        penExp,
        veExponential,
        1,
      );
    signals.push({ name: "ve", p });
  }
  const petFrom = startS + (options.petco2FromFraction ?? 0.3) * (series.span.endS - startS);
  const cIdx = win.filter((i) => Number.isFinite(series.petco2MmHg[i]) && series.timeS[i] >= petFrom);
  if (cIdx.length >= 2 * m + 3) {
    const p = segmentedProfile(
      cIdx.map((i) => series.timeS[i]),
      cIdx.map((i) => series.petco2MmHg[i]),
      [cIdx.map(() => 1), cIdx.map(minutes)],
      null,
      taus,
      "negative",
    );
    // PETCO2 keeps the straight hinge: an exponential fall fitted to it moved VT2 on noise (README-thresholds, round 13)
    signals.push({ name: "petco2", p });
  }
  const used = signals.filter((s) => s.p.sseSingle > 0 && Number.isFinite(s.p.sseSingle));
  const summary = summariseJointProfile(used, taus, temper, series);
  if (!summary) {
    return buildMethodEstimate({
      ...base,
      vo2MlMin: null,
      timeS: null,
      fit: { signals: used.length, candidates: taus.length },
      quality: "failed",
      reasons: ["not determinable: no signal with a usable two-segment fit"],
    });
  }
  const { tau, vo2At, lowS, highS, widthFraction, lr, bending, fit } = summary;
  const veExponentialAtTau = veExponential[Math.max(0, taus.indexOf(tau))];
  fit.veExponentialAbove = veExponentialAtTau;
  const reasons: string[] = [];
  let quality: MethodQuality;
  if (!(lr >= minLr)) {
    quality = "failed";
    reasons.push(
      `not determinable: no shared respiratory compensation (joint likelihood ratio ${lr.toFixed(1)} < ${minLr}; ${bending} of ${used.length} signals bend)`,
    );
  } else {
    reasons.push(
      `${bending} of ${used.length} signals show the compensation at ${Math.round(tau)} s (joint likelihood ratio ${lr.toFixed(1)}); profile 10–90 % ${Math.round(lowS)}–${Math.round(highS)} s`,
    );
    if (veExponentialAtTau === 1)
      reasons.push("VE departs exponentially from its line in VCO2 above the break (fitted as an exponential)");
    quality = bending >= 2 && widthFraction <= 0.1 ? "good" : bending >= 1 && widthFraction <= 0.25 ? "fair" : "poor";
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
