import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { convexOnsetProfile } from "../../lib/thresholds/convexOnsetProfile";
import { exponentialOnsetProfile } from "../../lib/thresholds/exponentialOnsetProfile";
import { fieldSeries } from "../../lib/thresholds/indexSeries";
import { segmentedProfile } from "../../lib/thresholds/jointVt1";

// The profiles walk their break index forward over ascending candidates and search again when a candidate steps back;
// fieldSeries reads each field once per rows array and cuts spans by binary search. Both must give exactly what the
// plain definitions give (invented data; the answers are the definitions themselves, run the slow way).

const t = Array.from({ length: 48 }, (_, i) => 300 + 20 * i + (i % 3)); // ascending, unevenly spaced
const y = t.map((s, i) => 10 + s / 60 + 3 * Math.max(0, Math.exp((s - 900) / 150) - 1) + ((i * 7919) % 13) / 13 - 0.5);
const ascending = Array.from({ length: 140 }, (_, i) => 360 + 5 * i);
// a permutation with steps back and repeats of a time
const shuffled = ascending.map((_, i) => ascending[(i * 37) % ascending.length]).concat([700, 700, 365]);

// `relative` 0: the same number; above 0: within that relative difference (a grid out of order is not even, so the
// exponential profile computes each e^((a − x_end)/σ) anew rather than by its running product: last digits differ).
function expectSameAtEachCandidate(run: (taus: number[]) => ArrayLike<number>, relative = 0): void {
  const whole = run(ascending);
  const mixed = run(shuffled);
  shuffled.forEach((tau, j) => {
    const a = whole[ascending.indexOf(tau)];
    const b = mixed[j];
    if (Number.isNaN(a)) expect(b, `τ = ${tau} s`).toBeNaN();
    else if (relative === 0) expect(b, `τ = ${tau} s`).toBe(a);
    else expect(Math.abs(b - a), `τ = ${tau} s`).toBeLessThanOrEqual(relative * Math.abs(a));
  });
}

describe("profiles over candidates in any order", () => {
  it("the exponential onset profile gives each candidate the same SSE whatever the order of the others (to 1e-9)", () => {
    expectSameAtEachCandidate((taus) => exponentialOnsetProfile(t, y, taus).sse, 1e-9);
  });

  it("the convex onset profile likewise", () => {
    expectSameAtEachCandidate((taus) => convexOnsetProfile(t, y, taus).sse);
  });

  it("the straight-hinge profile likewise", () => {
    const base = [t.map(() => 1), t.map((s) => (s - t[0]) / 60)];
    expectSameAtEachCandidate((taus) => segmentedProfile(t, y, base, null, taus, "positive").sse);
  });

  it("a candidate grid that is not even still gives the exponential profile's values (each e^((a − x_end)/σ) computed)", () => {
    const uneven = ascending.map((tau, i) => tau + (i % 4));
    const p = exponentialOnsetProfile(t, y, uneven);
    const single = (tau: number) => exponentialOnsetProfile(t, y, [tau]).sse[0];
    for (const j of [3, 40, 77, 120]) expect(p.sse[j]).toBeCloseTo(single(uneven[j]), 9);
  });
});

describe("fieldSeries", () => {
  const naive = (rows: BreathRow[], span?: { startS: number; endS: number }) => {
    const out = { t: [] as number[], v: [] as number[] };
    for (const r of rows) {
      if (span && (r.timeS < span.startS || r.timeS > span.endS)) continue;
      if (typeof r.vo2MlMin === "number" && Number.isFinite(r.vo2MlMin)) {
        out.t.push(r.timeS);
        out.v.push(r.vo2MlMin);
      }
    }
    return out;
  };
  const value = fc.oneof(fc.double({ min: 100, max: 4000, noNaN: true }), fc.constant(Number.NaN), fc.constant(undefined));
  const rowsArb = fc.array(fc.record({ dt: fc.integer({ min: -2, max: 6 }), v: value }), { maxLength: 60 }).map((spec) => {
    let time = 0;
    return spec.map(({ dt, v }) => ({ timeS: (time += dt), vo2MlMin: v }) as BreathRow);
  });
  const bound = fc.oneof(fc.integer({ min: -5, max: 200 }), fc.constant(Number.NaN));

  it("equals the plain scan, with or without a span, on rows in or out of time order, also when asked again", () => {
    fc.assert(
      fc.property(rowsArb, bound, bound, (rows, a, b) => {
        const span = { startS: a, endS: b };
        expect(fieldSeries(rows, "vo2MlMin", span)).toEqual(naive(rows, span));
        expect(fieldSeries(rows, "vo2MlMin")).toEqual(naive(rows));
        expect(fieldSeries(rows, "vo2MlMin", span)).toEqual(naive(rows, span));
      }),
      { seed: 20261204, numRuns: 400 },
    );
  });

  it("hands the caller its own arrays, and reads again when rows are added", () => {
    const rows = [10, 20, 30].map((timeS) => ({ timeS, vo2MlMin: timeS * 10 }) as BreathRow);
    const first = fieldSeries(rows, "vo2MlMin");
    first.v[0] = -1;
    first.t.length = 0;
    expect(fieldSeries(rows, "vo2MlMin")).toEqual({ t: [10, 20, 30], v: [100, 200, 300] });
    rows.push({ timeS: 40, vo2MlMin: 400 } as BreathRow);
    expect(fieldSeries(rows, "vo2MlMin", { startS: 25, endS: 50 })).toEqual({ t: [30, 40], v: [300, 400] });
  });
});
