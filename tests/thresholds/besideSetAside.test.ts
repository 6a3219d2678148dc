/**
 * A threshold placed next to breaths a reviewer set aside is said (`vt1-beside-set-aside`, `vt2-beside-set-aside`): the
 * corner was fitted across the gap. Invented test from the synthetic generator (truth known by construction).
 */
import { describe, expect, it } from "vitest";
import { conditionTable, type SetAsideSpan } from "../../lib/signal";
import { generateSyntheticTest } from "../../lib/synthetic";
import { detectThresholds, THRESHOLD_BESIDE_SPAN_S } from "../../lib/thresholds/detectThresholds";

describe("thresholds beside a span set aside by review (invented test)", () => {
  const syn = generateSyntheticTest({ noise: "low" }, 11);
  const vt1 = syn.truth.vt1!.timeS;
  const run = (setAside: SetAsideSpan[]) => detectThresholds(conditionTable(syn.table, { setAside }), { bootstrap: 0 });
  const codes = (r: ReturnType<typeof run>) => r.issues.map((i) => i.code);

  it("a gas span over the true VT1 time is said, naming the span and its reason", () => {
    const r = run([{ startS: vt1 - 15, endS: vt1 + 15, reason: "cough, by A. Reviewer" }]);
    expect(r.vt1.timeS).not.toBeNull();
    // the detected VT1 lies within the reach of the span (it was found from the breaths either side)
    expect(Math.abs(r.vt1.timeS! - vt1)).toBeLessThan(15 + THRESHOLD_BESIDE_SPAN_S);
    const issue = r.issues.find((i) => i.code === "vt1-beside-set-aside")!;
    expect(issue.severity).toBe("warning");
    expect(issue.message).toMatch(
      /^VT1 \(\d+:\d\d\) lies (inside|next to) breaths set aside by review \(\d+:\d\d–\d+:\d\d: cough, by A\. Reviewer\)/,
    );
  });

  it("not said for a span far from both thresholds, for a heart-rate span, nor without spans", () => {
    const restEnd = syn.table.rows.find((r) => r.phase === "exercise")!.timeS;
    expect(codes(run([{ startS: restEnd - 100, endS: restEnd - 80, reason: "swallow" }]))).not.toContain("vt1-beside-set-aside");
    const hr = run([{ startS: vt1 - 15, endS: vt1 + 15, reason: "ECG lead off", channel: "heart-rate" }]);
    expect(codes(hr).filter((c) => c.endsWith("beside-set-aside"))).toEqual([]);
    expect(codes(run([])).filter((c) => c.endsWith("beside-set-aside"))).toEqual([]);
  });

  it("a reviewer's own VT1 is not flagged", () => {
    const r = detectThresholds(conditionTable(syn.table, { setAside: [{ startS: vt1 - 15, endS: vt1 + 15, reason: "cough" }] }), {
      overrides: [{ which: "vt1", timeS: vt1 + 120, by: "A. Reviewer", reason: "read on the charts" }],
      bootstrap: 0,
    });
    expect(r.vt1.overridden).toBeDefined();
    expect(r.issues.map((i) => i.code)).not.toContain("vt1-beside-set-aside");
  });
});
