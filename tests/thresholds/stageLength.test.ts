import { describe, it, expect } from "vitest";
import type { BreathRow, Phase } from "../../lib/breath";
import { conditionTable } from "../../lib/signal";
import { auditSpec, generateAuditTest, generateSyntheticTest } from "../../lib/synthetic";
import { detectThresholds } from "../../lib/thresholds/detectThresholds";
import { stageLengthS } from "../../lib/thresholds/stageLength";

// Hand-built protocols (invented numbers), breaths every 3 s; stage lengths known by construction.
function test(load: (t: number) => Partial<BreathRow>) {
  const rows: BreathRow[] = [];
  for (let t = 0; t <= 1200; t += 3) {
    const phase: Phase = t < 120 ? "rest" : t < 300 ? "warmup" : t <= 1080 ? "exercise" : "recovery";
    rows.push({ timeS: t, vo2MlMin: 800, vco2MlMin: 720, veLMin: 25, phase, ...load(t) });
  }
  return conditionTable({
    shape: "breath",
    rows,
    fields: ["timeS", "vo2MlMin", "vco2MlMin", "veLMin", "workW", "speedKmh", "gradePct", "phase"],
  });
}

describe("stageLengthS", () => {
  it("a ramp of 20 W/min in whole watts (a 1-W change every 3 s) is a ramp: null", () => {
    expect(stageLengthS(test((t) => ({ workW: t < 300 ? 0 : Math.round((20 * (t - 300)) / 60) })))).toBeNull();
  });
  it("25 W every 60 s: 60 s", () => {
    expect(stageLengthS(test((t) => ({ workW: t < 300 ? 0 : 25 * (1 + Math.floor((t - 300) / 60)) })))).toBe(60);
  });
  it("treadmill grade +2 % every 180 s at 5 km/h: 180 s", () => {
    expect(stageLengthS(test((t) => ({ speedKmh: 5, gradePct: t < 300 ? 0 : 2 * (1 + Math.floor((t - 300) / 180)) })))).toBe(180);
  });
  it("no load signal: null", () => {
    expect(stageLengthS(test(() => ({})))).toBeNull();
  });
});

describe("detectThresholds on stepped protocols", () => {
  it("3-min stages (audit model, invented): a warning, and no threshold above moderate confidence", () => {
    let found = false;
    for (let i = 0; i < 120 && !found; i++) {
      const spec = auditSpec(i, 41, ["moderate"]);
      if (!spec.label.includes("steps180")) continue;
      found = true;
      const r = detectThresholds(conditionTable(generateAuditTest(spec, 41 + i).table), { bootstrap: 0 });
      const issue = r.issues.find((x) => x.code === "thresholds-stepped-protocol");
      expect(issue?.severity).toBe("warning");
      expect(issue?.message).toMatch(/stages of about 1(79|8[0-3]) s/); // breath-stamped: within a breath of 180 s
      expect(r.vt1.confidence).not.toBe("high");
      expect(r.vt2.confidence).not.toBe("high");
    }
    expect(found).toBe(true);
  });
  it("1-min stages (main model, noise-free, invented): VT1 within 3 % of truth, an info note, confidence not capped", () => {
    const syn = generateSyntheticTest({ noise: "none", stageS: 60 }, 2);
    const r = detectThresholds(conditionTable(syn.table), { bootstrap: 0 });
    expect(Math.abs(r.vt1.vo2MlMin.value! - syn.truth.vt1.vo2MlMin) / syn.truth.vt1.vo2MlMin).toBeLessThan(0.03);
    const note = r.issues.find((x) => x.code === "thresholds-stepped-protocol");
    expect(note?.severity).toBe("info");
    expect(note?.message).toMatch(/stages of about (59|6[0-2]) s/); // breath-stamped: within a breath of 60 s
  });
  it("a ramp (main model, noise-free): no stepped-protocol note", () => {
    const r = detectThresholds(conditionTable(generateSyntheticTest({ noise: "none" }, 2).table), { bootstrap: 0 });
    expect(r.issues.map((x) => x.code)).not.toContain("thresholds-stepped-protocol");
  });
});
