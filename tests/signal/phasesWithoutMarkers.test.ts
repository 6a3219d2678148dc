import { describe, expect, it } from "vitest";
import type { BreathTable } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";
import {
  crossCheckSpec,
  generateCrossCheckTest,
  generateSyntheticTest,
  generateVariantTest,
  syntheticBank,
  variantSpec,
} from "../../lib/synthetic";

// Files without a phase column (many exports have none) must give the same incremental phase as the phase markers.
// Checked on both synthetic models (INVENTED data, phases known by construction): the exercise span found from the
// load alone against the one from the markers.
const strip = (t: BreathTable): BreathTable => ({
  ...t,
  rows: t.rows.map(({ phase: _phase, ...r }) => r),
  fields: t.fields.filter((f) => f !== "phase"),
});

describe("phases from the load alone match the phase markers", () => {
  it("main model, 40 tests (warm-up loads 0–20 W): exercise start within 6 s, end within 3 s, in every test", () => {
    for (const c of syntheticBank(40, { seed: 2024, noiseLevels: ["moderate"] })) {
      const syn = generateSyntheticTest(c.spec, c.seed);
      const marked = conditionTable(syn.table).exercise!;
      const fromLoad = conditionTable(strip(syn.table)).exercise!;
      expect(Math.abs(fromLoad.startS - marked.startS)).toBeLessThanOrEqual(6);
      expect(Math.abs(fromLoad.endS - marked.endS)).toBeLessThanOrEqual(3);
    }
  });

  it("variant model, 40 tests: ramps start within 10 s (whole-watt loads from 0 W); 1-min steps whose first step is 0 W within 65 s", () => {
    for (let i = 0; i < 40; i++) {
      const spec = variantSpec(i, 2024, ["moderate"]);
      const syn = generateVariantTest(spec, 5000 + i);
      const marked = conditionTable(syn.table).exercise!;
      const fromLoad = conditionTable(strip(syn.table)).exercise!;
      const d = fromLoad.startS - marked.startS;
      // a first step at 0 W cannot be told from unloaded pedalling by the load: the ramp is seen one step later
      expect(d).toBeGreaterThanOrEqual(-3);
      expect(d).toBeLessThanOrEqual(spec.protocol === "steps" ? 65 : 10);
      expect(Math.abs(fromLoad.endS - marked.endS)).toBeLessThanOrEqual(5);
    }
  });

  it("treadmill tests of the cross-check model (written blind): the walking warm-up is not exercise", () => {
    // 39 treadmill tests among the first 120 cross-check specs (seed 53; INVENTED data): walking or running ramps and
    // stages after a walking warm-up at 0 % grade. Speed alone put the start at the warm-up in most of them (3 of 39
    // within 15 s of the markers, median 149 s early); the ACSM walking cost of speed and grade together, a first rise
    // that is a step, and a warm-up told from a first stage by the rise out of it find it (33 of 39 within 15 s, median
    // 0 s). Some stepped tests still read a warm-up as long as a stage, with an ordinary first step, as the first stage.
    const d: number[] = [];
    for (let i = 0; i < 120; i++) {
      const syn = generateCrossCheckTest(crossCheckSpec(i, 53, ["moderate"]), 53 + i);
      if (syn.table.rows.some((r) => (r.workW ?? 0) > 1)) continue;
      const marked = conditionTable(syn.table).exercise!;
      const fromLoad = conditionTable(strip(syn.table)).exercise!;
      d.push(Math.abs(fromLoad.startS - marked.startS));
    }
    d.sort((a, b) => a - b);
    expect(d.length).toBe(39);
    expect(d.filter((x) => x <= 15).length).toBeGreaterThanOrEqual(31); // our regression bound at the level reached (33)
    expect(d[Math.floor(d.length / 2)]).toBeLessThanOrEqual(5);
  });
});

// Files with only time and gases (no markers, no work rate, speed or grade): the exercise phase from the course of VO2.
const bare = (t: BreathTable): BreathTable => {
  const drop = new Set(["phase", "workW", "speedKmh", "gradePct"]);
  return {
    ...t,
    rows: t.rows.map((r) => Object.fromEntries(Object.entries(r).filter(([k]) => !drop.has(k))) as BreathTable["rows"][number]),
    fields: t.fields.filter((f) => !drop.has(f)),
  };
};

