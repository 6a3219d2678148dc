import { describe, expect, it } from "vitest";
import type { BreathRow } from "../../lib/breath";
import { conditionTable, detectPhases } from "../../lib/signal";
import { syntheticSeries } from "../fixtures/layouts/syntheticSeries";

// INVENTED SYNTHETIC DATA with known phases: rest 0–180 s (0 W), warm-up 180–360 s (20 W), ramp 25 W/min
// 360–840 s, recovery from 840 s (0 W); breath times are whole seconds 2–3 s apart.
const series = syntheticSeries();
const noMarkers: BreathRow[] = series.map(({ phase: _phase, ...b }) => b);

describe("detectPhases from the work rate", () => {
  const d = detectPhases(Object.freeze(noMarkers));

  it("finds rest, warm-up, incremental and recovery at the built-in times (within one breath, ≤ 5 s)", () => {
    expect(d.phases.map((p) => p.phase)).toEqual(["rest", "warmup", "exercise", "recovery"]);
    const at = (phase: string) => d.phases.find((p) => p.phase === phase)!;
    expect(Math.abs(at("warmup").startS - 180)).toBeLessThanOrEqual(5);
    expect(Math.abs(at("exercise").startS - 360)).toBeLessThanOrEqual(5);
    expect(Math.abs(at("exercise").endS - 840)).toBeLessThanOrEqual(5);
    expect(Math.abs(at("recovery").startS - 840)).toBeLessThanOrEqual(5);
    expect(d.exercise).toEqual({ startS: at("exercise").startS, endS: at("exercise").endS });
  });

  it("ramp rate by regression = 25 W/min ± 1", () => {
    expect(Math.abs(d.rampRateWPerMin! - 25)).toBeLessThan(1);
  });

  it("a step protocol (+15 W every 60 s from 50 W) gives 15 ± 1 W/min", () => {
    const steps: BreathRow[] = [];
    for (let t = 0; t <= 900; t += 2) {
      const w = t < 120 ? 0 : t < 300 ? 50 : t < 840 ? 50 + 15 * (1 + Math.floor((t - 300) / 60)) : 0;
      steps.push({ timeS: t, workW: w, vo2MlMin: 500 + 10 * w });
    }
    const s = detectPhases(steps);
    expect(s.phases.map((p) => p.phase)).toEqual(["rest", "warmup", "exercise", "recovery"]);
    expect(Math.abs(s.rampRateWPerMin! - 15)).toBeLessThan(1);
    expect(s.exercise!.startS).toBe(300);
  });

  it("a breath straddling the rest-to-warm-up change (half load) does not hide the warm-up", () => {
    // INVENTED: rest 0 W to 180 s, warm-up 7 W to 360 s, ramp 13 W/min, breaths every 3 s; the breath at 180 s
    // carries 3.5 W (time-averaged over the change), as a cart's breath-averaged load does.
    const rows: BreathRow[] = [];
    for (let t = 0; t <= 1200; t += 3) {
      const w = t < 180 ? 0 : t === 180 ? 3.5 : t < 360 ? 7 : t <= 1100 ? 7 + (13 * (t - 360)) / 60 : 0;
      rows.push({ timeS: t, workW: w, vo2MlMin: 400 + 10 * w });
    }
    const s = detectPhases(rows);
    expect(s.phases.map((p) => p.phase)).toEqual(["rest", "warmup", "exercise", "recovery"]);
    // built-in ramp onset 360 s; breaths are 3 s apart, so within one breath
    expect(Math.abs(s.exercise!.startS - 360)).toBeLessThanOrEqual(3);
  });

  it("a slow ramp with whole-watt loads starts where the ramp extrapolates to the warm-up load", () => {
    // INVENTED: warm-up 10 W from 120 s, ramp 10 W/min from 300 s, loads rounded to whole watts (a 1-W step takes
    // 6 s, so "first breath above the warm-up load" alone would be about 6 s late); breaths every 2 s.
    const rows: BreathRow[] = [];
    for (let t = 0; t <= 1000; t += 2) {
      const w = t < 120 ? 0 : t < 300 ? 10 : t <= 960 ? Math.round(10 + (10 * (t - 300)) / 60) : 0;
      rows.push({ timeS: t, workW: w, vo2MlMin: 400 + 10 * w });
    }
    const s = detectPhases(rows);
    expect(Math.abs(s.exercise!.startS - 300)).toBeLessThanOrEqual(4);
    expect(Math.abs(s.rampRateWPerMin! - 10)).toBeLessThan(0.2);
  });

  it("a ramp straight from 0 W (unloaded pedalling at zero load) starts where it extrapolates back to 0 W", () => {
    // INVENTED: 0 W to 400 s, then 15 W/min rounded down to whole watts (1 W only 4 s after the onset, 2 W after 8 s);
    // breaths every 3 s from 1 s.
    const rows: BreathRow[] = [];
    for (let t = 1; t <= 1100; t += 3) {
      const w = t < 400 || t > 1000 ? 0 : Math.floor((15 * (t - 400)) / 60);
      rows.push({ timeS: t, workW: w, vo2MlMin: 400 + 10 * w });
    }
    const s = detectPhases(rows);
    expect(s.phases.map((p) => p.phase)).toEqual(["rest", "exercise", "recovery"]);
    // the first breath with 2 W (> the 1-W zero-load limit) is at 409 s; the extrapolated onset is within two breaths of 400 s
    expect(s.exercise!.startS).toBeGreaterThanOrEqual(400);
    expect(s.exercise!.startS).toBeLessThanOrEqual(406);
    expect(s.phases[0].endS).toBe(s.exercise!.startS);
  });

  it("treadmill speed steps: phases found, no ramp rate in watts", () => {
    const rows: BreathRow[] = [];
    for (let t = 0; t <= 720; t += 3)
      rows.push({ timeS: t, speedKmh: t < 120 ? 0 : t < 660 ? 4 + Math.floor((t - 120) / 60) : 0, vo2MlMin: 1000 });
    const s = detectPhases(rows);
    expect(s.phases.map((p) => p.phase)).toEqual(["rest", "exercise", "recovery"]);
    expect(s.rampRateWPerMin).toBeNull();
  });

  it("no load and no markers: the exercise span from the course of VO2, with a warning", () => {
    // VO2 here is the load delayed by exactly 30 s (by construction), so the span it shows is 390–870 s
    const s = detectPhases(series.map((b) => ({ timeS: b.timeS, vo2MlMin: b.vo2MlMin })));
    expect(Math.abs(s.exercise!.startS - 390)).toBeLessThanOrEqual(10);
    expect(Math.abs(s.exercise!.endS - 870)).toBeLessThanOrEqual(10);
    expect(s.rampRateWPerMin).toBeNull();
    expect(s.issues[0]).toMatchObject({ code: "phases-from-vo2", severity: "warning" });
  });
});

