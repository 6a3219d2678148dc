import { describe, expect, it } from "vitest";
import { analyse } from "../../lib/analysis";
import { analysisCharts } from "../../lib/report/analysisCharts";
import { demoRecord } from "./demoRecord";

describe("analysis charts read the engine's fits, never refit", () => {
  it("the V-slope chart's lines are the V-slope method's own, crossing at its estimate (invented demo case)", async () => {
    const result = analyse(await demoRecord("normal-adult"), { bootstrap: 0 });
    const method = result.thresholds.methods.find((m) => m.id === "vt1-v-slope")!;
    expect(method.vo2MlMin.value).not.toBeNull();
    const chart = analysisCharts(result).find((c) => c.id === "v-slope")!;
    const lines = chart.series.find((s) => s.kind === "line")!;
    const [from, cross, to] = lines.points;
    expect(cross[0]).toBeCloseTo(method.vo2MlMin.value!, 6);
    const { s1, s2, intercept1, intercept2 } = method.fit as Record<string, number>;
    expect(from[1]).toBeCloseTo(s1 * from[0] + intercept1, 6);
    expect(cross[1]).toBeCloseTo(s2 * cross[0] + intercept2, 6);
    expect(to[1]).toBeCloseTo(s2 * to[0] + intercept2, 6);
    expect(from[0]).toBeLessThan(cross[0]);
    expect(to[0]).toBeGreaterThan(cross[0]);
  });
});

describe("a reviewer's VT1 on the charts (invented demo case 'deconditioning')", () => {
  it("every VT1 marker reads 'VT1 (reviewer)' at the reviewer's value; the V-slope lines stay the automatic fit, named so", async () => {
    const record = await demoRecord("deconditioning");
    const auto = analyse(record, { bootstrap: 0 });
    const method = auto.thresholds.methods.find((m) => m.id === "vt1-v-slope")!;
    expect(method.vo2MlMin.value).not.toBeNull();
    // the reviewer's value: 150 mL/min below the automatic V-slope crossing, so the two cannot coincide
    const reviewerVo2 = Math.round(method.vo2MlMin.value! - 150);
    const result = analyse(record, {
      bootstrap: 0,
      overrides: [{ which: "vt1", vo2MlMin: reviewerVo2, reason: "test", by: "Dr Review", atIso: "2026-01-01T00:00:00.000Z" }],
    });
    expect(result.thresholds.vt1.overridden).toBeDefined();
    const charts = analysisCharts(result);
    const vslope = charts.find((c) => c.id === "v-slope")!;
    expect(vslope.markers).toEqual([{ x: result.thresholds.vt1.vo2MlMin.value, label: "VT1 (reviewer)", kind: "vt1" }]);
    const lines = vslope.series.find((s) => s.kind === "line")!;
    expect(lines.points[1][0]).toBeCloseTo(method.vo2MlMin.value!, 6);
    expect(lines.name).toMatch(/^automatic V-slope fit \(S1 [\d.]+, S2 [\d.]+; lines cross at \d+ mL\/min\)$/);
    for (const c of charts) for (const m of c.markers.filter((x) => x.kind === "vt1")) expect(m.label).toBe("VT1 (reviewer)");
    // without the override: plain "VT1" and the usual line name
    const plain = analysisCharts(auto).find((c) => c.id === "v-slope")!;
    expect(plain.markers.map((m) => m.label)).toEqual(["VT1"]);
    expect(plain.note).toBeUndefined();
  });
});