describe("phases from VO2 when the file has no markers and no load", () => {
  it("noise-free by construction: rest, warm-up plateau, ramp and recovery are found at their breaks", () => {
    // INVENTED: breaths every 3 s; rest 300 mL/min to 180 s, warm-up 600 mL/min from 180 to 360 s, then a straight rise of
    // 4 mL/min per s to 2 700 mL/min at 885 s, then recovery falling back to 700 mL/min
    const rows: BreathTable["rows"] = [];
    for (let t = 0; t <= 1200; t += 3) {
      const vo2 = t < 180 ? 300 : t <= 360 ? 600 : t <= 885 ? 600 + 4 * (t - 360) : Math.max(700, 2700 - 8 * (t - 885));
      rows.push({ timeS: t, vo2MlMin: vo2, vco2MlMin: 0.9 * vo2, veLMin: (0.9 * vo2 * 30) / 1000 });
    }
    const test = conditionTable({ rows, fields: ["timeS", "vo2MlMin", "vco2MlMin", "veLMin"] } as BreathTable);
    // the start is a bin time (10-s bins, centred 5 s into each bin); the end is the last breath of the highest 30-s mean
    // of bins, which straddles the peak: up to 15 s after it
    expect(Math.abs(test.exercise!.startS - 360)).toBeLessThanOrEqual(10);
    expect(test.exercise!.endS - 885).toBeGreaterThanOrEqual(0);
    expect(test.exercise!.endS - 885).toBeLessThanOrEqual(15);
    expect(test.phases.map((p) => p.phase)).toEqual(["rest", "exercise", "recovery"]);
    expect(test.phases.every((p) => p.source === "vo2")).toBe(true);
    expect(test.issues.some((i) => i.code === "phases-from-vo2" && i.severity === "warning")).toBe(true);
  });

  it("no rise of VO2: no phases, with the reason", () => {
    const rows: BreathTable["rows"] = [];
    for (let t = 0; t <= 600; t += 3) rows.push({ timeS: t, vo2MlMin: 300 + (t % 9), vco2MlMin: 270, veLMin: 9 });
    const test = conditionTable({ rows, fields: ["timeS", "vo2MlMin", "vco2MlMin", "veLMin"] } as BreathTable);
    expect(test.exercise).toBeNull();
    expect(test.issues.find((i) => i.code === "phases-not-found")?.message).toMatch(/does not rise 1\.5-fold/);
  });

  it("main model, 40 tests: start 0–70 s after the markers (VO2 lags the load), end within 70 s", () => {
    // measured: start −11 to +66 s (median +34), end −61 to +8 s (median −4)
    for (const c of syntheticBank(40, { seed: 2024, noiseLevels: ["moderate"] })) {
      const syn = generateSyntheticTest(c.spec, c.seed);
      const marked = conditionTable(syn.table).exercise!;
      const fromVo2 = conditionTable(bare(syn.table)).exercise!;
      expect(fromVo2.startS - marked.startS).toBeGreaterThanOrEqual(-15);
      expect(fromVo2.startS - marked.startS).toBeLessThanOrEqual(75);
      expect(Math.abs(fromVo2.endS - marked.endS)).toBeLessThanOrEqual(70);
    }
  });

  it("cross-check model (written blind), 120 tests of every group and protocol: start within 100 s in most", () => {
    // measured: 95 of 120 starts within ±100 s (median −2 s; stepped treadmill tests the widest), ends −70 to +39 s
    const d: number[] = [];
    for (let i = 0; i < 120; i++) {
      const syn = generateCrossCheckTest(crossCheckSpec(i, 53, ["moderate"]), 53 + i);
      const marked = conditionTable(syn.table).exercise!;
      const fromVo2 = conditionTable(bare(syn.table)).exercise!;
      d.push(Math.abs(fromVo2.startS - marked.startS));
      expect(Math.abs(fromVo2.endS - marked.endS)).toBeLessThanOrEqual(80);
    }
    expect(d.filter((x) => x <= 100).length).toBeGreaterThanOrEqual(90); // our regression bound at the level reached (95)
  });
});
