import { describe, expect, it } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { exerciseShareSetAside, rejectArtefacts } from "../../lib/signal";

/** Small deterministic generator (LCG, Numerical Recipes constants) so the noise is the same on every run. */
function lcg(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

// INVENTED SYNTHETIC DATA: 400 breaths 2.5 s apart, VO2 ramping 400 → 2400 mL/min with a deterministic
// breath-to-breath wobble (sum of sines, |wobble| ≤ 45 mL/min), RER 0.9, VE = 30·VCO2/1000; spikes of
// +1500 mL/min VO2 (and +1350 VCO2) injected at known breaths.
function series(spikes: number[]): BreathRow[] {
  const rows: BreathRow[] = [];
  for (let i = 0; i < 400; i++) {
    const vo2 = 400 + 5 * i + 30 * Math.sin(i * 2.1) + 15 * Math.cos(i * 0.7);
    const vco2 = 0.9 * vo2 + 10 * Math.sin(i * 1.3);
    rows.push({ timeS: i * 2.5, vo2MlMin: vo2, vco2MlMin: vco2, veLMin: (30 * vco2) / 1000, sourceRow: i + 2 });
  }
  for (const k of spikes) {
    rows[k] = { ...rows[k], vo2MlMin: rows[k].vo2MlMin! + 1500, vco2MlMin: rows[k].vco2MlMin! + 1350 };
  }
  return rows;
}

describe("rejectArtefacts (local mean ± k SD, convention counted by doi 10.1055/a-2495-5364)", () => {
  const spikes = [3, 57, 150, 151 + 20, 398];
  const rows = Object.freeze(series(spikes).map((r) => Object.freeze(r)));

  it("removes exactly the injected spikes, with reasons, and does not mutate the input", () => {
    const r = rejectArtefacts(rows);
    expect(r.removed.map((x) => x.index)).toEqual(spikes);
    expect(r.clean.length).toBe(400 - spikes.length);
    for (const x of r.removed) expect(x.reason).toMatch(/SD from the local mean .* of the 10 surrounding breaths \(limit 4 SD\)/);
    expect(r.removed[0].sourceRow).toBe(5);
  });

  it("k = 3 is stricter than k = 4 and still finds every spike", () => {
    const r3 = rejectArtefacts(rows, { rule: { k: 3 } });
    expect(r3.removed.length).toBeGreaterThanOrEqual(spikes.length);
    for (const k of spikes) expect(r3.removed.map((x) => x.index)).toContain(k);
  });

  it("median centre finds the same spikes", () => {
    expect(rejectArtefacts(rows, { rule: { centre: "median" } }).removed.map((x) => x.index)).toEqual(spikes);
  });

  it("hand arithmetic: one spike on a flat line of alternating 1000/1010", () => {
    // neighbours of breath 10 (5 each side): five 1000 and five 1010 → mean 1005, sample SD = √(10·25/9) = 5.27
    // 4 SD = 21.1: breath 10 at 1030 deviates 25 → removed; at 1025 it deviates 20 → kept
    const flat = (v: number): BreathRow[] =>
      Array.from({ length: 21 }, (_, i) => ({ timeS: i * 3, vo2MlMin: i === 10 ? v : i % 2 ? 1010 : 1000 }));
    expect(rejectArtefacts(flat(1030), { rule: { fields: ["vo2MlMin"] } }).removed.map((x) => x.index)).toEqual([10]);
    expect(rejectArtefacts(flat(1025), { rule: { fields: ["vo2MlMin"] } }).removed).toEqual([]);
  });

  it("RER outside 0.5–2 and impossible values are set aside (common practice screens)", () => {
    const rows2 = series([]);
    rows2[100] = { ...rows2[100], vco2MlMin: rows2[100].vo2MlMin! * 2.3 };
    rows2[200] = { ...rows2[200], vco2MlMin: rows2[200].vo2MlMin! * 0.4 };
    rows2[300] = { ...rows2[300], veLMin: 0 };
    const r = rejectArtefacts(rows2);
    expect(r.removed.map((x) => x.index)).toEqual([100, 200, 300]);
    expect(r.removed[0].reason).toMatch(/^RER 2\.30 is above 2/);
    expect(r.removed[1].reason).toMatch(/^RER 0\.40 is below 0\.5/);
    // 2 of the series' breaths: isolated artefacts, an info line (fewer than 3 and under 1 %, our split)
    const rerIssue = r.issues.find((i) => i.code === "rer-out-of-range");
    expect(rerIssue?.message).toMatch(/^2 isolated breath/);
    expect(rerIssue?.severity).toBe("info");
  });

  it("RER out of range in more than 1 % of the breaths (at least 3) is a warning with the share", () => {
    const rows2 = series([]);
    const bad = [50, 60, 70, 80, 90, 100, 110];
    for (const i of bad) rows2[i] = { ...rows2[i], vco2MlMin: rows2[i].vo2MlMin! * 2.5 };
    const r = rejectArtefacts(rows2);
    const rerIssue = r.issues.find((i) => i.code === "rer-out-of-range");
    expect(rows2.length * 0.01).toBeLessThan(bad.length); // the series is short enough that 7 breaths exceed 1 %
    expect(rerIssue?.severity).toBe("warning");
    expect(rerIssue?.message).toMatch(
      new RegExp(
        `^7 breath\\(s\\) with RER above 2 or below 0\\.5 were set aside \\(${((100 * 7) / rows2.length).toFixed(1).replace(".", "\\.")} % of breaths\\)`,
      ),
    );
  });

  it("with random (uniform) noise the small 10-breath SD estimate gives a few false removals, as expected of the rule", () => {
    // INVENTED: same ramp with uniform noise ±40 mL/min; the spikes are still all found, and the extra
    // removals stay rare (≤ 1 % of breaths) — the rule is a screen, not a statistical test (Liang 1996 caution)
    const rnd = lcg(42);
    const noisy: BreathRow[] = Array.from({ length: 400 }, (_, i) => {
      const vo2 = 400 + 5 * i + 80 * (rnd() - 0.5) + (spikes.includes(i) ? 1500 : 0);
      return { timeS: i * 2.5, vo2MlMin: vo2 };
    });
    const removed = rejectArtefacts(noisy, { rule: { fields: ["vo2MlMin"] } }).removed.map((x) => x.index);
    for (const k of spikes) expect(removed).toContain(k);
    expect(removed.length - spikes.length).toBeLessThanOrEqual(4);
  });

  it("stage tables: only the screens apply", () => {
    expect(rejectArtefacts(rows, { stageRows: true }).removed).toEqual([]);
  });
});

describe("spans set aside by review", () => {
  it("removes the gas values of exactly the breaths inside the span (ends included), keeps the rows, HR and load", () => {
    const rows = series([]).map((r, i) => ({ ...r, hrBpm: 80 + i / 4, workW: i / 2 }));
    // breaths 100..120 lie at 250.0..300.0 s (2.5 s apart)
    const r = rejectArtefacts(rows, { setAside: [{ startS: 250, endS: 300, reason: "mask leak on the log, by A. Reviewer" }] });
    expect(r.removed.map((x) => x.index)).toEqual(Array.from({ length: 21 }, (_, i) => 100 + i));
    expect(r.removed[0].reason).toBe("set aside by review (4:10–5:00): mask leak on the log, by A. Reviewer");
    expect(r.clean).toHaveLength(400);
    for (const row of r.clean.slice(100, 121)) {
      expect(row.vo2MlMin).toBeUndefined();
      expect(row.vco2MlMin).toBeUndefined();
      expect(row.veLMin).toBeUndefined();
      expect(row.hrBpm).toBeDefined();
      expect(row.workW).toBeDefined();
    }
    // the input rows are not changed
    expect(rows[110].vo2MlMin).toBeDefined();
    const info = r.issues.find((i) => i.code === "breaths-set-aside-by-review")!;
    expect(info.severity).toBe("info");
    expect(info.message).toBe(
      "The gas and ventilation values of 21 breath(s) from 4:10 to 5:00 were set aside by review: mask leak on the log, by A. Reviewer. Heart rate, SpO2 and the load there are kept.",
    );
  });

  it("a spike inside a set-aside span is set aside once, by review; one outside is still found by the rule", () => {
    const r = rejectArtefacts(series([110, 300]), { setAside: [{ startS: 250, endS: 300, reason: "cough run" }] });
    expect(r.removed.filter((x) => x.index === 110)).toHaveLength(1);
    expect(r.removed.find((x) => x.index === 110)!.reason).toMatch(/^set aside by review/);
    expect(r.removed.find((x) => x.index === 300)!.reason).toMatch(/lies .* SD from the local mean/);
  });

  it("a span inside one already set aside says so and adds nothing; an empty span is a warning", () => {
    const r = rejectArtefacts(series([]), {
      setAside: [
        { startS: 250, endS: 300, reason: "leak" },
        { startS: 260, endS: 270, reason: "the same leak" },
        { startS: 251, endS: 252, reason: "between two breaths" },
      ],
    });
    expect(r.removed).toHaveLength(21);
    const said = r.issues.filter((i) => i.code === "breaths-set-aside-by-review");
    expect(said[1].message).toBe("The span 4:20 to 4:30 lies within spans already set aside: nothing more was set aside.");
    expect(said[2].severity).toBe("warning");
    expect(said[2].message).toMatch(/holds no rows: nothing was set aside there\.$/);
  });
});

describe("exerciseShareSetAside", () => {
  it("counts overlapping spans once and clips them to the exercise phase (arithmetic by hand)", () => {
    const ex = { startS: 100, endS: 500 };
    // 150–250 and 200–300 → 150–300 (150 s); 450–600 → 450–500 (50 s); 0–50 outside: 200 of 400 s
    expect(
      exerciseShareSetAside(
        [
          { startS: 150, endS: 250 },
          { startS: 200, endS: 300 },
          { startS: 450, endS: 600 },
          { startS: 0, endS: 50 },
        ],
        ex,
      ),
    ).toBeCloseTo(0.5, 12);
    expect(
      exerciseShareSetAside(
        [
          { startS: 120, endS: 130 },
          { startS: 125, endS: 126 },
        ],
        ex,
      ),
    ).toBeCloseTo(10 / 400, 12);
    expect(exerciseShareSetAside([], ex)).toBe(0);
  });
});
