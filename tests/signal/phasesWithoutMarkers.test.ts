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
