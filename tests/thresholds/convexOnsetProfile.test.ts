import { describe, it, expect } from "vitest";
import { argmin, bruteSse } from "./profileFitHelpers";
import { convexOnsetProfile } from "../../lib/thresholds/convexOnsetProfile";
import { jointVt1, segmentedProfile } from "../../lib/thresholds/jointVt1";
import type { ThresholdSeries } from "../../lib/thresholds/thresholdTypes";
import { handBuiltSeries } from "./handBuiltSeries";

// Shapes built by hand (invented numbers), answers known by construction. x = minutes from the first point.
const t = Array.from({ length: 41 }, (_, i) => 100 + 15 * i); // 100 … 700 s
const taus = Array.from({ length: 61 }, (_, i) => 200 + 5 * i); // 200 … 500 s
const x = (s: number) => (s - t[0]) / 60;

describe("convexOnsetProfile", () => {
  it("a rise that starts at 400 s and steepens (y = 2 + 0.5x + 3(x − a)²₊): zero SSE at 400 s, its minimum", () => {
    const a = x(400);
    const y = t.map((s) => 2 + 0.5 * x(s) + 3 * Math.max(0, x(s) - a) ** 2);
    const p = convexOnsetProfile(t, y, taus);
    expect(p.sse[taus.indexOf(400)]).toBeLessThan(1e-9);
    expect(taus[argmin(p.sse)]).toBe(400);
  });

  it("a straight hinge is a curve with q = 0: zero SSE at its break, like the straight-hinge profile", () => {
    const y = t.map((s) => 1 + x(s) + 2 * Math.max(0, x(s) - x(350)));
    const c = convexOnsetProfile(t, y, taus);
    const h = segmentedProfile(t, y, [t.map(() => 1), t.map(x)], null, taus, "positive");
    const j = taus.indexOf(350);
    expect(c.sse[j]).toBeLessThan(1e-9);
    expect(h.sse[j]).toBeLessThan(1e-9);
  });

  it("matches an independent least-squares solve (with d = 0 where the free slope step is negative) and never exceeds the straight hinge", () => {
    // a curved rise plus a fixed zig-zag (deterministic 'noise', ±0.3)
    const y = t.map((s, i) => 5 + 0.8 * x(s) + 1.5 * Math.max(0, x(s) - x(380)) ** 2 + (i % 2 === 0 ? 0.3 : -0.3));
    const c = convexOnsetProfile(t, y, taus);
    const h = segmentedProfile(t, y, [t.map(() => 1), t.map(x)], null, taus, "positive");
    // The data curve upward (q = 1.5 > 0) above 380 s, so every candidate has a convex fit: either the free fit has
    // d ≥ 0 and q ≥ 0, or its slope step d is negative and the fit with d = 0 (line + curve only) has q ≥ 0. All four
    // candidates are compared with an independent solve, unconditionally (here 260, 330 and 380 s take the d = 0
    // branch — at 380 s the free d is only −0.005 — and 455 s takes the free fit), and none may be NaN.
    for (const tau of [260, 330, 380, 455]) {
      const j = taus.indexOf(tau);
      const h1 = t.map((s) => Math.max(0, x(s) - x(tau)));
      const h2 = h1.map((v) => v * v);
      const free = bruteSse([t.map(() => 1), t.map(x), h1, h2], y);
      const fit = free.beta[2] >= 0 ? free : bruteSse([t.map(() => 1), t.map(x), h2], y);
      const q = fit.beta[fit.beta.length - 1];
      expect(q, `τ = ${tau} s`).toBeGreaterThanOrEqual(0);
      expect(c.sse[j], `τ = ${tau} s`).toBeCloseTo(fit.sse, 6);
      expect(c.sse[j], `τ = ${tau} s`).toBeLessThanOrEqual(h.sse[j] + 1e-9);
    }
  });

  it("a rise that starts with zero slope (d < 0 unconstrained) is refitted with d = 0", () => {
    const y = t.map((s) => 1 + x(s) + Math.max(0, x(s) - x(300)) ** 2);
    const p = convexOnsetProfile(t, y, taus);
    expect(p.sse[taus.indexOf(300)]).toBeLessThan(1e-9);
  });

  it("a bend that flattens (concave above the break) has no convex fit", () => {
    const y = t.map((s) => 1 + x(s) - 2 * Math.max(0, x(s) - x(400)) ** 2);
    const p = convexOnsetProfile(t, y, taus);
    expect(Number.isNaN(p.sse[taus.indexOf(400)])).toBe(true);
  });

  it("too few points: every candidate NaN", () => {
    expect(Array.from(convexOnsetProfile([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], [2, 3]).sse).every(Number.isNaN)).toBe(true);
  });
});

