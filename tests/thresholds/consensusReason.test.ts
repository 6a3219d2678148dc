import { describe, expect, it } from "vitest";
import { conditionTable } from "../../lib/signal";
import { generateSyntheticTest } from "../../lib/synthetic";
import { buildThresholdSeries } from "../../lib/thresholds/detectThresholds";
import { combineEstimates } from "../../lib/thresholds/consensus";
import { vSlope } from "../../lib/thresholds/vSlope";
import type { MethodQuality } from "../../lib/thresholds/thresholdTypes";
import { methodWithValue } from "./methodWithValue";

// Method values are invented; the estimate shape comes from the main synthetic model's test with seed 11.
describe("why agreeing methods give moderate rather than high confidence", () => {
  const series = buildThresholdSeries(conditionTable(generateSyntheticTest({}, 11).table))!;
  const base = vSlope(series);
  const as = (id: string, vo2MlMin: number, quality: MethodQuality) => methodWithValue(base, id, vo2MlMin, quality);

  it("names the missing good fit when the methods agree closely (0.4 % apart reads 'within 1 %', never 'within 0 %')", () => {
    const c = combineEstimates([as("a", 836, "poor"), as("b", 838, "fair"), as("c", 839.5, "poor")]);
    expect(c.confidence).toBe("moderate");
    expect(c.reason).toBe("methods agree within 1 %, but no method's fit is rated good");
  });

  it("names the spread against the 6 % needed for high confidence (default highSpreadFraction, our choice)", () => {
    // 1000 to 1080 mL/min around a median of 1040: spread 7.7 %, inside the 10 % agreement tolerance but above 6 %
    const c = combineEstimates([as("a", 1000, "good"), as("b", 1040, "fair"), as("c", 1080, "fair")]);
    expect(c.confidence).toBe("moderate");
    expect(c.reason).toBe("methods agree within 8 % (high confidence needs 6 %)");
  });

  it("gives no reason when confidence is high", () => {
    const c = combineEstimates([as("a", 1000, "good"), as("b", 1020, "fair")]);
    expect(c.confidence).toBe("high");
    expect(c.reason).toBeUndefined();
  });
});
