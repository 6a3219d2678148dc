import { describe, it, expect } from "vitest";
import { argmin, bruteSse } from "./profileFitHelpers";
import { exponentialOnsetProfile } from "../../lib/thresholds/exponentialOnsetProfile";
import { segmentedProfile } from "../../lib/thresholds/jointVt1";

// Shapes built by hand (invented numbers), answers known by construction. x = minutes from the first point.
const t = Array.from({ length: 41 }, (_, i) => 100 + 15 * i); // 100 … 700 s
const taus = Array.from({ length: 61 }, (_, i) => 200 + 5 * i); // 200 … 500 s, an even grid
const x = (s: number) => (s - t[0]) / 60;

describe("exponentialOnsetProfile", () => {
  it("an exponential rise from 400 s (y = 2 + 0.5x + 3(e^((x − a)/1.4) − 1)₊, σ on the grid): zero SSE at 400 s, its minimum, σ recovered", () => {
    const a = x(400);
    const y = t.map((s) => 2 + 0.5 * x(s) + 3 * Math.max(0, Math.exp((x(s) - a) / 1.4) - 1));
    const p = exponentialOnsetProfile(t, y, taus);
    const j = taus.indexOf(400);
    expect(p.sse[j]).toBeLessThan(1e-9);
    expect(taus[argmin(p.sse)]).toBe(400);
    expect(p.sigmaMin[j]).toBe(1.4);
  });

  it("a straight hinge is the limit of a slow exponential: near-zero SSE at its break with the largest σ", () => {
    // y = 1 + x + 2(x − a)₊ with 5.8 min above the break; A(e^(u/8) − 1) departs from a straight rise by about u/16
    // relative (≈ 36 % of the rise at the top before refitting), so the fit is close but not exact: it leaves under
    // 5 % of what the line alone leaves (measured 4.1 %).
    const y = t.map((s) => 1 + x(s) + 2 * Math.max(0, x(s) - x(350)));
    const p = exponentialOnsetProfile(t, y, taus);
    const h = segmentedProfile(t, y, [t.map(() => 1), t.map(x)], null, [200], "positive");
    const j = taus.indexOf(350);
    expect(p.sigmaMin[j]).toBe(8);
    expect(p.sse[j]).toBeLessThan(0.05 * h.sseSingle);
  });

  it("matches an independent least-squares solve at every σ it reports, for several candidates, on data with a zig-zag", () => {
    const y = t.map((s, i) => 5 + 0.8 * x(s) + 2 * Math.max(0, Math.exp((x(s) - x(380)) / 2) - 1) + (i % 2 === 0 ? 0.3 : -0.3));
    const p = exponentialOnsetProfile(t, y, taus);
    for (const tau of [260, 330, 380, 455]) {
      const j = taus.indexOf(tau);
      const sigma = p.sigmaMin[j];
      expect(Number.isFinite(sigma), `τ = ${tau} s`).toBe(true);
      const h = t.map((s) => Math.max(0, Math.exp((x(s) - x(tau)) / sigma) - 1));
      const fit = bruteSse([t.map(() => 1), t.map(x), h], y);
      expect(fit.beta[2], `τ = ${tau} s`).toBeGreaterThan(0);
      expect(p.sse[j] / fit.sse, `τ = ${tau} s`).toBeCloseTo(1, 8);
    }
  });

  it("an uneven candidate grid gives the same profile as the even one at the shared candidates", () => {
    const y = t.map((s) => 2 + 0.5 * x(s) + 3 * Math.max(0, Math.exp((x(s) - x(400)) / 2) - 1) + Math.sin(s));
    const even = exponentialOnsetProfile(t, y, taus);
    const uneven = [200, 333, 400, 451, 500];
    const q = exponentialOnsetProfile(t, y, uneven);
    uneven.forEach((tau, k) => {
      const j = taus.indexOf(tau);
      if (j >= 0) expect(q.sse[k] / even.sse[j]).toBeCloseTo(1, 9);
    });
    expect(q.sse.every(Number.isFinite)).toBe(true);
  });

  it("a fall above the break (A < 0) has no exponential-rise fit", () => {
    const y = t.map((s) => 1 + x(s) - 2 * Math.max(0, Math.exp((x(s) - x(400)) / 2) - 1));
    const p = exponentialOnsetProfile(t, y, taus);
    expect(Number.isNaN(p.sse[taus.indexOf(400)])).toBe(true);
  });

  it("too few points: every candidate NaN", () => {
    expect(Array.from(exponentialOnsetProfile([1, 2, 3, 4, 5], [1, 2, 3, 4, 5], [2, 3]).sse).every(Number.isNaN)).toBe(true);
  });
});