describe("joint VT1 profile on a rise that steepens above the threshold", () => {
  // Noise-free binned series (invented): VO2 on a ramp; excess CO2, VE and PETO2 start to rise at 600 s along an
  // exponential with zero initial size and a small initial slope (blood lactate rising as a continuous exponential
  // above its threshold — Hughson et al. 1987, confirmed abstract). The straight hinge finds the bend where it is
  // steepest, later than its start.
  const timeS = Float64Array.from({ length: 50 }, (_, i) => 100 + 20 * i); // 100 … 1080 s
  const rise = (s: number) => Math.max(0, Math.exp((0.4 * (s - 600)) / 60) - 1); // e^3.2 − 1 ≈ 23.5 at 1080 s
  const vo2 = Float64Array.from(timeS, (s) => 900 + 3 * (s - 100));
  const vco2 = Float64Array.from(vo2, (v, i) => 0.9 * v + 25 * rise(timeS[i]));
  const series = handBuiltSeries({
    timeS,
    vo2MlMin: vo2,
    vco2MlMin: vco2,
    veLMin: Float64Array.from(vco2, (v, i) => 3 + (24 * v) / 1000 + 0.6 * rise(timeS[i])),
    peto2MmHg: Float64Array.from(timeS, (s) => 100 + 0.2 * rise(s)),
    petco2MmHg: new Float64Array(50).fill(40),
  });
  // window to 900 s, as below an RCP at about 860 s (a quadratic cannot follow an exponential over any length of ramp)
  const win = { endS: 900, excessCo2EndS: 900 };
  it("finds the start of the rise within 20 s with the exponential fit (default), and says so", () => {
    const r = jointVt1(series, win);
    expect(Math.abs(r.timeS! - 600)).toBeLessThanOrEqual(20);
    expect(r.reasons.join(" ")).toMatch(/rise exponentially above the break/);
  });
  it("finds it within 20 s with the curved fit alone (exponential off), and says so", () => {
    const r = jointVt1(series, { ...win, exponentialOnsetPenalty: null });
    expect(Math.abs(r.timeS! - 600)).toBeLessThanOrEqual(20);
    expect(r.reasons.join(" ")).toMatch(/rise curvilinearly above the break/);
  });
  it("straight hinges alone put it more than 60 s late", () => {
    const r = jointVt1(series, { ...win, curvedAbovePenalty: null, exponentialOnsetPenalty: null });
    expect(r.timeS! - 600).toBeGreaterThan(60);
  });
  it("leaves a sharp straight break where it is (within 5 s)", () => {
    const sharp: ThresholdSeries = {
      ...series,
      vco2MlMin: Float64Array.from(vo2, (v, i) => 0.9 * v + 0.4 * Math.max(0, vo2[i] - vo2[25])),
      veLMin: Float64Array.from(timeS, (s) => 20 + 0.02 * (s - 100) + 0.03 * Math.max(0, s - timeS[25])),
      peto2MmHg: Float64Array.from(timeS, (s) => 100 + 0.01 * Math.max(0, s - timeS[25])),
    };
    const r = jointVt1(sharp);
    expect(Math.abs(r.timeS! - timeS[25])).toBeLessThanOrEqual(5);
  });
});