describe("phases from markers and the whole conditioning pass", () => {
  it("markers win over the work rate", () => {
    const d = detectPhases(series);
    expect(d.phases[0].source).toBe("markers");
    expect(d.exercise).toEqual({ startS: 361, endS: 837 }); // first/last breath marked "exercise"
  });

  it("conditionTable records its settings and carries the averaging label", () => {
    const c = conditionTable(
      { shape: "breath", rows: series, fields: ["timeS", "vo2MlMin"] },
      { averaging: { kind: "time-bin", seconds: 30, label: "30-s time bins" }, artefacts: { k: 3 } },
    );
    expect(c.settings).toEqual({
      averaging: { kind: "time-bin", seconds: 30, label: "30-s time bins" },
      artefacts: { k: 3, halfWindow: 5, fields: ["vo2MlMin", "vco2MlMin", "veLMin"], centre: "mean", enabled: true },
      rer: { min: 0.5, max: 2 },
    });
    expect(c.averaging.label).toBe("30-s time bins");
    // 30-s bins aligned at 0 s, one per bin that holds breaths: floor(last time / 30) + 1
    const last = series[series.length - 1].timeS;
    expect(c.averaged.length).toBe(Math.floor(last / 30) + 1);
    expect(Math.abs(c.rampRateWPerMin! - 25)).toBeLessThan(1);
  });
});

describe("an exercise phase set by review", () => {
  // the same invented series: rest 0–180 s, warm-up 180–360 s at 20 W, ramp 25 W/min 360–840 s, recovery
  it("replaces the detected span, keeps the warm-up before it, and gives the ramp rate over it", () => {
    const s = detectPhases(noMarkers, { exerciseSpan: { startS: 400, endS: 800, reason: "ramp start read off the chart" } });
    expect(s.exercise).toEqual({ startS: 400, endS: 800 });
    // the detected rest and warm-up keep their own breath times (the first breaths at or after 180 and 360 s)
    const auto = detectPhases(noMarkers).phases;
    expect(s.phases.map((p) => [p.phase, p.startS, p.endS, p.source])).toEqual([
      ["rest", 0, auto[0].endS, "work-rate"],
      ["warmup", auto[1].startS, auto[1].endS, "work-rate"],
      ["exercise", 400, 800, "reviewer"],
      ["recovery", 800, noMarkers[noMarkers.length - 1].timeS, "reviewer"],
    ]);
    expect(auto[1].endS).toBeLessThan(400);
    // work = 20 + 25·(t − 360)/60 over 400–800 s: a straight line, so the OLS rate is exactly 25 W/min
    expect(s.rampRateWPerMin).toBeCloseTo(25, 1);
    expect(s.issues.find((i) => i.code === "exercise-span-by-review")?.message).toMatch(/ramp start read off the chart/);
  });

  it("on a file with no load and no markers it stands in for the VO2 estimate", () => {
    const s = detectPhases(
      series.map((b) => ({ timeS: b.timeS, vo2MlMin: b.vo2MlMin })),
      { exerciseSpan: { startS: 360, endS: 840, reason: "from the test log" } },
    );
    expect(s.exercise).toEqual({ startS: 360, endS: 840 });
    expect(s.issues.map((i) => i.code)).toEqual(["exercise-span-by-review"]);
  });

  it("a span outside the record or ending before it starts is refused, with a warning, and detection stands", () => {
    const auto = detectPhases(noMarkers);
    for (const bad of [
      { startS: 500, endS: 400, reason: "swapped" },
      { startS: 300, endS: 5000, reason: "past the end" },
      { startS: Number.NaN, endS: 600, reason: "empty" },
    ]) {
      const s = detectPhases(noMarkers, { exerciseSpan: bad });
      expect(s.exercise).toEqual(auto.exercise);
      expect(s.issues.some((i) => i.code === "exercise-span-refused" && i.severity === "warning")).toBe(true);
    }
  });
});
