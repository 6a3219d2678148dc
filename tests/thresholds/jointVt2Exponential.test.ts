import { describe, it, expect } from "vitest";
import { jointVt2 } from "../../lib/thresholds/jointVt2";
import { exponentialOnsetProfile } from "../../lib/thresholds/exponentialOnsetProfile";
import { argmin, bruteSse } from "./profileFitHelpers";
import { handBuiltSeries } from "./handBuiltSeries";

// Hand-built ramp (invented numbers, answers known by construction): 20-s bins 0–720 s, VO2 = 800 + 2.5·t and
// VCO2 = 700 + 2.8·t mL/min, VE = 2 + 25·VCO2(L/min) L/min below the compensation; from 480 s VE departs from that
// line as 4·(e^((t − 480)/84) − 1) L/min (σ = 1.4 min, on the grid). PETCO2 missing, so VE alone carries the break.
const timeS = Float64Array.from({ length: 37 }, (_, i) => 20 * i);
const vo2 = timeS.map((t) => 800 + 2.5 * t);
const vco2 = timeS.map((t) => 700 + 2.8 * t);
const excess = (t: number) => 4 * Math.max(0, Math.exp((t - 480) / 84) - 1);
const ve = timeS.map((t, i) => 2 + 0.025 * vco2[i] + excess(t));
const series = handBuiltSeries({ timeS, vo2MlMin: vo2, vco2MlMin: vco2, veLMin: ve });

describe("VT2 joint profile: an exponential departure of VE from its line in VCO2", () => {
  it("finds the onset at 480 s (VO2 2000 mL/min); straight hinges alone put it later, inside the curve", () => {
    const withExp = jointVt2(series);
    expect(withExp.quality).not.toBe("failed");
    expect(withExp.timeS).toBe(480);
    expect(withExp.vo2MlMin.value).toBeCloseTo(2000, 6);
    expect(withExp.fit.veExponentialAbove).toBe(1);
    expect(withExp.reasons.join(" ")).toMatch(/VE departs? exponentially/);
    const straight = jointVt2(series, { exponentialOnsetPenalty: null });
    // a line fitted above a convex rise meets the lower line after the onset (measured 585 s, 105 s late)
    expect(straight.timeS!).toBeGreaterThanOrEqual(560);
  });

  it("a straight compensation (a corner in VE against VCO2) keeps the straight hinge and its break", () => {
    const veCorner = timeS.map((t, i) => 2 + 0.025 * vco2[i] + 0.03 * Math.max(0, t - 480));
    const m = jointVt2(handBuiltSeries({ timeS, vo2MlMin: vo2, vco2MlMin: vco2, veLMin: veCorner }));
    expect(m.timeS).toBe(480);
  });
});

describe("exponentialOnsetProfile with its own line regressor z", () => {
  it("y = 1 + 0.03·z + exponential in time: zero SSE and minimum at the onset; equals an independent solve", () => {
    const t = Array.from(timeS);
    const z = t.map((s) => 700 + 2.8 * s + 0.002 * s * s); // a curving regressor: the line is in z, not in time
    const x = (s: number) => s / 60;
    const y = t.map((s, i) => 1 + 0.03 * z[i] + 2 * Math.max(0, Math.exp((x(s) - x(400)) / 2) - 1));
    const taus = Array.from({ length: 41 }, (_, i) => 200 + 10 * i);
    const p = exponentialOnsetProfile(t, y, taus, undefined, z);
    expect(taus[argmin(p.sse)]).toBe(400);
    expect(p.sse[taus.indexOf(400)]).toBeLessThan(1e-8);
    for (const tau of [300, 450, 520]) {
      const j = taus.indexOf(tau);
      const h = t.map((s) => Math.max(0, Math.exp((x(s) - x(tau)) / p.sigmaMin[j]) - 1));
      const fit = bruteSse([t.map(() => 1), z, h], y);
      expect(p.sse[j] / fit.sse, `τ = ${tau} s`).toBeCloseTo(1, 6);
    }
  });
});
