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
