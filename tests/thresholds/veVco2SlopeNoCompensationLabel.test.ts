import { describe, it, expect } from "vitest";
import type { BreathTable } from "../../lib/breath/types";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest, SYNTHETIC_PRESETS } from "../../lib/synthetic";
import { slopeToVt2Name, veVco2Slope } from "../../lib/thresholds/veVco2Slope";

// Known by construction (invented data): the ventilatory-limitation preset (no RCP) with VE rewritten as an exact
// straight line of VCO2, VE = 3 + 30 × VCO2 (L/min), so VE/VCO2 falls to the end (no compensation) and every fit of
// VE on VCO2 — breath by breath or on bin means, over any range — has slope 30.0 and intercept 3.0. PETCO2 is flat at
// 38 mmHg and 38.6 mmHg in the last 20 s: the last 30-s mean lies above every 30-s window on the 10-s grid, so the
// fall from the highest window is 0, never negative.
function straightLineTest(vco2NoiseMlMin: number) {
  const spec = SYNTHETIC_PRESETS.find((p) => p.id === "ventilatory-limitation")!.spec;
  const syn = generateSyntheticTest({ ...spec, noise: "none" }, 3);
  const end = syn.table.rows[syn.table.rows.length - 1].timeS;
  let k = 0;
  const rows = syn.table.rows.map((r) => {
    // a fixed ±noise pattern on VCO2 only (the regressor), VE still on the noise-free line
    const vco2 = r.vco2MlMin;
    const noisy = vco2 === undefined ? undefined : vco2 + (k++ % 2 === 0 ? vco2NoiseMlMin : -vco2NoiseMlMin);
    return {
      ...r,
      vco2MlMin: noisy,
      veLMin: vco2 === undefined ? r.veLMin : 3 + (30 * vco2) / 1000,
      petco2MmHg: r.timeS > end - 20 ? 38.6 : 38,
    };
  });
  const fields = [...new Set([...syn.table.fields, "petco2MmHg" as const])];
  const table: BreathTable = { ...syn.table, rows, fields };
  return conditionTable(table);
}

function test0End(): number {
  return straightLineTest(0).exercise!.endS;
}

describe("VE/VCO2 slope below the RCP with no compensation: the label says what was fitted", () => {
  it("on an exact line, the slope below the RCP equals the whole-exercise slope (30.0) and the PETCO2 fall reads 0", () => {
    const r = veVco2Slope(straightLineTest(0), { vt2: null });
    const below = r.slopeToVt2.slope;
    expect(below.provenance.method).toBe("ve-vco2-slope-to-vt2-no-compensation");
    expect(below.value!).toBeCloseTo(30, 6);
    expect(r.slopeWholeExercise.slope.value!).toBeCloseTo(30, 6);
    expect(r.slopeToVt2.intercept.value!).toBeCloseTo(3, 6);
    expect(below.provenance.inputs?.petco2FallMmHg).toBe(0);
    // the name on screens, report and chart never says "to RCP" when no RCP was reached
    expect(slopeToVt2Name(r.slopeToVt2)).toBe(
      "VE/VCO2 slope, whole exercise on 20-s bin means (no respiratory compensation reached)",
    );
    // a bin length set by option is named as fitted, not as the default
    expect(slopeToVt2Name(veVco2Slope(straightLineTest(0), { vt2: null, toVt2BinS: 15 }).slopeToVt2)).toBe(
      "VE/VCO2 slope, whole exercise on 15-s bin means (no respiratory compensation reached)",
    );
    // with an RCP given, the same data are named "to RCP"
    const atRcp = veVco2Slope(straightLineTest(0), { vt2: { timeS: test0End() - 120, vo2MlMin: 1000 } });
    expect(slopeToVt2Name(atRcp.slopeToVt2)).toBe("VE/VCO2 slope, start of exercise to RCP");
    expect(below.provenance.label).toContain("PETCO2 in the last 30 s not below its highest 30-s mean");
    expect(below.provenance.label).not.toMatch(/-\d+(\.\d+)? mmHg/);
  });

  it("with breath noise on VCO2, the two differ and the label names the window and the 20-s bins", () => {
    const test = straightLineTest(150);
    const r = veVco2Slope(test, { vt2: null });
    const below = r.slopeToVt2.slope;
    const span = test.exercise!;
    // bins: 20-s bins from the start of exercise to the last breath, all holding breaths
    const nBins = Math.ceil((span.endS - span.startS) / 20);
    expect(below.provenance.label).toContain(`whole exercise phase (${Math.round(span.startS)}-${Math.round(span.endS)} s)`);
    expect(below.provenance.label).toMatch(
      new RegExp(`on 20-s time-bin means of the breaths \\((${nBins - 1}|${nBins}|${nBins + 1}) bins\\)`),
    );
    expect(below.provenance.label).toContain("fitted breath by breath");
    // regression dilution: the breath-by-breath slope on noisy VCO2 is flatter than 30; the bin means, closer to 30
    expect(r.slopeWholeExercise.slope.value!).toBeLessThan(30);
    expect(Math.abs(below.value! - 30)).toBeLessThan(Math.abs(r.slopeWholeExercise.slope.value! - 30));
  });
});
